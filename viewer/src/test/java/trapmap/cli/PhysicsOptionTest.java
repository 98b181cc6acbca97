package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;

/**
 * {@code --physics FILE}: one settings file reproduces a {@code convert --vth green} result in {@code inspect},
 * bad files end with exit status 2 and one line naming the file and field, and the settings are recorded in the
 * outputs' provenance.
 */
class PhysicsOptionTest {
    private static final Path MAP = Path.of("..", "demo-data", "LOT-A01-W02.tif");
    private static final String RULES = "{\"defect\": \"fe-i\", \"flag\": {\"quantity\": \"trap-density\","
            + " \"threshold\": 1e12}, \"limits\": {\"trap_density_p50_cm3\": {\"max\": 1e15},"
            + " \"trap_density_p95_cm3\": {\"max\": 1e15}}}";

    @TempDir
    Path dir;

    private Path write(String name, String text) throws Exception {
        Path f = dir.resolve(name);
        Files.writeString(f, text);
        return f;
    }

    private JsonNode inspect(Path rules, String... extra) throws Exception {
        Path out = dir.resolve("report-" + extra.length);
        String[] args = new String[7 + extra.length];
        String[] base = {"inspect", MAP.toString(), "--rules", rules.toString(), "--out", out.toString(),
            "--overwrite"};
        System.arraycopy(base, 0, args, 0, 7);
        System.arraycopy(extra, 0, args, 7, extra.length);
        Cli.Run r = Cli.run(args);
        assertThat(r.code()).as(r.err()).isIn(0, 1);
        return Cli.parse(Files.readString(out.resolve("results.json")));
    }

    @Test
    void convertWithGreenVelocitiesIsReproducedByInspectWithThePhysicsFile() throws Exception {
        Path nt = dir.resolve("nt.tif");
        Cli.Run c = Cli.run("convert", MAP.toString(), "--defect", "fe-i", "--vth", "green", "-o", nt.toString());
        assertThat(c.code()).as(c.err()).isZero();
        Path rules = write("rules.json", RULES);
        Path green = write("green.json", "{\"thermal_velocity\": \"green\"}");
        JsonNode withGreen = inspect(rules, "--physics", green.toString());
        JsonNode withDefaults = inspect(rules);
        assertThat(withGreen.get("physics").get("thermal_velocity").asText()).isEqualTo("green");
        assertThat(withDefaults.get("physics").get("thermal_velocity").asText()).isEqualTo("fixed");

        // the converted map's statistics over the pixels the batch evaluates
        WaferMap read = MapFiles.readSingle(MAP);
        boolean[] evaluated = new WaferInspection(Rules.read(rules)).judge(MAP.getFileName().toString(), read, null)
                .evaluated();
        WaferMap converted = MapFiles.readSingle(nt);
        MapStatistics st = MapStatistics.of(converted, Mask.of(converted.width(), converted.height(),
                i -> evaluated[i]), StatisticsRequest.of(new double[] {50, 95}));
        JsonNode wafer = withGreen.get("wafers").get(0);
        // quantiles of the float trap-density map are written at float precision
        assertThat(wafer.get("trap_density_p50_cm3").floatValue()).isEqualTo((float) st.percentile(50));
        assertThat(wafer.get("trap_density_p95_cm3").floatValue()).isEqualTo((float) st.percentile(95));
        // and the defaults give other densities, so the settings did reach the batch
        assertThat(withDefaults.get("wafers").get(0).get("trap_density_p50_cm3").floatValue())
                .isNotEqualTo((float) st.percentile(50));

        // a physics block in the rules file does the same as --physics
        Path rulesGreen = write("rules-green.json", RULES.substring(0, RULES.length() - 1)
                + ", \"physics\": {\"thermal_velocity\": \"green\"}}");
        assertThat(inspect(rulesGreen).get("wafers").get(0).get("trap_density_p50_cm3").floatValue())
                .isEqualTo((float) st.percentile(50));
    }

