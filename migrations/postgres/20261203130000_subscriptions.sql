-- Webhook subscriptions and the delivery of outbox events to them. A
-- delivery row per (event, subscription) is written in the transaction
-- that writes the event to the outbox (only active subscriptions for that
-- event type get one, so a subscription receives the events created after
-- it); the delivery log is append-only: one row per attempt.

CREATE TABLE subscriptions (
    id         BIGSERIAL PRIMARY KEY,
    url        TEXT NOT NULL,
    -- JSON list of the event types as created (subscription_events indexes them).
    events     TEXT NOT NULL,
    -- The signing secret (whsec_ + base64), kept in clear: signing needs it.
    secret     TEXT NOT NULL,
    created_by TEXT NOT NULL,
    created_at TIMESTAMPTZ NOT NULL,
    active     BOOLEAN NOT NULL DEFAULT TRUE,
    deleted_at TIMESTAMPTZ
);

CREATE TABLE subscription_events (
    subscription_id BIGINT NOT NULL REFERENCES subscriptions (id),
    event_type      TEXT NOT NULL,
    PRIMARY KEY (event_type, subscription_id)
);

-- Delivery state per (event, subscription). Times compared by the claim
-- (next_attempt_at, locked_until) are unix milliseconds, numeric in both
-- databases. A claim sets lease_token and locked_until; a worker that
-- dies leaves a lease that expires, and the delivery is claimed again.
CREATE TABLE deliveries (
    event_seq       BIGINT NOT NULL REFERENCES outbox (seq),
    subscription_id BIGINT NOT NULL REFERENCES subscriptions (id),
    state           TEXT NOT NULL DEFAULT 'pending'
                    CHECK (state IN ('pending', 'delivered', 'failed', 'cancelled')),
    attempts        BIGINT NOT NULL DEFAULT 0,
    next_attempt_at BIGINT NOT NULL,
    lease_token     TEXT,
    locked_until    BIGINT,
    last_status     TEXT,
    delivered_at    TIMESTAMPTZ,
    PRIMARY KEY (event_seq, subscription_id)
);
CREATE INDEX deliveries_due ON deliveries (next_attempt_at) WHERE state = 'pending';

CREATE TABLE delivery_attempts (
    seq             BIGSERIAL PRIMARY KEY,
    subscription_id BIGINT NOT NULL REFERENCES subscriptions (id),
    event_seq       BIGINT NOT NULL REFERENCES outbox (seq),
    attempt         BIGINT NOT NULL CHECK (attempt >= 1),
    attempted_at    TIMESTAMPTZ NOT NULL,
    -- the HTTP status the target answered, or NULL when none came (error says why)
    status_code     BIGINT,
    error           TEXT,
    duration_ms     BIGINT NOT NULL,
    outcome         TEXT NOT NULL CHECK (outcome IN ('delivered', 'retry', 'failed')),
    next_attempt_at TIMESTAMPTZ
);
CREATE INDEX delivery_attempts_by_subscription ON delivery_attempts (subscription_id, seq);

CREATE TRIGGER delivery_attempts_append_only
    BEFORE UPDATE OR DELETE ON delivery_attempts
    FOR EACH ROW EXECUTE FUNCTION joint_registry_refuse_rewrite();
CREATE TRIGGER delivery_attempts_no_truncate
    BEFORE TRUNCATE ON delivery_attempts
    FOR EACH STATEMENT EXECUTE FUNCTION joint_registry_refuse_rewrite();
