-- Saved setback schedules, one per zone, in the schedule format of core/plan/schedule.ts (checked by
-- the application before it is written). A schedule goes with its zone: deleting the zone deletes it,
-- and a later zone that reuses the id starts without one.
CREATE TABLE schedules (
  zone_id       INTEGER PRIMARY KEY REFERENCES zones (id) ON DELETE CASCADE,
  schedule_json TEXT    NOT NULL CHECK (json_valid(schedule_json)),
  saved_at      INTEGER NOT NULL
) STRICT;

PRAGMA user_version = 2;
