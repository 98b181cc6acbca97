package trapmap.cluster;

import java.io.IOException;
import java.io.PrintWriter;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.apache.spark.sql.SparkSession;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import trapmap.maps.batch.RulesException;
import trapmap.maps.model.Caution;

/**
 * {@code spark-submit --class trapmap.cluster.ArchiveInspect trapmap-cluster.jar --input PATH --rules R.json
 * --output PATH [--partition-by day|lot] [--store S [--store-batch N]]}: judges an archive of maps as
 * {@code inspect} judges a folder, on Spark ({@link ArchiveJob}), and loads the tables into a results store ({@link StoreLoad}). Exit status 0 when
 * every map was judged or turned into an error row, 2 for invalid arguments or rules (one line naming the option or
 * file), 3 when the job failed, 4 when the store could not be written.
 */
@Command(name = "trapmap-cluster", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Judges an archive of wafer maps (local, HDFS or object-storage paths) with the rules of"
                + " inspect on Apache Spark, and writes the results, flagged regions and footprints as Parquet tables"
                + " (OUTPUT/results, OUTPUT/regions, OUTPUT/footprints) partitioned by day or lot.",
                "Caution: " + Caution.TEXT},
        footer = {"", "Exit codes: 0 every map judged (bad files become error rows); 2 invalid arguments or rules;"
                + " 3 the job failed; 4 the tables were written but could not be loaded into the store."})
public final class ArchiveInspect implements Callable<Integer> {
    @Option(names = "--input", required = true, paramLabel = "PATH",
            description = "a map file or a folder of maps (.tif, .tiff, .csv with their .json sidecars); repeatable;"
                    + " any Hadoop path (file:, hdfs:, s3a:, ...)")
    List<String> inputs;

    @Option(names = "--rules", required = true, paramLabel = "R.json", description = "the rules file, as for inspect")
    String rules;

    @Option(names = "--output", required = true, paramLabel = "PATH",
            description = "the output folder of the Parquet tables")
    String output;

    @Option(names = "--partition-by", paramLabel = "day|lot", defaultValue = "day",
            description = "the partition column: the UTC day of the sidecar's measured_at, or the lot (default: ${DEFAULT-VALUE})")
    String partitionBy;

    @Option(names = "--recursive", description = "also read the maps in the folders below each input folder")
    boolean recursive;

    @Option(names = "--master", paramLabel = "URL",
            description = "the Spark master, e.g. local[*] to run on this machine without a cluster (default: what"
                    + " spark-submit sets, else local[*])")
    String master;

    @Option(names = "--store", paramLabel = "STORE",
            description = "also load the output's tables into a results store (a SQLite file, or"
                    + " postgresql://host[:port]/db with PGUSER/PGPASSWORD), as inspect --store stores wafers")
    String store;

    @Option(names = "--store-batch", paramLabel = "N", defaultValue = "" + StoreLoad.DEFAULT_BATCH,
            description = "wafers per store transaction when loading (default: ${DEFAULT-VALUE}); a batch lands whole or"
                    + " not at all, and loading again completes it; 0: one transaction per wafer")
    int storeBatch;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    public static void main(String[] args) {
        System.exit(run(args));
    }

    /** Runs the command line; returns the exit status. */
    public static int run(String... args) {
        CommandLine cl = new CommandLine(new ArchiveInspect());
        cl.setExecutionExceptionHandler((e, line, parsed) -> {
            line.getErr().println("trapmap-cluster: " + oneLine(e));
            return 3;
        });
        return cl.execute(args);
    }

    private static String oneLine(Throwable e) {
        String m = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        return m.replaceAll("\\s*\\R\\s*", " ").trim();
    }

    @Override
    public Integer call() {
        PrintWriter err = spec.commandLine().getErr();
        PrintWriter out = spec.commandLine().getOut();
        PartitionKey key;
        try {
            key = PartitionKey.valueOf(partitionBy.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            err.println("trapmap-cluster: --partition-by: '" + partitionBy + "' is not a partition column; expected"
                    + " day or lot");
            return 2;
        }
        if (storeBatch < 0) {
            err.println("trapmap-cluster: --store-batch: " + storeBatch + " wafers; give 0 or more");
            return 2;
        }
        SparkSession.Builder builder = SparkSession.builder().appName("trapmap archive inspection");
        if (master != null) {
            builder.master(master);
        } else if (System.getProperty("spark.master") == null) {
            builder.master("local[*]");
        }
        SparkSession spark = builder.getOrCreate();
        try {
            ArchiveJob.Outcome o = ArchiveJob.run(spark, new ArchiveJob.Request(inputs, rules, output, key,
                    recursive));
            out.println(o.total() + " maps: " + o.pass() + " pass, " + o.fail() + " fail, " + o.error() + " error;"
                    + " Parquet tables partitioned by " + key.column() + ": " + o.results() + ", " + o.regions()
                    + ", " + o.footprints());
            if (store != null) {
                long n = StoreLoad.load(spark, output, rules, store, storeBatch);
                out.println(n + " wafers loaded into the results store " + store);
            }
            out.println("Caution: " + Caution.TEXT);
            return 0;
        } catch (RulesException e) {
            err.println("trapmap-cluster: --rules " + e.getMessage());
            return 2;
        } catch (trapmap.store.StoreException e) {
            err.println("trapmap-cluster: --store " + oneLine(e));
            return 4;
        } catch (IOException e) {
            err.println("trapmap-cluster: " + oneLine(e));
            return 2;
        } finally {
            spark.stop();
        }
    }
}
