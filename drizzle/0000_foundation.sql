CREATE TYPE "public"."channel" AS ENUM('n', 'p');--> statement-breakpoint
CREATE TYPE "public"."fit_review" AS ENUM('auto_accepted', 'needs_review', 'accepted', 'rejected', 'retest');--> statement-breakpoint
CREATE TYPE "public"."part_status" AS ENUM('measured', 'needs_review', 'retest', 'accepted', 'in_stock', 'reserved', 'issued', 'returned', 'scrapped', 'quarantined');--> statement-breakpoint
CREATE TYPE "public"."upload_file_state" AS ENUM('queued', 'fitted', 'needs_review', 'rejected');--> statement-breakpoint
CREATE TYPE "public"."pick_list_status" AS ENUM('open', 'complete', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."reservation_status" AS ENUM('active', 'issued', 'cancelled', 'expired');--> statement-breakpoint
CREATE TABLE "account" (
	"id" text PRIMARY KEY NOT NULL,
	"account_id" text NOT NULL,
	"provider_id" text NOT NULL,
	"user_id" text NOT NULL,
	"access_token" text,
	"refresh_token" text,
	"id_token" text,
	"access_token_expires_at" timestamp with time zone,
	"refresh_token_expires_at" timestamp with time zone,
	"scope" text,
	"password" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "invitation" (
	"id" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"user_id" text NOT NULL,
	"invited_by" text,
	"roles" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"accepted_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "rate_limit" (
	"id" text PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"count" integer NOT NULL,
	"last_request" bigint NOT NULL,
	CONSTRAINT "rate_limit_key_unique" UNIQUE("key")
);
--> statement-breakpoint
CREATE TABLE "session" (
	"id" text PRIMARY KEY NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"token" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"ip_address" text,
	"user_agent" text,
	"user_id" text NOT NULL,
	"impersonated_by" text,
	CONSTRAINT "session_token_unique" UNIQUE("token")
);
--> statement-breakpoint
CREATE TABLE "station_token" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"token_sha256" text NOT NULL,
	"token_prefix" text NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	CONSTRAINT "station_token_token_sha256_unique" UNIQUE("token_sha256")
);
--> statement-breakpoint
CREATE TABLE "user" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"email" text NOT NULL,
	"email_verified" boolean DEFAULT false NOT NULL,
	"image" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"role" text,
	"banned" boolean DEFAULT false,
	"ban_reason" text,
	"ban_expires" timestamp with time zone,
	CONSTRAINT "user_email_unique" UNIQUE("email")
);
--> statement-breakpoint
CREATE TABLE "verification" (
	"id" text PRIMARY KEY NOT NULL,
	"identifier" text NOT NULL,
	"value" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "device_type" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"channel" "channel" NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"vds_test_v" double precision NOT NULL,
	"nominal_temperature_c" double precision DEFAULT 25 NOT NULL,
	"idss_min_a" double precision,
	"idss_max_a" double precision,
	"vp_min_v" double precision,
	"vp_max_v" double precision,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "device_type_name_unique" UNIQUE("name")
);
--> statement-breakpoint
CREATE TABLE "location" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"barcode" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "location_name_unique" UNIQUE("name"),
	CONSTRAINT "location_barcode_unique" UNIQUE("barcode")
);
--> statement-breakpoint
CREATE TABLE "lot" (
	"id" serial PRIMARY KEY NOT NULL,
	"code" text NOT NULL,
	"device_type_id" integer NOT NULL,
	"supplier" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "audit_log_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"actor_user_id" text,
	"actor_station_id" text,
	"action" text NOT NULL,
	"subject_type" text NOT NULL,
	"subject_id" text NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"reason" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "fit" (
	"id" serial PRIMARY KEY NOT NULL,
	"sweep_id" integer NOT NULL,
	"part_id" integer NOT NULL,
	"model" text NOT NULL,
	"engine_version" text NOT NULL,
	"vto_v" double precision NOT NULL,
	"beta_a_per_v2" double precision NOT NULL,
	"lambda_per_v" double precision NOT NULL,
	"rs_ohm" double precision DEFAULT 0 NOT NULL,
	"rd_ohm" double precision DEFAULT 0 NOT NULL,
	"idss_a" double precision NOT NULL,
	"idss_vds_v" double precision NOT NULL,
	"vp_v" double precision NOT NULL,
	"gfs_s" double precision NOT NULL,
	"gos_s" double precision NOT NULL,
	"rds_on_ohm" double precision NOT NULL,
	"rms_rel" double precision NOT NULL,
	"detail" jsonb NOT NULL,
	"flags" text[] DEFAULT '{}' NOT NULL,
	"review" "fit_review" NOT NULL,
	"reviewed_by" text,
	"reviewed_at" timestamp with time zone,
	"review_note" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "part" (
	"id" serial PRIMARY KEY NOT NULL,
	"serial" text NOT NULL,
	"device_type_id" integer NOT NULL,
	"lot_id" integer,
	"status" "part_status" DEFAULT 'measured' NOT NULL,
	"current_fit_id" integer,
	"bin_id" integer,
	"location_id" integer,
	"reservation_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "part_serial_unique" UNIQUE("serial")
);
--> statement-breakpoint
CREATE TABLE "sweep" (
	"id" serial PRIMARY KEY NOT NULL,
	"part_id" integer NOT NULL,
	"upload_file_id" integer,
	"index_in_file" integer DEFAULT 0 NOT NULL,
	"vgs_steps_v" double precision[] NOT NULL,
	"curves" jsonb NOT NULL,
	"point_count" integer NOT NULL,
	"temperature_c" double precision,
	"station" text,
	"operator" text,
	"metadata" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"excluded_points" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"measured_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "upload" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" text,
	"station_token_id" text,
	"tags" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "upload_file" (
	"id" serial PRIMARY KEY NOT NULL,
	"upload_id" uuid NOT NULL,
	"original_name" text NOT NULL,
	"sha256" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"stored_path" text NOT NULL,
	"state" "upload_file_state" DEFAULT 'queued' NOT NULL,
	"reason" text,
	"error_code" text,
	"duplicate_of_id" integer,
	"serials" text[] DEFAULT '{}' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "bin" (
	"id" serial PRIMARY KEY NOT NULL,
	"bin_plan_id" integer NOT NULL,
	"code" text NOT NULL,
	"label" text NOT NULL,
	"ranges" jsonb NOT NULL,
	"is_hold" boolean DEFAULT false NOT NULL,
	"home_location_id" integer,
	"low_stock_threshold" integer DEFAULT 0 NOT NULL,
	"low_stock_alerted_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "bin_assignment" (
	"id" serial PRIMARY KEY NOT NULL,
	"part_id" integer NOT NULL,
	"bin_id" integer NOT NULL,
	"fit_id" integer,
	"assigned_by" text,
	"assigned_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "bin_plan" (
	"id" serial PRIMARY KEY NOT NULL,
	"device_type_id" integer NOT NULL,
	"version" integer NOT NULL,
	"name" text DEFAULT '' NOT NULL,
	"definition" jsonb NOT NULL,
	"is_active" boolean DEFAULT false NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "low_stock_alert" (
	"id" serial PRIMARY KEY NOT NULL,
	"bin_id" integer NOT NULL,
	"on_hand" integer NOT NULL,
	"threshold" integer NOT NULL,
	"crossed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"mailed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "match_proposal" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"designer_user_id" text NOT NULL,
	"device_type_id" integer NOT NULL,
	"request" jsonb NOT NULL,
	"result" jsonb NOT NULL,
	"confirmed_reservation_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pick_line" (
	"id" serial PRIMARY KEY NOT NULL,
	"pick_list_id" integer NOT NULL,
	"line_no" integer NOT NULL,
	"part_id" integer NOT NULL,
	"location_id" integer,
	"set_index" integer NOT NULL,
	"role" text NOT NULL,
	"picked_at" timestamp with time zone,
	"picked_by" text
);
--> statement-breakpoint
CREATE TABLE "pick_list" (
	"id" serial PRIMARY KEY NOT NULL,
	"reservation_id" uuid NOT NULL,
	"status" "pick_list_status" DEFAULT 'open' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"completed_at" timestamp with time zone,
	"completed_by" text
);
--> statement-breakpoint
CREATE TABLE "reservation" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"proposal_id" uuid,
	"designer_user_id" text NOT NULL,
	"purpose" text DEFAULT '' NOT NULL,
	"status" "reservation_status" DEFAULT 'active' NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"closed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "reservation_part" (
	"id" serial PRIMARY KEY NOT NULL,
	"reservation_id" uuid NOT NULL,
	"part_id" integer NOT NULL,
	"set_index" integer NOT NULL,
	"role" text NOT NULL,
	"vgs_v" double precision NOT NULL,
	"gm_s" double precision NOT NULL,
	"idss_a" double precision NOT NULL
);
--> statement-breakpoint
ALTER TABLE "account" ADD CONSTRAINT "account_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_invited_by_user_id_fk" FOREIGN KEY ("invited_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "session" ADD CONSTRAINT "session_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "station_token" ADD CONSTRAINT "station_token_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lot" ADD CONSTRAINT "lot_device_type_id_device_type_id_fk" FOREIGN KEY ("device_type_id") REFERENCES "public"."device_type"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lot" ADD CONSTRAINT "lot_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit" ADD CONSTRAINT "fit_sweep_id_sweep_id_fk" FOREIGN KEY ("sweep_id") REFERENCES "public"."sweep"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit" ADD CONSTRAINT "fit_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fit" ADD CONSTRAINT "fit_reviewed_by_user_id_fk" FOREIGN KEY ("reviewed_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_device_type_id_device_type_id_fk" FOREIGN KEY ("device_type_id") REFERENCES "public"."device_type"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_lot_id_lot_id_fk" FOREIGN KEY ("lot_id") REFERENCES "public"."lot"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_location_id_location_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."location"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweep" ADD CONSTRAINT "sweep_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweep" ADD CONSTRAINT "sweep_upload_file_id_upload_file_id_fk" FOREIGN KEY ("upload_file_id") REFERENCES "public"."upload_file"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "upload" ADD CONSTRAINT "upload_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "upload" ADD CONSTRAINT "upload_station_token_id_station_token_id_fk" FOREIGN KEY ("station_token_id") REFERENCES "public"."station_token"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "upload_file" ADD CONSTRAINT "upload_file_upload_id_upload_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."upload"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bin" ADD CONSTRAINT "bin_bin_plan_id_bin_plan_id_fk" FOREIGN KEY ("bin_plan_id") REFERENCES "public"."bin_plan"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bin" ADD CONSTRAINT "bin_home_location_id_location_id_fk" FOREIGN KEY ("home_location_id") REFERENCES "public"."location"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bin_assignment" ADD CONSTRAINT "bin_assignment_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bin_assignment" ADD CONSTRAINT "bin_assignment_bin_id_bin_id_fk" FOREIGN KEY ("bin_id") REFERENCES "public"."bin"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bin_plan" ADD CONSTRAINT "bin_plan_device_type_id_device_type_id_fk" FOREIGN KEY ("device_type_id") REFERENCES "public"."device_type"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bin_plan" ADD CONSTRAINT "bin_plan_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "low_stock_alert" ADD CONSTRAINT "low_stock_alert_bin_id_bin_id_fk" FOREIGN KEY ("bin_id") REFERENCES "public"."bin"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "match_proposal" ADD CONSTRAINT "match_proposal_designer_user_id_user_id_fk" FOREIGN KEY ("designer_user_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "match_proposal" ADD CONSTRAINT "match_proposal_device_type_id_device_type_id_fk" FOREIGN KEY ("device_type_id") REFERENCES "public"."device_type"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pick_line" ADD CONSTRAINT "pick_line_pick_list_id_pick_list_id_fk" FOREIGN KEY ("pick_list_id") REFERENCES "public"."pick_list"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pick_line" ADD CONSTRAINT "pick_line_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pick_line" ADD CONSTRAINT "pick_line_location_id_location_id_fk" FOREIGN KEY ("location_id") REFERENCES "public"."location"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pick_line" ADD CONSTRAINT "pick_line_picked_by_user_id_fk" FOREIGN KEY ("picked_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pick_list" ADD CONSTRAINT "pick_list_reservation_id_reservation_id_fk" FOREIGN KEY ("reservation_id") REFERENCES "public"."reservation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pick_list" ADD CONSTRAINT "pick_list_completed_by_user_id_fk" FOREIGN KEY ("completed_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reservation" ADD CONSTRAINT "reservation_proposal_id_match_proposal_id_fk" FOREIGN KEY ("proposal_id") REFERENCES "public"."match_proposal"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reservation" ADD CONSTRAINT "reservation_designer_user_id_user_id_fk" FOREIGN KEY ("designer_user_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reservation_part" ADD CONSTRAINT "reservation_part_reservation_id_reservation_id_fk" FOREIGN KEY ("reservation_id") REFERENCES "public"."reservation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reservation_part" ADD CONSTRAINT "reservation_part_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "lot_code_unique" ON "lot" USING btree ("code");--> statement-breakpoint
CREATE INDEX "audit_subject_idx" ON "audit_log" USING btree ("subject_type","subject_id");--> statement-breakpoint
CREATE INDEX "audit_at_idx" ON "audit_log" USING btree ("at");--> statement-breakpoint
CREATE INDEX "fit_part_idx" ON "fit" USING btree ("part_id");--> statement-breakpoint
CREATE INDEX "fit_sweep_idx" ON "fit" USING btree ("sweep_id");--> statement-breakpoint
CREATE INDEX "part_type_status_idx" ON "part" USING btree ("device_type_id","status");--> statement-breakpoint
CREATE INDEX "part_bin_status_idx" ON "part" USING btree ("bin_id","status");--> statement-breakpoint
CREATE INDEX "part_lot_idx" ON "part" USING btree ("lot_id");--> statement-breakpoint
CREATE INDEX "sweep_part_idx" ON "sweep" USING btree ("part_id");--> statement-breakpoint
CREATE UNIQUE INDEX "sweep_file_index_unique" ON "sweep" USING btree ("upload_file_id","index_in_file");--> statement-breakpoint
CREATE INDEX "upload_file_upload_idx" ON "upload_file" USING btree ("upload_id");--> statement-breakpoint
CREATE INDEX "upload_file_sha_idx" ON "upload_file" USING btree ("sha256");--> statement-breakpoint
CREATE UNIQUE INDEX "bin_plan_code_unique" ON "bin" USING btree ("bin_plan_id","code");--> statement-breakpoint
CREATE INDEX "bin_assignment_part_idx" ON "bin_assignment" USING btree ("part_id");--> statement-breakpoint
CREATE UNIQUE INDEX "bin_plan_version_unique" ON "bin_plan" USING btree ("device_type_id","version");--> statement-breakpoint
CREATE INDEX "pick_line_list_idx" ON "pick_line" USING btree ("pick_list_id");--> statement-breakpoint
CREATE INDEX "reservation_status_idx" ON "reservation" USING btree ("status","expires_at");--> statement-breakpoint
CREATE INDEX "reservation_part_res_idx" ON "reservation_part" USING btree ("reservation_id");--> statement-breakpoint
CREATE INDEX "reservation_part_part_idx" ON "reservation_part" USING btree ("part_id");