package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeFalse;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.shared.progress.ProgressListener;

/** The life of a batch run in its output folder: run record, lock, resume and overwrite, output failures. */
class BatchRunLifecycleTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "grades": [{"grade": "A"}]}
            """;
    private static final RunManifest.Source SOURCE_A = new RunManifest.Source("trapmap test", "a.json",
            RunManifest.sha256("rules A".getBytes()));
    private static final RunManifest.Source SOURCE_B = new RunManifest.Source("trapmap test", "b.json",
            RunManifest.sha256("rules B".getBytes()));

    @AfterEach
    void noFault() {
        OutputFolder.fault = null;
    }

    private BatchInspection batch(RunManifest.Source source) throws RulesException {
        return new BatchInspection(Rules.parse(RULES, "rules.json")).withSource(source);
    }

    private List<Path> maps() throws IOException {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.clean(in, "w1", 80);
        SyntheticWafers.spot(in, "w2", 80, 20, -10, 5, 4);
        SyntheticWafers.clean(in, "w3", 80);
        SyntheticWafers.spot(in, "w4", 80, -15, 5, 5, 4);
        try (Stream<Path> s = Files.list(in)) {
            return s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
    }

    private static BatchInspection.Options options(boolean resume, boolean overwrite) {
        return new BatchInspection.Options(2, resume, true, ProgressListener.NONE, overwrite);
    }

    @Test
    void theRunRecordSaysRunningWhileWafersAreInspectedFinishingForTheSummaryAndCompleteLast() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        List<RunManifest.State> seen = new java.util.ArrayList<>();
        BatchInspection b = batch(SOURCE_A).finishingWith(d -> {
            seen.add(RunManifest.read(d).state());
            assertThat(Files.exists(d.resolve(BatchInspection.JSON_NAME))).isTrue();
        });
        b.run(files, out, new BatchInspection.Options(1, false, true, (done, total, m) -> {
            try {
                seen.add(RunManifest.read(out).state());
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        }));
        RunManifest m = RunManifest.read(out);
        assertThat(seen).containsExactly(RunManifest.State.RUNNING, RunManifest.State.RUNNING,
                RunManifest.State.RUNNING, RunManifest.State.RUNNING, RunManifest.State.FINISHING);
        assertThat(m.state()).isEqualTo(RunManifest.State.COMPLETE);
        assertThat(m.rulesSha256()).isEqualTo(SOURCE_A.rulesSha256());
        assertThat(m.inputs()).isEqualTo(4);
        assertThat(m.finished()).isAfterOrEqualTo(m.started());
        assertThat(m.physics()).containsEntry("thermal_velocity", "fixed");
    }

    @Test
    void aNewRunIntoAFolderWithResultsIsRefusedAndOverwriteRemovesOnlyTheBatchsFiles() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        batch(SOURCE_A).run(files, out, options(false, false));
        byte[] before = Files.readAllBytes(out.resolve(BatchInspection.CSV_NAME));
        Files.writeString(out.resolve("notes.txt"), "mine");
        Files.writeString(out.resolve(BatchInspection.THUMBNAIL_DIR).resolve("logo.png"), "mine");
        assertThatThrownBy(() -> batch(SOURCE_B).run(files, out, options(false, false)))
                .isInstanceOf(RunRefusedException.class)
                .hasMessageContaining(out.toString()).hasMessageContaining("--overwrite")
                .hasMessageContaining("--resume");
        assertThat(Files.readAllBytes(out.resolve(BatchInspection.CSV_NAME))).isEqualTo(before);
        // an old thumbnail and recurrence file of the earlier run that this run would not write
        Files.writeString(out.resolve("recurrence-old.tif"), "earlier run");
        Files.writeString(out.resolve(BatchInspection.THUMBNAIL_DIR).resolve("gone.tif.png"), "earlier run");
        batch(SOURCE_B).run(files.subList(0, 2), out, options(false, true));
        assertThat(Files.exists(out.resolve("recurrence-old.tif"))).isFalse();
        assertThat(Files.exists(out.resolve(BatchInspection.THUMBNAIL_DIR).resolve("gone.tif.png"))).isFalse();
        assertThat(Files.readString(out.resolve("notes.txt"))).isEqualTo("mine");
        assertThat(Files.readString(out.resolve(BatchInspection.THUMBNAIL_DIR).resolve("logo.png")))
                .isEqualTo("mine");
        assertThat(Files.readAllLines(out.resolve(BatchInspection.CSV_NAME))).hasSize(3);
        assertThat(RunManifest.read(out).rulesSha256()).isEqualTo(SOURCE_B.rulesSha256());
    }

    @Test
    void resumeWithOtherRulesIsRefusedNamingBothHashes() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        BatchInspectionTest.interruptedAfter(batch(SOURCE_A), files, out, 2);
        byte[] partial = Files.readAllBytes(out.resolve(BatchInspection.PARTIAL_NAME));
        assertThatThrownBy(() -> batch(SOURCE_B).run(files, out, options(true, false)))
                .isInstanceOf(RunRefusedException.class)
                .hasMessageContaining("--resume: " + out + " was run with other rules (sha256 "
                        + SOURCE_A.rulesSha256().substring(0, 12) + "… then, "
                        + SOURCE_B.rulesSha256().substring(0, 12) + "… now)")
                .hasMessageContaining("use a new --out or --overwrite");
        assertThat(Files.readAllBytes(out.resolve(BatchInspection.PARTIAL_NAME))).isEqualTo(partial);
        assertThatThrownBy(() -> batch(SOURCE_A).run(files.subList(0, 3), out, options(true, false)))
                .isInstanceOf(RunRefusedException.class).hasMessageContaining("other input files (4 files")
                .hasMessageNotContaining("other rules");
        Rules green = Rules.parse(RULES, "rules.json").withPhysics(trapmap.physics.conversion.PhysicsSettings.DEFAULTS
                .withVelocities(trapmap.physics.material.ThermalVelocityModel.GREEN_1990));
        assertThatThrownBy(() -> new BatchInspection(green).withSource(SOURCE_A).run(files, out,
                options(true, false))).isInstanceOf(RunRefusedException.class)
                .hasMessageContaining("other physics settings (thermal_velocity fixed then, ", " now)");
        assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.RUNNING);
    }

    @Test
    void resumeWithOtherThumbnailCaptionsIsRefused() throws Exception {
        // thumbnails with captions after plain ones would mix two kinds of picture in one folder
        List<Path> files = maps();
        Path out = dir.resolve("out");
        batch(SOURCE_A).run(files, out, options(false, false));
        assertThat(RunManifest.read(out).thumbnailCaptions()).isFalse();
        assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(true, false).withThumbnailCaptions(true)))
                .isInstanceOf(RunRefusedException.class)
                .hasMessageContaining("thumbnail captions off then, on now");
        batch(SOURCE_A).run(files, out, options(false, true).withThumbnailCaptions(true));
        assertThat(RunManifest.read(out).thumbnailCaptions()).isTrue();
        batch(SOURCE_A).run(files, out, options(true, false).withThumbnailCaptions(true));
    }

    @Test
    void resumeRefusesResultsWithoutARunRecord() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        batch(SOURCE_A).run(files, out, options(false, false));
        Files.delete(out.resolve(RunManifest.FILE_NAME));
        assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(true, false)))
                .isInstanceOf(RunRefusedException.class).hasMessageContaining("without a run.json");
    }

    @Test
    void aBrokenRunRecordRefusesResumeAndOverwriteReplacesIt() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        batch(SOURCE_A).run(files, out, options(false, false));
        Files.writeString(out.resolve(RunManifest.FILE_NAME), "{\"format\": \"trapmap-run/1\", \"state\": ");
        assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(true, false)))
                .isInstanceOf(RunRefusedException.class)
                .hasMessageContaining(out.resolve(RunManifest.FILE_NAME) + ": not a run record");
        assertThat(batch(SOURCE_A).run(files, out, options(false, true)).total()).isEqualTo(4);
        assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.COMPLETE);
    }

    @Test
    void resumeTriesErrorRowsAgain() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        Path flaky = files.get(1);
        AtomicInteger attempts = new AtomicInteger();
        Rules rules = Rules.parse(RULES, "rules.json");
        WaferInspection.MapReader failingOnce = f -> {
            if (f.equals(flaky) && attempts.getAndIncrement() == 0) {
                throw new IOException("device not ready");
            }
            return MapFiles.readSingle(f);
        };
        BatchInspection.Summary first = new BatchInspection(rules, failingOnce).withSource(SOURCE_A).run(files, out,
                options(false, false));
        assertThat(first.error()).isEqualTo(1);
        AtomicInteger reads = new AtomicInteger();
        BatchInspection.Summary again = new BatchInspection(rules, f -> {
            reads.incrementAndGet();
            return failingOnce.read(f);
        }).withSource(SOURCE_A).run(files, out, options(true, false));
        assertThat(reads.get()).isEqualTo(1);
        assertThat(again.error()).isZero();
        assertThat(again.total()).isEqualTo(4);
        assertThat(Files.readString(out.resolve(BatchInspection.CSV_NAME))).doesNotContain("device not ready");
    }

    @Test
    void aResumedRunRetryingAnErrorRowWritesTheTablesInInputOrderLikeAnUninterruptedRun() throws Exception {
        List<Path> files = maps();
        Path broken = files.get(1);
        Rules rules = Rules.parse(RULES, "rules.json");
        WaferInspection.MapReader unreadable = f -> {
            if (f.equals(broken)) {
                throw new IOException("not a map");
            }
            return MapFiles.readSingle(f);
        };
        Path reference = dir.resolve("reference");
        new BatchInspection(rules, unreadable).withSource(SOURCE_A).run(files, reference,
                new BatchInspection.Options(1, false, false, ProgressListener.NONE, false));
        // stopped after the third wafer: the partial table holds w1, w2 (error), w3; the error row of w2 is
        // tried again on resume, so it is inspected after the kept w1 and w3
        Path out = dir.resolve("out");
        ProgressListener stopAfterThird = (done, total, message) -> {
            if (done == 3) {
                throw new IllegalStateException("stopped here");
            }
        };
        assertThatThrownBy(() -> new BatchInspection(rules, unreadable).withSource(SOURCE_A).run(files, out,
                new BatchInspection.Options(1, false, false, stopAfterThird, false)))
                .hasMessage("stopped here");
        assertThat(Files.readAllLines(out.resolve(BatchInspection.PARTIAL_NAME))).hasSize(4);
        new BatchInspection(rules, unreadable).withSource(SOURCE_A).run(files, out,
                new BatchInspection.Options(1, true, false, ProgressListener.NONE, false));
        for (String name : List.of(BatchInspection.CSV_NAME, BatchInspection.REGIONS_NAME,
                BatchInspection.FOOTPRINTS_NAME, BatchInspection.RECURRENCE_NAME)) {
            assertThat(Files.readString(out.resolve(name))).as(name)
                    .isEqualTo(Files.readString(reference.resolve(name)));
        }
        // results.json: the same wafers in the same order; only the summary's count of kept wafers differs
        com.fasterxml.jackson.databind.ObjectMapper json = new com.fasterxml.jackson.databind.ObjectMapper();
        com.fasterxml.jackson.databind.JsonNode resumed = json.readTree(out.resolve(BatchInspection.JSON_NAME).toFile());
        com.fasterxml.jackson.databind.JsonNode whole = json.readTree(reference.resolve(BatchInspection.JSON_NAME)
                .toFile());
        assertThat(resumed.get("wafers")).isEqualTo(whole.get("wafers"));
        assertThat(resumed.at("/summary/skipped").asInt()).isEqualTo(2);
    }

    @Test
    void aWaferThatFailedOnceAndIsReadOnResumeTakesItsPlaceInAllThreeTables() throws Exception {
        List<Path> files = maps();
        Path flaky = files.get(1); // w2, with a flagged spot: a footprint and region rows
        Rules rules = Rules.parse(RULES, "rules.json");
        Path reference = dir.resolve("reference");
        new BatchInspection(rules).withSource(SOURCE_A).run(files, reference,
                new BatchInspection.Options(1, false, false, ProgressListener.NONE, false));
        AtomicInteger attempts = new AtomicInteger();
        WaferInspection.MapReader failingOnce = f -> {
            if (f.equals(flaky) && attempts.getAndIncrement() == 0) {
                throw new IOException("device not ready");
            }
            return MapFiles.readSingle(f);
        };
        Path out = dir.resolve("out");
        ProgressListener stopAfterThird = (done, total, message) -> {
            if (done == 3) {
                throw new IllegalStateException("stopped here");
            }
        };
        assertThatThrownBy(() -> new BatchInspection(rules, failingOnce).withSource(SOURCE_A).run(files, out,
                new BatchInspection.Options(1, false, false, stopAfterThird, false)))
                .hasMessage("stopped here");
        new BatchInspection(rules, failingOnce).withSource(SOURCE_A).run(files, out,
                new BatchInspection.Options(1, true, false, ProgressListener.NONE, false));
        assertThat(Files.readString(reference.resolve(BatchInspection.REGIONS_NAME))).contains("w2.tif");
        for (String name : List.of(BatchInspection.FOOTPRINTS_NAME, BatchInspection.REGIONS_NAME,
                BatchInspection.CSV_NAME, BatchInspection.RECURRENCE_NAME)) {
            assertThat(Files.readString(out.resolve(name))).as(name)
                    .isEqualTo(Files.readString(reference.resolve(name)));
        }
    }

    /** The header and the rows of {@code table} in {@code folder} whose file is one of {@code wafers}. */
    private static String rowsOf(Path folder, String table, List<Path> wafers) throws IOException {
        List<String> lines = Files.readAllLines(folder.resolve(table));
        StringBuilder b = new StringBuilder(lines.get(0)).append("\r\n");
        for (String line : lines.subList(1, lines.size())) {
            if (wafers.stream().anyMatch(w -> line.startsWith(w + ","))) {
                b.append(line).append("\r\n");
            }
        }
        return b.toString();
    }

    /**
     * Folders as a kill at some moment leaves them: each table holds complete rows of a prefix of the wafers (a
     * wafer's footprint and regions are flushed before its results row), the last one may be cut short, and the
     * three tables may stand in different generations (partial or moved). Resume reads only the wafers missing
     * from the results and ends with the uninterrupted run's tables.
     */
    @Test
    void resumeFromEachStateAKillCanLeaveEndsWithTheUninterruptedTables() throws Exception {
        List<Path> files = maps();
        Rules rules = Rules.parse(RULES, "rules.json");
        BatchInspection.Options once = new BatchInspection.Options(1, false, false, ProgressListener.NONE, false);
        BatchInspection.Options resume = new BatchInspection.Options(1, true, false, ProgressListener.NONE, false);
        Path reference = dir.resolve("reference");
        new BatchInspection(rules).withSource(SOURCE_A).run(files, reference, once);
        String fp = BatchInspection.FOOTPRINTS_NAME;
        String rg = BatchInspection.REGIONS_NAME;
        String w4Footprint = rowsOf(reference, fp, List.of(files.get(3))).lines().skip(1).findFirst().orElseThrow();
        String w4Region = rowsOf(reference, rg, List.of(files.get(3))).lines().skip(1).findFirst().orElseThrow();
        List<Path> two = files.subList(0, 2);
        List<Path> three = files.subList(0, 3);
        // state -> {file name -> content}; the wafers to be read again
        record State(String name, Map<String, String> tables, int reads) { }
        List<State> states = List.of(
                // killed while w4's footprint was flushed, w3's results row not yet written
                new State("footprint ahead", Map.of(
                        BatchInspection.PARTIAL_NAME, rowsOf(reference, BatchInspection.CSV_NAME, two),
                        rg + ".partial", rowsOf(reference, rg, two) + w4Region + "\r\n",
                        fp + ".partial", rowsOf(reference, fp, three) + w4Footprint.substring(0,
                                w4Footprint.length() / 2),
                        BatchInspection.PARTIAL_NAME + ".new", "file\r\n"), 2),
                // killed between the final moves: footprints moved, regions and results still partial
                new State("between the moves", Map.of(
                        BatchInspection.PARTIAL_NAME, Files.readString(reference.resolve(BatchInspection.CSV_NAME)),
                        rg + ".partial", Files.readString(reference.resolve(rg)),
                        fp, Files.readString(reference.resolve(fp))), 0),
                // killed while a resumed run rewrote its kept rows: old partial tables beside a stale .new
                new State("rewriting the kept rows", Map.of(
                        BatchInspection.PARTIAL_NAME, rowsOf(reference, BatchInspection.CSV_NAME, three),
                        rg + ".partial", rowsOf(reference, rg, files),
                        fp + ".partial", rowsOf(reference, fp, files),
                        fp + ".new", rowsOf(reference, fp, two)), 1));
        for (State state : states) {
            Path out = Files.createDirectories(dir.resolve("out-" + state.name().replace(' ', '-')));
            Files.copy(reference.resolve(RunManifest.FILE_NAME), out.resolve(RunManifest.FILE_NAME));
            for (Map.Entry<String, String> e : state.tables().entrySet()) {
                Files.writeString(out.resolve(e.getKey()), e.getValue());
            }
            AtomicInteger reads = new AtomicInteger();
            new BatchInspection(rules, f -> {
                reads.incrementAndGet();
                return MapFiles.readSingle(f);
            }).withSource(SOURCE_A).run(files, out, resume);
            assertThat(reads.get()).as(state.name()).isEqualTo(state.reads());
            for (String name : List.of(fp, rg, BatchInspection.CSV_NAME, BatchInspection.RECURRENCE_NAME)) {
                assertThat(Files.readString(out.resolve(name))).as(state.name() + ": " + name)
                        .isEqualTo(Files.readString(reference.resolve(name)));
            }
            try (Stream<Path> left = Files.list(out)) {
                assertThat(left.map(p -> p.getFileName().toString()))
                        .as(state.name()).noneMatch(n -> n.endsWith(".partial") || n.endsWith(".new"));
            }
        }
    }

    @Test
    void aSecondRunIntoAHeldFolderIsRefusedAtOnceAndTheFirstFinishesIntact() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        CountDownLatch reading = new CountDownLatch(1);
        CountDownLatch release = new CountDownLatch(1);
        Rules rules = Rules.parse(RULES, "rules.json");
        BatchInspection first = new BatchInspection(rules, f -> {
            reading.countDown();
            try {
                release.await();
            } catch (InterruptedException e) {
                throw new java.io.InterruptedIOException();
            }
            return MapFiles.readSingle(f);
        }).withSource(SOURCE_A);
        AtomicReference<Throwable> failed = new AtomicReference<>();
        AtomicReference<BatchInspection.Summary> done = new AtomicReference<>();
        Thread t = new Thread(() -> {
            try {
                done.set(first.run(files, out, options(false, false)));
            } catch (Throwable e) {
                failed.set(e);
            }
        });
        t.start();
        reading.await();
        assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(true, false)))
                .isInstanceOf(RunRefusedException.class).hasMessageContaining(out.toString())
                .hasMessageContaining("in use by another trapmap inspect run (pid "
                        + ProcessHandle.current().pid());
        assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(false, true)))
                .isInstanceOf(RunRefusedException.class);
        release.countDown();
        t.join(30_000);
        assertThat(failed.get()).isNull();
        assertThat(done.get().total()).isEqualTo(4);
        assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.COMPLETE);
        assertThat(Files.readAllLines(out.resolve(BatchInspection.CSV_NAME))).hasSize(5);
        // released: the folder can be resumed (nothing left to do)
        assertThat(batch(SOURCE_A).run(files, out, options(true, false)).skipped()).isEqualTo(4);
    }

    @Test
    void aFullDiskStopsTheBatchNamingTheFileAndResumeContinuesToTheSameResults() throws Exception {
        List<Path> files = maps();
        Path reference = dir.resolve("reference");
        batch(SOURCE_A).run(files, reference, options(false, false));
        int stopped = 0;
        for (int failAt : new int[] {1, 4, 9, 16, 30}) {
            Path out = dir.resolve("out-" + failAt);
            AtomicInteger writes = new AtomicInteger();
            OutputFolder.fault = file -> {
                if (writes.incrementAndGet() >= failAt) {
                    throw new IOException("No space left on device");
                }
            };
            BatchOutputException e = org.assertj.core.api.Assertions.catchThrowableOfType(
                    () -> batch(SOURCE_A).run(files, out, options(false, false)), BatchOutputException.class);
            OutputFolder.fault = null;
            if (e == null) {
                continue; // the run needed fewer writes
            }
            stopped++;
            assertThat(e.reason()).as("fail at %d", failAt).isEqualTo("No space left on device");
            assertThat(e.file().toAbsolutePath().normalize().startsWith(out.toAbsolutePath().normalize()))
                    .as("%s in %s", e.file(), out).isTrue();
            assertThat(e.getMessage()).startsWith(e.file() + ": ");
            RunManifest m = RunManifest.read(out);
            assertThat(m == null || m.state() != RunManifest.State.COMPLETE).isTrue();
            for (String name : List.of(BatchInspection.PARTIAL_NAME, BatchInspection.CSV_NAME)) {
                Path p = out.resolve(name);
                if (Files.exists(p)) {
                    assertThat(Files.readString(p)).doesNotContain("No space").doesNotContain(",error,");
                }
            }
            batch(SOURCE_A).run(files, out, options(m != null, false));
            assertThat(Files.readString(out.resolve(BatchInspection.CSV_NAME))).as("fail at %d", failAt)
                    .isEqualTo(Files.readString(reference.resolve(BatchInspection.CSV_NAME)));
            assertThat(Files.readString(out.resolve(BatchInspection.REGIONS_NAME)))
                    .isEqualTo(Files.readString(reference.resolve(BatchInspection.REGIONS_NAME)));
            assertThat(Files.readString(out.resolve(BatchInspection.FOOTPRINTS_NAME)))
                    .isEqualTo(Files.readString(reference.resolve(BatchInspection.FOOTPRINTS_NAME)));
            assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.COMPLETE);
        }
        assertThat(stopped).as("runs stopped by the full disk").isGreaterThanOrEqualTo(4);
    }

    @Test
    void aThumbnailThatCannotBeWrittenStopsTheBatchInsteadOfFailingTheWafer() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        OutputFolder.fault = file -> {
            if (file.getFileName().toString().equals("w3.tif.png")) {
                throw new IOException("No space left on device");
            }
        };
        assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(false, false)))
                .isInstanceOf(BatchOutputException.class)
                .hasMessage(out.resolve(BatchInspection.THUMBNAIL_DIR).resolve("w3.tif.png")
                        + ": No space left on device");
        assertThat(Files.readString(out.resolve(BatchInspection.PARTIAL_NAME))).doesNotContain("w3.tif")
                .doesNotContain(",error,");
    }

    @Test
    void aReadOnlyOutputFolderIsAnOutputFailure() throws Exception {
        assumeFalse("root".equals(System.getProperty("user.name")), "root writes into read-only folders");
        List<Path> files = maps();
        Path out = Files.createDirectories(dir.resolve("out"));
        Files.setPosixFilePermissions(out, PosixFilePermissions.fromString("r-xr-xr-x"));
        try {
            assertThatThrownBy(() -> batch(SOURCE_A).run(files, out, options(false, false)))
                    .isInstanceOf(BatchOutputException.class).hasMessageContaining(out.toString())
                    .hasMessageContaining("permission denied");
        } finally {
            Files.setPosixFilePermissions(out, PosixFilePermissions.fromString("rwxr-xr-x"));
        }
    }

    @Test
    void aRunRemovesTheTemporariesOfAnInterruptedWriteAndNothingElse() throws Exception {
        List<Path> files = maps();
        Path out = dir.resolve("out");
        BatchInspectionTest.interruptedAfter(batch(SOURCE_A), files, out, 1);
        Files.writeString(out.resolve(".summary.pdf.123456.tmp"), "cut short");
        Files.writeString(out.resolve("results.json.tmp"), "cut short");
        Files.writeString(out.resolve(".recurrence-m2.png.99.tmp"), "cut short");
        Files.createDirectories(out.resolve(BatchInspection.THUMBNAIL_DIR));
        Files.writeString(out.resolve(BatchInspection.THUMBNAIL_DIR).resolve("w4.tif.png.tmp"), "cut short");
        Files.writeString(out.resolve(".mine.tmp"), "not the batch's");
        batch(SOURCE_A).run(files, out, new BatchInspection.Options(2, true, false, ProgressListener.NONE));
        try (Stream<Path> s = Files.walk(out)) {
            assertThat(s.map(p -> p.getFileName().toString()).filter(n -> n.endsWith(".tmp")))
                    .containsExactly(".mine.tmp");
        }
    }
}
