package trapmap.cluster;

import java.lang.management.ManagementFactory;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.function.Supplier;
import org.apache.spark.sql.SparkSession;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.WaferResult;
import trapmap.store.PostgresServer;
import trapmap.store.ResultsStore;
import trapmap.store.WaferRecord;

/**
 * Benchmark of loading an archive job's tables into a results store (not a unit test; {@code scripts/bench-store}).
 *
 * <p>Usage: {@code StoreLoadBench TABLES RULES sqlite|postgresql REPEATS BATCH[,BATCH...] COPIES [WORKDIR]}. Gathers
 * the wafers' records from the tables in Spark (local[1], timed), takes them COPIES times (each copy under other result
 * keys: its map content hash rehashed, so that the store holds COPIES times the wafers), then for each batch size and
 * repeat writes them all
 * into a fresh store (a new SQLite file under WORKDIR, or a new database on a throw-away PostgreSQL server) and again
 * (a rerun: every wafer replaced), timing the writes alone: wall, this process's CPU and, for PostgreSQL, the server's
 * CPU (its processes' user + system time from /proc). Batch 0 is the per-wafer path ({@link ResultsStore#write}, one
 * transaction per wafer, as {@code inspect --store}); N > 0 the bulk path ({@link ResultsStore#writeAll}, N wafers per
 * transaction). Last, one whole {@link StoreLoad#load} of the tables (one copy) per batch size (Spark's join and
 * streaming included). Prints medians.
 */
public final class StoreLoadBench {
    private StoreLoadBench() {
    }

    public static void main(String[] args) throws Exception {
        if (args.length < 6) {
            System.err.println("usage: StoreLoadBench TABLES RULES sqlite|postgresql REPEATS BATCH[,BATCH...] COPIES"
                    + " [WORKDIR]");
            System.exit(2);
        }
        String tables = args[0];
        String rules = args[1];
        boolean pg = args[2].equals("postgresql");
        int repeats = Integer.parseInt(args[3]);
        int[] batches = Arrays.stream(args[4].split(",")).mapToInt(Integer::parseInt).toArray();
        int copies = Integer.parseInt(args[5]);
        Path work = Files.createDirectories(Path.of(args.length > 6 ? args[6] : "/tmp/trapmap-bench-store"));
        SparkSession spark = LocalSpark.start("local[1]");
        PostgresServer server = pg ? PostgresServer.start() : null;
        if (server != null && server.skipped() != null) {
            throw new IllegalStateException("no PostgreSQL server: " + server.skipped());
        }
        try {
            StoreLoad.Loading l = StoreLoad.prepare(spark, rules);
            List<WaferRecord> records = new ArrayList<>();
            double[] gather = new double[2];
            for (int i = 0; i < Math.max(2, repeats); i++) { // the first warms Spark up
                records.clear();
                long w = System.nanoTime();
                long c = cpu();
                for (Iterator<WaferRecord> it = StoreLoad.records(spark, tables, l); it.hasNext(); ) {
                    records.add(it.next());
                }
                gather = new double[] {(System.nanoTime() - w) / 1e9, (cpu() - c) / 1e9};
            }
            List<WaferRecord> real = List.copyOf(records);
            for (int k = 1; k < copies; k++) { // the same wafers under other result keys: another map content hash
                for (WaferRecord w : real) {
                    records.add(new WaferRecord(w.result(), WaferRecord.sha256(w.contentSha256() + "/copy " + k),
                            w.attributes(), w.lot(), w.measuredAt(), w.warnings()));
                }
            }
            long rows = records.stream().mapToLong(StoreLoadBench::rows).sum();
            System.out.printf(Locale.ROOT, "%d wafers (%d of the tables x %d), %d rows in 7 tables (%.1f rows per"
                    + " wafer); store %s; %d processors, load %s%n", records.size(), real.size(), copies, rows,
                    rows / (double) records.size(), args[2],
                    Runtime.getRuntime().availableProcessors(), Files.readString(Path.of("/proc/loadavg")).trim());
            System.out.printf(Locale.ROOT, "gather in Spark (join, stream, records), last of warm runs: %.3f s wall,"
                    + " %.3f s CPU%n", gather[0], gather[1]);
            int[] n = {0};
            Supplier<String> fresh = () -> {
                try {
                    return pg ? server.newDatabase() : work.resolve("bench-" + ProcessHandle.current().pid() + "-"
                            + (++n[0]) + ".db").toString();
                } catch (java.sql.SQLException e) {
                    throw new IllegalStateException(e);
                }
            };
            for (int batch : batches) {
                double[][] first = new double[repeats][];
                double[][] again = new double[repeats][];
                for (int r = 0; r < repeats; r++) {
                    String url = fresh.get();
                    try (ResultsStore s = open(server, url)) {
                        first[r] = timed(server, () -> write(s, l, records, batch));
                        again[r] = timed(server, () -> write(s, l, records, batch));
                    }
                    if (!pg) {
                        deleteDb(url);
                    }
                }
                report("batch " + batch + " first load", first, records.size(), rows);
                report("batch " + batch + " rerun (replace)", again, records.size(), rows);
            }
            for (int batch : batches) {
                String url = fresh.get();
                double[][] whole = new double[1][];
                try (ResultsStore s = open(server, url)) {
                    whole[0] = timed(server, () -> {
                        try {
                            StoreLoad.load(spark, tables, s, StoreLoad.prepare(spark, rules), batch);
                        } catch (trapmap.maps.batch.RulesException e) {
                            throw new IllegalStateException(e);
                        }
                    });
                }
                if (!pg) {
                    deleteDb(url);
                }
                report("batch " + batch + " whole StoreLoad.load", whole, real.size(),
                        real.stream().mapToLong(StoreLoadBench::rows).sum());
            }
        } finally {
            spark.stop();
            if (server != null) {
                server.close();
            }
        }
    }

