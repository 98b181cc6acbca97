-- trapmap results store, schema version 1. One script for SQLite and PostgreSQL: only types both understand
-- (TEXT, INTEGER, BIGINT, DOUBLE PRECISION), keys made by the program (no auto-increment), times as epoch
-- milliseconds (UTC) beside their ISO-8601 text.

-- One inspection run: when, by which rules (file and SHA-256 of its content), physics settings and program version.
CREATE TABLE runs (
    run_id          TEXT PRIMARY KEY,
    started_at_ms   BIGINT NOT NULL,
    started_at      TEXT NOT NULL,
    rules_file      TEXT NOT NULL,
    rules_sha256    TEXT NOT NULL,
    settings_json   TEXT NOT NULL,
    settings_sha256 TEXT NOT NULL,
    program_version TEXT NOT NULL
);

-- One wafer's result. result_key = SHA-256 of (map content SHA-256, rules SHA-256, settings SHA-256): the same map
-- judged by the same rules and settings again replaces its rows.
CREATE TABLE wafers (
    result_key      TEXT PRIMARY KEY,
    run_id          TEXT NOT NULL REFERENCES runs (run_id),
    file            TEXT NOT NULL,
    content_sha256  TEXT NOT NULL,
    rules_sha256    TEXT NOT NULL,
    settings_sha256 TEXT NOT NULL,
    wafer_id        TEXT NOT NULL,
    lot             TEXT,
    measured_at_ms  BIGINT,
    measured_at     TEXT,
    inspected_at_ms BIGINT NOT NULL,
    profile         TEXT NOT NULL,
    verdict         TEXT NOT NULL,
    grade           TEXT NOT NULL,
    defect          TEXT NOT NULL,
    error           TEXT NOT NULL
);
CREATE INDEX wafers_time ON wafers (measured_at_ms, inspected_at_ms);
CREATE INDEX wafers_lot ON wafers (lot);

-- Every figure of the wafer's profile; value NULL where it could not be computed (NaN).
CREATE TABLE wafer_figures (
    result_key TEXT NOT NULL REFERENCES wafers (result_key),
    figure     TEXT NOT NULL,
    value      DOUBLE PRECISION,
    PRIMARY KEY (result_key, figure)
);
CREATE INDEX wafer_figures_figure ON wafer_figures (figure);

-- The figures outside their limits, in the profile's order.
CREATE TABLE wafer_failed_rules (
    result_key TEXT NOT NULL REFERENCES wafers (result_key),
    position   INTEGER NOT NULL,
    rule       TEXT NOT NULL,
    PRIMARY KEY (result_key, position)
);

-- The facts of the map's sidecar conditions (lot, measured_at, furnace_tube, boat_slot, ...), as text.
CREATE TABLE wafer_attributes (
    result_key TEXT NOT NULL REFERENCES wafers (result_key),
    name       TEXT NOT NULL,
    value      TEXT NOT NULL,
    PRIMARY KEY (result_key, name)
);
CREATE INDEX wafer_attributes_name ON wafer_attributes (name, value);

-- The flagged regions (as in regions.csv): lengths and positions mm (wafer centre origin, y up), areas mm^2,
-- peak and mean in the flag's quantity, densities cm^-3; NULL where not given. centroid_inside 1/0.
CREATE TABLE wafer_regions (
    result_key         TEXT NOT NULL REFERENCES wafers (result_key),
    region             INTEGER NOT NULL,
    area_mm2           DOUBLE PRECISION,
    x_mm               DOUBLE PRECISION,
    y_mm               DOUBLE PRECISION,
    centroid_x_mm      DOUBLE PRECISION,
    centroid_y_mm      DOUBLE PRECISION,
    centroid_inside    INTEGER,
    min_x_mm           DOUBLE PRECISION,
    min_y_mm           DOUBLE PRECISION,
    max_x_mm           DOUBLE PRECISION,
    max_y_mm           DOUBLE PRECISION,
    peak               DOUBLE PRECISION,
    peak_x_mm          DOUBLE PRECISION,
    peak_y_mm          DOUBLE PRECISION,
    mean               DOUBLE PRECISION,
    edge_distance_mm   DOUBLE PRECISION,
    peak_density_cm3   DOUBLE PRECISION,
    median_density_cm3 DOUBLE PRECISION,
    PRIMARY KEY (result_key, region)
);

-- Where the wafer was evaluated, on cells of pitch_mm: the covered cells as Base64 of the row-by-row bit set (as in
-- footprints.csv), their count, and the flagged cells one row each in footprint_cells.
CREATE TABLE wafer_footprints (
    result_key    TEXT PRIMARY KEY REFERENCES wafers (result_key),
    family        TEXT NOT NULL,
    pitch_mm      DOUBLE PRECISION NOT NULL,
    min_i         INTEGER NOT NULL,
    min_j         INTEGER NOT NULL,
    width         INTEGER NOT NULL,
    height        INTEGER NOT NULL,
    covered_cells INTEGER NOT NULL,
    covered       TEXT NOT NULL,
    flagged_cells INTEGER NOT NULL
);

-- A flagged footprint cell: column cell_i, row cell_j (cell (i, j) is centred at (i·pitch, j·pitch) mm).
CREATE TABLE footprint_cells (
    result_key TEXT NOT NULL REFERENCES wafers (result_key),
    cell_i     INTEGER NOT NULL,
    cell_j     INTEGER NOT NULL,
    PRIMARY KEY (result_key, cell_i, cell_j)
);
