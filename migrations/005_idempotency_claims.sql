-- An Idempotency-Key is claimed (a row without a response) before its request is worked, so two requests with one
-- key cannot both do the work; the response is written into the claim when the work commits. SQLite cannot drop
-- NOT NULL in place: the table is rebuilt with status and response_json nullable.

CREATE TABLE idempotency_keys_claimable (
  org_id        TEXT NOT NULL REFERENCES organisations (id),
  key           TEXT NOT NULL,
  request_hash  TEXT NOT NULL,
  status        INTEGER,
  location      TEXT,
  response_json TEXT,
  created_at    TEXT NOT NULL,
  PRIMARY KEY (org_id, key),
  CHECK ((status IS NULL) = (response_json IS NULL))
);
INSERT INTO idempotency_keys_claimable (org_id, key, request_hash, status, location, response_json, created_at)
  SELECT org_id, key, request_hash, status, location, response_json, created_at FROM idempotency_keys;
DROP TABLE idempotency_keys;
ALTER TABLE idempotency_keys_claimable RENAME TO idempotency_keys;
CREATE INDEX idempotency_keys_by_age ON idempotency_keys (created_at);
