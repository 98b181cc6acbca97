package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.material.DensityOfStatesModel;
import trapmap.physics.material.IntrinsicDensityModel;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.error.InvalidValueException;

/** The JSON form of the physics settings: defaults, every field, round trip and each refusal. */
class PhysicsSettingsFileTest {
    @TempDir
    Path dir;

    private Path file(String json) throws Exception {
        Path f = dir.resolve("physics.json");
        Files.writeString(f, json);
        return f;
    }

    @Test
    void anEmptyObjectIsTheDefaults() throws Exception {
        assertThat(PhysicsSettingsFile.read(file("{}"))).isEqualTo(PhysicsSettings.DEFAULTS);
        // the defaults are the normative ones: 1.1e7 cm/s, Sproul 1994, Altermatt 2003, Green 1990,
        // B_low = 4.73e-15 cm³/s (Trupke et al., JAP 94, 4930 (2003)), 5 % resolution
        PhysicsSettings d = PhysicsSettings.DEFAULTS;
        assertThat(d.velocities()).isEqualTo(ThermalVelocityModel.FIXED);
        assertThat(d.surfaceModel()).isEqualTo(SurfaceModel.SPROUL);
        assertThat(d.intrinsicDensity()).isEqualTo(IntrinsicDensityModel.ALTERMATT_2003);
        assertThat(d.densityOfStates()).isEqualTo(DensityOfStatesModel.GREEN_1990);
        assertThat(d.radiativeCm3PerS()).isEqualTo(4.73e-15);
        assertThat(d.detectionResolution()).isEqualTo(0.05);
    }

    @Test
    void everyFieldIsReadAndWrittenBack() throws Exception {
        PhysicsSettings s = PhysicsSettingsFile.read(file("{\"thermal_velocity\": \"green\", \"surface_model\":"
                + " \"exact\", \"intrinsic_density\": \"misiakos-1993\", \"density_of_states\": \"couderc-2014\","
                + " \"radiative_coefficient_cm3_s\": 4.0e-15, \"detection_resolution\": 0.02}"));
        assertThat(s).isEqualTo(new PhysicsSettings(ThermalVelocityModel.GREEN_1990, SurfaceModel.EXACT,
                IntrinsicDensityModel.MISIAKOS_1993, DensityOfStatesModel.COUDERC_2014, 4.0e-15, 0.02));
        String json = new ObjectMapper().writeValueAsString(PhysicsSettingsFile.toJson(s));
        assertThat(PhysicsSettingsFile.read(file(json))).isEqualTo(s);
        assertThat(s.describe()).containsEntry("thermal_velocity", "green")
                .containsEntry("intrinsic_density", "misiakos-1993");
    }

    @Test
    void anUnknownKeyIsRefusedWithTheKnownOnes() throws Exception {
        Path f = file("{\"vth\": \"green\"}");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f)).isInstanceOf(InvalidValueException.class)
                .hasMessageStartingWith(f.toString()).hasMessageContaining("field 'vth'")
                .hasMessageContaining("thermal_velocity");
    }

    @Test
    void anUnknownModelNameIsRefusedWithTheNames() throws Exception {
        Path f = file("{\"intrinsic_density\": \"sze\"}");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f)).hasMessageContaining("field 'intrinsic_density'")
                .hasMessageContaining("altermatt-2003").hasMessageContaining("couderc-2014");
    }

    @Test
    void numbersOutOfRangeNameFieldAndUnit() throws Exception {
        Path f = file("{\"radiative_coefficient_cm3_s\": 4.73}");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f))
                .hasMessageContaining("field 'radiative_coefficient_cm3_s'").hasMessageContaining("(cm^3/s)")
                .hasMessageContaining("4.73");
        Path g = file("{\"detection_resolution\": \"5%\"}");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(g)).hasMessageContaining("field 'detection_resolution'")
                .hasMessageContaining("must be a number");
        Path h = file("{\"detection_resolution\": 0}");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(h)).hasMessageContaining("field 'detection_resolution'");
    }

    @Test
    void notJsonOrMissingFileSaysSo() throws Exception {
        Path f = file("{\"thermal_velocity\": ");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f)).hasMessageStartingWith(f.toString())
                .hasMessageContaining("not valid JSON");
        Path none = dir.resolve("none.json");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(none)).hasMessageContaining("no such physics settings file");
        Path array = file("[1]");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(array)).hasMessageContaining("must be a JSON object");
    }

    @Test
    void aLineBreakInAKeyStaysOnTheMessagesOneLine() throws Exception {
        Path f = file("{\"detection\\nresolution\": 0.1}");
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f)).isInstanceOf(InvalidValueException.class)
                .hasMessageStartingWith(f + ": field 'detection\\nresolution': unknown key")
                .satisfies(e -> assertThat(e.getMessage()).doesNotContain("\n"));
    }
}
