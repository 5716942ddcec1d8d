-- Tokens may carry the role `approver` (approves joint releases under the
-- four-eyes rule; between editor and admin). SQLite cannot change a CHECK
-- constraint, so the table is rebuilt with its rows and ids as they were.
CREATE TABLE api_tokens_with_approver (
    id          INTEGER PRIMARY KEY AUTOINCREMENT,
    name        TEXT NOT NULL UNIQUE CHECK (length(trim(name)) > 0),
    role        TEXT NOT NULL CHECK (role IN ('reader', 'editor', 'approver', 'admin')),
    secret_hash TEXT NOT NULL UNIQUE,
    created_at  TEXT NOT NULL,
    expires_at  TEXT,
    revoked_at  TEXT
);
INSERT INTO api_tokens_with_approver (id, name, role, secret_hash, created_at, expires_at, revoked_at)
    SELECT id, name, role, secret_hash, created_at, expires_at, revoked_at FROM api_tokens;
DROP TABLE api_tokens;
ALTER TABLE api_tokens_with_approver RENAME TO api_tokens;
