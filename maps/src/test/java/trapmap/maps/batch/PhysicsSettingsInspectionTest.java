package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ThermalVelocityModel;

/**
 * The batch converts with the rules' physics settings: a map judged with a {@code physics} block of green
 * velocities gets exactly the densities {@link MapConversion} gives with those settings (and not the defaults'),
 * and the settings are recorded in the density map's history.
 */
class PhysicsSettingsInspectionTest {
    private static final Path MAP = Path.of("..", "demo-data", "LOT-A01-W02.tif");
    private static final String RULES = "{\"defect\": \"fe-i\", \"flag\": {\"quantity\": \"trap-density\","
            + " \"threshold\": 1e12}%s}";

    @Test
    void judgedDensitiesEqualTheConversionWithTheRulesSettings() throws Exception {
        Rules rules = Rules.parse(String.format(RULES, ", \"physics\": {\"thermal_velocity\": \"green\"}"), "r.json");
        assertThat(rules.physics().velocities()).isEqualTo(ThermalVelocityModel.GREEN_1990);
        WaferMap read = MapFiles.readSingle(MAP);
        WaferInspection.Evaluation ev = new WaferInspection(rules).judge(MAP.getFileName().toString(), read, null);
        float[] judged = ev.density().raster().samples();
        PhysicsSettings green = PhysicsSettings.DEFAULTS.withVelocities(ThermalVelocityModel.GREEN_1990);
        float[] converted = MapConversion.convert(ev.lifetime(), DefectLibrary.byId("fe-i"),
                ConversionSettings.of(green), 1).get(Quantity.TRAP_DENSITY).raster().samples();
        float[] defaults = MapConversion.convert(ev.lifetime(), DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS, 1).get(Quantity.TRAP_DENSITY).raster().samples();
        int compared = 0;
        int differ = 0;
        for (int i = 0; i < judged.length; i++) {
            if (ev.evaluated()[i]) {
                assertThat(judged[i]).as("pixel %d", i).isEqualTo(converted[i]);
                compared++;
                if (judged[i] != defaults[i]) {
                    differ++;
                }
            }
        }
        assertThat(compared).isPositive();
        // Green's electron velocity is 2.05e7 cm/s instead of 1.1e7: most densities change (not all: the detection
        // limit of a BELOW_LIMIT pixel does not depend on v_th alone)
        assertThat(differ).isGreaterThan(compared / 2);
        ProcessingStep step = ev.density().provenance().steps().get(ev.density().provenance().steps().size() - 1);
        assertThat(step.parameters()).containsEntry("physics.thermal_velocity", "green")
                .containsEntry("physics.radiative_coefficient_cm3_s", "4.73E-15");
    }

    @Test
    void withoutABlockTheDefaultsAndAnInvalidBlockNamesFileAndField() throws Exception {
        assertThat(Rules.parse(String.format(RULES, ""), "r.json").physics()).isEqualTo(PhysicsSettings.DEFAULTS);
        assertThatThrownBy(() -> Rules.parse(String.format(RULES, ", \"physics\": {\"detection_resolution\": 2}"),
                "r.json")).isInstanceOf(RulesException.class).hasMessageStartingWith("r.json: field"
                        + " 'physics.detection_resolution'");
        assertThatThrownBy(() -> Rules.parse(String.format(RULES, ", \"physics\": {\"surface_model\": \"fast\"}"),
                "r.json")).hasMessageContaining("'physics.surface_model'").hasMessageContaining("sproul, exact");
    }
}
