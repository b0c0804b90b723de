-- The site's IANA time zone (e.g. "America/Denver"), checked by the application before it is written.
-- NULL when not set: a zone's times then follow its newest log that names a time zone, else the
-- computer's. Logs with UTC offsets or epoch timestamps carry no zone of their own.
ALTER TABLE sites ADD COLUMN timezone TEXT;

PRAGMA user_version = 3;
