-- A counter of registry changes: every write to joints, releases or release
-- events adds one, in the writing transaction, and notifies
-- `registry_changed` at commit. Each instance keeps the answers the line
-- fetches by joint id in memory for one value of this counter (the watcher
-- reads it with the catalogue revision), so a release, approval, withdrawal
-- or review mark made through any instance ends what others keep.
CREATE TABLE registry_generation (
    id INTEGER PRIMARY KEY CHECK (id = 1),
    n  BIGINT  NOT NULL
);
INSERT INTO registry_generation (id, n) VALUES (1, 0);

CREATE FUNCTION registry_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    UPDATE registry_generation SET n = n + 1 WHERE id = 1;
    PERFORM pg_notify('registry_changed', '');
    RETURN NULL;
END;
$$;

CREATE TRIGGER joints_registry_changed AFTER INSERT OR UPDATE OR DELETE ON joints
    FOR EACH STATEMENT EXECUTE FUNCTION registry_changed();
CREATE TRIGGER joint_releases_registry_changed AFTER INSERT ON joint_releases
    FOR EACH STATEMENT EXECUTE FUNCTION registry_changed();
CREATE TRIGGER joint_release_events_registry_changed AFTER INSERT ON joint_release_events
    FOR EACH STATEMENT EXECUTE FUNCTION registry_changed();
