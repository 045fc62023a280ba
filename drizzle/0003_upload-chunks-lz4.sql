-- Written by hand (drizzle-kit does not model column compression). The original upload is kept in
-- 1 MiB chunks; lz4 compresses CSV text several times faster than the default pglz, which was
-- the slowest step after the samples themselves on a large upload. Existing chunks keep theirs.
ALTER TABLE "upload_chunks" ALTER COLUMN "bytes" SET COMPRESSION lz4;
