-- Orchard store, PostgreSQL, version 1. Times are timestamptz on database time (now()).
CREATE TABLE arm_profiles (
    arm_id        text PRIMARY KEY,
    profile_json  text NOT NULL,
    updated_at    timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE api_keys (
    key_id           text PRIMARY KEY,
    role             text NOT NULL CHECK (role IN ('tablet', 'controller', 'manager', 'admin')),
    secret_hash_hex  text NOT NULL UNIQUE,
    label            text NOT NULL,
    created_at       timestamptz NOT NULL
);

CREATE TABLE trees (
    tree_id            text PRIMARY KEY,
    block              text NOT NULL,
    row_label          text NOT NULL,
    position_in_row    integer NOT NULL,
    arm_profile_id     text NOT NULL,
    latest_scan_id     text NOT NULL,
    retry_policy       text NOT NULL,
    current_version    integer NULL,
    total_seconds      double precision NULL,
    step_count         integer NULL,
    unscheduled_count  integer NULL,
    updated_at         timestamptz NOT NULL
);

CREATE TABLE scans (
    scan_id     text PRIMARY KEY,
    tree_id     text NOT NULL REFERENCES trees (tree_id),
    scan_json   text NOT NULL,
    created_at  timestamptz NOT NULL
);
CREATE INDEX scans_tree ON scans (tree_id);

CREATE TABLE jobs (
    job_id            text PRIMARY KEY,
    tree_id           text NOT NULL REFERENCES trees (tree_id),
    kind              text NOT NULL CHECK (kind IN ('plan', 'replan')),
    scan_id           text NOT NULL REFERENCES scans (scan_id),
    status            text NOT NULL CHECK (status IN ('queued', 'running', 'done', 'failed')),
    attempt           integer NOT NULL DEFAULT 0,
    lease_owner       text NULL,
    lease_until       timestamptz NULL,
    payload_json      text NULL,
    error             text NULL,
    schedule_version  integer NULL,
    created_at        timestamptz NOT NULL,
    finished_at       timestamptz NULL,
    CHECK (status <> 'running' OR (lease_owner IS NOT NULL AND lease_until IS NOT NULL))
);
CREATE INDEX jobs_queued ON jobs (created_at, job_id) WHERE status = 'queued';
CREATE INDEX jobs_running ON jobs (lease_until) WHERE status = 'running';
CREATE INDEX jobs_tree ON jobs (tree_id);

-- One schedule per (tree, version) and one per job: a job's result is written exactly once.
CREATE TABLE schedules (
    tree_id        text NOT NULL REFERENCES trees (tree_id),
    version        integer NOT NULL CHECK (version >= 1),
    schedule_json  text NOT NULL,
    job_id         text NOT NULL UNIQUE REFERENCES jobs (job_id),
    created_at     timestamptz NOT NULL,
    PRIMARY KEY (tree_id, version)
);

CREATE TABLE plan_state (
    tree_id     text PRIMARY KEY REFERENCES trees (tree_id),
    version     integer NOT NULL,
    state_json  text NOT NULL,
    updated_at  timestamptz NOT NULL,
    FOREIGN KEY (tree_id, version) REFERENCES schedules (tree_id, version)
);

CREATE TABLE outcomes (
    outcome_id   bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    tree_id      text NOT NULL,
    version      integer NOT NULL,
    cut_id       text NOT NULL,
    outcome      text NOT NULL CHECK (outcome IN ('done', 'missed', 'skipped')),
    job_id       text NULL,
    scan_id      text NULL,
    reported_at  timestamptz NOT NULL,
    FOREIGN KEY (tree_id, version) REFERENCES schedules (tree_id, version)
);
CREATE INDEX outcomes_tree ON outcomes (tree_id, reported_at, outcome_id);

-- The first answer to an idempotent POST wins: the primary key (scope, key) decides.
CREATE TABLE idempotency (
    scope             text NOT NULL,
    key               text NOT NULL,
    request_hash_hex  text NOT NULL,
    status_code       integer NOT NULL,
    response_json     text NOT NULL,
    location          text NULL,
    created_at        timestamptz NOT NULL,
    CONSTRAINT idempotency_scope_key PRIMARY KEY (scope, key)
);
