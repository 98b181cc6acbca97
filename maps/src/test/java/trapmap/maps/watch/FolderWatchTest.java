package trapmap.maps.watch;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.io.MapFiles;

/**
 * The watch on real demonstration maps: a map written in pieces and one whose sidecar comes late are read once,
 * complete; a broken map gives one error row that later rounds keep; a restart inspects only the new maps; the
 * tables hold every map once.
 */
class FolderWatchTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final long MS = 1_000_000L;
    /** Settle time: long against the pauses between the pieces written below (100 ms). */
    private static final long SETTLE = 1500 * MS;

    private final Map<Path, AtomicInteger> reads = new ConcurrentHashMap<>();
    private final List<String> told = new CopyOnWriteArrayList<>();
    private final List<Integer> rounds = new CopyOnWriteArrayList<>();

    private FolderWatch watch(Path in, Path out, Rules rules) {
        BatchInspection.Options options = new BatchInspection.Options(1, true, false, null);
        return new FolderWatch(new FolderWatch.Settings(in, out, SETTLE, 50 * MS, true, 0, options),
                () -> new BatchInspection(rules, f -> {
                    reads.computeIfAbsent(f.getFileName(), k -> new AtomicInteger()).incrementAndGet();
                    return MapFiles.readSingle(f);
                }), new FolderWatch.Listener() {
                    @Override
                    public void wafer(Map<String, String> row) {
                        told.add(row.get("wafer_id") + " " + row.get("status")); // an error row: no wafer id
                    }

                    @Override
                    public void round(BatchInspection.Summary summary) {
                        rounds.add(summary.total());
                    }
                });
    }

    /** Waits for the end of a round whose batch holds {@code wafers} wafers. */
    private void awaitRound(int wafers) throws InterruptedException {
        long end = System.nanoTime() + 60_000 * MS;
        while (!rounds.contains(wafers) && System.nanoTime() < end) {
            Thread.sleep(20);
        }
        assertThat(rounds).as("wafers of each round's batch").contains(wafers);
    }

    private static Thread start(FolderWatch w, AtomicReference<Throwable> failure) {
        Thread t = new Thread(() -> {
            try {
                w.run();
            } catch (Throwable e) {
                failure.set(e);
            }
        }, "watch-under-test");
        t.start();
        return t;
    }

    private void awaitTold(int n) throws InterruptedException {
        long end = System.nanoTime() + 60_000 * MS;
        while (told.size() < n && System.nanoTime() < end) {
            Thread.sleep(20);
        }
        assertThat(told).as("wafers told").hasSizeGreaterThanOrEqualTo(n);
    }

    private static List<String> tableFiles(Path out) throws IOException {
        return BatchInspection.listedFiles(out).stream().map(f -> Path.of(f).getFileName().toString()).toList();
    }

    @Test
    void mapsArrivingInPiecesOrWithoutSidecarAreReadOnceCompleteAndARestartInspectsOnlyTheNewOnes(
            @TempDir Path in, @TempDir Path out) throws Exception {
        Rules rules = Rules.read(DEMO.resolve("rules-example.json"));
        AtomicReference<Throwable> failure = new AtomicReference<>();
        FolderWatch w = watch(in, out, rules);
        Thread t = start(w, failure);

        // W01: sidecar first, then the map in 8 pieces 100 ms apart (each piece far inside the settle time)
        Files.copy(DEMO.resolve("LOT-A01-W01.json"), in.resolve("LOT-A01-W01.json"));
        byte[] map = Files.readAllBytes(DEMO.resolve("LOT-A01-W01.tif"));
        try (OutputStream o = Files.newOutputStream(in.resolve("LOT-A01-W01.tif"))) {
            int piece = map.length / 8 + 1;
            for (int at = 0; at < map.length; at += piece) {
                o.write(map, at, Math.min(piece, map.length - at));
                o.flush();
                Thread.sleep(100);
            }
        }
        // W02: the map without its sidecar waits, however long it has settled
        Files.copy(DEMO.resolve("LOT-A01-W02.tif"), in.resolve("LOT-A01-W02.tif"));
        awaitTold(1);
        Thread.sleep(2 * SETTLE / MS);
        assertThat(told).containsExactly("LOT-A01-W01 pass"); // as inspect judges the whole map
        assertThat(reads).doesNotContainKey(Path.of("LOT-A01-W02.tif"));
        Files.copy(DEMO.resolve("LOT-A01-W02.json"), in.resolve("LOT-A01-W02.json"));
        // a broken map with a done marker: one error row, never tried again
        Files.write(in.resolve("BROKEN-W09.tif"), new byte[] {'I', 'I', 42, 0, 1, 2, 3});
        Files.write(in.resolve("BROKEN-W09.tif.done"), new byte[0]);
        awaitTold(3);
        // one more round: the error row is kept, not tried again
        Files.copy(DEMO.resolve("LOT-A01-W03.json"), in.resolve("LOT-A01-W03.json"));
        Files.copy(DEMO.resolve("LOT-A01-W03.tif"), in.resolve("LOT-A01-W03.tif"));
        awaitTold(4);
        awaitRound(4);
        w.stop();
        t.join(60_000);
        assertThat(t.isAlive()).isFalse();
        assertThat(failure.get()).isNull();
        assertThat(told).containsExactlyInAnyOrder("LOT-A01-W01 pass", "LOT-A01-W02 fail", " error",
                "LOT-A01-W03 pass");
        assertThat(tableFiles(out)).containsExactlyInAnyOrder("LOT-A01-W01.tif", "LOT-A01-W02.tif",
                "BROKEN-W09.tif", "LOT-A01-W03.tif");
        assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.COMPLETE);

        // restart: a new map arrived meanwhile; only it is read
        Files.copy(DEMO.resolve("LOT-A01-W04.json"), in.resolve("LOT-A01-W04.json"));
        Files.copy(DEMO.resolve("LOT-A01-W04.tif"), in.resolve("LOT-A01-W04.tif"));
        told.clear();
        FolderWatch again = watch(in, out, rules);
        Thread t2 = start(again, failure);
        awaitTold(1);
        awaitRound(5);
        again.stop();
        t2.join(60_000);
        assertThat(failure.get()).isNull();
        assertThat(told).containsExactly("LOT-A01-W04 fail");
        assertThat(reads).allSatisfy((file, n) -> assertThat(n.get()).as("reads of %s", file).isOne());
        assertThat(tableFiles(out)).hasSize(5).doesNotHaveDuplicates();
        String json = Files.readString(out.resolve(BatchInspection.JSON_NAME));
        assertThat(json).contains("\"pass\" : 2", "\"fail\" : 2", "\"error\" : 1");
    }

    @Test
    void aSecondWatchOfTheSameOutputFolderIsRefused(@TempDir Path in, @TempDir Path out) throws Exception {
        Rules rules = Rules.read(DEMO.resolve("rules-example.json"));
        AtomicReference<Throwable> failure = new AtomicReference<>();
        FolderWatch first = watch(in, out, rules);
        Thread t = start(first, failure);
        long end = System.nanoTime() + 30_000 * MS;
        while (!Files.exists(out.resolve(FolderWatch.LOCK_NAME)) && System.nanoTime() < end) {
            Thread.sleep(10);
        }
        Thread.sleep(200);
        AtomicReference<Throwable> second = new AtomicReference<>();
        Thread t2 = start(watch(in, out, rules), second);
        t2.join(30_000);
        first.stop();
        t.join(30_000);
        assertThat(second.get()).isInstanceOf(trapmap.maps.batch.RunRefusedException.class)
                .hasMessageContaining("watched by another trapmap watch");
        assertThat(failure.get()).isNull();
    }
}
