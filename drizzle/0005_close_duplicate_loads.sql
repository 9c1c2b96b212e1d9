-- Before one active load per mix or container per batch and station is enforced (next
-- migration), close the duplicates that concurrent loads could make: the earliest load of each
-- group stays active, the later copies are marked unloaded at the moment they were loaded.
UPDATE "station_loads" AS l
SET "unloaded_at" = l."loaded_at"
WHERE l."unloaded_at" IS NULL
  AND EXISTS (
    SELECT 1 FROM "station_loads" AS e
    WHERE e."unloaded_at" IS NULL
      AND e."station_id" = l."station_id"
      AND e."batch_id" = l."batch_id"
      AND e."container_id" IS NOT DISTINCT FROM l."container_id"
      AND e."mix_id" IS NOT DISTINCT FROM l."mix_id"
      AND (e."loaded_at", e."id") < (l."loaded_at", l."id")
  );
