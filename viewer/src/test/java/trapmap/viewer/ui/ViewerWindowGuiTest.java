package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.File;
import java.io.InputStreamReader;
import java.io.PrintWriter;
import java.io.Reader;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import trapmap.cli.TrapmapCommand;

/**
 * Starts the real window on a display in a child JVM ({@link GuiScenario}): on the machine's display when DISPLAY is
 * set, otherwise on a private Xvfb started here; skipped when there is neither.
 */
class ViewerWindowGuiTest {
    private static final Path DEMO = Path.of("..", "demo-data").toAbsolutePath().normalize();

    /** Starts a display when DISPLAY is not set (skipping when there is no Xvfb) and runs a scenario's main class. */
    private static String runOnDisplay(Class<?> scenario, String... args) throws Exception {
        String display = System.getenv("DISPLAY");
        Process xvfb = null;
        try {
            if (display == null || display.isBlank()) {
                Path bin = onPath("Xvfb");
                Assumptions.assumeTrue(bin != null, "no DISPLAY and no Xvfb on the PATH: the window cannot be shown");
                xvfb = new ProcessBuilder(bin.toString(), "-displayfd", "1", "-screen", "0", "1600x1000x24",
                        "-nolisten", "tcp").redirectError(ProcessBuilder.Redirect.DISCARD).start();
                BufferedReader r = new BufferedReader(new InputStreamReader(xvfb.getInputStream(),
                        StandardCharsets.US_ASCII));
                String n = r.readLine();
                assertThat(n).as("display number from Xvfb -displayfd").isNotNull().matches("\\d+");
                display = ":" + n.trim();
            }
            String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
            List<String> cmd = new ArrayList<>(List.of(java, "-cp", System.getProperty("java.class.path"),
                    "-Djava.awt.headless=false", scenario.getName()));
            cmd.addAll(List.of(args));
            ProcessBuilder pb = new ProcessBuilder(cmd).redirectErrorStream(true);
            pb.environment().put("DISPLAY", display);
            Path log = Files.createTempFile("trapmap-gui", ".log");
            pb.redirectOutput(log.toFile());
            Process child = pb.start();
            boolean finished = child.waitFor(120, TimeUnit.SECONDS);
            if (!finished) {
                child.destroyForcibly();
            }
            String out = Files.readString(log);
            Files.deleteIfExists(log);
            assertThat(finished).as("GUI scenario finished; output:%n%s", out).isTrue();
            assertThat(child.exitValue()).as("exit status; output:%n%s", out).isZero();
            return out;
        } finally {
            if (xvfb != null) {
                xvfb.destroy();
                xvfb.waitFor(5, TimeUnit.SECONDS);
            }
        }
    }

    @Test
    void thresholdTypedIntoTheWindowFlagsTheRegionsOfThresholdRegions() throws Exception {
        String out = runOnDisplay(GuiScenario.class, DEMO.toString(), "120", "LOT-A01-W05");
        Matcher m = Pattern.compile("GUI-RESULT wafers=(\\d+) table=(\\d+) expected=(\\d+) model=(\\d+)"
                + " threshold=([0-9.]+)").matcher(out);
        assertThat(m.find()).as("result line in:%n%s", out).isTrue();
        int table = Integer.parseInt(m.group(2));
        assertThat(Integer.parseInt(m.group(1))).as("demo maps opened").isEqualTo(17);
        assertThat(table).as("region table rows").isEqualTo(Integer.parseInt(m.group(3)))
                .isEqualTo(Integer.parseInt(m.group(4))).isGreaterThan(1);
        assertThat(Double.parseDouble(m.group(5))).isEqualTo(120.0);
        assertThat(out).contains("title=trapmap — LOT-A01-W05.tif");
        assertThat(out).as("without rules the verdict is labelled").contains("verdict=quick threshold check: fail")
                .contains("(not a rules verdict)");
        Matcher v = Pattern.compile("GUI-VIEW colours=(\\d+)").matcher(out);
        assertThat(v.find()).as("view line in:%n%s", out).isTrue();
        assertThat(Integer.parseInt(v.group(1))).as("distinct colours in the exported view").isGreaterThan(50);
        Matcher u = Pattern.compile("GUI-UNDO threshold=([0-9.]+) table=(\\d+) model=(\\d+)").matcher(out);
        assertThat(u.find()).as("undo line in:%n%s", out).isTrue();
        assertThat(Double.parseDouble(u.group(1))).as("threshold after Edit ▸ Undo").isEqualTo(20.0);
        assertThat(u.group(2)).isEqualTo(u.group(3));
        assertThat(Integer.parseInt(u.group(2))).as("fewer regions at 20 µs than at 120 µs").isLessThan(table);
    }

