package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.model.Quantity;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ThermalVelocityModel;

/**
 * The viewer converts with one set of physics settings: the user's (view --physics, a session's block), else the
 * rules file's block; it judges with them exactly as the batch does, and the n-type wafer converted with a p-type
 * defect carries the conductivity-type warning.
 */
class ViewerPhysicsTest {
    private static final PhysicsSettings GREEN = PhysicsSettings.DEFAULTS.withVelocities(
            ThermalVelocityModel.GREEN_1990);

    @TempDir
    Path dir;

    private static ViewerModel opened(Path... files) {
        ViewerModel m = new ViewerModel();
        m.open(List.of(files));
        return m;
    }

    @Test
    void quickCheckConvertsWithTheChosenSettings() {
        ViewerModel m = opened(ViewerModelTest.W03);
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withQuantity(DisplayedQuantity.TRAP_DENSITY), "settings");
        WaferAnalysis defaults = m.compute(0, () -> false);
        m.setPhysics(GREEN);
        assertThat(m.physics()).isEqualTo(GREEN);
        WaferAnalysis green = m.compute(0, () -> false);
        assertThat(green.conversion().physics()).isEqualTo(GREEN);
        float[] expected = MapConversion.convert(green.lifetime(), DefectLibrary.byId("fe-i"),
                ConversionSettings.of(GREEN)).get(Quantity.TRAP_DENSITY).raster().samples();
        assertThat(green.displayed().raster().samples()).containsExactly(expected);
        assertThat(green.displayedStats().median()).isNotEqualTo(defaults.displayedStats().median());
    }

    @Test
    void rulesVerdictWithPhysicsEqualsTheBatchWithTheSameSettings() throws Exception {
        String text = """
                {"defect": "fe-i", "flag": {"quantity": "trap-density", "threshold": 3e11, "min_area_mm2": 2},
                 "limits": {"trap_density_p95_cm3": {"max": 1e12}}}""";
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, text);
        WaferResult batch = new WaferInspection(Rules.parse(text, "r").withPhysics(GREEN))
                .inspect(ViewerModelTest.W03);
        WaferResult batchDefaults = new WaferInspection(Rules.parse(text, "r")).inspect(ViewerModelTest.W03);
        ViewerModel m = opened(ViewerModelTest.W03);
        m.loadRules(rules);
        m.setPhysics(GREEN);
        WaferAnalysis r = m.compute(0, () -> false);
        assertThat(r.verdict().rulesVerdict()).isTrue();
        double p95 = batch.figures().get("trap_density_p95_cm3");
        assertThat(p95).isNotEqualTo(batchDefaults.figures().get("trap_density_p95_cm3"));
        assertThat(r.conversion().physics()).isEqualTo(GREEN);
        // the viewer shows what the batch judged: the same p95 over the evaluated pixels
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        assertThat(m.compute(0, () -> false).displayedStats().percentile(95)).isEqualTo(p95);
    }

    @Test
    void sessionKeepsThePhysicsBlock() throws Exception {
        ViewerModel m = opened(ViewerModelTest.W03);
        m.setPhysics(GREEN);
        Path f = dir.resolve("s.json");
        SessionFiles.write(Session.of(m), f);
        assertThat(Files.readString(f)).contains("\"physics\"").contains("\"thermal_velocity\" : \"green\"");
        ViewerModel back = new ViewerModel();
        SessionFiles.read(f).applyTo(back);
        assertThat(back.physics()).isEqualTo(GREEN);
        Files.writeString(f, Files.readString(f).replace("\"green\"", "\"blue\""));
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> SessionFiles.read(f))
                .hasMessageContaining("physics.thermal_velocity");
    }

    @Test
    void pTypeDefectOnAnNTypeWaferWarnsOnScreenAndInTheReport() {
        ViewerModel m = opened(ViewerModelTest.DEMO.resolve("LOT-N01-W01.tif"));
        m.setAnalysis(Analysis.DEFAULT.withDefect("fe-i").withQuantity(DisplayedQuantity.TRAP_DENSITY), "settings");
        WaferAnalysis r = m.compute(0, () -> false);
        assertThat(r.warnings()).contains(ConversionWarning.P_TYPE_DEFECT_ON_N_TYPE);
        assertThat(trapmap.viewer.report.WaferPages.of(Path.of("n.tif"), r, null, DefectLibrary.byId("fe-i"))
                .notes()).anyMatch(n -> n.contains("n-type") && n.contains("midgap"))
                .anyMatch(n -> n.startsWith("physics settings: thermal_velocity=fixed"));
    }
}
