package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;

/** {@code trapmap iron} on the demonstration FeB pair, checked against the planted iron of demo-data/truth.json. */
class IronMapCommandTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final String FEB = DEMO.resolve("LOT-A03-W02-feb-state.tif").toString();
    private static final String FEI = DEMO.resolve("LOT-A03-W02-fe-i-state.tif").toString();

    @TempDir
    Path dir;

    @Test
    void recoversThePlantedIronWithinTenPercent() throws Exception {
        Path out = dir.resolve("fe.tif");
        Path status = dir.resolve("fe-status.tif");
        JsonNode j = Cli.json("iron", FEB, FEI, "-o", out.toString(), "--status-output", status.toString(), "--json");
        WaferMap fe = MapFiles.readSingle(out);
        assertThat(fe.quantity()).isEqualTo(Quantity.IRON_DENSITY);
        assertThat(MapFiles.readSingle(status).quantity()).isEqualTo(Quantity.STATUS);
        JsonNode truth = new ObjectMapper().readTree(DEMO.resolve("truth.json").toFile());
        int checked = 0;
        for (JsonNode f : truth.get("files")) {
            if (!f.get("file").asText().equals("LOT-A03-W02-fe-i-state.tif")) {
                continue;
            }
            for (JsonNode d : f.get("defects")) {
                double x = d.get("probe_x_mm").asDouble();
                double y = d.get("probe_y_mm").asDouble();
                double planted = d.get("density_cm3").asDouble();
                int px = (int) Math.round(fe.grid().xPx(x));
                int py = (int) Math.round(fe.grid().yPx(y));
                assertThat((double) fe.raster().get(px, py)).as("[Fe_i] at %s (%s, %s) mm", d.get("kind"), x, y)
                        .isCloseTo(planted, within(0.10 * planted));
                checked++;
            }
        }
        assertThat(checked).isEqualTo(2);
        assertThat(j.get("injection_cm3").asDouble()).isEqualTo(1e13);
        assertThat(j.get("crossover_injection_cm3").asDouble()).isBetween(1e13, 1e15);
        assertThat(j.get("status_counts").get("ok").asInt()).isEqualTo(j.get("pixels_with_value").asInt());
        assertThat(j.get("iron_p95_cm3").asDouble()).isGreaterThan(j.get("iron_median_cm3").asDouble());
        assertThat(j.get("warnings")).isEmpty();
    }

    @Test
    void injectionAtTheCrossoverMarksEveryPixel() {
        JsonNode j = Cli.json("iron", FEB, FEI, "--no-registration", "--injection", "1.1e14", "--json");
        assertThat(j.get("status_counts").get("crossover").asInt()).isGreaterThan(60000);
        assertThat(j.get("status_counts").get("ok").asInt()).isZero();
        assertThat(j.get("pixels_with_value").asInt()).isZero();
        assertThat(j.get("iron_median_cm3").isNull()).isTrue();
        JsonNode near = Cli.json("iron", FEB, FEI, "--no-registration", "--injection", "7e13", "--json");
        assertThat(near.get("status_counts").get("near-crossover").asInt()).isGreaterThan(60000);
    }

    @Test
    void aMapOfAnotherWaferWarnsAndStrictFails() {
        Cli.Run r = Cli.run("iron", FEB, DEMO.resolve("LOT-A01-W01.tif").toString(), "--strict",
                "--injection", "1e13");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).anyMatch(l -> l.contains("different wafer ids"));
    }

    @Test
    void calcIronStillAnswersForOnePair() {
        JsonNode j = Cli.json("calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "p:1e16",
                "--injection", "1e13", "--json");
        assertThat(j.get("fe_i_cm3").asDouble()).isCloseTo(1.0e12, within(0.01e12)); // as before the map command
    }

    @Test
    void anOutputOrStatusOutputOntoAnInputIsRefusedAndTheInputsKept() throws Exception {
        Path feb = dir.resolve("w-feb.tif");
        Path fei = dir.resolve("w-fei.tif");
        java.nio.file.Files.copy(Path.of(FEB), feb);
        java.nio.file.Files.copy(Path.of(FEI), fei);
        java.nio.file.Files.copy(DEMO.resolve("LOT-A03-W02-fe-i-state.json"), dir.resolve("w-fei.json"));
        byte[] febBytes = java.nio.file.Files.readAllBytes(feb);
        byte[] feiBytes = java.nio.file.Files.readAllBytes(fei);
        for (String option : new String[] {"-o", "--status-output"}) {
            for (Path target : new Path[] {feb, fei}) {
                Cli.Run r = Cli.run("iron", feb.toString(), fei.toString(), "--no-registration", option,
                        target.toString());
                String named = option.equals("-o") ? "--output" : option;
                assertThat(r.code()).as("%s %s", option, target).isEqualTo(2);
                assertThat(r.errLines()).hasSize(1);
                assertThat(r.err()).startsWith("trapmap iron: " + named + " " + target + " would overwrite " + target)
                        .contains("input files are never modified");
            }
        }
        assertThat(java.nio.file.Files.readAllBytes(feb)).isEqualTo(febBytes);
        assertThat(java.nio.file.Files.readAllBytes(fei)).isEqualTo(feiBytes);
    }

    @Test
    void badOutputsAreRefusedBeforeAnyFileIsWritten() throws Exception {
        Path iron = dir.resolve("fe.tif");
        Cli.Run r = Cli.run("iron", FEB, FEI, "-o", iron.toString(), "--status-output",
                dir.resolve("status.json").toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap iron: --status-output " + dir.resolve("status.json")
                + ": unsupported output type");
        assertThat(iron).doesNotExist();

        r = Cli.run("iron", FEB, FEI, "-o", iron.toString(), "--status-output", iron.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap iron: --status-output " + iron + " is also --output");
        assertThat(iron).doesNotExist();
    }

    @Test
    void aMaximumTurnWithNoRegistrationIsRefusedNotIgnored() {
        Cli.Run r = Cli.run("iron", FEB, FEI, "--no-registration", "--max-rotation-deg", "2");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).containsExactly("trapmap iron: --max-rotation-deg shapes the registration, which"
                + " --no-registration leaves out: give one or the other");
    }

    @Test
    void theTextOutputCarriesTheCautionOfDensitiesBesideTheIronOne() {
        Cli.Run r = Cli.run("iron", FEB, FEI);
        assertThat(r.code()).isZero();
        assertThat(r.out()).contains("caution: " + trapmap.maps.process.IronMapping.CAUTION)
                .contains("caution: " + trapmap.maps.model.Caution.TEXT);
    }
}
