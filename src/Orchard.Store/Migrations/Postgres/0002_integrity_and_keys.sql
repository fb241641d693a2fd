-- Orchard store, PostgreSQL, version 2: schedule integrity and key management.
--  * jobs: a 'superseded' end (its scan or the version it re-plans was no longer current), the version a
--    re-plan re-plans (base_version), the key that asked for it (requested_by, for the per-key queue quota),
--    and at most one running job per tree (the partial unique index claims rely on).
--  * schedules name the scan they were planned from; trees remember the scan of their current version.
--  * plan state is kept per (tree, scan); outcomes always name their scan.
--  * api keys: expiry, revocation, last use, demo keys; review sessions; the audit trail; the
--    cookie-protection key ring shared by every replica.

ALTER TABLE jobs DROP CONSTRAINT jobs_status_check;
ALTER TABLE jobs ADD CONSTRAINT jobs_status_check CHECK (status IN ('queued', 'running', 'done', 'failed', 'superseded'));
ALTER TABLE jobs ADD COLUMN base_version integer NULL;
ALTER TABLE jobs ADD COLUMN requested_by text NULL;
-- Two workers never plan one tree at once: a claim that would make a second running job of a tree fails.
CREATE UNIQUE INDEX jobs_one_running_per_tree ON jobs (tree_id) WHERE status = 'running';
CREATE INDEX jobs_open_by_requester ON jobs (requested_by) WHERE status IN ('queued', 'running');

ALTER TABLE schedules ADD COLUMN scan_id text NULL REFERENCES scans (scan_id);
UPDATE schedules s SET scan_id = j.scan_id FROM jobs j WHERE j.job_id = s.job_id;
ALTER TABLE schedules ALTER COLUMN scan_id SET NOT NULL;

ALTER TABLE trees ADD COLUMN current_scan_id text NULL;
UPDATE trees t SET current_scan_id = s.scan_id FROM schedules s WHERE s.tree_id = t.tree_id AND s.version = t.current_version;

ALTER TABLE plan_state ADD COLUMN scan_id text NULL;
UPDATE plan_state p SET scan_id = s.scan_id FROM schedules s WHERE s.tree_id = p.tree_id AND s.version = p.version;
ALTER TABLE plan_state ALTER COLUMN scan_id SET NOT NULL;
ALTER TABLE plan_state DROP CONSTRAINT plan_state_pkey;
ALTER TABLE plan_state ADD PRIMARY KEY (tree_id, scan_id);

UPDATE outcomes o SET scan_id = s.scan_id FROM schedules s WHERE s.tree_id = o.tree_id AND s.version = o.version;
ALTER TABLE outcomes ALTER COLUMN scan_id SET NOT NULL;
CREATE INDEX outcomes_scan_cut ON outcomes (tree_id, scan_id, cut_id);

ALTER TABLE api_keys ADD COLUMN expires_at timestamptz NULL;
ALTER TABLE api_keys ADD COLUMN revoked_at timestamptz NULL;
ALTER TABLE api_keys ADD COLUMN last_used_at timestamptz NULL;
ALTER TABLE api_keys ADD COLUMN demo boolean NOT NULL DEFAULT false;

-- A signed-in review page: the cookie names the session; sign-out or the key's revocation ends it.
CREATE TABLE review_sessions (
    session_id  text PRIMARY KEY,
    key_id      text NOT NULL REFERENCES api_keys (key_id),
    created_at  timestamptz NOT NULL,
    expires_at  timestamptz NOT NULL,
    revoked_at  timestamptz NULL
);
CREATE INDEX review_sessions_key ON review_sessions (key_id);

-- Who did what: scans posted, outcomes and re-plans, keys made and revoked, profiles changed, sign-ins.
CREATE TABLE audit (
    audit_id  bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    at        timestamptz NOT NULL,
    key_id    text NULL,
    action    text NOT NULL,
    target    text NOT NULL,
    detail    text NULL
);
CREATE INDEX audit_newest ON audit (audit_id DESC);

-- The ASP.NET Core data-protection key ring (cookies, antiforgery tokens), one XML element per key.
CREATE TABLE protection_keys (
    name        text PRIMARY KEY,
    xml         text NOT NULL,
    created_at  timestamptz NOT NULL
);