    @Test
    void theConvertedMapsHistoryRecordsEverySetting() throws Exception {
        Path nt = dir.resolve("nt.tif");
        Path physics = write("p.json", "{\"intrinsic_density\": \"sproul-green-1991\", \"detection_resolution\":"
                + " 0.02}");
        Cli.Run c = Cli.run("convert", MAP.toString(), "--defect", "fe-i", "--physics", physics.toString(), "-o",
                nt.toString());
        assertThat(c.code()).as(c.err()).isZero();
        var steps = MapFiles.readSingle(nt).provenance().steps();
        ProcessingStep last = steps.get(steps.size() - 1);
        assertThat(last.operation()).isEqualTo("convert");
        assertThat(last.parameters()).containsEntry("physics.intrinsic_density", "sproul-green-1991")
                .containsEntry("physics.detection_resolution", "0.02")
                .containsEntry("physics.thermal_velocity", "fixed").containsKey("physics.density_of_states");
    }

    private static String pdfText(Path pdf) throws Exception {
        try (org.apache.pdfbox.pdmodel.PDDocument doc = org.apache.pdfbox.Loader.loadPDF(pdf.toFile())) {
            return new org.apache.pdfbox.text.PDFTextStripper().getText(doc).replaceAll("\\s+", " ");
        }
    }

    @Test
    void thePdfsStateTheSettings() throws Exception {
        Path rules = write("rules.json", RULES);
        Path green = write("green.json", "{\"thermal_velocity\": \"green\"}");
        inspect(rules, "--physics", green.toString());
        assertThat(pdfText(dir.resolve("report-2").resolve("summary.pdf")))
                .contains("Physics settings of every conversion: thermal_velocity=green");
        Path pdf = dir.resolve("wafer.pdf");
        Cli.Run r = Cli.run("report", MAP.toString(), "--rules", rules.toString(), "--physics", green.toString(),
                "--quantity", "trap-density", "-o", pdf.toString());
        assertThat(r.code()).as(r.err()).isIn(0, 1);
        assertThat(pdfText(pdf)).contains("physics settings: thermal_velocity=green");
    }

    @Test
    void theIronMapsHistoryRecordsTheSettings() throws Exception {
        Path out = dir.resolve("fe.tif");
        Path green = write("green.json", "{\"thermal_velocity\": \"green\"}");
        Cli.Run r = Cli.run("iron", "../demo-data/LOT-A03-W02-feb-state.tif", "../demo-data/LOT-A03-W02-fe-i-state.tif",
                "-o", out.toString(), "--physics", green.toString());
        assertThat(r.code()).as(r.err()).isIn(0, 2);
        var steps = MapFiles.readSingle(out).provenance().steps();
        assertThat(steps.get(steps.size() - 1).parameters()).containsEntry("physics.thermal_velocity", "green");
    }

    @Test
    void calcUsesTheFileAndReportsIt() throws Exception {
        Path physics = write("p.json", "{\"thermal_velocity\": \"green\"}");
        JsonNode viaFile = Cli.json("calc", "--lifetime-us", "20", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--physics", physics.toString(), "--json");
        JsonNode viaFlag = Cli.json("calc", "--lifetime-us", "20", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--vth", "green", "--json");
        assertThat(viaFile.get("trap_density_cm3").asDouble()).isEqualTo(viaFlag.get("trap_density_cm3").asDouble());
        assertThat(viaFile.get("physics").asText()).contains("thermal_velocity=green");
    }

    @Test
    void invalidSettingsFilesEndWithStatus2AndNameTheField() throws Exception {
        Path bad = write("bad.json", "{\"radiative_coefficient_cm3_s\": -1}");
        for (String[] args : new String[][] {
            {"calc", "--lifetime-us", "20", "--doping", "p:1e16", "--injection", "1e14", "--defect", "fe-i",
                "--physics", bad.toString()},
            {"convert", MAP.toString(), "--defect", "fe-i", "--physics", bad.toString(), "-o",
                dir.resolve("x.tif").toString()},
            {"stats", MAP.toString(), "--physics", bad.toString()},
            {"inspect", MAP.toString(), "--rules", write("r.json", RULES).toString(), "--out",
                dir.resolve("o").toString(), "--physics", bad.toString()}}) {
            Cli.Run r = Cli.run(args);
            assertThat(r.code()).as(String.join(" ", args)).isEqualTo(2);
            assertThat(r.err()).as(args[0]).contains("--physics " + bad)
                    .contains("field 'radiative_coefficient_cm3_s'").contains("cm^3/s");
        }
        Path unknown = write("unknown.json", "{\"vth\": \"green\"}");
        Cli.Run r = Cli.run("calc", "--lifetime-us", "20", "--doping", "p:1e16", "--injection", "1e14", "--defect",
                "fe-i", "--physics", unknown.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.err()).contains("field 'vth'").contains("thermal_velocity");
    }
}
