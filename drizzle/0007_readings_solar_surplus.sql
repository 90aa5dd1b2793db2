-- Solar surplus beside each reading (W, before diversion to the immersion), so that heat from
-- diverted surplus can be accounted as free. On the pg_partman parent this reaches every existing
-- daily partition, and partitions made later copy the parent's columns.
ALTER TABLE "readings" ADD COLUMN "solar_surplus_w" smallint;
