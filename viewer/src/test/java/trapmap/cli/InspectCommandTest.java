package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class InspectCommandTest {
    private static final int N = 161;
    private static final double PITCH_MM = 0.5;

    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 1,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "grades": [{"grade": "A", "when": {"median_lifetime_us": {"min": 60}}}, {"grade": "B"}]}
            """;

    /** An 80 mm round wafer of 80 µs; with a spot, a 4 µs disc of 4 mm radius at (15, 10) mm. */
    static Path wafer(Path folder, String name, boolean spot) throws Exception {
        float[] s = new float[N * N];
        PixelGrid g = PixelGrid.centred(N, N, PITCH_MM);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x);
                double ym = g.yMm(y);
                s[y * N + x] = Math.hypot(xm, ym) > 40 ? Float.NaN
                        : spot && Math.hypot(xm - 15, ym - 10) <= 4 ? 4f : 80f;
            }
        }
        Path f = folder.resolve(name + ".tif");
        MapFiles.write(new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, name,
                MeasurementConditions.UNKNOWN, Provenance.of("test")), f);
        return f;
    }

    private Path rules(String json) throws Exception {
        Path r = dir.resolve("rules.json");
        Files.writeString(r, json);
        return r;
    }

    private Path folder(boolean withSpot) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        wafer(in, "w1", false);
        wafer(in, "w2", withSpot);
        Files.writeString(in.resolve("w1.json"), "{\"wafer_id\": \"w1\"}");
        Files.writeString(in.resolve("notes.txt"), "not a map");
        return in;
    }

    @Test
    void allPassingExitsZeroWithASummaryAndProgressLines() throws Exception {
        Path in = folder(false);
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", out.toString(),
                "--threads", "2");
        assertThat(r.code()).isZero();
        assertThat(r.out()).contains("2 wafers: 2 pass, 0 fail, 0 error; yield 100.0 %")
                .contains(out.resolve("results.csv").toString());
        assertThat(r.errLines()).containsExactly("inspect: 1/2 " + in.resolve("w1.tif"),
                "inspect: 2/2 " + in.resolve("w2.tif"));
        List<String> csv = Files.readAllLines(out.resolve("results.csv"));
        assertThat(csv).hasSize(3);
        assertThat(csv.get(0)).startsWith("file,wafer_id,status,grade,");
        assertThat(Files.exists(out.resolve("results.json"))).isTrue();
    }

    @Test
    void thumbnailsAndTheRegionsTableAreWrittenUnlessSwitchedOff() throws Exception {
        Path in = folder(true);
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", out.toString());
        assertThat(r.code()).isEqualTo(1);
        assertThat(out.resolve("thumbnails").resolve("w1.tif.png")).isRegularFile();
        assertThat(out.resolve("thumbnails").resolve("w2.tif.png")).isRegularFile();
        List<String> regions = Files.readAllLines(out.resolve("regions.csv"));
        assertThat(regions).hasSize(2);
        assertThat(regions.get(1)).startsWith(in.resolve("w2.tif") + ",w2,1,");

        Path bare = dir.resolve("bare");
        Cli.Run r2 = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", bare.toString(),
                "--no-thumbnails");
        assertThat(r2.code()).isEqualTo(1);
        assertThat(bare.resolve("thumbnails")).doesNotExist();
        assertThat(bare.resolve("results.csv")).isRegularFile();
    }

    @Test
    void anOutFolderThatCannotBeMadeAtTheStartIsNotTakenForOneRemovedDuringTheRun() throws Exception {
        Path proc = Path.of("/proc");
        org.junit.jupiter.api.Assumptions.assumeTrue(Files.isDirectory(proc.resolve("self")), "needs Linux /proc");
        Path in = folder(false);
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out",
                proc.resolve("trapmap-out").toString());
        assertThat(r.code()).isEqualTo(4);
        assertThat(r.err()).contains("/proc/trapmap-out: ").doesNotContain("removed while the batch ran");
    }

    @Test
    void aFailingWaferExitsOne() throws Exception {
        Path in = folder(true);
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out",
                dir.resolve("out").toString(), "--json");
        assertThat(r.code()).isEqualTo(1);
        JsonNode j = Cli.parse(r.out());
        assertThat(j.get("pass").asInt()).isEqualTo(1);
        assertThat(j.get("fail").asInt()).isEqualTo(1);
        assertThat(j.get("yield_fraction").asDouble()).isEqualTo(0.5);
        assertThat(j.has("yield")).isFalse();
        assertThat(j.get("recurrence")).hasSize(2);
    }

    @Test
    void anUnreadableFileExitsOneAndTheOthersAreInspected() throws Exception {
        Path in = folder(false);
        Files.write(in.resolve("w3.tif"), new byte[] {1, 2, 3});
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out",
                dir.resolve("out").toString());
        assertThat(r.code()).isEqualTo(1);
        assertThat(r.out()).contains("3 wafers: 2 pass, 0 fail, 1 error");
    }

    @Test
    void resumeSkipsListedFilesAndTriesErrorRowsAgain() throws Exception {
        Path in = folder(false);
        Path out = dir.resolve("out");
        Path w3 = in.resolve("w3.tif");
        Files.write(w3, new byte[] {1, 2, 3});
        Cli.Run first = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out",
                out.toString());
        assertThat(first.out()).contains("3 wafers: 2 pass, 0 fail, 1 error");
        Files.delete(w3);
        wafer(in, "w3", false);
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", out.toString(),
                "--resume");
        assertThat(r.code()).isZero();
        assertThat(r.out()).contains("3 wafers: 3 pass").contains("(2 kept from the previous run)");
        assertThat(r.errLines()).containsExactly("inspect: 1/1 " + w3);
    }

    @Test
    void usageErrorsExitTwoWithOneLine() throws Exception {
        Path in = folder(false);
        String out = dir.resolve("out").toString();
        Cli.Run badRules = Cli.run("inspect", in.toString(), "--rules", rules("{\"flag\": {\"quantity\":"
                + " \"lifetime\", \"threshold\": -1}}").toString(), "--out", out);
        assertThat(badRules.code()).isEqualTo(2);
        assertThat(badRules.errLines()).hasSize(1);
        assertThat(badRules.err()).contains("flag.threshold").contains("(µs)");

        Cli.Run noOut = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString());
        assertThat(noOut.code()).isEqualTo(2);
        assertThat(noOut.err()).contains("--out");

        Path empty = Files.createDirectories(dir.resolve("empty"));
        Cli.Run noFiles = Cli.run("inspect", empty.toString(), "--rules", rules(RULES).toString(), "--out", out);
        assertThat(noFiles.code()).isEqualTo(2);
        assertThat(noFiles.err()).contains("no map files");

        Cli.Run missingRules = Cli.run("inspect", in.toString(), "--rules", dir.resolve("none.json").toString(),
                "--out", out);
        assertThat(missingRules.code()).isEqualTo(2);
        assertThat(missingRules.errLines()).hasSize(1);
        assertThat(missingRules.err()).contains("none.json: no such rules file");

        Cli.Run threads = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", out,
                "--threads", "0");
        assertThat(threads.code()).isEqualTo(2);
        assertThat(threads.err()).contains("--threads");
        assertThat(Files.exists(dir.resolve("out"))).isFalse();
    }

    @Test
    void foldersListMapFilesByNameWithoutSidecarsOrTheOutputFolder() throws Exception {
        Path in = folder(false);
        Files.writeString(in.resolve("a.csv"), "x");
        Path out = Files.createDirectories(in.resolve("out"));
        Files.writeString(out.resolve("results.csv"), "file");
        assertThat(InspectCommand.files(List.of(in), out)).containsExactly(in.resolve("a.csv"),
                in.resolve("w1.tif"), in.resolve("w2.tif"));
    }

    @Test
    void outEqualToTheInputFolderInspectsTheMapsAndNeverReadsItsOwnOutputsBack() throws Exception {
        Path in = folder(true);
        for (int run = 1; run <= 2; run++) {
            // a second run into a folder holding results replaces them only when told to
            Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", in.toString(),
                    "--threads", "1", run == 1 ? "--thumbnails" : "--overwrite");
            assertThat(r.out()).as("run " + run).contains("2 wafers: 1 pass, 1 fail, 0 error");
            assertThat(Files.readAllLines(in.resolve("results.csv"))).as("run " + run).hasSize(3);
        }
        try (var written = Files.list(in)) {
            assertThat(written.map(p -> p.getFileName().toString())).contains("results.csv", "regions.csv",
                    "footprints.csv", "recurrence.csv").anyMatch(n -> n.startsWith("recurrence-")
                    && n.endsWith(".tif"));
        }
    }

    @Test
    void anOutFolderInsideTheInputFolderIsLeftOutEvenWhenNamedLikeAMap() throws Exception {
        Path in = folder(false);
        Path out = in.resolve("report.tif");
        for (int run = 1; run <= 2; run++) {
            Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out",
                    out.toString(), "--threads", "1", run == 1 ? "--thumbnails" : "--overwrite");
            assertThat(r.code()).as("run " + run).isZero();
            assertThat(r.out()).as("run " + run).contains("2 wafers: 2 pass, 0 fail, 0 error");
        }
    }

    @Test
    void aFolderHoldingOnlyTrapmapOutputsSaysSo() throws Exception {
        Path in = Files.createDirectories(dir.resolve("old-report"));
        Files.writeString(in.resolve("results.csv"), "file,status\n");
        Files.writeString(in.resolve("regions.csv"), "file\n");
        Files.writeString(in.resolve("recurrence-round-80.tif"), "x");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out",
                dir.resolve("out").toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).singleElement().asString().contains("no map files").contains(in.toString())
                .contains("the 3 found are trapmap's own outputs").contains("results.csv");
    }

    @Test
    void foldersDevicesAndDanglingLinksNamedLikeMapsAreErrorRowsAndTheBatchGoesOn() throws Exception {
        Path in = folder(false);
        Files.createDirectories(in.resolve("folder.tif"));
        Files.createSymbolicLink(in.resolve("gone.tif"), in.resolve("deleted.tif"));
        Files.createSymbolicLink(in.resolve("device.csv"), Path.of("/dev/null"));
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", out.toString(),
                "--threads", "2");
        assertThat(r.code()).isEqualTo(1);
        assertThat(r.out()).contains("5 wafers: 2 pass, 0 fail, 3 error");
        String csv = Files.readString(out.resolve("results.csv"));
        assertThat(csv).contains(in.resolve("folder.tif") + ": is a directory")
                .contains(in.resolve("gone.tif") + ": is a dangling link to " + in.resolve("deleted.tif"))
                .contains(in.resolve("device.csv") + ": is a FIFO, socket or device, not a regular file");
    }

    @Test
    @org.junit.jupiter.api.Timeout(120)
    void aFifoNamedLikeAMapIsAnErrorRowAndNeverOpened() throws Exception {
        Path in = folder(false);
        Fifo.make(in.resolve("pipe.tif"));
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules(RULES).toString(), "--out", out.toString(),
                "--threads", "1");
        assertThat(r.out()).contains("3 wafers: 2 pass, 0 fail, 1 error");
        assertThat(Files.readString(out.resolve("results.csv")))
                .contains(in.resolve("pipe.tif") + ": is a FIFO, socket or device, not a regular file");
    }

}
