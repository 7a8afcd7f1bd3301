-- Baselines, screenings and flags. Server timestamps are timestamptz; observed_at keeps the caller's offset as
-- round-trip text ('O' format). Documents and results are JSON kept as text: opaque here and returned byte for byte.

-- One row: a random id of this database (part of every change token) and the change counter, bumped in the
-- transaction of every flag insertion and review. Its row lock orders those commits across replicas.
CREATE TABLE store_info (
    id integer PRIMARY KEY CHECK (id = 1),
    epoch text NOT NULL,
    change_counter bigint NOT NULL
);
INSERT INTO store_info (id, epoch, change_counter) VALUES (1, replace(gen_random_uuid()::text, '-', ''), 0);

-- The last version given out per name; an upsert on it hands out the next one atomically (the row lock makes a
-- concurrent creation under the same name wait and take the following version).
CREATE TABLE baseline_names (
    name text PRIMARY KEY,
    last_version bigint NOT NULL
);

CREATE TABLE baselines (
    seq bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    id text NOT NULL UNIQUE,
    name text NOT NULL,
    version bigint NOT NULL,
    created_at timestamptz NOT NULL,
    retired_at timestamptz NULL,
    document text NOT NULL,
    UNIQUE (name, version)
);
-- Listing only the active baselines, latest first.
CREATE INDEX ix_baselines_active ON baselines (seq) WHERE retired_at IS NULL;

-- One row per (baseline, sample): the idempotency key.
CREATE TABLE screenings (
    seq bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    baseline_id text NOT NULL REFERENCES baselines (id),
    sample_id text NOT NULL,
    fingerprint text NOT NULL,
    observed_at text NULL,
    source text NULL,
    screened_at timestamptz NOT NULL,
    result text NOT NULL,
    flag_id text NULL,
    UNIQUE (baseline_id, sample_id)
);

-- seq comes from store_info.change_counter, so it increases in commit order (no cursor can pass over a flag that
-- commits later).
CREATE TABLE flags (
    seq bigint PRIMARY KEY,
    id text NOT NULL UNIQUE,
    baseline_id text NOT NULL,
    sample_id text NOT NULL,
    observed_at text NULL,
    source text NULL,
    screened_at timestamptz NOT NULL,
    distance double precision NOT NULL,
    p_value double precision NOT NULL,
    reasons text NOT NULL,
    status text NOT NULL CHECK (status IN ('open', 'confirmed', 'dismissed')),
    review_note text NULL,
    reviewer text NULL,
    reviewed_at timestamptz NULL,
    UNIQUE (baseline_id, sample_id),
    FOREIGN KEY (baseline_id, sample_id) REFERENCES screenings (baseline_id, sample_id)
);
-- The listing filters: by status, by baseline, by both; each in sequence order.
CREATE INDEX ix_flags_status_seq ON flags (status, seq);
CREATE INDEX ix_flags_baseline_seq ON flags (baseline_id, seq);
CREATE INDEX ix_flags_baseline_status_seq ON flags (baseline_id, status, seq);
