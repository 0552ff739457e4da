-- Organisations, buildings (with version history), surveys (immutable revisions),
-- idempotency records and the audit log. Every row belongs to an organisation.

CREATE TABLE organisations (
  id         TEXT PRIMARY KEY,
  name       TEXT NOT NULL,
  created_at TEXT NOT NULL
);

INSERT INTO organisations (id, name, created_at)
VALUES ('org_default', 'Default organisation', strftime('%Y-%m-%dT%H:%M:%fZ', 'now'));

CREATE TABLE buildings (
  id                        TEXT PRIMARY KEY,
  org_id                    TEXT NOT NULL REFERENCES organisations (id),
  name                      TEXT NOT NULL COLLATE NOCASE,
  address                   TEXT,
  notes                     TEXT,
  voltage_v                 REAL NOT NULL CHECK (voltage_v > 0),
  frequency_hz              INTEGER NOT NULL CHECK (frequency_hz IN (50, 60)),
  phases                    INTEGER NOT NULL CHECK (phases IN (1, 3)),
  transformer_kva           REAL CHECK (transformer_kva > 0),
  transformer_impedance_pct REAL CHECK (transformer_impedance_pct > 0),
  transformer_x_over_r      REAL CHECK (transformer_x_over_r > 0),
  utility_fault_mva         REAL CHECK (utility_fault_mva > 0),
  version                   INTEGER NOT NULL CHECK (version >= 1),
  created_at                TEXT NOT NULL,
  updated_at                TEXT NOT NULL,
  UNIQUE (org_id, id),
  CHECK ((transformer_kva IS NULL) = (transformer_impedance_pct IS NULL))
);
CREATE INDEX buildings_by_name ON buildings (org_id, name, id);

-- Every version of a building, the current one included; written once, never changed.
CREATE TABLE building_versions (
  org_id      TEXT NOT NULL,
  building_id TEXT NOT NULL,
  version     INTEGER NOT NULL,
  data_json   TEXT NOT NULL,
  recorded_at TEXT NOT NULL,
  actor       TEXT NOT NULL,
  PRIMARY KEY (building_id, version),
  FOREIGN KEY (org_id, building_id) REFERENCES buildings (org_id, id)
);

-- One row per survey: the head of its revisions and the summary of the latest one,
-- so lists and trends read columns, not JSON.
CREATE TABLE surveys (
  id               TEXT PRIMARY KEY,
  org_id           TEXT NOT NULL,
  building_id      TEXT NOT NULL,
  created_at       TEXT NOT NULL,
  latest_revision  INTEGER NOT NULL CHECK (latest_revision >= 1),
  surveyed_at      TEXT NOT NULL,
  surveyed_at_utc  TEXT NOT NULL,
  surveyor         TEXT NOT NULL,
  kw               REAL NOT NULL,
  kvar             REAL NOT NULL,
  kva              REAL NOT NULL,
  displacement_pf  REAL NOT NULL,
  kvar_required    REAL NOT NULL,
  warning_count    INTEGER NOT NULL,
  UNIQUE (org_id, id),
  FOREIGN KEY (org_id, building_id) REFERENCES buildings (org_id, id)
);
CREATE INDEX surveys_by_time ON surveys (org_id, building_id, surveyed_at_utc, id);

-- Immutable revisions: the inputs as submitted, the result the engine gave then,
-- the engine version and the building's electrical data it was computed with.
CREATE TABLE survey_revisions (
  org_id                 TEXT NOT NULL,
  survey_id              TEXT NOT NULL,
  n                      INTEGER NOT NULL CHECK (n >= 1),
  reason                 TEXT,
  created_at             TEXT NOT NULL,
  actor                  TEXT NOT NULL,
  inputs_json            TEXT NOT NULL,
  result_json            TEXT NOT NULL,
  engine_version         TEXT NOT NULL,
  building_snapshot_json TEXT NOT NULL,
  kw                     REAL NOT NULL,
  kvar                   REAL NOT NULL,
  kva                    REAL NOT NULL,
  displacement_pf        REAL NOT NULL,
  kvar_required          REAL NOT NULL,
  warning_count          INTEGER NOT NULL,
  PRIMARY KEY (survey_id, n),
  FOREIGN KEY (org_id, survey_id) REFERENCES surveys (org_id, id),
  CHECK ((n = 1) = (reason IS NULL))
);

CREATE TABLE idempotency_keys (
  org_id        TEXT NOT NULL REFERENCES organisations (id),
  key           TEXT NOT NULL,
  request_hash  TEXT NOT NULL,
  status        INTEGER NOT NULL,
  location      TEXT,
  response_json TEXT NOT NULL,
  created_at    TEXT NOT NULL,
  PRIMARY KEY (org_id, key)
);
CREATE INDEX idempotency_keys_by_age ON idempotency_keys (created_at);

CREATE TABLE audit_log (
  id            INTEGER PRIMARY KEY AUTOINCREMENT,
  org_id        TEXT NOT NULL REFERENCES organisations (id),
  actor         TEXT NOT NULL,
  action        TEXT NOT NULL,
  resource_type TEXT NOT NULL,
  resource_id   TEXT NOT NULL,
  request_id    TEXT,
  at            TEXT NOT NULL
);
CREATE INDEX audit_log_by_org ON audit_log (org_id, id);

-- What is recorded stays recorded.
CREATE TRIGGER building_versions_immutable BEFORE UPDATE ON building_versions
BEGIN SELECT RAISE(ABORT, 'building versions are immutable'); END;
CREATE TRIGGER building_versions_kept BEFORE DELETE ON building_versions
BEGIN SELECT RAISE(ABORT, 'building versions are never deleted'); END;
CREATE TRIGGER survey_revisions_immutable BEFORE UPDATE ON survey_revisions
BEGIN SELECT RAISE(ABORT, 'survey revisions are immutable'); END;
CREATE TRIGGER survey_revisions_kept BEFORE DELETE ON survey_revisions
BEGIN SELECT RAISE(ABORT, 'survey revisions are never deleted'); END;
CREATE TRIGGER surveys_kept BEFORE DELETE ON surveys
BEGIN SELECT RAISE(ABORT, 'surveys are never deleted'); END;
CREATE TRIGGER audit_log_immutable BEFORE UPDATE ON audit_log
BEGIN SELECT RAISE(ABORT, 'the audit log is append-only'); END;
CREATE TRIGGER audit_log_kept BEFORE DELETE ON audit_log
BEGIN SELECT RAISE(ABORT, 'the audit log is append-only'); END;
