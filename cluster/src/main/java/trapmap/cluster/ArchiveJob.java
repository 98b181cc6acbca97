package trapmap.cluster;

import java.io.FileNotFoundException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.FileStatus;
import org.apache.hadoop.fs.FileSystem;
import org.apache.spark.SerializableWritable;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.FlatMapFunction;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.DataFrameReader;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Encoders;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SaveMode;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.functions;
import org.apache.spark.storage.StorageLevel;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.InspectionBuffers;
import trapmap.maps.batch.IronPairs;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.model.WaferMap;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.ReadOptions;
import trapmap.maps.io.Sidecar;
import trapmap.maps.io.InputFiles;

/**
 * The archive inspection on Spark: lists the maps of the inputs with Spark's binary-file source (any
 * Hadoop-compatible path: local, HDFS, object storage), judges each in the executors with the rules shipped once
 * ({@link Shipment}, a broadcast) by the very {@code WaferInspection} that {@code inspect} runs, and writes three
 * Parquet tables under the output, partitioned by {@link PartitionKey}: {@code results} (one row per map, the
 * columns of {@code results.csv}), {@code regions} (one row per flagged region) and {@code footprints} (one row per
 * judged wafer). A map that cannot be read or judged is an {@code error} row, as in {@code inspect}. Maps judged
 * together are judged together: a stack's other levels are fetched beside its first level's map ({@link #levels}); the
 * FeB/Fe_i pairs of an {@code iron} section are matched on the listed paths ({@link #partners}), judged in the
 * executors by the batch's iron step ({@link Iron}) and merged into the rows ({@link MergeIron}).
 *
 * <p>Writes are idempotent: each table is written with Spark's file commit protocol (a retried or speculative task's
 * files are never committed twice) in dynamic partition-overwrite mode, so a run replaces the partitions it writes
 * and leaves the others; running again over the same maps gives the same tables, not duplicates.
 */
public final class ArchiveJob {
    /** The tables under the output path. */
    public static final String RESULTS = "results";
    public static final String REGIONS = "regions";
    public static final String FOOTPRINTS = "footprints";
    public static final String RECURRENCE = ArchiveRecurrence.RECURRENCE;
    public static final String HOTSPOTS = ArchiveRecurrence.HOTSPOTS;

    /** The map files of a folder, as {@code inspect} takes them from a folder (by extension). */
    static final String MAP_GLOB = "*.{tif,tiff,csv,TIF,TIFF,CSV,Tif,Tiff,Csv}";

    /**
     * What to run.
     *
     * @param inputs    map files or folders (paths or URIs); a folder gives its map files, and those of its sub-folders
     *                  with {@code recursive}
     * @param rules     the rules file (path or URI)
     * @param output    the output folder (path or URI)
     * @param key       the partition column
     * @param recursive whether folders are read with their sub-folders
     */
    public record Request(List<String> inputs, String rules, String output, PartitionKey key, boolean recursive) {
        public Request {
            inputs = List.copyOf(inputs);
        }
    }

    /**
     * What a run did: wafers by status, the tables written, and the recurrence of the wafers of the footprints table
     * (also written as {@code recurrence} and {@code hotspots}).
     */
    public record Outcome(long pass, long fail, long error, String results, String regions, String footprints,
                          ArchiveRecurrence.Outcome recurrence) {
        public long total() {
            return pass + fail + error;
        }
    }

    private ArchiveJob() {
    }