    @Test
    void withARulesFileEveryWaferShowsTheVerdictAndGradeOfInspect(@TempDir Path dir) throws Exception {
        Path rules = DEMO.resolve("rules-example.json");
        Path batch = dir.resolve("batch");
        StringWriter err = new StringWriter();
        int code = TrapmapCommand.run(new PrintWriter(new StringWriter()), new PrintWriter(err), "inspect",
                DEMO.toString(), "--rules", rules.toString(), "--out", batch.toString(), "--no-thumbnails");
        assertThat(code).as(err.toString()).isEqualTo(1);
        Map<String, CSVRecord> expected = new HashMap<>();
        try (Reader in = Files.newBufferedReader(batch.resolve("results.csv"))) {
            for (CSVRecord row : CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(in)) {
                expected.put(Path.of(row.get("file")).getFileName().toString(), row);
            }
        }
        Path pdf = dir.resolve("w01.pdf");
        String out = runOnDisplay(RulesGuiScenario.class, DEMO.toString(), rules.toString(), "LOT-A01-W01",
                pdf.toString());

        Matcher m = Pattern.compile("GUI-VERDICT file=(\\S+) status=(\\S+) grade=(\\S*) profile=(\\S+)"
                + " defect=(\\S+) rules=(\\S+)").matcher(out);
        int seen = 0;
        while (m.find()) {
            CSVRecord row = expected.get(m.group(1));
            assertThat(row).as("inspect row of %s", m.group(1)).isNotNull();
            assertThat(m.group(2)).as("status of %s", m.group(1)).isEqualTo(row.get("status"));
            assertThat(m.group(3)).as("grade of %s", m.group(1)).isEqualTo(row.get("grade"));
            assertThat(m.group(4)).as("profile of %s", m.group(1)).isEqualTo(row.get("profile"));
            assertThat(m.group(5)).as("defect of %s", m.group(1)).isEqualTo(row.get("defect"));
            assertThat(m.group(6)).isEqualTo("true");
            seen++;
        }
        assertThat(seen).as("verdict lines in:%n%s", out).isEqualTo(expected.size()).isEqualTo(17);
        long pass = expected.values().stream().filter(r -> r.get("status").equals("pass")).count();
        assertThat(out).contains("GUI-GALLERY 17 wafers rules rules-example.json: " + pass + " pass · "
                + (17 - pass) + " fail");
        CSVRecord w01 = expected.get("LOT-A01-W01.tif");
        assertThat(out).contains("GUI-PANEL " + w01.get("status") + " · grade " + w01.get("grade")
                + " rules-example.json · profile " + w01.get("profile"));
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(new PDFTextStripper().getText(doc)).contains("Verdict: "
                    + w01.get("status").toUpperCase(java.util.Locale.ROOT) + " - grade " + w01.get("grade"));
        }
    }

    @Test
    void pageKeysAndAltArrowsChangeTheWaferAndNeverTheFocusedDefectList_injectionTitleFollowsTheDefect() throws Exception {
        String out = runOnDisplay(KeysGuiScenario.class, DEMO.toString());
        Matcher m = Pattern.compile("GUI-KEY key=(\\S+) from=(\\d+) wafer=(\\d+) defect=(\\S+) box=(\\S+) same=(\\S+)"
                + " focus=(\\S+)").matcher(out);
        Map<String, int[]> steps = Map.of("PageDown", new int[] {1, 2}, "PageUp", new int[] {2, 1},
                "Alt+Right", new int[] {1, 2}, "Alt+Left", new int[] {2, 1}, "PageDown-in-thickness", new int[] {1, 2});
        int seen = 0;
        while (m.find()) {
            int[] fromTo = steps.get(m.group(1));
            assertThat(fromTo).as("key %s", m.group(1)).isNotNull();
            assertThat(Integer.parseInt(m.group(2))).as("wafer before %s", m.group(1)).isEqualTo(fromTo[0]);
            assertThat(Integer.parseInt(m.group(3))).as("wafer after %s", m.group(1)).isEqualTo(fromTo[1]);
            assertThat(m.group(4)).as("defect of the analysis after %s", m.group(1)).isEqualTo("midgap");
            assertThat(m.group(5)).as("choice of the Defect box after %s", m.group(1)).isEqualTo("midgap");
            assertThat(m.group(6)).as("analysis unchanged (no re-conversion) after %s", m.group(1)).isEqualTo("true");
            assertThat(m.group(7)).as("focus stays after %s", m.group(1))
                    .isEqualTo(m.group(1).endsWith("thickness") ? "thickness" : "defect");
            seen++;
        }
        assertThat(seen).as("key lines in:%n%s", out).isEqualTo(5);
        Matcher inj = Pattern.compile("GUI-INJECTION before=(.*) \\| after=(.*)").matcher(out);
        assertThat(inj.find()).as("injection line in:%n%s", out).isTrue();
        assertThat(inj.group(1)).as("injection chart title before the change").startsWith("defect fe-i,");
        assertThat(inj.group(2)).as("injection chart title right after choosing midgap").startsWith("defect midgap,");
    }

    @Test
    void identificationDialogRunsOnTheOpenLevelsAndShowsTheClickedPixel(@org.junit.jupiter.api.io.TempDir Path dir)
            throws Exception {
        List<trapmap.maps.model.WaferMap> maps = trapmap.viewer.model.SyntheticLevels.maps(
                new double[] {1e13, 1e14, 1e15}, 0.02, 11, "SYN-W01", true);
        String[] names = {"dn1e13", "dn1e14", "dn1e15"};
        for (int i = 0; i < maps.size(); i++) {
            trapmap.maps.io.MapFiles.write(maps.get(i), dir.resolve("SYN-W01-" + names[i] + ".tif"));
        }
        String out = runOnDisplay(IdentifyGuiScenario.class, dir.toString());
        Matcher head = Pattern.compile("GUI-IDENTIFY levels=(\\d+) legend=(\\d+) first=(\\S+) regions=(\\d+)"
                + " shown=(.*) fitSeries=(\\d+) rows=(.*)").matcher(out);
        assertThat(head.find()).as("identify line in:%n%s", out).isTrue();
        assertThat(head.group(1)).isEqualTo("3");
        // one row per ranked defect, then the two greys of "no single defect" and "too few levels"
        assertThat(Integer.parseInt(head.group(2))).isEqualTo((int) trapmap.physics.defect.DefectLibrary.all().stream()
                .filter(trapmap.physics.defect.Defect::hasAbsoluteCrossSections).count() + 2);
        assertThat(head.group(3)).isEqualTo("fe-i");
        assertThat(head.group(4)).isEqualTo("3");
        assertThat(head.group(5)).startsWith("region 1 (");
        assertThat(head.group(6)).isEqualTo("3");
        // the planted squares are found by themselves; where both overlap no single defect explains the curve
        assertThat(head.group(7).split(";")).contains("fe-i/OK", "cr-i/OK").anyMatch(r -> r.endsWith(
                "/no single defect"));
        Matcher click = Pattern.compile("GUI-CLICK px=(\\d+),(\\d+) shown=(.*)").matcher(out);
        assertThat(click.find()).as("click line in:%n%s", out).isTrue();
        assertThat(click.group(3)).isEqualTo("pixel (" + click.group(1) + ", " + click.group(2) + ")");
        for (trapmap.viewer.model.StackIdentification.Layer l : trapmap.viewer.model.StackIdentification.Layer.values()) {
            assertThat(out).contains("GUI-LAYER " + l.name() + " quantity=");
        }
        assertThat(out).contains("GUI-LAYER BEST quantity=defect-index", "GUI-LAYER STATUS quantity="
                + "identification-status", "GUI-LAYER CHI_SQUARED quantity=chi-squared");
        assertThat(out).contains("GUI-CANCEL phase=identification cancelled identify=true cancel=false"
                + " progress=false");
    }

    @Test
    void historyWindowChartsAStoreAndAClickedPointOpensItsWafer(@TempDir Path dir) throws Exception {
        // twelve stored wafers, one an hour, lots L1..L4 of three, tubes T1 (L1, L3) and T2 (L2, L4); the maps are
        // the demonstration set's, but the last wafer's map has been removed since it was stored
        String[] maps = {"LOT-A01-W01", "LOT-A01-W02", "LOT-A01-W03", "LOT-A01-W04", "LOT-A01-W05", "LOT-A01-W06",
            "LOT-A01-W07", "LOT-A01-W08", "LOT-N01-W01", "LOT-N01-W02", "LOT-N01-W03"};
        Path store = dir.resolve("history.db");
        java.time.Instant start = java.time.Instant.parse("2026-10-05T06:00:00Z");
        try (trapmap.store.ResultsStore s = trapmap.store.ResultsStore.open(store.toString())) {
            String run = s.startRun(new trapmap.store.RunInfo(start, "rules.json", "r", "{}", "s", "test"));
            for (int i = 0; i < 12; i++) {
                Path file = i < maps.length ? DEMO.resolve(maps[i] + ".tif") : dir.resolve("gone").resolve("H-W12.tif");
                String lot = "L" + (i / 3 + 1);
                double value = 3e10 * (1 + 0.05 * ((i * 7) % 5)) + (i >= 9 ? 3e10 : 0);
                Map<String, Double> figures = new java.util.LinkedHashMap<>();
                figures.put("trap_density_p50_cm3", value);
                figures.put("flagged_area_fraction", 0.001 * i);
                boolean pass = value < 5e10;
                trapmap.maps.batch.WaferResult r = new trapmap.maps.batch.WaferResult(file.toString(),
                        String.format(java.util.Locale.ROOT, "H-W%02d", i + 1), pass
                        ? trapmap.maps.batch.WaferResult.Status.PASS : trapmap.maps.batch.WaferResult.Status.FAIL,
                        pass ? "A" : "C", "default", "fe-i", figures, pass ? List.of() : List.of("trap_density_p50_cm3"),
                        List.of(), List.of(), "", null);
                java.time.Instant t = start.plusSeconds(3600L * i);
                s.write(run, new trapmap.store.WaferRecord(r, "sha" + i, Map.of("lot", lot, "measured_at",
                        t.toString(), "furnace_tube", (i / 3) % 2 == 0 ? "T1" : "T2"), lot, t, List.of()));
            }
        }
        Path png = dir.resolve("history.png");
        String out = runOnDisplay(HistoryGuiScenario.class, store.toString(), "4", "2", "2", "11", png.toString());
        assertThat(out).as("scenario output").doesNotContain("GUI-ERROR");
        assertThat(out).contains("GUI-NOSTORE error=true made=false status=store " + store + ".missing does not exist");
        assertThat(out).contains("GUI-HISTORY figures=flagged_area_fraction,trap_density_p50_cm3"
                + " figure=trap_density_p50_cm3 by=lot groupings=none,lot,day,week,furnace_tube charts=6");
        // charts by lot: X, mR, X-bar, R, yield, Pareto (three wafers failed); one yield row per lot
        assertThat(out).containsPattern("yields=4 status=12 wafers; \\d+ signal\\(s\\) after the baseline");
        // the 5th wafer in time is the 5th map; opened and shown in the viewer
        assertThat(out).contains("GUI-OPENED point=4 shown=LOT-A01-W05.tif open=1");
        // lot L3 (wafers 7-9) offers its three wafers; the third is LOT-N01-W01's map
        assertThat(out).contains("GUI-MENU point=2 wafers=H-W07,H-W08,H-W09");
        assertThat(out).contains("GUI-CHOSEN wafer=H-W09 shown=LOT-N01-W01.tif open=2");
        Matcher missing = Pattern.compile("GUI-MISSING point=11 error=true opened=0 status=(.*)").matcher(out);
        assertThat(missing.find()).as("missing line in:%n%s", out).isTrue();
        assertThat(missing.group(1)).contains("wafer H-W12", "H-W12.tif", "is no longer there");
        assertThat(out).contains("GUI-TUBES charts=individuals (X);moving range (mR);individuals (X) of T1;"
                + "moving range (mR) of T1;individuals (X) of T2;moving range (mR) of T2;Yield per group;"
                + "Pareto of failed rules");
        assertThat(out).contains("GUI-EXPORT status=written: " + png);
        java.awt.image.BufferedImage img = javax.imageio.ImageIO.read(png.toFile());
        assertThat(img.getWidth()).isEqualTo(1000);
        assertThat(img.getHeight()).as("8 charts of 380 px, as trend -o .png draws them").isEqualTo(8 * 380);
        // facts furnace_tube=T2 typed: lots L2 and L4 only, one chart pair (of T2) less
        assertThat(out).contains("GUI-FILTER wafers=12->6 charts=6 status=6 wafers;");
        assertThat(out).contains("GUI-BADFILTER error=true idle=true wafers=6 status=where must be NAME=VALUE"
                + " (e.g. furnace_tube=T2) but was boat_slot");
        assertThat(out).contains("GUI-CANCELCHART shown=true after=false status=chart request cancelled; the charts"
                + " shown are the last ones read");
        assertThat(out).contains("GUI-AFTERCANCEL idle=true wafers=6 filter=furnace_tube=T2 readCancelled=true"
                + " running=false");
        // lots typed with a quoted one: L1 and L3, six wafers, read at once after the cancel
        assertThat(out).contains("GUI-NEWAFTERCANCEL wafers=6 filter=lot L1, L3 running=false");
    }

    private static Path onPath(String name) {
        String path = System.getenv("PATH");
        if (path == null) {
            return null;
        }
        for (String dir : path.split(File.pathSeparator)) {
            Path p = Path.of(dir, name);
            if (Files.isExecutable(p)) {
                return p;
            }
        }
        return null;
    }

}
