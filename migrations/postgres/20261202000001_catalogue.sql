-- Versioned friction catalogue (PostgreSQL). Never edit an applied
-- migration: add a new file (expand, then contract).

-- The catalogue's current revision. One row; writers lock it
-- (SELECT ... FOR UPDATE) so revisions are strictly sequential across
-- every instance. Revision 0 = empty; the store writes the seed as 1.
CREATE TABLE catalogue_head (
    id       SMALLINT PRIMARY KEY CHECK (id = 1),
    revision BIGINT NOT NULL CHECK (revision >= 0)
);
INSERT INTO catalogue_head (id, revision) VALUES (1, 0);

-- One row per accepted batch of changes: who, when, why.
CREATE TABLE catalogue_revisions (
    revision   BIGINT PRIMARY KEY CHECK (revision >= 1),
    created_at TIMESTAMPTZ NOT NULL,
    actor      TEXT NOT NULL CHECK (length(btrim(actor)) > 0),
    reason     TEXT NOT NULL CHECK (length(btrim(reason)) > 0),
    evidence   TEXT
);

-- Append-only change history: one row per changed item, with its state
-- before (NULL on create) and after, as JSON text.
CREATE TABLE catalogue_history (
    seq         BIGSERIAL PRIMARY KEY,
    revision    BIGINT NOT NULL REFERENCES catalogue_revisions (revision),
    entity_kind TEXT NOT NULL CHECK (entity_kind IN ('friction_entry', 'finish', 'lubricant')),
    entity_id   TEXT NOT NULL,
    action      TEXT NOT NULL CHECK (action IN ('create', 'update', 'retire')),
    before_json TEXT,
    after_json  TEXT NOT NULL,
    actor       TEXT NOT NULL,
    reason      TEXT NOT NULL,
    created_at  TIMESTAMPTZ NOT NULL
);
CREATE INDEX catalogue_history_entity ON catalogue_history (entity_kind, entity_id, seq);
CREATE INDEX catalogue_history_revision ON catalogue_history (revision, seq);

-- The database itself refuses to rewrite history.
CREATE FUNCTION catalogue_refuse_rewrite() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION 'catalogue history is append-only: % on % refused', TG_OP, TG_TABLE_NAME
        USING ERRCODE = 'insufficient_privilege';
END
$$;
CREATE TRIGGER catalogue_history_append_only
    BEFORE UPDATE OR DELETE ON catalogue_history
    FOR EACH ROW EXECUTE FUNCTION catalogue_refuse_rewrite();
CREATE TRIGGER catalogue_history_no_truncate
    BEFORE TRUNCATE ON catalogue_history
    FOR EACH STATEMENT EXECUTE FUNCTION catalogue_refuse_rewrite();
CREATE TRIGGER catalogue_revisions_append_only
    BEFORE UPDATE OR DELETE ON catalogue_revisions
    FOR EACH ROW EXECUTE FUNCTION catalogue_refuse_rewrite();
CREATE TRIGGER catalogue_revisions_no_truncate
    BEFORE TRUNCATE ON catalogue_revisions
    FOR EACH STATEMENT EXECUTE FUNCTION catalogue_refuse_rewrite();

-- Current state of every item (derived from history, kept for constraints
-- and fast loading). `body` is the item as JSON text.
CREATE TABLE finishes (
    id       TEXT PRIMARY KEY,
    status   TEXT NOT NULL CHECK (status IN ('active', 'retired')),
    revision BIGINT NOT NULL,
    body     TEXT NOT NULL
);
CREATE TABLE lubricants (
    id       TEXT PRIMARY KEY,
    status   TEXT NOT NULL CHECK (status IN ('active', 'retired')),
    revision BIGINT NOT NULL,
    body     TEXT NOT NULL
);
CREATE TABLE friction_entries (
    id              BIGINT PRIMARY KEY,
    finish          TEXT NOT NULL REFERENCES finishes (id),
    lubricant       TEXT NOT NULL REFERENCES lubricants (id),
    bearing_surface TEXT,
    status          TEXT NOT NULL CHECK (status IN ('active', 'retired')),
    revision        BIGINT NOT NULL,
    body            TEXT NOT NULL
);
-- At most one active entry per key.
CREATE UNIQUE INDEX friction_entries_one_active_per_key
    ON friction_entries (finish, lubricant, COALESCE(bearing_surface, ''))
    WHERE status = 'active';

-- API tokens: only the SHA-256 of the secret is stored.
CREATE TABLE api_tokens (
    id          BIGSERIAL PRIMARY KEY,
    name        TEXT NOT NULL UNIQUE CHECK (length(btrim(name)) > 0),
    role        TEXT NOT NULL CHECK (role IN ('reader', 'editor', 'admin')),
    secret_hash TEXT NOT NULL UNIQUE,
    created_at  TIMESTAMPTZ NOT NULL,
    expires_at  TIMESTAMPTZ,
    revoked_at  TIMESTAMPTZ
);
