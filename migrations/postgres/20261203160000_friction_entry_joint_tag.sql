-- A friction entry may be limited to joints carrying one tag (`joint_tag`
-- in the entry's body; absent: generic). At most one active entry per
-- finish, lubricant, bearing surface and joint tag: the key index is
-- replaced by one that reads the tag from the body. No column is added
-- (the seed is written by code before this migration runs, and code
-- without tags keeps writing the same rows); the application checks the
-- same rule before writing.
DROP INDEX friction_entries_one_active_per_key;
CREATE UNIQUE INDEX friction_entries_one_active_per_scoped_key
    ON friction_entries (finish, lubricant, COALESCE(bearing_surface, ''),
                         COALESCE((body::jsonb) ->> 'joint_tag', ''))
    WHERE status = 'active';
