package trapmap.cluster;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.regex.Pattern;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.functions;
import trapmap.maps.batch.FlaggedRegions;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.region.Region;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.WaferRecord;

/**
 * Loads the Parquet tables of an archive inspection ({@link ArchiveJob}) into a results store ({@link ResultsStore}:
 * SQLite file or PostgreSQL) through the store's bulk path {@link ResultsStore#writeAll}, a batch of wafers
 * ({@value #DEFAULT_BATCH} by default) per transaction, stored as {@code inspect --store} stores them one by one: the
 * same result keys (map content, rules and physics settings hashed) and rows, so that loading again, or inspecting the
 * same maps with the same rules with {@code inspect --store}, replaces the wafers instead of adding them. A batch lands
 * whole or not at all; after a failure loading again completes the store. The wafers' rows are gathered in Spark
 * (results with their regions and footprint by file) and streamed to the driver, which writes them (one writer: a
 * store takes one transaction at a time).
 */
public final class StoreLoad {
    /** Wafers per transaction by default: few commits, and a rerun after a failure redoes little. */
    public static final int DEFAULT_BATCH = 500;

    private StoreLoad() {
    }

    /**
     * Loads every wafer of the tables under {@code tables} (the job's output folder), judged by the rules file
     * {@code rulesPath} (its text hashed into the result keys; its physics settings recorded with the run).
     *
     * @return the wafers written
     * @throws RulesException when the rules cannot be read (one line naming the file)
     */
    public static long load(SparkSession spark, String tables, String rulesPath, String store) throws RulesException {
        return load(spark, tables, rulesPath, store, DEFAULT_BATCH);
    }

    /**
     * As {@link #load(SparkSession, String, String, String)}, {@code batch} wafers per transaction (0: one wafer per
     * transaction through {@link ResultsStore#write}, as {@code inspect --store} writes).
     */
    public static long load(SparkSession spark, String tables, String rulesPath, String store, int batch)
            throws RulesException {
        if (batch < 0) {
            throw new IllegalArgumentException("batch " + batch + " wafers: must be 0 or more");
        }
        Loading l = prepare(spark, rulesPath);
        try (ResultsStore s = ResultsStore.open(store)) {
            return load(spark, tables, s, l, batch);
        }
    }

    /** Loads the wafers of the tables under {@code tables} into the open store {@code s}; see {@link #load}. */
    static long load(SparkSession spark, String tables, ResultsStore s, Loading l, int batch) {
        String runId = s.startRun(l.run());
        Iterator<WaferRecord> it = records(spark, tables, l);
        long written = 0;
        List<WaferRecord> pending = new ArrayList<>();
        while (it.hasNext()) {
            WaferRecord w = it.next();
            if (batch == 0) {
                s.write(runId, w);
            } else {
                pending.add(w);
                if (pending.size() == batch) {
                    s.writeAll(runId, pending);
                    pending.clear();
                }
            }
            written++;
        }
        if (!pending.isEmpty()) {
            s.writeAll(runId, pending);
        }
        return written;
    }

    /**
     * What a load needs of the rules file {@code rulesPath}: the run to record, the figures of each profile by name
     * (in the profile's order) and the lot pattern (null for none).
     */
    record Loading(RunInfo run, Map<String, List<String>> figures, Pattern lots) {
    }

    /**
     * Reads the rules file {@code rulesPath} for a load.
     *
     * @throws RulesException when the rules cannot be read (one line naming the file)
     */
    static Loading prepare(SparkSession spark, String rulesPath) throws RulesException {
        String text = ArchiveJob.readRules(rulesPath, spark.sparkContext().hadoopConfiguration());
        Rules rules = Rules.parse(text, rulesPath);
        Pattern lots = LotPattern.parse(text, rulesPath).orElse(null);
        RunManifest.Source source = new RunManifest.Source(trapmap.shared.Version.LINE, rulesPath,
                RunManifest.sha256(text.getBytes(java.nio.charset.StandardCharsets.UTF_8)));
        Map<String, List<String>> figures = new LinkedHashMap<>();
        for (Rules.Profile p : rules.allProfiles()) {
            figures.put(p.name(), p.figures().stream().map(f -> f.name()).toList());
        }
        return new Loading(RunInfo.of(source, rules.physics(), Instant.now()), figures, lots);
    }

