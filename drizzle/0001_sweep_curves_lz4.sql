-- Sweep curves (7-13 kB of JSON each) are compressed with lz4 rather than the default pglz:
-- about half the database's CPU per stored sweep, for a few per cent more space. A server
-- built without lz4 keeps pglz.
DO $$
BEGIN
  ALTER TABLE "sweep" ALTER COLUMN "curves" SET COMPRESSION lz4;
EXCEPTION WHEN feature_not_supported THEN
  RAISE NOTICE 'lz4 is not available on this server; sweep curves stay pglz-compressed';
END $$;
