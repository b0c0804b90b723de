-- The site's location in decimal degrees (latitude north positive, longitude east positive), for the
-- clear-sky solar gain proxy of the fit (core/solar.ts). Both NULL when not set: the fit then has no
-- solar term. Checked by the application (core/solar.ts checkSiteLocation) and again here.
ALTER TABLE sites ADD COLUMN latitude REAL CHECK (latitude IS NULL OR (latitude BETWEEN -90 AND 90));
ALTER TABLE sites ADD COLUMN longitude REAL CHECK (longitude IS NULL OR (longitude BETWEEN -180 AND 180));

PRAGMA user_version = 4;
