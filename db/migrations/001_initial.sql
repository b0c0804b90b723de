-- 001: the first schema of a Heatlag store.
-- Units: temperatures °C (REAL), runtime as the fraction 0–1 of the interval that ends at the sample's
-- time, timestamps epoch milliseconds UTC (INTEGER). Names of sites, zones and mappings compare without
-- regard to ASCII case. Every table is STRICT.

-- "HTLG" as a 32-bit integer: marks the file as a Heatlag store (PRAGMA application_id).
PRAGMA application_id = 1213484103;

CREATE TABLE sites (
  id         INTEGER PRIMARY KEY,
  name       TEXT    NOT NULL COLLATE NOCASE UNIQUE CHECK (length(trim(name)) > 0),
  created_at INTEGER NOT NULL
) STRICT;

CREATE TABLE zones (
  id         INTEGER PRIMARY KEY,
  site_id    INTEGER NOT NULL REFERENCES sites (id) ON DELETE CASCADE,
  name       TEXT    NOT NULL COLLATE NOCASE CHECK (length(trim(name)) > 0),
  -- unit the zone's logs were written in (for display); NULL before the first import
  units      TEXT    CHECK (units IN ('C', 'F')),
  created_at INTEGER NOT NULL,
  UNIQUE (site_id, name)
) STRICT;

-- One imported file.
CREATE TABLE logs (
  id               INTEGER PRIMARY KEY,
  zone_id          INTEGER NOT NULL REFERENCES zones (id) ON DELETE CASCADE,
  file_name        TEXT    NOT NULL,
  sha256           TEXT    NOT NULL CHECK (length(sha256) = 64),
  bytes            INTEGER NOT NULL,
  imported_at      INTEGER NOT NULL,
  -- the mapping actually used (detected or given), as JSON
  mapping_json     TEXT    NOT NULL CHECK (json_valid(mapping_json)),
  encoding         TEXT    NOT NULL,
  units            TEXT    NOT NULL CHECK (units IN ('C', 'F')),
  rows_accepted    INTEGER NOT NULL DEFAULT 0,
  rows_rejected    INTEGER NOT NULL DEFAULT 0,
  duplicates       INTEGER NOT NULL DEFAULT 0,
  first_time       INTEGER,
  last_time        INTEGER,
  interval_minutes REAL,
  warnings_json    TEXT    NOT NULL DEFAULT '[]' CHECK (json_valid(warnings_json))
) STRICT;
CREATE INDEX logs_by_zone ON logs (zone_id, imported_at);
CREATE INDEX logs_by_hash ON logs (zone_id, sha256);

-- Readings in internal units. log_id says which import added the row; it has no foreign key on
-- purpose (a cascade from logs would scan the whole table); Store.deleteLog removes a log's rows by
-- (zone_id, log_id), and deleting a zone removes its rows through zone_id.
CREATE TABLE samples (
  zone_id       INTEGER NOT NULL REFERENCES zones (id) ON DELETE CASCADE,
  time          INTEGER NOT NULL,
  log_id        INTEGER NOT NULL,
  indoor        REAL    NOT NULL,
  outdoor       REAL,
  heat_setpoint REAL,
  cool_setpoint REAL,
  heat          REAL    CHECK (heat BETWEEN 0 AND 1),
  cool          REAL    CHECK (cool BETWEEN 0 AND 1),
  PRIMARY KEY (zone_id, time)
) STRICT, WITHOUT ROWID;

-- Rows of a log that could not be read, with the reason (line and column 1-based).
CREATE TABLE rejected_rows (
  id           INTEGER PRIMARY KEY,
  log_id       INTEGER NOT NULL REFERENCES logs (id) ON DELETE CASCADE,
  line         INTEGER NOT NULL,
  column_index INTEGER,
  column_name  TEXT,
  reason       TEXT    NOT NULL,
  raw          TEXT    NOT NULL
) STRICT;
CREATE INDEX rejected_rows_by_log ON rejected_rows (log_id, line);

-- Saved column mappings (core/mapping.ts), by name.
CREATE TABLE mappings (
  id           INTEGER PRIMARY KEY,
  name         TEXT    NOT NULL COLLATE NOCASE UNIQUE CHECK (length(trim(name)) > 0),
  mapping_json TEXT    NOT NULL CHECK (json_valid(mapping_json)),
  created_at   INTEGER NOT NULL,
  updated_at   INTEGER NOT NULL
) STRICT;

-- Fitted zone responses (core/types.ts ZoneResponse as JSON, the main numbers as columns).
CREATE TABLE responses (
  id            INTEGER PRIMARY KEY,
  zone_id       INTEGER NOT NULL REFERENCES zones (id) ON DELETE CASCADE,
  created_at    INTEGER NOT NULL,
  tau_hours     REAL    NOT NULL,
  heat_rate     REAL    NOT NULL,
  cool_rate     REAL    NOT NULL,
  gain          REAL    NOT NULL,
  rmse          REAL,
  held_out_rmse REAL,
  cvrmse        REAL,
  nmbe          REAL,
  samples_used  INTEGER NOT NULL,
  first_time    INTEGER,
  last_time     INTEGER,
  response_json TEXT    NOT NULL CHECK (json_valid(response_json))
) STRICT;
CREATE INDEX responses_by_zone ON responses (zone_id, created_at);

PRAGMA user_version = 1;
