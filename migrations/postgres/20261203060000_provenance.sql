-- Catalogue revision: entry sources without publishers' names or
-- addresses (data in migrations/seed/catalogue-revision-2.json, which
-- catalogue::Snapshot::seed applies in memory; a test compares the two).
-- The store seeds revision 1 before this migration runs, so a fresh
-- database holds revision 2. An older database gets the next revision;
-- an entry changed since revision 1 keeps its own text. Nothing is
-- written when no entry is still at revision 1.

SELECT revision FROM catalogue_head WHERE id = 1 FOR UPDATE;

CREATE TEMP TABLE provenance_fix (id BIGINT PRIMARY KEY, new TEXT NOT NULL) ON COMMIT DROP;
INSERT INTO provenance_fix (id, new) VALUES
    (2, 'VDI 2230 Part 1 (2003) Table A5, friction class B (bright metal or black oxide, oils); total friction 0.12–0.18 for untreated steel, oiled, as reproduced in a supplier''s technical tables'),
    (3, 'VDI 2230 Part 1 (2003) Table A5, friction class A (solid lubricant MoS2 in paste); total friction 0.05–0.10 for untreated steel with MoS2 paste, as reproduced in a supplier''s technical tables'),
    (7, 'VDI 2230 Part 1 (2003) Table A5, friction class C (electroplated Zn, as delivered or no lubricant); the same 0.14–0.24 range is used for electro-zinc plated screws in a VDI 2230 worked example as reproduced in a supplier''s technical tables'),
    (8, 'VDI 2230 Part 1 (2003) Table A5, friction class B (electroplated Zn, oils); total friction 0.12–0.18 for electroplated screw and nut, oiled, as reproduced in a supplier''s technical tables'),
    (15, 'VDI 2230 Part 1 (2003) Table A5, friction class B (zinc-flake, oils); total friction 0.10–0.14 for zinc-flake coated screw and nut, oiled, as reproduced in a supplier''s technical tables'),
    (20, 'VDI 2230 Part 1 (2003) Table A5, friction class B (phosphate, oils / as delivered); total friction 0.12–0.18 for phosphated steel, oiled, as reproduced in a supplier''s technical tables'),
    (21, 'VDI 2230 Part 1 (2003) Table A5, friction class A (phosphate, solid lubricant MoS2 in paste); total friction 0.05–0.10 for phosphated steel with MoS2 paste, as reproduced in a supplier''s technical tables');

CREATE TEMP TABLE provenance_hit ON COMMIT DROP AS
SELECT e.id, e.body AS before_json,
       jsonb_set(jsonb_set(e.body::jsonb, '{source}', to_jsonb(f.new)),
                 '{revision}', to_jsonb((SELECT revision + 1 FROM catalogue_head WHERE id = 1)))::text AS after_json
FROM friction_entries e JOIN provenance_fix f ON f.id = e.id
WHERE e.revision = 1;

CREATE TEMP TABLE provenance_rev ON COMMIT DROP AS
SELECT revision + 1 AS revision, now() AS created_at
FROM catalogue_head WHERE id = 1 AND EXISTS (SELECT 1 FROM provenance_hit);

INSERT INTO catalogue_revisions (revision, created_at, actor, reason, evidence)
SELECT revision, created_at, 'migration',
       'Provenance: entry sources name the standard, table and edition; ranges read from a reproduction say so without naming who published it', NULL
FROM provenance_rev;

INSERT INTO catalogue_history (revision, entity_kind, entity_id, action, before_json, after_json, actor, reason, created_at)
SELECT r.revision, 'friction_entry', h.id::text, 'update', h.before_json, h.after_json, 'migration',
       'Provenance: entry sources name the standard, table and edition; ranges read from a reproduction say so without naming who published it', r.created_at
FROM provenance_hit h CROSS JOIN provenance_rev r ORDER BY h.id;

UPDATE friction_entries e
SET body = h.after_json, revision = r.revision
FROM provenance_hit h CROSS JOIN provenance_rev r
WHERE h.id = e.id;

UPDATE catalogue_head SET revision = r.revision
FROM provenance_rev r WHERE catalogue_head.id = 1;

SELECT pg_notify('catalogue_changed', revision::text) FROM provenance_rev;