    private static ResultsStore open(PostgresServer server, String url) {
        return server == null ? ResultsStore.open(url) : server.open(url, Clock.systemUTC());
    }

    private static void deleteDb(String file) throws java.io.IOException {
        for (String suffix : List.of("", "-wal", "-shm")) {
            Files.deleteIfExists(Path.of(file + suffix));
        }
    }

    /** Writes every record under a new run: batch 0 one wafer per transaction, else {@code batch} per transaction. */
    private static void write(ResultsStore s, StoreLoad.Loading l, List<WaferRecord> records, int batch) {
        String run = s.startRun(l.run());
        if (batch == 0) {
            for (WaferRecord w : records) {
                s.write(run, w);
            }
        } else {
            for (int i = 0; i < records.size(); i += batch) {
                s.writeAll(run, records.subList(i, Math.min(records.size(), i + batch)));
            }
        }
    }

    /** The rows a wafer takes in the store's seven tables. */
    static long rows(WaferRecord w) {
        WaferResult r = w.result();
        Footprint f = r.footprint();
        return 1 + r.figures().size() + r.failed().size() + w.attributes().size() + r.regions().size()
                + (f == null ? 0 : 1 + f.flagged().cardinality());
    }

    /** {wall s, client CPU s, server CPU s (NaN without a server)} of {@code task}. */
    private static double[] timed(PostgresServer server, Runnable task) throws Exception {
        double s0 = serverCpu(server);
        long c = cpu();
        long w = System.nanoTime();
        task.run();
        double wall = (System.nanoTime() - w) / 1e9;
        return new double[] {wall, (cpu() - c) / 1e9, serverCpu(server) - s0};
    }

    private static long cpu() {
        return ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean())
                .getProcessCpuTime();
    }

    /**
     * The CPU seconds (user + system) the server's processes have used: the postmaster's own and its reaped
     * children's, and its live children's (the backends).
     */
    private static double serverCpu(PostgresServer server) throws Exception {
        if (server == null) {
            return Double.NaN;
        }
        Path pidFile = server.base().resolve("data").resolve("postmaster.pid");
        if (!Files.isReadable(pidFile)) {
            return Double.NaN;
        }
        long master = Long.parseLong(Files.readAllLines(pidFile).get(0).trim());
        long ticks = 0;
        try (var procs = Files.list(Path.of("/proc"))) {
            for (Path p : procs.filter(p -> p.getFileName().toString().matches("\\d+")).toList()) {
                String stat;
                try {
                    stat = Files.readString(p.resolve("stat"));
                } catch (java.io.IOException e) {
                    continue; // ended meanwhile
                }
                String[] f = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
                long pid = Long.parseLong(p.getFileName().toString());
                long ppid = Long.parseLong(f[1]);
                if (pid == master) {
                    ticks += Long.parseLong(f[11]) + Long.parseLong(f[12]) + Long.parseLong(f[13])
                            + Long.parseLong(f[14]);
                } else if (ppid == master) {
                    ticks += Long.parseLong(f[11]) + Long.parseLong(f[12]);
                }
            }
        }
        return ticks / 100.0; // USER_HZ
    }

    private static void report(String label, double[][] runs, int wafers, long rows) {
        double wall = median(runs, 0);
        double cpu = median(runs, 1);
        double server = median(runs, 2);
        System.out.printf(Locale.ROOT, "%-34s %8.3f s wall %8.3f s CPU%s  %8.0f wafers/s %9.0f rows/s (wall)"
                        + "  %.2f ms CPU per wafer%n", label, wall, cpu,
                Double.isNaN(server) ? "" : String.format(Locale.ROOT, " + %6.2f s server CPU", server),
                wafers / wall, rows / wall, 1e3 * (cpu + (Double.isNaN(server) ? 0 : server)) / wafers);
    }

    private static double median(double[][] runs, int column) {
        double[] v = Arrays.stream(runs).mapToDouble(r -> r[column]).sorted().toArray();
        return v.length % 2 == 1 ? v[v.length / 2] : (v[v.length / 2 - 1] + v[v.length / 2]) / 2;
    }
}