    /**
     * Runs the inspection.
     *
     * @throws RulesException when the rules cannot be read or judged by the cluster job (one line, naming the file)
     * @throws IOException    when an input cannot be listed or the rules file cannot be read
     */
    public static Outcome run(SparkSession spark, Request request) throws RulesException, IOException {
        Configuration conf = spark.sparkContext().hadoopConfiguration();
        Shipment shipment = new Shipment(readRules(request.rules(), conf), request.rules());
        Shipment.Judge judge = shipment.parse(); // checked here, once, before any executor starts
        WaferRows rows = new WaferRows(judge.rules(), judge.iron());
        JavaSparkContext jsc = JavaSparkContext.fromSparkContext(spark.sparkContext());
        Broadcast<Shipment> rulesShipped = jsc.broadcast(shipment);
        Broadcast<SerializableWritable<Configuration>> confShipped = jsc.broadcast(new SerializableWritable<>(conf));

        Dataset<Row> files = listing(spark, request, conf);
        JavaRDD<Row> inspected = files.select("path", "content").javaRDD()
                .mapPartitions(new Inspect(rulesShipped, confShipped, rows));
        Dataset<Row> alone = spark.createDataFrame(inspected, rows.schema()).persist(StorageLevel.MEMORY_AND_DISK());
        Dataset<Row> wafers = alone;
        if (judge.iron() != null) {
            // the FeB/Fe_i pairs: matched on the listed paths, judged in the executors, merged into the rows
            Dataset<Row> pairs = partners(spark, files.select("path"), rulesShipped);
            Dataset<Row> iron = spark.createDataFrame(pairs.javaRDD().mapPartitions(new Iron(rulesShipped,
                    confShipped)), IRON);
            Column[] both = new Column[rows.schema().size() + 2];
            for (int i = 0; i < rows.schema().size(); i++) {
                both[i] = alone.col(rows.schema().fieldNames()[i]);
            }
            both[both.length - 2] = iron.col("pair_text");
            both[both.length - 1] = iron.col("pair_values");
            JavaRDD<Row> merged = alone.join(iron, alone.col("file").equalTo(iron.col("pair_file")), "left_outer")
                    .select(both).javaRDD().mapPartitions(new MergeIron(rulesShipped, rows));
            wafers = spark.createDataFrame(merged, rows.schema()).persist(StorageLevel.MEMORY_AND_DISK());
        }
        try {
            String key = request.key().column();
            String out = request.output().endsWith("/") ? request.output() : request.output() + "/";
            Dataset<Row> results = wafers.drop(WaferRows.REGIONS, WaferRows.FOOTPRINT_COLUMN);
            Dataset<Row> regions = wafers.select(functions.col("file"), functions.col("wafer_id"),
                            functions.col(key), functions.explode(functions.col(WaferRows.REGIONS)).as("r"))
                    .select(regionColumns(key));
            Dataset<Row> footprints = wafers.where(functions.col(WaferRows.FOOTPRINT_COLUMN).isNotNull())
                    .select(functions.col("file"), functions.col("wafer_id"), functions.col(key),
                            functions.col(WaferRows.FOOTPRINT_COLUMN + ".*"));
            write(results, key, out + RESULTS);
            write(regions, key, out + REGIONS);
            write(footprints, key, out + FOOTPRINTS);
            // the recurrence of every wafer the footprints table now holds (earlier runs' partitions too)
            ArchiveRecurrence.Outcome recurrence = ArchiveRecurrence.aggregate(spark.read().parquet(out + FOOTPRINTS));
            ArchiveRecurrence.write(spark, recurrence, out);
            long pass = 0;
            long fail = 0;
            long error = 0;
            for (Row r : wafers.groupBy("status").count().collectAsList()) {
                switch (WaferResult.Status.valueOf(r.getString(0).toUpperCase(java.util.Locale.ROOT))) {
                    case PASS -> pass = r.getLong(1);
                    case FAIL -> fail = r.getLong(1);
                    case ERROR -> error = r.getLong(1);
                }
            }
            return new Outcome(pass, fail, error, out + RESULTS, out + REGIONS, out + FOOTPRINTS, recurrence);
        } finally {
            wafers.unpersist();
            alone.unpersist();
            rulesShipped.destroy();
            confShipped.destroy();
        }
    }

    private static Column[] regionColumns(String key) {
        List<Column> c = new ArrayList<>(List.of(functions.col("file"), functions.col("wafer_id")));
        for (String f : WaferRows.REGION.fieldNames()) {
            c.add(functions.col("r." + f).as(f));
        }
        c.add(functions.col(key));
        return c.toArray(Column[]::new);
    }

    /** Writes a table partitioned by {@code key}, replacing only the partitions this run writes. */
    private static void write(Dataset<Row> table, String key, String path) {
        table.write().mode(SaveMode.Overwrite).option("partitionOverwriteMode", "dynamic").partitionBy(key)
                .parquet(path);
    }

