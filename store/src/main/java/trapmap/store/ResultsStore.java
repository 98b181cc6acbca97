package trapmap.store;

import java.io.IOException;
import java.io.StringReader;
import java.net.URI;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.sql.Types;
import java.time.Clock;
import java.time.Instant;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.time.temporal.IsoFields;
import java.util.ArrayList;
import java.util.Base64;
import java.util.BitSet;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.UUID;
import java.util.logging.Level;
import java.util.logging.Logger;
import javax.sql.DataSource;
import org.flywaydb.core.Flyway;
import org.flywaydb.core.api.MigrationInfo;
import org.flywaydb.core.api.MigrationVersion;
import org.flywaydb.core.api.FlywayException;
import org.postgresql.PGConnection;
import org.postgresql.ds.PGSimpleDataSource;
import org.sqlite.SQLiteConfig;
import org.sqlite.SQLiteDataSource;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.WaferResult;

/**
 * The results store: every inspected wafer (its verdict, grade, figures, failed rules, regions, footprint cells and
 * sidecar facts) and the runs that judged them, in SQLite (a file) or PostgreSQL. The schema is made and upgraded by
 * Flyway's versioned migrations ({@code db/migration/V*__*.sql}, one script for both databases); Flyway records the
 * version in its table {@code flyway_schema_history} ({@link #schemaVersion}).
 *
 * <p>Each wafer is written in one transaction ({@link #write}): all its rows or none; the bulk path
 * ({@link #writeAll}) writes many wafers in one transaction, all or none. A wafer is keyed by the SHA-256
 * of its map's content, the rules' and the physics settings' ({@link #resultKey}): writing it again replaces its rows.
 * The methods are synchronized: one store may be shared by threads; several processes may share a SQLite file (its
 * writers wait for each other up to {@value #BUSY_TIMEOUT_MS} ms).
 */
public final class ResultsStore implements AutoCloseable {
    /** The schema version the migrations of this program reach. */
    public static final String SCHEMA_VERSION = "1";
    /** The group of a point without a value for the grouping ({@link #points}). */
    public static final String NO_GROUP = "(none)";
    /** The group of every point when there is no grouping ({@link #points} with {@code groupBy} null or "none"). */
    public static final String ALL = "all";
    /** How long a SQLite writer waits for another process's transaction, ms. */
    static final int BUSY_TIMEOUT_MS = 30_000;
    private static final String PG_PREFIX = "postgresql://";
    /** Flyway tells each step at INFO; the store's user wants only warnings (kept referenced: loggers are weak). */
    private static final Logger FLYWAY_LOG = Logger.getLogger("org.flywaydb");

    static {
        FLYWAY_LOG.setLevel(Level.WARNING);
    }

    private final String name;
    private final Connection connection;
    private final String schemaVersion;
    private final Clock clock;
    /** The rules' and settings' SHA-256 of the runs written to ({@link #runHashes}). */
    private final Map<String, String[]> runs = new HashMap<>();
    /** The statements of writing wafers, prepared on first use; null before. */
    private Statements statements;

    private ResultsStore(String name, DataSource source, Clock clock) {
        this.name = name;
        this.clock = clock;
        try {
            Flyway flyway = Flyway.configure(ResultsStore.class.getClassLoader()).dataSource(source)
                    .locations("classpath:db/migration").load();
            flyway.migrate();
            MigrationInfo current = flyway.info().current();
            MigrationVersion v = current == null ? null : current.getVersion();
            this.schemaVersion = v == null ? "" : v.getVersion();
            this.connection = source.getConnection();
        } catch (FlywayException | SQLException e) {
            throw new StoreException("store " + name + ": cannot be opened or its schema made: " + oneLine(e), e);
        }
        if (!SCHEMA_VERSION.equals(schemaVersion)) {
            close();
            throw new StoreException("store " + name + ": schema version " + schemaVersion + ", but this program"
                    + " knows version " + SCHEMA_VERSION + " (a newer trapmap made it)");
        }
    }

    /**
     * Opens (and makes or upgrades) a store: a file path or {@code jdbc:sqlite:PATH} opens a SQLite file (made when
     * missing; its folder must exist); {@code postgresql://host[:port]/database} (or {@code jdbc:postgresql://...})
     * a PostgreSQL database, the user from the environment's {@code PGUSER} (else the system user) and the password
     * from {@code PGPASSWORD} or else the driver's password file ({@code PGPASSFILE}, default {@code ~/.pgpass}).
     * Credentials in the address itself are refused: they would show in the command line.
     *
     * @throws StoreException naming the store when it cannot be opened
     */
    public static ResultsStore open(String urlOrPath) {
        return open(urlOrPath, System.getenv(), Clock.systemUTC());
    }

