-- Orchard store, SQLite, version 3: orchard documents (the row registry, reference rates), tree features
-- computed once when a scan is accepted or a plan completes, and measured cut durations.

CREATE TABLE orchard_documents (
    name           TEXT PRIMARY KEY,
    document_json  TEXT NOT NULL,
    updated_at     INTEGER NOT NULL
);

CREATE TABLE tree_features (
    tree_id                  TEXT PRIMARY KEY REFERENCES trees (tree_id),
    scan_id                  TEXT NULL,
    scan_cut_count           INTEGER NULL,
    branch_length_m          REAL NULL,
    node_count               INTEGER NULL,
    schedule_version         INTEGER NULL,
    total_seconds            REAL NULL,
    scheduled_cuts           INTEGER NULL,
    unreachable_cuts         INTEGER NULL,
    moot_cuts                INTEGER NULL,
    hand_cuts                INTEGER NULL,
    far_side_stops           INTEGER NULL,
    cut_seconds              REAL NULL,
    diameter_sum_mm          REAL NULL,
    diameter_square_sum_mm2  REAL NULL,
    updated_at               INTEGER NOT NULL
);

CREATE TABLE cut_durations (
    tree_id           TEXT NOT NULL REFERENCES trees (tree_id),
    version           INTEGER NOT NULL,
    cut_id            TEXT NOT NULL,
    block             TEXT NOT NULL,
    diameter_mm       REAL NOT NULL CHECK (diameter_mm >= 0),
    duration_seconds  REAL NOT NULL CHECK (duration_seconds > 0),
    reported_at       INTEGER NOT NULL,
    PRIMARY KEY (tree_id, version, cut_id)
);
CREATE INDEX cut_durations_block ON cut_durations (block);
