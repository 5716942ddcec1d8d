-- Tokens may carry the role `approver` (approves joint releases under the
-- four-eyes rule; between editor and admin). Expand only: the old roles
-- stay valid.
ALTER TABLE api_tokens DROP CONSTRAINT IF EXISTS api_tokens_role_check;
ALTER TABLE api_tokens ADD CONSTRAINT api_tokens_role_check
    CHECK (role IN ('reader', 'editor', 'approver', 'admin'));
