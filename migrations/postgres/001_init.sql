-- The PostgreSQL schema: the same tables, keys and refusals as migrations/001…004 (SQLite) at their newest, with
-- PostgreSQL's types: timestamptz for the instants the service records, jsonb for documents, double precision for
-- measured figures. No column holds money: tariffs and costs live inside buildings.economics (jsonb) as submitted.
-- Identifiers and names are COLLATE "C" so that ordering and keyset paging compare bytes, as SQLite does,
-- whatever the database's default collation.

CREATE TABLE organisations (
  id         text COLLATE "C" PRIMARY KEY,
  name       text NOT NULL,
  created_at timestamptz NOT NULL
);
CREATE UNIQUE INDEX organisations_by_name ON organisations (name);

INSERT INTO organisations (id, name, created_at)
VALUES ('org_default', 'Default organisation', date_trunc('milliseconds', now()));

CREATE TABLE buildings (
  id                        text COLLATE "C" PRIMARY KEY,
  org_id                    text COLLATE "C" NOT NULL REFERENCES organisations (id),
  -- Ordered and searched case-insensitively in ASCII only, as SQLite's NOCASE: lower() under "C" folds A-Z alone.
  name                      text COLLATE "C" NOT NULL,
  address                   text,
  notes                     text,
  voltage_v                 double precision NOT NULL CHECK (voltage_v > 0),
  frequency_hz              integer NOT NULL CHECK (frequency_hz IN (50, 60)),
  phases                    integer NOT NULL CHECK (phases IN (1, 3)),
  transformer_kva           double precision CHECK (transformer_kva > 0),
  transformer_impedance_pct double precision CHECK (transformer_impedance_pct > 0),
  transformer_x_over_r      double precision CHECK (transformer_x_over_r > 0),
  utility_fault_mva         double precision CHECK (utility_fault_mva > 0),
  economics_json            jsonb,
  installed_banks_json      jsonb,
  version                   integer NOT NULL CHECK (version >= 1),
  created_at                timestamptz NOT NULL,
  updated_at                timestamptz NOT NULL,
  UNIQUE (org_id, id),
  CHECK ((transformer_kva IS NULL) = (transformer_impedance_pct IS NULL))
);
-- The list: by name (case-folded), then id, within an organisation.
CREATE INDEX buildings_by_name ON buildings (org_id, lower(name), id);

-- Every version of a building, the current one included; written once, never changed.
CREATE TABLE building_versions (
  org_id      text COLLATE "C" NOT NULL,
  building_id text COLLATE "C" NOT NULL,
  version     integer NOT NULL,
  data_json   jsonb NOT NULL,
  recorded_at timestamptz NOT NULL,
  actor       text NOT NULL,
  PRIMARY KEY (building_id, version),
  FOREIGN KEY (org_id, building_id) REFERENCES buildings (org_id, id)
);

-- One row per survey: the head of its revisions and the summary of the latest one, so lists and trends read columns.
CREATE TABLE surveys (
  id                        text COLLATE "C" PRIMARY KEY,
  org_id                    text COLLATE "C" NOT NULL,
  building_id               text COLLATE "C" NOT NULL,
  created_at                timestamptz NOT NULL,
  latest_revision           integer NOT NULL CHECK (latest_revision >= 1),
  -- As submitted (its own offset kept); surveyed_at_utc is the instant, for ordering and date filters.
  surveyed_at               text NOT NULL,
  surveyed_at_utc           timestamptz NOT NULL,
  surveyor                  text NOT NULL,
  kw                        double precision NOT NULL,
  kvar                      double precision NOT NULL,
  kva                       double precision NOT NULL,
  displacement_pf           double precision NOT NULL,
  kvar_required             double precision NOT NULL,
  warning_count             integer NOT NULL,
  installed_kvar_in_service double precision,
  installed_kvar_delivered  double precision,
  UNIQUE (org_id, id),
  FOREIGN KEY (org_id, building_id) REFERENCES buildings (org_id, id)
);
-- Lists (newest first) and trends (oldest first) of one building, keyset on (surveyed_at_utc, id).
CREATE INDEX surveys_by_time ON surveys (org_id, building_id, surveyed_at_utc, id);

-- Immutable revisions: the inputs as submitted, the result the engine gave then, the engine version and the
-- building's electrical data it was computed with.
CREATE TABLE survey_revisions (
  org_id                    text COLLATE "C" NOT NULL,
  survey_id                 text COLLATE "C" NOT NULL,
  n                         integer NOT NULL CHECK (n >= 1),
  reason                    text,
  created_at                timestamptz NOT NULL,
  actor                     text NOT NULL,
  inputs_json               jsonb NOT NULL,
  result_json               jsonb NOT NULL,
  engine_version            text NOT NULL,
  building_snapshot_json    jsonb NOT NULL,
  kw                        double precision NOT NULL,
  kvar                      double precision NOT NULL,
  kva                       double precision NOT NULL,
  displacement_pf           double precision NOT NULL,
  kvar_required             double precision NOT NULL,
  warning_count             integer NOT NULL,
  installed_kvar_in_service double precision,
  installed_kvar_delivered  double precision,
  PRIMARY KEY (survey_id, n),
  FOREIGN KEY (org_id, survey_id) REFERENCES surveys (org_id, id),
  CHECK ((n = 1) = (reason IS NULL))
);

-- The first response to each Idempotency-Key. A row with a NULL status is a claim whose work is still running (or
-- whose instance died: replaced once stale); the claim is committed before the work so that every instance sees it.
CREATE TABLE idempotency_keys (
  org_id        text COLLATE "C" NOT NULL REFERENCES organisations (id),
  key           text COLLATE "C" NOT NULL,
  request_hash  text NOT NULL,
  status        integer,
  location      text,
  -- The response body byte for byte as first sent (text, not jsonb: a replay must not reorder its keys).
  response_json text,
  created_at    timestamptz NOT NULL,
  PRIMARY KEY (org_id, key),
  CHECK ((status IS NULL) = (response_json IS NULL))
);
CREATE INDEX idempotency_keys_by_age ON idempotency_keys (created_at);

