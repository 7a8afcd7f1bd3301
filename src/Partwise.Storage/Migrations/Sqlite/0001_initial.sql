-- Baselines, screenings and flags. Timestamps are UTC text 'yyyy-MM-ddTHH:mm:ss.ffffffZ' (they sort as they read);
-- observed_at keeps the caller's offset (round-trip 'O' format). Documents and results are JSON text, opaque here.

-- One row: a random id of this database (part of every change token) and the change counter, bumped in the
-- transaction of every flag insertion and review. Its write lock orders those commits.
CREATE TABLE store_info (
    id INTEGER PRIMARY KEY CHECK (id = 1),
    epoch TEXT NOT NULL,
    change_counter INTEGER NOT NULL
);
INSERT INTO store_info (id, epoch, change_counter) VALUES (1, lower(hex(randomblob(16))), 0);

-- The last version given out per name; an upsert on it hands out the next one atomically.
CREATE TABLE baseline_names (
    name TEXT PRIMARY KEY,
    last_version INTEGER NOT NULL
);

CREATE TABLE baselines (
    seq INTEGER PRIMARY KEY AUTOINCREMENT,
    id TEXT NOT NULL UNIQUE,
    name TEXT NOT NULL,
    version INTEGER NOT NULL,
    created_at TEXT NOT NULL,
    retired_at TEXT NULL,
    document TEXT NOT NULL,
    UNIQUE (name, version)
);
-- Listing only the active baselines, latest first.
CREATE INDEX ix_baselines_active ON baselines (seq) WHERE retired_at IS NULL;

-- One row per (baseline, sample): the idempotency key.
CREATE TABLE screenings (
    seq INTEGER PRIMARY KEY AUTOINCREMENT,
    baseline_id TEXT NOT NULL REFERENCES baselines (id),
    sample_id TEXT NOT NULL,
    fingerprint TEXT NOT NULL,
    observed_at TEXT NULL,
    source TEXT NULL,
    screened_at TEXT NOT NULL,
    result TEXT NOT NULL,
    flag_id TEXT NULL,
    UNIQUE (baseline_id, sample_id)
);

-- seq comes from store_info.change_counter, so it increases in commit order (no cursor can pass over a flag that
-- commits later).
CREATE TABLE flags (
    seq INTEGER PRIMARY KEY,
    id TEXT NOT NULL UNIQUE,
    baseline_id TEXT NOT NULL,
    sample_id TEXT NOT NULL,
    observed_at TEXT NULL,
    source TEXT NULL,
    screened_at TEXT NOT NULL,
    distance REAL NOT NULL,
    p_value REAL NOT NULL,
    reasons TEXT NOT NULL,
    status TEXT NOT NULL CHECK (status IN ('open', 'confirmed', 'dismissed')),
    review_note TEXT NULL,
    reviewer TEXT NULL,
    reviewed_at TEXT NULL,
    UNIQUE (baseline_id, sample_id),
    FOREIGN KEY (baseline_id, sample_id) REFERENCES screenings (baseline_id, sample_id)
);
-- The listing filters: by status, by baseline, by both; each in sequence order.
CREATE INDEX ix_flags_status_seq ON flags (status, seq);
CREATE INDEX ix_flags_baseline_seq ON flags (baseline_id, seq);
CREATE INDEX ix_flags_baseline_status_seq ON flags (baseline_id, status, seq);