    /**
     * The map files of the inputs as Spark's binary-file source reads them ({@code path}, {@code content}, ...): a
     * folder's map files by extension (with {@code recursive} also those below it), a file as it is; the batch's own
     * outputs ({@link BatchInspection#isOutputName}) left out, as {@code inspect} leaves them out.
     */
    static Dataset<Row> listing(SparkSession spark, Request request, Configuration conf) throws IOException {
        List<String> paths = new ArrayList<>();
        for (String in : request.inputs()) {
            org.apache.hadoop.fs.Path p = new org.apache.hadoop.fs.Path(in);
            FileStatus st;
            try {
                st = p.getFileSystem(conf).getFileStatus(p);
            } catch (FileNotFoundException e) {
                throw new IOException("input " + in + " does not exist", e);
            }
            if (st.isDirectory() && !request.recursive()) {
                org.apache.hadoop.fs.Path glob = new org.apache.hadoop.fs.Path(p, MAP_GLOB);
                FileStatus[] found = p.getFileSystem(conf).globStatus(glob);
                if (found == null || found.length == 0) {
                    throw new IOException("no map files (.tif, .tiff, .csv) in " + in
                            + "; use --recursive for the folders below it");
                }
                paths.add(glob.toString());
            } else {
                paths.add(in);
            }
        }
        DataFrameReader reader = spark.read().format("binaryFile");
        if (request.recursive()) {
            reader = reader.option("recursiveFileLookup", "true").option("pathGlobFilter", MAP_GLOB);
        }
        Dataset<Row> listed = reader.load(paths.toArray(String[]::new));
        Dataset<Row> files = mapsOnly(listed).select("path", "content");
        // Spark's file scan skips files of no bytes; inspect gives them an error row ("is empty"), so they are
        // found among the listed files (path strings only, no content read) and judged from no bytes
        List<String> listedPaths = new ArrayList<>();
        for (String uri : listed.inputFiles()) { // URIs (file:///a); the path column holds Hadoop paths (file:/a)
            listedPaths.add(new org.apache.hadoop.fs.Path(java.net.URI.create(uri)).toString());
        }
        Dataset<Row> empty = mapsOnly(spark.createDataset(listedPaths, Encoders.STRING()).toDF("path"))
                .except(files.select("path"))
                .withColumn("content", functions.lit(new byte[0]));
        return files.unionByName(empty);
    }

    /** The rows of map files: the batch's own outputs ({@link BatchInspection#isOutputName}) left out. */
    private static Dataset<Row> mapsOnly(Dataset<Row> files) {
        return files.where(functions.not(functions.regexp_extract(functions.col("path"), "([^/]*)$", 1)
                .isin(OUTPUT_NAMES.toArray())).and(functions.not(functions.col("path").rlike(
                        "/recurrence-[^/]*$|\\.(partial|new|tmp)$"))));
    }

    /** The fixed names of a batch's output files ({@link BatchInspection#isOutputName} names the patterns too). */
    private static final List<String> OUTPUT_NAMES = List.of(BatchInspection.CSV_NAME, BatchInspection.PARTIAL_NAME,
            BatchInspection.JSON_NAME, BatchInspection.FOOTPRINTS_NAME, BatchInspection.REGIONS_NAME,
            BatchInspection.RECURRENCE_NAME);

    /** The rules file's text (UTF-8, within the JSON size limit), from any Hadoop-compatible path. */
    static String readRules(String rules, Configuration conf) throws RulesException {
        org.apache.hadoop.fs.Path p = new org.apache.hadoop.fs.Path(rules);
        try {
            FileSystem fs = p.getFileSystem(conf);
            FileStatus st = fs.getFileStatus(p);
            if (!st.isFile()) {
                throw new RulesException(rules + ": rules file is not a regular file");
            }
            if (st.getLen() > InputFiles.JSON_MAX_BYTES) {
                throw new RulesException(rules + ": rules file " + InputFiles.tooLarge(st.getLen(),
                        InputFiles.JSON_MAX_BYTES));
            }
            try (InputStream in = fs.open(p)) {
                return StandardCharsets.UTF_8.newDecoder()
                        .decode(java.nio.ByteBuffer.wrap(in.readAllBytes())).toString();
            }
        } catch (FileNotFoundException e) {
            throw new RulesException(rules + ": no such rules file");
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new RulesException(rules + ": rules file is not UTF-8 text");
        } catch (IOException e) {
            throw new RulesException(rules + ": cannot read the rules file (" + e.getMessage() + ")");
        }
    }

