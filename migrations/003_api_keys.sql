-- API keys: each belongs to one organisation and has one role. Only the SHA-256 of the secret part is
-- stored, with the short public prefix used to find the row; a revoked key keeps its row for the audit log.
CREATE TABLE api_keys (
  id            TEXT PRIMARY KEY,
  org_id        TEXT NOT NULL REFERENCES organisations (id),
  prefix        TEXT NOT NULL UNIQUE,
  secret_sha256 TEXT NOT NULL CHECK (length(secret_sha256) = 64),
  role          TEXT NOT NULL CHECK (role IN ('admin', 'surveyor', 'auditor')),
  label         TEXT,
  created_at    TEXT NOT NULL,
  created_by    TEXT NOT NULL,
  revoked_at    TEXT,
  last_used_at  TEXT
);
CREATE INDEX api_keys_by_org ON api_keys (org_id, created_at, id);

CREATE UNIQUE INDEX organisations_by_name ON organisations (name);
