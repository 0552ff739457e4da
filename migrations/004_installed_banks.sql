-- Installed capacitor banks of a building, and what each survey found them delivering.

-- The building's installed banks as JSON (label, location, control, rating, steps…); NULL when none.
ALTER TABLE buildings ADD COLUMN installed_banks_json TEXT CHECK (installed_banks_json IS NULL OR json_valid(installed_banks_json));

-- Per survey (head and each revision), for trends without parsing results: the rated kvar of the installed steps
-- energised during the readings, and the kvar they delivered (measured where given). NULL: no installed banks.
ALTER TABLE surveys ADD COLUMN installed_kvar_in_service REAL;
ALTER TABLE surveys ADD COLUMN installed_kvar_delivered REAL;
ALTER TABLE survey_revisions ADD COLUMN installed_kvar_in_service REAL;
ALTER TABLE survey_revisions ADD COLUMN installed_kvar_delivered REAL;
