-- Friction test series (torque–tension tests evaluated the ISO 16047 way)
-- kept as evidence for catalogue changes. A stored series never changes:
-- the database refuses UPDATE and DELETE.

CREATE TABLE friction_test_series (
    id              INTEGER PRIMARY KEY AUTOINCREMENT,
    created_at      TEXT NOT NULL,
    actor           TEXT NOT NULL CHECK (length(trim(actor)) > 0),
    thread          TEXT NOT NULL,
    property_class  TEXT,
    finish          TEXT NOT NULL,
    lubricant       TEXT NOT NULL,
    -- Catalogue revision current when the series was stored.
    catalogue_revision INTEGER NOT NULL,
    -- The series as posted and its evaluation as answered, JSON text.
    series_json     TEXT NOT NULL,
    evaluation_json TEXT NOT NULL
);
CREATE INDEX friction_test_series_key ON friction_test_series (finish, lubricant, id);

-- Each time a series was applied to the catalogue: the revision it made.
CREATE TABLE friction_test_applications (
    seq        INTEGER PRIMARY KEY AUTOINCREMENT,
    series_id  INTEGER NOT NULL REFERENCES friction_test_series (id),
    revision   INTEGER NOT NULL REFERENCES catalogue_revisions (revision),
    entry_id   INTEGER NOT NULL,
    basis      TEXT NOT NULL CHECK (basis IN ('observed', 'three_sigma')),
    actor      TEXT NOT NULL,
    reason     TEXT NOT NULL CHECK (length(trim(reason)) > 0),
    created_at TEXT NOT NULL
);
CREATE INDEX friction_test_applications_series ON friction_test_applications (series_id, seq);

CREATE TRIGGER friction_test_series_no_update BEFORE UPDATE ON friction_test_series
BEGIN
    SELECT RAISE(ABORT, 'friction test records are immutable: UPDATE on friction_test_series refused');
END;
CREATE TRIGGER friction_test_series_no_delete BEFORE DELETE ON friction_test_series
BEGIN
    SELECT RAISE(ABORT, 'friction test records are immutable: DELETE on friction_test_series refused');
END;
CREATE TRIGGER friction_test_applications_no_update BEFORE UPDATE ON friction_test_applications
BEGIN
    SELECT RAISE(ABORT, 'friction test records are immutable: UPDATE on friction_test_applications refused');
END;
CREATE TRIGGER friction_test_applications_no_delete BEFORE DELETE ON friction_test_applications
BEGIN
    SELECT RAISE(ABORT, 'friction test records are immutable: DELETE on friction_test_applications refused');
END;
