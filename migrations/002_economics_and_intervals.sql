-- A building's tariff and costs, and interval analyses attached to a building.

-- The building's EconomicsSettings as JSON (currency, tariff, operating hours, losses, cost); NULL when none.
ALTER TABLE buildings ADD COLUMN economics_json TEXT CHECK (economics_json IS NULL OR json_valid(economics_json));

-- One row per stored analysis of a building's interval data: the summary (not the raw file), written once.
-- seq orders them by insertion (newest first in lists; "the newest" a survey uses); id is the public name.
CREATE TABLE interval_analyses (
  seq              INTEGER PRIMARY KEY AUTOINCREMENT,
  id               TEXT NOT NULL UNIQUE,
  org_id           TEXT NOT NULL REFERENCES organisations (id),
  building_id      TEXT NOT NULL,
  created_at       TEXT NOT NULL,
  actor            TEXT NOT NULL,
  request_id       TEXT,
  target_pf        REAL NOT NULL CHECK (target_pf > 0 AND target_pf <= 1),
  interval_count   INTEGER NOT NULL CHECK (interval_count >= 1),
  interval_minutes REAL NOT NULL CHECK (interval_minutes > 0),
  first_timestamp  TEXT NOT NULL,
  last_timestamp   TEXT NOT NULL,
  hold99_kvar      REAL NOT NULL,
  min_kvar         REAL NOT NULL,
  summary_json     TEXT NOT NULL CHECK (json_valid(summary_json)),
  UNIQUE (org_id, id),
  FOREIGN KEY (org_id, building_id) REFERENCES buildings (org_id, id)
);
CREATE INDEX interval_analyses_by_building ON interval_analyses (org_id, building_id, seq);

CREATE TRIGGER interval_analyses_immutable BEFORE UPDATE ON interval_analyses
BEGIN SELECT RAISE(ABORT, 'interval analyses are immutable'); END;
CREATE TRIGGER interval_analyses_kept BEFORE DELETE ON interval_analyses
BEGIN SELECT RAISE(ABORT, 'interval analyses are never deleted'); END;