    /**
     * The store's records of every wafer of the tables under {@code tables}, joined in Spark (results with their
     * regions and footprint by file) and streamed to the driver one partition at a time.
     */
    static Iterator<WaferRecord> records(SparkSession spark, String tables, Loading l) {
        String out = tables.endsWith("/") ? tables : tables + "/";
        Dataset<Row> results = spark.read().parquet(out + ArchiveJob.RESULTS);
        Dataset<Row> regions = spark.read().parquet(out + ArchiveJob.REGIONS);
        Dataset<Row> footprints = spark.read().parquet(out + ArchiveJob.FOOTPRINTS);
        Dataset<Row> regionLists = regions.groupBy("file").agg(functions.collect_list(functions.struct(
                java.util.Arrays.stream(WaferRows.REGION.fieldNames()).map(functions::col)
                        .toArray(org.apache.spark.sql.Column[]::new))).as("region_list"));
        Dataset<Row> footprintRows = footprints.select(functions.col("file"), functions.struct(
                java.util.Arrays.stream(WaferRows.FOOTPRINT.fieldNames()).map(functions::col)
                        .toArray(org.apache.spark.sql.Column[]::new)).as("fp"));
        Dataset<Row> wafers = results.join(regionLists, "file", "left").join(footprintRows, "file", "left");
        Iterator<Row> rows = wafers.toLocalIterator();
        return new Iterator<>() {
            @Override
            public boolean hasNext() {
                return rows.hasNext();
            }

            @Override
            public WaferRecord next() {
                return record(rows.next(), l.figures(), l.lots());
            }
        };
    }

    /**
     * The store's record of one wafer's joined row; {@code figures}: the figures of each profile by name, in the
     * profile's order (a judged wafer has exactly its profile's, NaN where a figure could not be computed: null in
     * the table).
     */
    static WaferRecord record(Row r, Map<String, List<String>> figures, Pattern lots) {
        Map<String, Double> values = new LinkedHashMap<>();
        if (!"error".equals(r.getAs("status"))) {
            for (String f : figures.getOrDefault(r.<String>getAs("profile"), List.of())) {
                Object v = r.getAs(f);
                values.put(f, v == null ? Double.NaN : (Double) v);
            }
        }
        List<FlaggedRegions.FlaggedRegion> regions = new ArrayList<>();
        int listAt = r.fieldIndex("region_list");
        if (!r.isNullAt(listAt)) {
            List<Row> list = new ArrayList<>(r.getList(listAt));
            list.sort((a, b) -> Integer.compare(a.getInt(0), b.getInt(0)));
            for (Row g : list) {
                regions.add(new FlaggedRegions.FlaggedRegion(new Region(g.getInt(0), g.getInt(1), d(g, "area_mm2"),
                        d(g, "centroid_x_mm"), d(g, "centroid_y_mm"), new Region.BoundsMm(d(g, "min_x_mm"),
                        d(g, "min_y_mm"), d(g, "max_x_mm"), d(g, "max_y_mm")), d(g, "peak"), d(g, "peak_x_mm"),
                        d(g, "peak_y_mm"), d(g, "mean"), d(g, "edge_distance_mm"), g.getAs("centroid_inside"),
                        d(g, "x_mm"), d(g, "y_mm")), d(g, "peak_density_cm3"), d(g, "median_density_cm3")));
            }
        }
        int fpAt = r.fieldIndex("fp");
        // the map's own verdict, as inspect --store keeps it: before an iron pair's is merged into the row
        Row verdict = r;
        if (java.util.Arrays.asList(r.schema().fieldNames()).contains(WaferRows.MAP_VERDICT)
                && !r.isNullAt(r.fieldIndex(WaferRows.MAP_VERDICT))) {
            verdict = r.getStruct(r.fieldIndex(WaferRows.MAP_VERDICT));
        }
        WaferResult result = new WaferResult(r.getAs("file"), r.getAs("wafer_id"),
                WaferResult.Status.valueOf(verdict.<String>getAs("status").toUpperCase(java.util.Locale.ROOT)),
                verdict.getAs("grade"), r.getAs("profile"), r.getAs("defect"), values,
                strings(verdict, "failed_rules"), strings(verdict, "graded_down_by"), regions, r.getAs("error"),
                r.isNullAt(fpAt) ? null : WaferRows.footprint(r.getStruct(fpAt)));
        Map<String, String> attributes = new TreeMap<>();
        int attrAt = r.fieldIndex("attributes");
        if (!r.isNullAt(attrAt)) {
            attributes.putAll(r.getJavaMap(attrAt));
        }
        java.sql.Timestamp measured = r.getAs("measured_at");
        String lot = attributes.get(WaferRecord.LOT);
        if (lot == null || lot.isBlank()) {
            lot = LotPattern.lotOf(lots, result.waferId());
        }
        return new WaferRecord(result, r.getAs("content_sha256"), attributes, lot,
                measured == null ? null : measured.toInstant(), List.of());
    }

    private static double d(Row g, String column) {
        Object v = g.getAs(column);
        return v == null ? Double.NaN : (Double) v;
    }

    private static List<String> strings(Row r, String column) {
        int at = r.fieldIndex(column);
        return r.isNullAt(at) ? List.of() : List.copyOf(r.<String>getList(at));
    }
}
