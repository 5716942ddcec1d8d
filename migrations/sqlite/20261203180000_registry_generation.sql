-- A counter of registry changes: every write to joints, releases or release
-- events adds one, in the writing transaction. Each instance keeps the
-- answers the line fetches by joint id in memory for one value of this
-- counter (the watcher reads it with the catalogue revision), so a change
-- made through any instance ends what others keep.
CREATE TABLE registry_generation (
    id INTEGER PRIMARY KEY CHECK (id = 1),
    n  INTEGER NOT NULL
);
INSERT INTO registry_generation (id, n) VALUES (1, 0);

CREATE TRIGGER joints_insert_registry_changed AFTER INSERT ON joints
BEGIN
    UPDATE registry_generation SET n = n + 1 WHERE id = 1;
END;
CREATE TRIGGER joints_update_registry_changed AFTER UPDATE ON joints
BEGIN
    UPDATE registry_generation SET n = n + 1 WHERE id = 1;
END;
CREATE TRIGGER joints_delete_registry_changed AFTER DELETE ON joints
BEGIN
    UPDATE registry_generation SET n = n + 1 WHERE id = 1;
END;
CREATE TRIGGER joint_releases_registry_changed AFTER INSERT ON joint_releases
BEGIN
    UPDATE registry_generation SET n = n + 1 WHERE id = 1;
END;
CREATE TRIGGER joint_release_events_registry_changed AFTER INSERT ON joint_release_events
BEGIN
    UPDATE registry_generation SET n = n + 1 WHERE id = 1;
END;
