ALTER TABLE "device_type" ADD COLUMN "vtotc_v_per_c" double precision DEFAULT -0.0022 NOT NULL;--> statement-breakpoint
ALTER TABLE "device_type" ADD COLUMN "betatce_pct_per_c" double precision DEFAULT -0.7 NOT NULL;--> statement-breakpoint
ALTER TABLE "fit" ADD COLUMN "operating_table" double precision[];--> statement-breakpoint
ALTER TABLE "fit" ADD COLUMN "model_vgs_sigma_v" double precision;