    /**
     * Told each map's name before an executor judges it, in local mode only (a test's way to fail a task attempt and
     * see Spark run it again); null: nothing.
     */
    static volatile java.util.function.Consumer<String> beforeEachMap;

    /** The executors' work: each map of a partition judged, one row each. */
    static final class Inspect implements FlatMapFunction<Iterator<Row>, Row> {
        private static final long serialVersionUID = 1L;
        private final Broadcast<Shipment> rules;
        private final Broadcast<SerializableWritable<Configuration>> conf;
        private final WaferRows rows;

        Inspect(Broadcast<Shipment> rules, Broadcast<SerializableWritable<Configuration>> conf, WaferRows rows) {
            this.rules = rules;
            this.conf = conf;
            this.rows = rows;
        }

        @Override
        public Iterator<Row> call(Iterator<Row> files) {
            Shipment.Judge judge = rules.value().judge();
            Configuration c = conf.value().value();
            boolean stacks = judge.hasStacks();
            InspectionBuffers buffers = new InspectionBuffers(); // reused from map to map, as a batch worker does
            return new Iterator<>() {
                @Override
                public boolean hasNext() {
                    return files.hasNext();
                }

                @Override
                public Row next() {
                    Row f = files.next();
                    String name = f.getString(0);
                    java.util.function.Consumer<String> hook = beforeEachMap;
                    if (hook != null) {
                        hook.accept(name);
                    }
                    byte[] content = (byte[]) f.get(1);
                    SidecarBytes sidecar = sidecar(name, c);
                    // a stack's other levels are read from beside the map, as inspect reads them
                    WaferInspection inspection = stacks ? new WaferInspection(judge.rules(), levels(name, c))
                            : judge.inspection();
                    WaferResult r = inspection.inspect(name, () -> {
                        if (sidecar.failure() != null) {
                            throw sidecar.failure();
                        }
                        return MapFiles.readSingle(name, content, sidecar.name(), sidecar.bytes(),
                                ReadOptions.DEFAULTS);
                    }, buffers);
                    return rows.row(r, new WaferRows.Facts(sha256(content), facts(sidecar)), judge.lotPattern());
                }
            };
        }
    }

    /**
     * The reader of the levels of an injection stack whose first level is the map {@code name}: each level (named
     * by {@code StackFigures} beside the map) fetched from the map's folder through its file system with its sidecar,
     * read by {@link MapFiles#readSingle(String, byte[], String, byte[], ReadOptions)}.
     */
    static WaferInspection.MapReader levels(String name, Configuration conf) {
        org.apache.hadoop.fs.Path folder = new org.apache.hadoop.fs.Path(name).getParent();
        return level -> readMap(new org.apache.hadoop.fs.Path(folder, level.getFileName().toString()), conf);
    }

    /**
     * The map in {@code file} with its sidecar, fetched through the file's file system; a file that is not there or
     * not a regular file gives the reason {@code MapFiles.readSingle(Path)} gives.
     */
    static WaferMap readMap(org.apache.hadoop.fs.Path file, Configuration conf) throws IOException {
        String name = file.toString();
        byte[] content;
        try {
            FileSystem fs = file.getFileSystem(conf);
            FileStatus st = fs.getFileStatus(file);
            if (!st.isFile()) {
                throw new MapFormatException(name, null, "is " + (st.isDirectory() ? "a directory"
                        : "a FIFO, socket or device") + ", not a regular file");
            }
            try (InputStream in = fs.open(file)) {
                content = in.readAllBytes();
            }
        } catch (FileNotFoundException e) {
            throw new MapFormatException(name, null, "no such file", "", e);
        }
        SidecarBytes sidecar = sidecar(name, conf);
        if (sidecar.failure() != null) {
            throw sidecar.failure();
        }
        return MapFiles.readSingle(name, content, sidecar.name(), sidecar.bytes(), ReadOptions.DEFAULTS);
    }

