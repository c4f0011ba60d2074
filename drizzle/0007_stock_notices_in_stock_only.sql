-- Stock change notices only for changes that touch stock: a part inserted or deleted in stock,
-- or updated while in stock before or after (a status move, a refit, a new bin or lot). Parts
-- being measured, reviewed or issued do not change what matching picks from, and on a busy
-- intake line they would otherwise make every match request reload the type's stock.
CREATE OR REPLACE FUNCTION sluice_notify_stock_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_TABLE_NAME = 'device_type' THEN
    PERFORM pg_notify('sluice_stock', NEW.id::text);
    RETURN NULL;
  END IF;
  IF TG_OP <> 'INSERT' AND OLD.status = 'in_stock' THEN
    PERFORM pg_notify('sluice_stock', OLD.device_type_id::text);
  END IF;
  IF TG_OP <> 'DELETE' AND NEW.status = 'in_stock' THEN
    PERFORM pg_notify('sluice_stock', NEW.device_type_id::text);
  END IF;
  RETURN NULL;
END;
$$;
