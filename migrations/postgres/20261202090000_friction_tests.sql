-- Friction test series (torque–tension tests evaluated the ISO 16047 way)
-- kept as evidence for catalogue changes. A stored series never changes:
-- the database refuses UPDATE, DELETE and TRUNCATE.

CREATE TABLE friction_test_series (
    id              BIGSERIAL PRIMARY KEY,
    created_at      TIMESTAMPTZ NOT NULL,
    actor           TEXT NOT NULL CHECK (length(btrim(actor)) > 0),
    thread          TEXT NOT NULL,
    property_class  TEXT,
    finish          TEXT NOT NULL,
    lubricant       TEXT NOT NULL,
    -- Catalogue revision current when the series was stored.
    catalogue_revision BIGINT NOT NULL,
    -- The series as posted and its evaluation as answered, JSON text.
    series_json     TEXT NOT NULL,
    evaluation_json TEXT NOT NULL
);
CREATE INDEX friction_test_series_key ON friction_test_series (finish, lubricant, id);

-- Each time a series was applied to the catalogue: the revision it made.
CREATE TABLE friction_test_applications (
    seq        BIGSERIAL PRIMARY KEY,
    series_id  BIGINT NOT NULL REFERENCES friction_test_series (id),
    revision   BIGINT NOT NULL REFERENCES catalogue_revisions (revision),
    entry_id   BIGINT NOT NULL,
    basis      TEXT NOT NULL CHECK (basis IN ('observed', 'three_sigma')),
    actor      TEXT NOT NULL,
    reason     TEXT NOT NULL CHECK (length(btrim(reason)) > 0),
    created_at TIMESTAMPTZ NOT NULL
);
CREATE INDEX friction_test_applications_series ON friction_test_applications (series_id, seq);

CREATE FUNCTION friction_tests_refuse_rewrite() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION 'friction test records are immutable: % on % refused', TG_OP, TG_TABLE_NAME
        USING ERRCODE = 'insufficient_privilege';
END
$$;
CREATE TRIGGER friction_test_series_immutable
    BEFORE UPDATE OR DELETE ON friction_test_series
    FOR EACH ROW EXECUTE FUNCTION friction_tests_refuse_rewrite();
CREATE TRIGGER friction_test_series_no_truncate
    BEFORE TRUNCATE ON friction_test_series
    FOR EACH STATEMENT EXECUTE FUNCTION friction_tests_refuse_rewrite();
CREATE TRIGGER friction_test_applications_immutable
    BEFORE UPDATE OR DELETE ON friction_test_applications
    FOR EACH ROW EXECUTE FUNCTION friction_tests_refuse_rewrite();
CREATE TRIGGER friction_test_applications_no_truncate
    BEFORE TRUNCATE ON friction_test_applications
    FOR EACH STATEMENT EXECUTE FUNCTION friction_tests_refuse_rewrite();
