-- Orchard store, SQLite, version 2: schedule integrity and key management (as PostgreSQL's version 2).
-- SQLite cannot change a CHECK, a primary key or NOT NULL in place, so jobs, schedules, plan_state and
-- outcomes are rebuilt (new table, copy, drop, rename). Migrations run on a connection with foreign keys
-- off, as SQLite's documented procedure for such changes asks; the last statements prove that every
-- reference still holds before the transaction commits.

CREATE TABLE jobs_v2 (
    job_id            TEXT PRIMARY KEY,
    tree_id           TEXT NOT NULL REFERENCES trees (tree_id),
    kind              TEXT NOT NULL CHECK (kind IN ('plan', 'replan')),
    scan_id           TEXT NOT NULL REFERENCES scans (scan_id),
    status            TEXT NOT NULL CHECK (status IN ('queued', 'running', 'done', 'failed', 'superseded')),
    attempt           INTEGER NOT NULL DEFAULT 0,
    lease_owner       TEXT NULL,
    lease_until       INTEGER NULL,
    payload_json      TEXT NULL,
    error             TEXT NULL,
    schedule_version  INTEGER NULL,
    created_at        INTEGER NOT NULL,
    finished_at       INTEGER NULL,
    base_version      INTEGER NULL,
    requested_by      TEXT NULL,
    CHECK (status <> 'running' OR (lease_owner IS NOT NULL AND lease_until IS NOT NULL))
);
INSERT INTO jobs_v2 (job_id, tree_id, kind, scan_id, status, attempt, lease_owner, lease_until, payload_json, error, schedule_version, created_at, finished_at)
    SELECT job_id, tree_id, kind, scan_id, status, attempt, lease_owner, lease_until, payload_json, error, schedule_version, created_at, finished_at FROM jobs;
DROP TABLE jobs;
ALTER TABLE jobs_v2 RENAME TO jobs;
CREATE INDEX jobs_queued ON jobs (created_at, job_id) WHERE status = 'queued';
CREATE INDEX jobs_running ON jobs (lease_until) WHERE status = 'running';
CREATE INDEX jobs_tree ON jobs (tree_id);
-- Two workers never plan one tree at once.
CREATE UNIQUE INDEX jobs_one_running_per_tree ON jobs (tree_id) WHERE status = 'running';
CREATE INDEX jobs_open_by_requester ON jobs (requested_by) WHERE status IN ('queued', 'running');

CREATE TABLE schedules_v2 (
    tree_id        TEXT NOT NULL REFERENCES trees (tree_id),
    version        INTEGER NOT NULL CHECK (version >= 1),
    schedule_json  TEXT NOT NULL,
    job_id         TEXT NOT NULL UNIQUE REFERENCES jobs (job_id),
    created_at     INTEGER NOT NULL,
    scan_id        TEXT NOT NULL REFERENCES scans (scan_id),
    PRIMARY KEY (tree_id, version)
);
INSERT INTO schedules_v2 (tree_id, version, schedule_json, job_id, created_at, scan_id)
    SELECT s.tree_id, s.version, s.schedule_json, s.job_id, s.created_at, j.scan_id FROM schedules s JOIN jobs j ON j.job_id = s.job_id;
DROP TABLE schedules;
ALTER TABLE schedules_v2 RENAME TO schedules;

ALTER TABLE trees ADD COLUMN current_scan_id TEXT NULL;
UPDATE trees SET current_scan_id = (SELECT s.scan_id FROM schedules s WHERE s.tree_id = trees.tree_id AND s.version = trees.current_version);

CREATE TABLE plan_state_v2 (
    tree_id     TEXT NOT NULL REFERENCES trees (tree_id),
    scan_id     TEXT NOT NULL,
    version     INTEGER NOT NULL,
    state_json  TEXT NOT NULL,
    updated_at  INTEGER NOT NULL,
    PRIMARY KEY (tree_id, scan_id),
    FOREIGN KEY (tree_id, version) REFERENCES schedules (tree_id, version)
);
INSERT INTO plan_state_v2 (tree_id, scan_id, version, state_json, updated_at)
    SELECT p.tree_id, s.scan_id, p.version, p.state_json, p.updated_at FROM plan_state p JOIN schedules s ON s.tree_id = p.tree_id AND s.version = p.version;
DROP TABLE plan_state;
ALTER TABLE plan_state_v2 RENAME TO plan_state;

CREATE TABLE outcomes_v2 (
    outcome_id   INTEGER PRIMARY KEY AUTOINCREMENT,
    tree_id      TEXT NOT NULL,
    version      INTEGER NOT NULL,
    cut_id       TEXT NOT NULL,
    outcome      TEXT NOT NULL CHECK (outcome IN ('done', 'missed', 'skipped')),
    job_id       TEXT NULL,
    scan_id      TEXT NOT NULL,
    reported_at  INTEGER NOT NULL,
    FOREIGN KEY (tree_id, version) REFERENCES schedules (tree_id, version)
);
INSERT INTO outcomes_v2 (outcome_id, tree_id, version, cut_id, outcome, job_id, scan_id, reported_at)
    SELECT o.outcome_id, o.tree_id, o.version, o.cut_id, o.outcome, o.job_id, s.scan_id, o.reported_at
    FROM outcomes o JOIN schedules s ON s.tree_id = o.tree_id AND s.version = o.version;
DROP TABLE outcomes;
ALTER TABLE outcomes_v2 RENAME TO outcomes;
CREATE INDEX outcomes_tree ON outcomes (tree_id, reported_at, outcome_id);
CREATE INDEX outcomes_scan_cut ON outcomes (tree_id, scan_id, cut_id);

ALTER TABLE api_keys ADD COLUMN expires_at INTEGER NULL;
ALTER TABLE api_keys ADD COLUMN revoked_at INTEGER NULL;
ALTER TABLE api_keys ADD COLUMN last_used_at INTEGER NULL;
ALTER TABLE api_keys ADD COLUMN demo INTEGER NOT NULL DEFAULT 0 CHECK (demo IN (0, 1));

-- A signed-in review page: the cookie names the session; sign-out or the key's revocation ends it.
CREATE TABLE review_sessions (
    session_id  TEXT PRIMARY KEY,
    key_id      TEXT NOT NULL REFERENCES api_keys (key_id),
    created_at  INTEGER NOT NULL,
    expires_at  INTEGER NOT NULL,
    revoked_at  INTEGER NULL
);
CREATE INDEX review_sessions_key ON review_sessions (key_id);

-- Who did what: scans posted, outcomes and re-plans, keys made and revoked, profiles changed, sign-ins.
CREATE TABLE audit (
    audit_id  INTEGER PRIMARY KEY AUTOINCREMENT,
    at        INTEGER NOT NULL,
    key_id    TEXT NULL,
    action    TEXT NOT NULL,
    target    TEXT NOT NULL,
    detail    TEXT NULL
);

-- The ASP.NET Core data-protection key ring (cookies, antiforgery tokens), one XML element per key.
CREATE TABLE protection_keys (
    name        TEXT PRIMARY KEY,
    xml         TEXT NOT NULL,
    created_at  INTEGER NOT NULL
);

-- Every reference still holds (the rebuilt tables were copied with foreign keys off).
CREATE TEMP TABLE migration_0002_check (violations INTEGER CHECK (violations = 0));
INSERT INTO migration_0002_check SELECT count(*) FROM pragma_foreign_key_check;
DROP TABLE migration_0002_check;