    static ResultsStore open(String urlOrPath, Map<String, String> env, Clock clock) {
        if (urlOrPath == null || urlOrPath.isBlank()) {
            throw new StoreException("store: give a SQLite file or postgresql://host[:port]/database");
        }
        String s = urlOrPath.trim();
        if (s.startsWith("jdbc:")) {
            s = s.substring("jdbc:".length());
        }
        if (s.startsWith(PG_PREFIX)) {
            return new ResultsStore(s, postgres(s, env), clock);
        }
        if (s.startsWith("sqlite:")) {
            s = s.substring("sqlite:".length());
        }
        Path file = Path.of(s).toAbsolutePath();
        Path dir = file.getParent();
        if (dir != null && !Files.isDirectory(dir)) {
            throw new StoreException("store " + urlOrPath + ": folder " + dir + " does not exist");
        }
        if (Files.isDirectory(file)) {
            throw new StoreException("store " + urlOrPath + ": is a folder; give a SQLite file");
        }
        SQLiteConfig config = new SQLiteConfig();
        config.setBusyTimeout(BUSY_TIMEOUT_MS);
        config.setJournalMode(SQLiteConfig.JournalMode.WAL);
        config.enforceForeignKeys(true);
        SQLiteDataSource ds = new SQLiteDataSource(config);
        ds.setUrl("jdbc:sqlite:" + file);
        return new ResultsStore(urlOrPath, ds, clock);
    }

    /** A PostgreSQL source for {@code postgresql://host[:port]/database}, credentials from {@code env}. */
    static PGSimpleDataSource postgres(String address, Map<String, String> env) {
        URI uri;
        try {
            uri = new URI(address);
        } catch (URISyntaxException e) {
            throw new StoreException("store " + address + ": not an address postgresql://host[:port]/database ("
                    + e.getReason() + ")");
        }
        if (uri.getRawUserInfo() != null || (uri.getRawQuery() != null
                && uri.getRawQuery().toLowerCase(Locale.ROOT).matches("(.*&)?(user|password)=.*"))) {
            throw new StoreException("store " + redacted(uri) + ": credentials in the address are refused (they would"
                    + " show in the command line); set PGUSER and PGPASSWORD or use ~/.pgpass");
        }
        String db = uri.getPath() == null ? "" : uri.getPath().replaceFirst("^/", "");
        if (uri.getHost() == null || db.isEmpty()) {
            throw new StoreException("store " + address + ": give postgresql://host[:port]/database");
        }
        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setServerNames(new String[] {uri.getHost()});
        ds.setPortNumbers(new int[] {uri.getPort() < 0 ? 5432 : uri.getPort()});
        ds.setDatabaseName(db);
        String user = env.get("PGUSER");
        ds.setUser(user == null || user.isEmpty() ? System.getProperty("user.name") : user);
        String password = env.get("PGPASSWORD");
        if (password != null && !password.isEmpty()) {
            ds.setPassword(password);
        }
        ds.setApplicationName("trapmap");
        // a batch of inserts goes as multi-row INSERTs (the bulk path, writeAll): fewer statements for the server
        ds.setReWriteBatchedInserts(true);
        return ds;
    }

    private static String redacted(URI uri) {
        return "postgresql://" + (uri.getHost() == null ? "" : uri.getHost())
                + (uri.getPort() < 0 ? "" : ":" + uri.getPort()) + (uri.getPath() == null ? "" : uri.getPath());
    }

    /** The schema version recorded in the store (Flyway's history), e.g. {@code "1"}. */
    public String schemaVersion() {
        return schemaVersion;
    }

    /** The store as it was given to {@link #open}. */
    public String name() {
        return name;
    }

