-- Orchard store, PostgreSQL, version 3: orchard documents (the row registry, reference rates), tree
-- features computed once when a scan is accepted or a plan completes, and measured cut durations.

CREATE TABLE orchard_documents (
    name           text PRIMARY KEY,
    document_json  text NOT NULL,
    updated_at     timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE tree_features (
    tree_id                  text PRIMARY KEY REFERENCES trees (tree_id),
    scan_id                  text NULL,
    scan_cut_count           integer NULL,
    branch_length_m          double precision NULL,
    node_count               integer NULL,
    schedule_version         integer NULL,
    total_seconds            double precision NULL,
    scheduled_cuts           integer NULL,
    unreachable_cuts         integer NULL,
    moot_cuts                integer NULL,
    hand_cuts                integer NULL,
    far_side_stops           integer NULL,
    cut_seconds              double precision NULL,
    diameter_sum_mm          double precision NULL,
    diameter_square_sum_mm2  double precision NULL,
    updated_at               timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE cut_durations (
    tree_id           text NOT NULL REFERENCES trees (tree_id),
    version           integer NOT NULL,
    cut_id            text NOT NULL,
    block             text NOT NULL,
    diameter_mm       double precision NOT NULL CHECK (diameter_mm >= 0),
    duration_seconds  double precision NOT NULL CHECK (duration_seconds > 0),
    reported_at       timestamptz NOT NULL DEFAULT now(),
    PRIMARY KEY (tree_id, version, cut_id)
);
CREATE INDEX cut_durations_block ON cut_durations (block);
