-- Versioned friction catalogue (SQLite, the embedded default). Same
-- schema as migrations/postgres; never edit an applied migration.

-- The catalogue's current revision; writers take the write lock first
-- (BEGIN IMMEDIATE). Revision 0 = empty; the store writes the seed as 1.
CREATE TABLE catalogue_head (
    id       INTEGER PRIMARY KEY CHECK (id = 1),
    revision INTEGER NOT NULL CHECK (revision >= 0)
);
INSERT INTO catalogue_head (id, revision) VALUES (1, 0);

CREATE TABLE catalogue_revisions (
    revision   INTEGER PRIMARY KEY CHECK (revision >= 1),
    created_at TEXT NOT NULL,
    actor      TEXT NOT NULL CHECK (length(trim(actor)) > 0),
    reason     TEXT NOT NULL CHECK (length(trim(reason)) > 0),
    evidence   TEXT
);

CREATE TABLE catalogue_history (
    seq         INTEGER PRIMARY KEY AUTOINCREMENT,
    revision    INTEGER NOT NULL REFERENCES catalogue_revisions (revision),
    entity_kind TEXT NOT NULL CHECK (entity_kind IN ('friction_entry', 'finish', 'lubricant')),
    entity_id   TEXT NOT NULL,
    action      TEXT NOT NULL CHECK (action IN ('create', 'update', 'retire')),
    before_json TEXT,
    after_json  TEXT NOT NULL,
    actor       TEXT NOT NULL,
    reason      TEXT NOT NULL,
    created_at  TEXT NOT NULL
);
CREATE INDEX catalogue_history_entity ON catalogue_history (entity_kind, entity_id, seq);
CREATE INDEX catalogue_history_revision ON catalogue_history (revision, seq);

-- The database itself refuses to rewrite history.
CREATE TRIGGER catalogue_history_no_update BEFORE UPDATE ON catalogue_history
BEGIN
    SELECT RAISE(ABORT, 'catalogue history is append-only: UPDATE on catalogue_history refused');
END;
CREATE TRIGGER catalogue_history_no_delete BEFORE DELETE ON catalogue_history
BEGIN
    SELECT RAISE(ABORT, 'catalogue history is append-only: DELETE on catalogue_history refused');
END;
CREATE TRIGGER catalogue_revisions_no_update BEFORE UPDATE ON catalogue_revisions
BEGIN
    SELECT RAISE(ABORT, 'catalogue history is append-only: UPDATE on catalogue_revisions refused');
END;
CREATE TRIGGER catalogue_revisions_no_delete BEFORE DELETE ON catalogue_revisions
BEGIN
    SELECT RAISE(ABORT, 'catalogue history is append-only: DELETE on catalogue_revisions refused');
END;

CREATE TABLE finishes (
    id       TEXT PRIMARY KEY,
    status   TEXT NOT NULL CHECK (status IN ('active', 'retired')),
    revision INTEGER NOT NULL,
    body     TEXT NOT NULL
);
CREATE TABLE lubricants (
    id       TEXT PRIMARY KEY,
    status   TEXT NOT NULL CHECK (status IN ('active', 'retired')),
    revision INTEGER NOT NULL,
    body     TEXT NOT NULL
);
CREATE TABLE friction_entries (
    id              INTEGER PRIMARY KEY,
    finish          TEXT NOT NULL REFERENCES finishes (id),
    lubricant       TEXT NOT NULL REFERENCES lubricants (id),
    bearing_surface TEXT,
    status          TEXT NOT NULL CHECK (status IN ('active', 'retired')),
    revision        INTEGER NOT NULL,
    body            TEXT NOT NULL
);
CREATE UNIQUE INDEX friction_entries_one_active_per_key
    ON friction_entries (finish, lubricant, COALESCE(bearing_surface, ''))
    WHERE status = 'active';

CREATE TABLE api_tokens (
    id          INTEGER PRIMARY KEY AUTOINCREMENT,
    name        TEXT NOT NULL UNIQUE CHECK (length(trim(name)) > 0),
    role        TEXT NOT NULL CHECK (role IN ('reader', 'editor', 'admin')),
    secret_hash TEXT NOT NULL UNIQUE,
    created_at  TEXT NOT NULL,
    expires_at  TEXT,
    revoked_at  TEXT
);