    /** Records a run and returns its id (a random UUID), for {@link #write}. */
    public synchronized String startRun(RunInfo run) {
        String id = UUID.randomUUID().toString();
        try (PreparedStatement p = connection.prepareStatement("INSERT INTO runs (run_id, started_at_ms, started_at,"
                + " rules_file, rules_sha256, settings_json, settings_sha256, program_version)"
                + " VALUES (?, ?, ?, ?, ?, ?, ?, ?)")) {
            p.setString(1, id);
            p.setLong(2, run.startedAt().toEpochMilli());
            p.setString(3, run.startedAt().toString());
            p.setString(4, run.rulesFile());
            p.setString(5, run.rulesSha256());
            p.setString(6, run.settingsJson());
            p.setString(7, run.settingsSha256());
            p.setString(8, run.programVersion());
            p.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": the run could not be recorded: " + oneLine(e), e);
        }
        return id;
    }

    /**
     * The key of a wafer's result: SHA-256 of its map content's SHA-256, the rules' and the settings' (one per line);
     * a map that could not be read (no content hash) is keyed by its file name as given instead.
     */
    public static String resultKey(String contentSha256, String file, String rulesSha256, String settingsSha256) {
        String content = contentSha256.isEmpty() ? "file:" + file : contentSha256;
        return WaferRecord.sha256(content + "\n" + rulesSha256 + "\n" + settingsSha256);
    }

    /**
     * Writes one wafer of run {@code runId} in one transaction, replacing the rows of the same result key
     * ({@link #resultKey}); returns that key. On failure nothing of the wafer is written.
     *
     * @throws StoreException naming the store and the file
     */
    public synchronized String write(String runId, WaferRecord wafer) {
        return writeAll(runId, List.of(wafer)).get(0);
    }

    /**
     * Writes the wafers of run {@code runId} in one transaction, the bulk path: each replaces the rows of its result
     * key as {@link #write} does, and the store ends as it would after writing them one by one in this order (of
     * wafers with the same key the last stays). The rows go to the database in batches of one statement per table,
     * prepared once for the store. On failure nothing of these wafers is written (the rows they would have replaced
     * stay), so writing them again completes the load. Returns the wafers' keys in order.
     *
     * @throws StoreException naming the store and the file (of a failed batch the first and last file and the count)
     */
    public synchronized List<String> writeAll(String runId, List<WaferRecord> wafers) {
        if (wafers.isEmpty()) {
            return List.of();
        }
        List<String> keys = new ArrayList<>(wafers.size());
        try {
            String[] hashes = runHashes(runId);
            Map<String, WaferRecord> byKey = new LinkedHashMap<>();
            for (WaferRecord w : wafers) {
                String key = resultKey(w.contentSha256(), w.result().file(), hashes[0], hashes[1]);
                keys.add(key);
                byKey.remove(key); // a later wafer of the same key replaces it, and is written where it comes
                byKey.put(key, w);
            }
            Statements st = statements();
            connection.setAutoCommit(false);
            try {
                for (String key : byKey.keySet()) {
                    for (PreparedStatement d : st.deletes) {
                        d.setString(1, key);
                        d.addBatch();
                    }
                }
                for (PreparedStatement d : st.deletes) {
                    d.executeBatch();
                }
                for (Map.Entry<String, WaferRecord> e : byKey.entrySet()) {
                    addWafer(st, e.getKey(), runId, e.getValue(), hashes);
                }
                for (PreparedStatement i : st.inserts()) {
                    i.executeBatch();
                }
                st.copyCells(connection);
                connection.commit();
            } catch (SQLException | RuntimeException e) {
                try {
                    st.clear(); // rows gathered but not sent must not go with the next transaction
                } catch (SQLException f) {
                    e.addSuppressed(f);
                }
                try {
                    connection.rollback();
                } catch (SQLException f) {
                    e.addSuppressed(f);
                }
                throw e;
            } finally {
                connection.setAutoCommit(true);
            }
        } catch (SQLException e) {
            String what = wafers.size() == 1 ? "wafer " + wafers.get(0).result().file()
                    : wafers.size() + " wafers (" + wafers.get(0).result().file() + " to "
                    + wafers.get(wafers.size() - 1).result().file() + ", none of them)";
            throw new StoreException("store " + name + ": " + what + " not written: " + oneLine(e), e);
        }
        return keys;
    }

    /**
     * Which of {@code files} (map files as given to a run) the store holds a wafer of under the rules and settings of
     * run {@code runId}, by file name alone (no map is read): the cheap check a restarted watch makes over every map
     * of its folder.
     *
     * @throws StoreException naming the store
     */
    public synchronized java.util.Set<String> storedOf(String runId, java.util.Collection<String> files) {
        java.util.Set<String> held = new java.util.HashSet<>();
        try {
            String[] hashes = runHashes(runId);
            try (PreparedStatement p = connection.prepareStatement(
                    "SELECT file FROM wafers WHERE rules_sha256 = ? AND settings_sha256 = ?")) {
                p.setString(1, hashes[0]);
                p.setString(2, hashes[1]);
                try (ResultSet rs = p.executeQuery()) {
                    while (rs.next()) {
                        held.add(rs.getString(1));
                    }
                }
            }
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": the stored files could not be read: " + oneLine(e), e);
        }
        held.retainAll(new java.util.HashSet<>(files));
        return held;
    }

    /**
     * Whether the store holds the result of map {@code file} (its content as it is now) under the rules and settings
     * of run {@code runId}, i.e. a wafer of that {@link #resultKey}.
     *
     * @throws StoreException naming the store and the file
     */
    public synchronized boolean holds(String runId, String file) {
        String sha = "";
        try {
            sha = WaferRecord.sha256(Path.of(file));
        } catch (IOException | RuntimeException e) {
            // an unreadable file is keyed by its name, as write keys its error result
        }
        try {
            String[] hashes = runHashes(runId);
            try (PreparedStatement p = connection.prepareStatement("SELECT 1 FROM wafers WHERE result_key = ?")) {
                p.setString(1, resultKey(sha, file, hashes[0], hashes[1]));
                try (ResultSet rs = p.executeQuery()) {
                    return rs.next();
                }
            }
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": wafer " + file + " not looked up: " + oneLine(e), e);
        }
    }

    /**
     * The runs that judge as run {@code runId} does: the same rules and physics settings (by their SHA-256), itself
     * included; a map inspected by any of them gets the same {@link #resultKey}.
     *
     * @throws StoreException naming the store and the run
     */
    public synchronized java.util.Set<String> runsJudgingAs(String runId) {
        try {
            String[] hashes = runHashes(runId);
            java.util.Set<String> out = new java.util.TreeSet<>();
            try (PreparedStatement p = connection.prepareStatement(
                    "SELECT run_id FROM runs WHERE rules_sha256 = ? AND settings_sha256 = ?")) {
                p.setString(1, hashes[0]);
                p.setString(2, hashes[1]);
                try (ResultSet rs = p.executeQuery()) {
                    while (rs.next()) {
                        out.add(rs.getString(1));
                    }
                }
            }
            return out;
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": the runs like " + runId + " could not be read: "
                    + oneLine(e), e);
        }
    }

    /** The rules' and settings' SHA-256 of a run (a run's never change: kept once read). */
    private String[] runHashes(String runId) throws SQLException {
        String[] known = runs.get(runId);
        if (known != null) {
            return known;
        }
        try (PreparedStatement p = connection.prepareStatement(
                "SELECT rules_sha256, settings_sha256 FROM runs WHERE run_id = ?")) {
            p.setString(1, runId);
            try (ResultSet rs = p.executeQuery()) {
                if (!rs.next()) {
                    throw new StoreException("store " + name + ": no run " + runId + " (start it with startRun)");
                }
                String[] hashes = {rs.getString(1), rs.getString(2)};
                runs.put(runId, hashes);
                return hashes;
            }
        }
    }

    private static final String[] CHILD_TABLES = {"footprint_cells", "wafer_footprints", "wafer_regions",
        "wafer_attributes", "wafer_failed_rules", "wafer_figures"};

    /** Columns of {@code wafer_regions} after {@code result_key, region}, as named in regions.csv. */
    private static final List<String> REGION_VALUES = List.of("area_mm2", "x_mm", "y_mm", "centroid_x_mm",
            "centroid_y_mm", "centroid_inside", "min_x_mm", "min_y_mm", "max_x_mm", "max_y_mm", "peak", "peak_x_mm",
            "peak_y_mm", "mean", "edge_distance_mm", "peak_density_cm3", "median_density_cm3");

    /**
     * The statements that write wafers, prepared once on the store's connection and reused by every transaction: the
     * deletes of a result key's rows (the child tables first) and the inserts of each table (the wafer first), each
     * gathering a batch of rows.
     */
    private static final class Statements {
        final List<PreparedStatement> deletes = new ArrayList<>();
        final PreparedStatement wafer;
        final PreparedStatement figure;
        final PreparedStatement failedRule;
        final PreparedStatement attribute;
        final PreparedStatement region;
        final PreparedStatement footprint;
        final PreparedStatement cell;
        /**
         * On PostgreSQL the flagged cells in COPY's text format (result key, tab, column, tab, row, newline: hex keys
         * and integers need no escaping), sent by {@link #copyCells}; null elsewhere (the {@link #cell} batch).
         */
        final StringBuilder cells;

        Statements(Connection c) throws SQLException {
            for (String t : CHILD_TABLES) {
                deletes.add(c.prepareStatement("DELETE FROM " + t + " WHERE result_key = ?"));
            }
            deletes.add(c.prepareStatement("DELETE FROM wafers WHERE result_key = ?"));
            wafer = c.prepareStatement("INSERT INTO wafers (result_key, run_id, file, content_sha256, rules_sha256,"
                    + " settings_sha256, wafer_id, lot, measured_at_ms, measured_at, inspected_at_ms, profile, verdict,"
                    + " grade, defect, error) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)");
            figure = c.prepareStatement("INSERT INTO wafer_figures (result_key, figure, value) VALUES (?, ?, ?)");
            failedRule = c.prepareStatement(
                    "INSERT INTO wafer_failed_rules (result_key, position, rule) VALUES (?, ?, ?)");
            attribute = c.prepareStatement("INSERT INTO wafer_attributes (result_key, name, value) VALUES (?, ?, ?)");
            region = c.prepareStatement("INSERT INTO wafer_regions (result_key, region, "
                    + String.join(", ", REGION_VALUES) + ") VALUES (?, ?" + ", ?".repeat(REGION_VALUES.size()) + ")");
            footprint = c.prepareStatement("INSERT INTO wafer_footprints (result_key, family, pitch_mm, min_i, min_j,"
                    + " width, height, covered_cells, covered, flagged_cells) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)");
            cell = c.prepareStatement("INSERT INTO footprint_cells (result_key, cell_i, cell_j) VALUES (?, ?, ?)");
            cells = c.isWrapperFor(PGConnection.class) ? new StringBuilder() : null;
        }

        /**
         * Sends the flagged cells gathered in {@link #cells} by PostgreSQL's COPY (most of a flagged wafer's rows: COPY
         * takes them at a fraction of the server's work for INSERTs), after the wafers' rows they refer to.
         */
        void copyCells(Connection c) throws SQLException {
            if (cells == null || cells.length() == 0) {
                return;
            }
            try {
                c.unwrap(PGConnection.class).getCopyAPI().copyIn("COPY footprint_cells (result_key, cell_i, cell_j)"
                        + " FROM STDIN", new StringReader(cells.toString()));
            } catch (java.io.IOException e) {
                throw new SQLException("COPY of the flagged cells: " + e.getMessage(), e);
            } finally {
                cells.setLength(0);
            }
        }

        /** The inserts in the order they run: a wafer's row before the rows that refer to it. */
        List<PreparedStatement> inserts() {
            return List.of(wafer, figure, failedRule, attribute, region, footprint, cell);
        }

        /** Drops the rows gathered but not sent (after a failure). */
        void clear() throws SQLException {
            if (cells != null) {
                cells.setLength(0);
            }
            for (PreparedStatement p : deletes) {
                p.clearBatch();
            }
            for (PreparedStatement p : inserts()) {
                p.clearBatch();
            }
        }

        void close() throws SQLException {
            for (PreparedStatement p : deletes) {
                p.close();
            }
            for (PreparedStatement p : inserts()) {
                p.close();
            }
        }
    }

    private Statements statements() throws SQLException {
        if (statements == null) {
            statements = new Statements(connection);
        }
        return statements;
    }

    /** Adds the rows of wafer {@code w} under {@code key} to the batches of {@code st}. */
    private void addWafer(Statements st, String key, String runId, WaferRecord w, String[] hashes)
            throws SQLException {
        WaferResult r = w.result();
        PreparedStatement p = st.wafer;
        p.setString(1, key);
        p.setString(2, runId);
        p.setString(3, r.file());
        p.setString(4, w.contentSha256());
        p.setString(5, hashes[0]);
        p.setString(6, hashes[1]);
        p.setString(7, r.waferId());
        p.setString(8, w.lot());
        if (w.measuredAt() == null) {
            p.setNull(9, Types.BIGINT);
            p.setNull(10, Types.VARCHAR);
        } else {
            p.setLong(9, w.measuredAt().toEpochMilli());
            p.setString(10, w.measuredAt().toString());
        }
        p.setLong(11, clock.instant().toEpochMilli());
        p.setString(12, r.profile());
        p.setString(13, r.status().key());
        p.setString(14, r.grade());
        p.setString(15, r.defectId());
        p.setString(16, r.error());
        p.addBatch();
        p = st.figure;
        for (Map.Entry<String, Double> e : r.figures().entrySet()) {
            p.setString(1, key);
            p.setString(2, e.getKey());
            setDouble(p, 3, e.getValue() == null ? Double.NaN : e.getValue());
            p.addBatch();
        }
        p = st.failedRule;
        for (int i = 0; i < r.failed().size(); i++) {
            p.setString(1, key);
            p.setInt(2, i);
            p.setString(3, r.failed().get(i));
            p.addBatch();
        }
        p = st.attribute;
        for (Map.Entry<String, String> e : w.attributes().entrySet()) {
            p.setString(1, key);
            p.setString(2, e.getKey());
            p.setString(3, e.getValue());
            p.addBatch();
        }
        p = st.region;
        for (Map<String, String> row : w.regionRows()) {
            p.setString(1, key);
            p.setInt(2, Integer.parseInt(row.get("region")));
            for (int i = 0; i < REGION_VALUES.size(); i++) {
                String c = REGION_VALUES.get(i);
                String v = row.getOrDefault(c, "");
                if (c.equals("centroid_inside")) {
                    p.setInt(3 + i, Boolean.parseBoolean(v) ? 1 : 0);
                } else {
                    setDouble(p, 3 + i, number(v));
                }
            }
            p.addBatch();
        }
        Footprint f = w.footprint();
        if (f != null) {
            p = st.footprint;
            p.setString(1, key);
            p.setString(2, f.family());
            p.setDouble(3, f.pitchMm());
            p.setInt(4, f.minI());
            p.setInt(5, f.minJ());
            p.setInt(6, f.width());
            p.setInt(7, f.height());
            p.setInt(8, f.covered().cardinality());
            p.setString(9, Base64.getEncoder().encodeToString(f.covered().toByteArray()));
            p.setInt(10, f.flagged().cardinality());
            p.addBatch();
            p = st.cell;
            BitSet flagged = f.flagged();
            for (int b = flagged.nextSetBit(0); b >= 0; b = flagged.nextSetBit(b + 1)) {
                int i = f.minI() + b % f.width(); // cells are stored row by row from (minI, minJ)
                int j = f.minJ() + b / f.width();
                if (st.cells != null) {
                    st.cells.append(key).append('\t').append(i).append('\t').append(j).append('\n');
                } else {
                    p.setString(1, key);
                    p.setInt(2, i);
                    p.setInt(3, j);
                    p.addBatch();
                }
            }
        }
    }

    private static double number(String text) {
        if (text == null || text.isBlank()) {
            return Double.NaN;
        }
        try {
            return Double.parseDouble(text);
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }

    /** NaN and infinities are stored as NULL (PostgreSQL would keep them, SQLite would not: one rule for both). */
    private static void setDouble(PreparedStatement p, int i, double v) throws SQLException {
        if (Double.isFinite(v)) {
            p.setDouble(i, v);
        } else {
            p.setNull(i, Types.DOUBLE);
        }
    }

    /** Whether {@code groupBy} names a sidecar fact rather than {@code none}, {@code lot}, {@code day} or {@code week}. */
    public static boolean groupsByAttribute(String groupBy) {
        return groupBy != null && !List.of("none", "lot", "day", "week").contains(groupBy.trim());
    }

    /**
     * The wafers' values of {@code figure} for a trend, oldest first (by {@link StoredPoint#time}, then wafer id and
     * file). Every stored wafer is a point (NaN value where it has none of the figure), so that yields count errors.
     *
     * @param figure  a figure name as in results.csv, e.g. {@code median_density_cm3}
     * @param groupBy {@code lot}, {@code day} (UTC date, {@code 2026-11-02}), {@code week} (ISO week,
     *                {@code 2026-W45}), the name of a sidecar fact (e.g. {@code furnace_tube}), or null/{@code none}
     *                for one group {@value #ALL}; a wafer without the value is in {@value #NO_GROUP}
     * @param since   only points at or after this time; null for all
     * @param profile only wafers judged by this rules profile; null for all
     */
    public synchronized List<StoredPoint> points(String figure, String groupBy, Instant since, String profile) {
        return points(figure, groupBy, new StoreFilter(since, null, profile, List.of(), Map.of()));
    }

    /**
     * The wafers' values of {@code figure} for a trend, as {@link #points(String, String, Instant, String)} gives
     * them, of the wafers {@code filter} takes (a period, a profile, lots, sidecar facts).
     */
    public List<StoredPoint> points(String figure, String groupBy, StoreFilter filter) {
        return points(null, figure, groupBy, filter);
    }

    /**
     * {@link #points(String, String, StoreFilter)} that another thread may stop through {@code query} (null: none):
     * then the statement running is cancelled and this throws {@link StoreQuery.Cancelled}.
     */
    public synchronized List<StoredPoint> points(StoreQuery query, String figure, String groupBy,
                                                 StoreFilter filter) {
        String g = groupBy == null ? "none" : groupBy.trim();
        boolean byAttribute = groupsByAttribute(g);
        List<Object> args = new ArrayList<>();
        String where = where(filter, args);
        String sql = "SELECT w.result_key, w.measured_at_ms, w.inspected_at_ms, w.lot, w.verdict, w.wafer_id,"
                + " w.file, w.profile, f.value, " + (byAttribute ? "a.value" : "NULL") + ", w.run_id"
                + " FROM wafers w LEFT JOIN wafer_figures f ON f.result_key = w.result_key AND f.figure = ?"
                + (byAttribute ? " LEFT JOIN wafer_attributes a ON a.result_key = w.result_key AND a.name = ?" : "")
                + where + " ORDER BY COALESCE(w.measured_at_ms, w.inspected_at_ms), w.wafer_id, w.file";
        List<Object> all = new ArrayList<>();
        all.add(figure);
        if (byAttribute) {
            all.add(g);
        }
        all.addAll(args);
        String what = "store " + name + ": the points of " + figure;
        try {
            Map<String, List<String>> failed = failedRules(where, args, query, what);
            List<StoredPoint> points = new ArrayList<>();
            try (PreparedStatement p = connection.prepareStatement(sql)) {
                bind(p, all);
                if (query != null) {
                    query.start(p, what);
                }
                try (ResultSet rs = p.executeQuery()) {
                    while (rs.next()) {
                        if (query != null && (points.size() & 1023) == 0) {
                            query.check(what);
                        }
                        String key = rs.getString(1);
                        long measured = rs.getLong(2);
                        boolean isMeasured = !rs.wasNull();
                        Instant time = Instant.ofEpochMilli(isMeasured ? measured : rs.getLong(3));
                        String lot = rs.getString(4);
                        String verdict = rs.getString(5);
                        double value = rs.getDouble(9);
                        if (rs.wasNull()) {
                            value = Double.NaN;
                        }
                        String group = groupOf(g, time, lot, byAttribute ? rs.getString(10) : null);
                        points.add(new StoredPoint(time, isMeasured, group, value,
                                "pass".equals(verdict), verdict, failed.getOrDefault(key, List.of()), rs.getString(6),
                                lot, rs.getString(7), rs.getString(8), rs.getString(11)));
                    }
                }
            } finally {
                if (query != null) {
                    query.end();
                }
            }
            return points;
        } catch (SQLException e) {
            if (query != null) {
                query.check(what); // the cancel's own failure (SQLite: interrupted; PostgreSQL: canceling statement)
            }
            throw new StoreException("store " + name + ": the points of " + figure + " could not be read: "
                    + oneLine(e), e);
        }
    }

    /**
     * The condition {@code " WHERE ..."} on the wafers {@code w} that {@code filter} takes, its arguments added to
     * {@code args} in order.
     */
    private static String where(StoreFilter filter, List<Object> args) {
        StringBuilder where = new StringBuilder(" WHERE 1 = 1");
        if (filter.since() != null) {
            where.append(" AND COALESCE(w.measured_at_ms, w.inspected_at_ms) >= ?");
            args.add(filter.since().toEpochMilli());
        }
        if (filter.until() != null) {
            where.append(" AND COALESCE(w.measured_at_ms, w.inspected_at_ms) < ?");
            args.add(filter.until().toEpochMilli());
        }
        if (filter.profile() != null) {
            where.append(" AND w.profile = ?");
            args.add(filter.profile());
        }
        if (!filter.lots().isEmpty()) {
            where.append(" AND w.lot IN (?").append(", ?".repeat(filter.lots().size() - 1)).append(')');
            args.addAll(filter.lots());
        }
        for (Map.Entry<String, String> e : filter.attributes().entrySet()) {
            where.append(" AND EXISTS (SELECT 1 FROM wafer_attributes fa WHERE fa.result_key = w.result_key"
                    + " AND fa.name = ? AND fa.value = ?)");
            args.add(e.getKey());
            args.add(e.getValue());
        }
        return where.toString();
    }

    /**
     * The footprints of the wafers {@code filter} takes, in one group {@value #ALL}; see
     * {@link #footprints(StoreFilter, String)}.
     */
    public List<StoredFootprint> footprints(StoreFilter filter) {
        return footprints(filter, null);
    }

    /**
     * The footprints (where each wafer was evaluated and where flagged, {@link Footprint}) of the stored wafers that
     * {@code filter} takes, oldest first (by time, then wafer id and file); wafers without a footprint (errors) are
     * left out. The cells are those the batch wrote: the covered set as stored, the flagged cells from
     * {@code footprint_cells}.
     *
     * @param groupBy as for {@link #points}: {@code lot}, {@code day}, {@code week}, a sidecar fact, or null/{@code
     *                none} for one group {@value #ALL}; a wafer without a value is in {@value #NO_GROUP}
     * @throws StoreException naming the store when it cannot be read
     */
    public synchronized List<StoredFootprint> footprints(StoreFilter filter, String groupBy) {
        String g = groupBy == null || groupBy.isBlank() ? "none" : groupBy.trim();
        boolean byAttribute = groupsByAttribute(g);
        List<Object> args = new ArrayList<>();
        String where = where(filter, args);
        String sql = "SELECT w.result_key, w.measured_at_ms, w.inspected_at_ms, w.lot, w.wafer_id, w.file, w.profile,"
                + " p.family, p.pitch_mm, p.min_i, p.min_j, p.width, p.height, p.covered, "
                + (byAttribute ? "a.value" : "NULL")
                + " FROM wafers w JOIN wafer_footprints p ON p.result_key = w.result_key"
                + (byAttribute ? " LEFT JOIN wafer_attributes a ON a.result_key = w.result_key AND a.name = ?" : "")
                + where + " ORDER BY COALESCE(w.measured_at_ms, w.inspected_at_ms), w.wafer_id, w.file";
        List<Object> all = new ArrayList<>();
        if (byAttribute) {
            all.add(g);
        }
        all.addAll(args);
        try {
            Map<String, List<int[]>> cells = new HashMap<>();
            try (PreparedStatement p = connection.prepareStatement("SELECT c.result_key, c.cell_i, c.cell_j"
                    + " FROM footprint_cells c WHERE c.result_key IN (SELECT w.result_key FROM wafers w" + where
                    + ")")) {
                bind(p, args);
                try (ResultSet rs = p.executeQuery()) {
                    while (rs.next()) {
                        cells.computeIfAbsent(rs.getString(1), k -> new ArrayList<>())
                                .add(new int[] {rs.getInt(2), rs.getInt(3)});
                    }
                }
            }
            List<StoredFootprint> out = new ArrayList<>();
            Base64.Decoder b64 = Base64.getDecoder();
            try (PreparedStatement p = connection.prepareStatement(sql)) {
                bind(p, all);
                try (ResultSet rs = p.executeQuery()) {
                    while (rs.next()) {
                        String key = rs.getString(1);
                        long measured = rs.getLong(2);
                        boolean isMeasured = !rs.wasNull();
                        Instant time = Instant.ofEpochMilli(isMeasured ? measured : rs.getLong(3));
                        String lot = rs.getString(4);
                        int minI = rs.getInt(10);
                        int minJ = rs.getInt(11);
                        int width = rs.getInt(12);
                        int height = rs.getInt(13);
                        BitSet flagged = new BitSet(width * height);
                        for (int[] c : cells.getOrDefault(key, List.of())) {
                            int i = c[0] - minI;
                            int j = c[1] - minJ;
                            if (i < 0 || j < 0 || i >= width || j >= height) {
                                throw new StoreException("store " + name + ": wafer " + rs.getString(6)
                                        + ": flagged cell (" + c[0] + ", " + c[1] + ") outside its footprint");
                            }
                            flagged.set(j * width + i); // row by row from (minI, minJ), as written
                        }
                        Footprint f = new Footprint(rs.getString(8), rs.getDouble(9), minI, minJ, width, height,
                                BitSet.valueOf(b64.decode(rs.getString(14))), flagged);
                        out.add(new StoredFootprint(rs.getString(5), lot, time, isMeasured, rs.getString(6),
                                rs.getString(7), groupOf(g, time, lot, byAttribute ? rs.getString(15) : null), f));
                    }
                }
            }
            return out;
        } catch (SQLException | IllegalArgumentException e) {
            throw new StoreException("store " + name + ": the footprints could not be read: " + oneLine(e), e);
        }
    }

    /**
     * A wafer's group for the grouping {@code g} (see {@link #points}): {@value #ALL}, its lot, its UTC day, its ISO
     * week or {@code fact} (the value of the sidecar fact grouped by); {@value #NO_GROUP} when it has none.
     */
    private static String groupOf(String g, Instant time, String lot, String fact) {
        String group = switch (g) {
            case "none" -> ALL;
            case "lot" -> lot;
            case "day" -> LocalDate.ofInstant(time, ZoneOffset.UTC).toString();
            case "week" -> isoWeek(LocalDate.ofInstant(time, ZoneOffset.UTC));
            default -> fact;
        };
        return group == null ? NO_GROUP : group;
    }

    /** ISO-8601 week of {@code d}, e.g. {@code 2026-W45} (its week-based year). */
    static String isoWeek(LocalDate d) {
        return String.format(Locale.ROOT, "%d-W%02d", d.get(IsoFields.WEEK_BASED_YEAR),
                d.get(IsoFields.WEEK_OF_WEEK_BASED_YEAR));
    }

    private Map<String, List<String>> failedRules(String where, List<Object> args, StoreQuery query, String what)
            throws SQLException {
        Map<String, List<String>> m = new HashMap<>();
        try (PreparedStatement p = connection.prepareStatement("SELECT r.result_key, r.rule FROM wafer_failed_rules r"
                + " WHERE r.result_key IN (SELECT w.result_key FROM wafers w" + where + ")"
                + " ORDER BY r.result_key, r.position")) {
            bind(p, args);
            if (query != null) {
                query.start(p, what);
            }
            try (ResultSet rs = p.executeQuery()) {
                while (rs.next()) {
                    m.computeIfAbsent(rs.getString(1), k -> new ArrayList<>()).add(rs.getString(2));
                }
            }
        } finally {
            if (query != null) {
                query.end();
            }
        }
        return m;
    }

    private static void bind(PreparedStatement p, List<Object> args) throws SQLException {
        for (int i = 0; i < args.size(); i++) {
            Object a = args.get(i);
            if (a instanceof Long l) {
                p.setLong(i + 1, l);
            } else {
                p.setString(i + 1, (String) a);
            }
        }
    }

    /**
     * The names of the figures the stored wafers have (a column of results.csv each, e.g.
     * {@code trap_density_p50_cm3}), sorted by {@link String#compareTo} (the same order from SQLite and PostgreSQL,
     * whatever the server's collation). A figure is listed when any wafer has a row for it, with or without a value.
     */
    public synchronized List<String> figures() {
        return distinct("SELECT DISTINCT figure FROM wafer_figures", "figure names");
    }

    /**
     * The names of the sidecar facts the stored wafers have ({@code boat_slot}, {@code furnace_tube}, {@code lot},
     * {@code measured_at}, ...), sorted as {@link #figures}.
     */
    public synchronized List<String> attributeNames() {
        return distinct("SELECT DISTINCT name FROM wafer_attributes", "fact names");
    }

    private List<String> distinct(String sql, String what) {
        List<String> out = new ArrayList<>();
        try (Statement s = connection.createStatement(); ResultSet rs = s.executeQuery(sql)) {
            while (rs.next()) {
                out.add(rs.getString(1));
            }
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": the " + what + " could not be read: " + oneLine(e), e);
        }
        out.sort(null);
        return List.copyOf(out);
    }

    /** Number of rows of a table (tests and checks). */
    synchronized long count(String table) {
        try (Statement s = connection.createStatement();
             ResultSet rs = s.executeQuery("SELECT COUNT(*) FROM " + table)) {
            rs.next();
            return rs.getLong(1);
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": cannot count " + table + ": " + oneLine(e), e);
        }
    }

    /** The connection (tests). */
    Connection connection() {
        return connection;
    }

    private static String oneLine(Throwable e) {
        String m = e.getMessage() == null ? e.toString() : e.getMessage();
        return m.replaceAll("\\s*\\R\\s*", " ").trim();
    }

    @Override
    public synchronized void close() {
        try {
            try {
                if (statements != null) {
                    statements.close();
                    statements = null;
                }
            } finally {
                if (connection != null) {
                    connection.close();
                }
            }
        } catch (SQLException e) {
            throw new StoreException("store " + name + ": could not be closed: " + oneLine(e), e);
        }
    }
}
