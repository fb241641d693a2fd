-- Orchard store, SQLite, version 1. Times are INTEGER microseconds since the Unix epoch (UTC),
-- taken from the store's own clock (SQLite has no server clock).
CREATE TABLE arm_profiles (
    arm_id        TEXT PRIMARY KEY,
    profile_json  TEXT NOT NULL,
    updated_at    INTEGER NOT NULL
);

CREATE TABLE api_keys (
    key_id           TEXT PRIMARY KEY,
    role             TEXT NOT NULL CHECK (role IN ('tablet', 'controller', 'manager', 'admin')),
    secret_hash_hex  TEXT NOT NULL UNIQUE,
    label            TEXT NOT NULL,
    created_at       INTEGER NOT NULL
);

CREATE TABLE trees (
    tree_id            TEXT PRIMARY KEY,
    block              TEXT NOT NULL,
    row_label          TEXT NOT NULL,
    position_in_row    INTEGER NOT NULL,
    arm_profile_id     TEXT NOT NULL,
    latest_scan_id     TEXT NOT NULL,
    retry_policy       TEXT NOT NULL,
    current_version    INTEGER NULL,
    total_seconds      REAL NULL,
    step_count         INTEGER NULL,
    unscheduled_count  INTEGER NULL,
    updated_at         INTEGER NOT NULL
);

CREATE TABLE scans (
    scan_id     TEXT PRIMARY KEY,
    tree_id     TEXT NOT NULL REFERENCES trees (tree_id),
    scan_json   TEXT NOT NULL,
    created_at  INTEGER NOT NULL
);
CREATE INDEX scans_tree ON scans (tree_id);

CREATE TABLE jobs (
    job_id            TEXT PRIMARY KEY,
    tree_id           TEXT NOT NULL REFERENCES trees (tree_id),
    kind              TEXT NOT NULL CHECK (kind IN ('plan', 'replan')),
    scan_id           TEXT NOT NULL REFERENCES scans (scan_id),
    status            TEXT NOT NULL CHECK (status IN ('queued', 'running', 'done', 'failed')),
    attempt           INTEGER NOT NULL DEFAULT 0,
    lease_owner       TEXT NULL,
    lease_until       INTEGER NULL,
    payload_json      TEXT NULL,
    error             TEXT NULL,
    schedule_version  INTEGER NULL,
    created_at        INTEGER NOT NULL,
    finished_at       INTEGER NULL,
    CHECK (status <> 'running' OR (lease_owner IS NOT NULL AND lease_until IS NOT NULL))
);
CREATE INDEX jobs_queued ON jobs (created_at, job_id) WHERE status = 'queued';
CREATE INDEX jobs_running ON jobs (lease_until) WHERE status = 'running';
CREATE INDEX jobs_tree ON jobs (tree_id);

-- One schedule per (tree, version) and one per job: a job's result is written exactly once.
CREATE TABLE schedules (
    tree_id        TEXT NOT NULL REFERENCES trees (tree_id),
    version        INTEGER NOT NULL CHECK (version >= 1),
    schedule_json  TEXT NOT NULL,
    job_id         TEXT NOT NULL UNIQUE REFERENCES jobs (job_id),
    created_at     INTEGER NOT NULL,
    PRIMARY KEY (tree_id, version)
);

CREATE TABLE plan_state (
    tree_id     TEXT PRIMARY KEY REFERENCES trees (tree_id),
    version     INTEGER NOT NULL,
    state_json  TEXT NOT NULL,
    updated_at  INTEGER NOT NULL,
    FOREIGN KEY (tree_id, version) REFERENCES schedules (tree_id, version)
);

CREATE TABLE outcomes (
    outcome_id   INTEGER PRIMARY KEY AUTOINCREMENT,
    tree_id      TEXT NOT NULL,
    version      INTEGER NOT NULL,
    cut_id       TEXT NOT NULL,
    outcome      TEXT NOT NULL CHECK (outcome IN ('done', 'missed', 'skipped')),
    job_id       TEXT NULL,
    scan_id      TEXT NULL,
    reported_at  INTEGER NOT NULL,
    FOREIGN KEY (tree_id, version) REFERENCES schedules (tree_id, version)
);
CREATE INDEX outcomes_tree ON outcomes (tree_id, reported_at, outcome_id);

-- The first answer to an idempotent POST wins: the primary key (scope, key) decides.
CREATE TABLE idempotency (
    scope             TEXT NOT NULL,
    key               TEXT NOT NULL,
    request_hash_hex  TEXT NOT NULL,
    status_code       INTEGER NOT NULL,
    response_json     TEXT NOT NULL,
    location          TEXT NULL,
    created_at        INTEGER NOT NULL,
    PRIMARY KEY (scope, key)
);
