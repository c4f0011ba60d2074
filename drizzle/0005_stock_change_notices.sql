-- Stock change notices: every committed change to a part, or to a device type's temperature
-- coefficients, sends NOTIFY sluice_stock with the device type's id. Servers LISTEN and drop
-- their cached candidates for that type (see services/match/stock-changes.ts); PostgreSQL
-- delivers a notice only when its transaction commits, and sends one per type per transaction.
CREATE OR REPLACE FUNCTION sluice_notify_stock_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_TABLE_NAME = 'device_type' THEN
    PERFORM pg_notify('sluice_stock', NEW.id::text);
    RETURN NULL;
  END IF;
  IF TG_OP <> 'INSERT' THEN
    PERFORM pg_notify('sluice_stock', OLD.device_type_id::text);
  END IF;
  IF TG_OP <> 'DELETE' THEN
    PERFORM pg_notify('sluice_stock', NEW.device_type_id::text);
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER part_stock_change_notice AFTER INSERT OR UPDATE OR DELETE ON part
  FOR EACH ROW EXECUTE FUNCTION sluice_notify_stock_change();
--> statement-breakpoint
CREATE TRIGGER device_type_stock_change_notice AFTER UPDATE ON device_type
  FOR EACH ROW EXECUTE FUNCTION sluice_notify_stock_change();
