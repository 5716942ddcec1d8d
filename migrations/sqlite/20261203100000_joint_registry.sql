-- The joint registry: the plant's joints (current definition), the history
-- of every definition change, the frozen releases and their status events,
-- and the outbox of events to deliver. History, releases and release events
-- are append-only: the database refuses UPDATE and DELETE.

CREATE TABLE joints (
    id                  TEXT PRIMARY KEY,
    title               TEXT NOT NULL,
    -- JSON text: the tags (list), the spec request, the tool presentation.
    tags                TEXT NOT NULL,
    request             TEXT NOT NULL,
    setpoints           TEXT NOT NULL,
    -- 1 on create, one more with each update (the If-Match of an edit).
    version             INTEGER NOT NULL CHECK (version >= 1),
    -- Set when a catalogue revision would change the active release.
    review_due_revision INTEGER,
    review_due_since    TEXT,
    created_at          TEXT NOT NULL,
    updated_at          TEXT NOT NULL
);
CREATE INDEX joints_review_due ON joints (review_due_revision);

-- One row per tag of a joint (the list filter); rewritten with the joint.
CREATE TABLE joint_tags (
    joint_id TEXT NOT NULL REFERENCES joints (id),
    tag      TEXT NOT NULL,
    PRIMARY KEY (joint_id, tag)
);
CREATE INDEX joint_tags_tag ON joint_tags (tag, joint_id);

-- Every create, update and delete of a definition: who, why, before, after.
CREATE TABLE joint_history (
    seq         INTEGER PRIMARY KEY AUTOINCREMENT,
    joint_id    TEXT NOT NULL,
    action      TEXT NOT NULL CHECK (action IN ('create', 'update', 'delete')),
    version     INTEGER NOT NULL,
    before_json TEXT,
    after_json  TEXT,
    actor       TEXT NOT NULL CHECK (length(trim(actor)) > 0),
    reason      TEXT NOT NULL,
    created_at  TEXT NOT NULL
);
CREATE INDEX joint_history_joint ON joint_history (joint_id, seq);

-- A joint's spec frozen at one catalogue revision, numbered 1, 2, ... per joint.
CREATE TABLE joint_releases (
    joint_id           TEXT NOT NULL REFERENCES joints (id),
    number             INTEGER NOT NULL CHECK (number >= 1),
    spec_hash          TEXT NOT NULL,
    catalogue_revision INTEGER NOT NULL REFERENCES catalogue_revisions (revision),
    service_version    TEXT NOT NULL,
    method_version     TEXT NOT NULL,
    requested_by       TEXT NOT NULL CHECK (length(trim(requested_by)) > 0),
    reason             TEXT NOT NULL CHECK (length(trim(reason)) > 0),
    -- JSON text: [{"code", "reason"}]
    accepted_checks    TEXT NOT NULL,
    -- The answers exactly as served (JSON text).
    spec               TEXT NOT NULL,
    setpoints          TEXT NOT NULL,
    created_at         TEXT NOT NULL,
    PRIMARY KEY (joint_id, number)
);

-- Status changes of a release; its current status is that of its latest event.
CREATE TABLE joint_release_events (
    seq        INTEGER PRIMARY KEY AUTOINCREMENT,
    joint_id   TEXT NOT NULL,
    number     INTEGER NOT NULL,
    event      TEXT NOT NULL
        CHECK (event IN ('requested', 'released', 'approved', 'superseded', 'withdrawn')),
    status     TEXT NOT NULL CHECK (status IN ('draft', 'released', 'superseded', 'withdrawn')),
    actor      TEXT NOT NULL CHECK (length(trim(actor)) > 0),
    reason     TEXT NOT NULL,
    created_at TEXT NOT NULL,
    FOREIGN KEY (joint_id, number) REFERENCES joint_releases (joint_id, number)
);
CREATE INDEX joint_release_events_release ON joint_release_events (joint_id, number, seq);

-- Events to deliver (CloudEvents JSON), written in the transaction of the
-- change they announce. Delivery state will be added beside it.
CREATE TABLE outbox (
    seq        INTEGER PRIMARY KEY AUTOINCREMENT,
    event_id   TEXT NOT NULL UNIQUE,
    event_type TEXT NOT NULL,
    subject    TEXT NOT NULL,
    payload    TEXT NOT NULL,
    created_at TEXT NOT NULL
);

CREATE TRIGGER joint_history_no_update BEFORE UPDATE ON joint_history
BEGIN
    SELECT RAISE(ABORT, 'joint registry records are append-only: UPDATE on joint_history refused');
END;
CREATE TRIGGER joint_history_no_delete BEFORE DELETE ON joint_history
BEGIN
    SELECT RAISE(ABORT, 'joint registry records are append-only: DELETE on joint_history refused');
END;
CREATE TRIGGER joint_releases_no_update BEFORE UPDATE ON joint_releases
BEGIN
    SELECT RAISE(ABORT, 'joint registry records are append-only: UPDATE on joint_releases refused');
END;
CREATE TRIGGER joint_releases_no_delete BEFORE DELETE ON joint_releases
BEGIN
    SELECT RAISE(ABORT, 'joint registry records are append-only: DELETE on joint_releases refused');
END;
CREATE TRIGGER joint_release_events_no_update BEFORE UPDATE ON joint_release_events
BEGIN
    SELECT RAISE(ABORT, 'joint registry records are append-only: UPDATE on joint_release_events refused');
END;
CREATE TRIGGER joint_release_events_no_delete BEFORE DELETE ON joint_release_events
BEGIN
    SELECT RAISE(ABORT, 'joint registry records are append-only: DELETE on joint_release_events refused');
END;