    /** The rows of the iron step: a listed file's iron columns as text and their numbers. */
    static final StructType IRON = new StructType(new StructField[] {
        DataTypes.createStructField("pair_file", DataTypes.StringType, false),
        DataTypes.createStructField("pair_text", DataTypes.createMapType(DataTypes.StringType,
                DataTypes.StringType, false), false),
        DataTypes.createStructField("pair_values", DataTypes.createMapType(DataTypes.StringType,
                DataTypes.DoubleType, false), false)});

    /** Path expressions on a path column: its file name and its folder. */
    private static Column nameOf(Column path) {
        return functions.regexp_extract(path, "([^/]*)$", 1);
    }

    private static Column folderOf(Column path) {
        return functions.regexp_replace(path, "/[^/]*$", "");
    }

    /**
     * The members of FeB/Fe_i pairs among the listed {@code paths} ({@code path, name, partner}): each file whose
     * name matches a state's glob with the partner the batch's {@code IronPairs} would take: the listed file of the
     * partner's name in the same folder, else the first by path of that name in another; null when none is listed.
     */
    static Dataset<Row> partners(SparkSession spark, Dataset<Row> paths, Broadcast<Shipment> rules) {
        StructType wanted = new StructType(new StructField[] {
            DataTypes.createStructField("path", DataTypes.StringType, false),
            DataTypes.createStructField("want", DataTypes.StringType, false)});
        Dataset<Row> members = spark.createDataFrame(paths.javaRDD().mapPartitions(
                (FlatMapFunction<Iterator<Row>, Row>) it -> {
                    trapmap.maps.batch.IronPairRules iron = rules.value().judge().iron();
                    List<Row> out = new ArrayList<>();
                    while (it.hasNext()) {
                        String path = it.next().getString(0);
                        String name = path.substring(path.lastIndexOf('/') + 1);
                        // the FeB-state glob first, as IronPairs looks
                        java.util.Optional<String> want = iron.feiNameFor(name).or(() -> iron.febNameFor(name));
                        want.ifPresent(w -> out.add(org.apache.spark.sql.RowFactory.create(path, w)));
                    }
                    return out.iterator();
                }), wanted);
        Dataset<Row> listed = paths.select(functions.col("path").as("p_path"),
                nameOf(functions.col("path")).as("p_name"), folderOf(functions.col("path")).as("p_folder"));
        Column rank = functions.when(functions.col("p_folder").equalTo(folderOf(functions.col("path"))), 0)
                .otherwise(1);
        return members.join(listed, members.col("want").equalTo(listed.col("p_name")), "left_outer")
                .groupBy(functions.col("path"))
                .agg(functions.min(functions.struct(rank.as("rank"), functions.col("p_path").as("partner")))
                        .as("best"))
                .select(functions.col("path"), nameOf(functions.col("path")).as("name"),
                        functions.col("best.partner").as("partner"));
    }

    /** The executors' iron step: each pair member's columns by the batch's {@link IronPairs#evaluate}. */
    static final class Iron implements FlatMapFunction<Iterator<Row>, Row> {
        private static final long serialVersionUID = 1L;
        private final Broadcast<Shipment> rules;
        private final Broadcast<SerializableWritable<Configuration>> conf;

        Iron(Broadcast<Shipment> rules, Broadcast<SerializableWritable<Configuration>> conf) {
            this.rules = rules;
            this.conf = conf;
        }

        @Override
        public Iterator<Row> call(Iterator<Row> members) {
            Shipment.Judge judge = rules.value().judge();
            Configuration c = conf.value().value();
            return new Iterator<>() {
                @Override
                public boolean hasNext() {
                    return members.hasNext();
                }

                @Override
                public Row next() {
                    Row m = members.next();
                    String path = m.getString(0);
                    String partner = m.isNullAt(2) ? null : m.getString(2);
                    IronPairs.Evaluation e = IronPairs.evaluate(judge.iron(), judge.rules(), m.getString(1), path,
                            wanted -> partner, file -> readMap(new org.apache.hadoop.fs.Path(file), c));
                    return org.apache.spark.sql.RowFactory.create(path,
                            scala.jdk.javaapi.CollectionConverters.asScala(e.columns()),
                            scala.jdk.javaapi.CollectionConverters.asScala(e.values()));
                }
            };
        }
    }