CREATE TABLE audit_log (
  id            bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
  org_id        text COLLATE "C" NOT NULL REFERENCES organisations (id),
  actor         text NOT NULL,
  action        text NOT NULL,
  resource_type text NOT NULL,
  resource_id   text NOT NULL,
  request_id    text,
  at            timestamptz NOT NULL
);
CREATE INDEX audit_log_by_org ON audit_log (org_id, id);

-- One row per stored analysis of a building's interval data: the summary (not the raw file), written once.
-- seq orders them by insertion; id is the public name. The first and last timestamps are the meter's, as read.
CREATE TABLE interval_analyses (
  seq              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
  id               text COLLATE "C" NOT NULL UNIQUE,
  org_id           text COLLATE "C" NOT NULL REFERENCES organisations (id),
  building_id      text COLLATE "C" NOT NULL,
  created_at       timestamptz NOT NULL,
  actor            text NOT NULL,
  request_id       text,
  target_pf        double precision NOT NULL CHECK (target_pf > 0 AND target_pf <= 1),
  interval_count   integer NOT NULL CHECK (interval_count >= 1),
  interval_minutes double precision NOT NULL CHECK (interval_minutes > 0),
  first_timestamp  text NOT NULL,
  last_timestamp   text NOT NULL,
  hold99_kvar      double precision NOT NULL,
  min_kvar         double precision NOT NULL,
  summary_json     jsonb NOT NULL,
  UNIQUE (org_id, id),
  FOREIGN KEY (org_id, building_id) REFERENCES buildings (org_id, id)
);
CREATE INDEX interval_analyses_by_building ON interval_analyses (org_id, building_id, seq);

-- API keys: only the SHA-256 of the secret part is stored, with the short public prefix used to find the row; a
-- revoked key keeps its row for the audit log.
CREATE TABLE api_keys (
  id            text COLLATE "C" PRIMARY KEY,
  org_id        text COLLATE "C" NOT NULL REFERENCES organisations (id),
  prefix        text COLLATE "C" NOT NULL UNIQUE,
  secret_sha256 text NOT NULL CHECK (length(secret_sha256) = 64),
  role          text NOT NULL CHECK (role IN ('admin', 'surveyor', 'auditor')),
  label         text,
  created_at    timestamptz NOT NULL,
  created_by    text NOT NULL,
  revoked_at    timestamptz,
  last_used_at  timestamptz
);
CREATE INDEX api_keys_by_org ON api_keys (org_id, created_at, id);

-- What is recorded stays recorded: one trigger function, named by the message it raises.
CREATE FUNCTION refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '%', TG_ARGV[0] USING ERRCODE = 'restrict_violation';
END
$$;

CREATE TRIGGER building_versions_immutable BEFORE UPDATE ON building_versions
  FOR EACH ROW EXECUTE FUNCTION refuse_change('building versions are immutable');
CREATE TRIGGER building_versions_kept BEFORE DELETE ON building_versions
  FOR EACH ROW EXECUTE FUNCTION refuse_change('building versions are never deleted');
CREATE TRIGGER survey_revisions_immutable BEFORE UPDATE ON survey_revisions
  FOR EACH ROW EXECUTE FUNCTION refuse_change('survey revisions are immutable');
CREATE TRIGGER survey_revisions_kept BEFORE DELETE ON survey_revisions
  FOR EACH ROW EXECUTE FUNCTION refuse_change('survey revisions are never deleted');
CREATE TRIGGER surveys_kept BEFORE DELETE ON surveys
  FOR EACH ROW EXECUTE FUNCTION refuse_change('surveys are never deleted');
CREATE TRIGGER audit_log_immutable BEFORE UPDATE ON audit_log
  FOR EACH ROW EXECUTE FUNCTION refuse_change('the audit log is append-only');
CREATE TRIGGER audit_log_kept BEFORE DELETE ON audit_log
  FOR EACH ROW EXECUTE FUNCTION refuse_change('the audit log is append-only');
CREATE TRIGGER interval_analyses_immutable BEFORE UPDATE ON interval_analyses
  FOR EACH ROW EXECUTE FUNCTION refuse_change('interval analyses are immutable');
CREATE TRIGGER interval_analyses_kept BEFORE DELETE ON interval_analyses
  FOR EACH ROW EXECUTE FUNCTION refuse_change('interval analyses are never deleted');
-- TRUNCATE skips row triggers: refuse it on the kept tables too.
CREATE TRIGGER building_versions_not_truncated BEFORE TRUNCATE ON building_versions
  FOR EACH STATEMENT EXECUTE FUNCTION refuse_change('building versions are never deleted');
CREATE TRIGGER survey_revisions_not_truncated BEFORE TRUNCATE ON survey_revisions
  FOR EACH STATEMENT EXECUTE FUNCTION refuse_change('survey revisions are never deleted');
CREATE TRIGGER surveys_not_truncated BEFORE TRUNCATE ON surveys
  FOR EACH STATEMENT EXECUTE FUNCTION refuse_change('surveys are never deleted');
CREATE TRIGGER audit_log_not_truncated BEFORE TRUNCATE ON audit_log
  FOR EACH STATEMENT EXECUTE FUNCTION refuse_change('the audit log is append-only');
CREATE TRIGGER interval_analyses_not_truncated BEFORE TRUNCATE ON interval_analyses
  FOR EACH STATEMENT EXECUTE FUNCTION refuse_change('interval analyses are never deleted');