    /** Merges each row's iron columns ({@link WaferRows#withIron}); a row without any keeps its verdict. */
    static final class MergeIron implements FlatMapFunction<Iterator<Row>, Row> {
        private static final long serialVersionUID = 1L;
        private final Broadcast<Shipment> rules;
        private final WaferRows rows;

        MergeIron(Broadcast<Shipment> rules, WaferRows rows) {
            this.rules = rules;
            this.rows = rows;
        }

        @Override
        public Iterator<Row> call(Iterator<Row> joined) {
            Rules r = rules.value().judge().rules();
            return new Iterator<>() {
                @Override
                public boolean hasNext() {
                    return joined.hasNext();
                }

                @Override
                public Row next() {
                    Row j = joined.next();
                    int at = j.size() - 2;
                    IronPairs.Evaluation e = j.isNullAt(at) ? null
                            : new IronPairs.Evaluation(j.getJavaMap(at), j.getJavaMap(at + 1));
                    return rows.withIron(j, e, r);
                }
            };
        }
    }

    /** The sidecar's condition facts ({@code lot}, {@code measured_at}, ...); none when it is absent or unreadable. */
    static Map<String, String> facts(SidecarBytes sidecar) {
        if (sidecar.bytes() == null) {
            return Map.of();
        }
        try {
            return Sidecar.parse(sidecar.bytes(), sidecar.name()).conditions().extra();
        } catch (MapFormatException | RuntimeException e) {
            return Map.of(); // the inspection tells the sidecar's problem in the wafer's error
        }
    }

    /**
     * The sidecar beside the map {@code name} ({@link MapFiles#sidecarOf}'s rule: the same folder and stem,
     * {@code .json}), fetched through its file system: its bytes, none when there is no such file, or the failure
     * the map's reading reports (a folder, or more than {@link Sidecar#MAX_BYTES}).
     */
    static SidecarBytes sidecar(String name, Configuration conf) {
        org.apache.hadoop.fs.Path map = new org.apache.hadoop.fs.Path(name);
        String file = map.getName();
        int dot = file.lastIndexOf('.');
        org.apache.hadoop.fs.Path side = new org.apache.hadoop.fs.Path(map.getParent(),
                (dot <= 0 ? file : file.substring(0, dot)) + ".json");
        String sideName = side.toString();
        if (file.toLowerCase(java.util.Locale.ROOT).endsWith(".json")) {
            return new SidecarBytes(sideName, null, null);
        }
        try {
            FileSystem fs = side.getFileSystem(conf);
            FileStatus st = fs.getFileStatus(side);
            if (!st.isFile()) {
                return new SidecarBytes(sideName, null, new MapFormatException(sideName, null, "the sidecar of "
                        + file + " is " + (st.isDirectory() ? "a directory" : "a FIFO, socket or device")
                        + ", not a regular file; remove or rename it"));
            }
            if (st.getLen() > Sidecar.MAX_BYTES) {
                return new SidecarBytes(sideName, null, new MapFormatException(sideName, null, "sidecar "
                        + InputFiles.tooLarge(st.getLen(), Sidecar.MAX_BYTES)));
            }
            try (InputStream in = fs.open(side)) {
                return new SidecarBytes(sideName, in.readAllBytes(), null);
            }
        } catch (FileNotFoundException e) {
            return new SidecarBytes(sideName, null, null);
        } catch (IOException e) {
            return new SidecarBytes(sideName, null, new MapFormatException(sideName, null,
                    "cannot read the sidecar (" + e.getMessage() + ")", "", e));
        }
    }

    /**
     * A map's sidecar as fetched: its path or URI, its bytes (null: none), or the failure its reading reports.
     */
    record SidecarBytes(String name, byte[] bytes, MapFormatException failure) {
    }

    /** SHA-256 of the map's bytes, lower-case hex (as the results store keeps it). */
    static String sha256(byte[] content) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(content));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is missing from this Java runtime", e);
        }
    }
}
