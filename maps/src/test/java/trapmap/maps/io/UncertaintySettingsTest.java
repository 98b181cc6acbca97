package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.shared.error.InvalidValueException;

/** The {@code uncertainty} block of a physics settings file: defaults, every field, round trip and refusals. */
class UncertaintySettingsTest {
    @TempDir
    Path dir;

    private Path file(String json) throws Exception {
        Path f = dir.resolve("physics.json");
        Files.writeString(f, json);
        return f;
    }

    @Test
    void withoutABlockTheDefaultsHold() throws Exception {
        assertThat(PhysicsSettingsFile.readUncertainty(file("{\"thermal_velocity\": \"green\"}")))
                .isEqualTo(UncertaintySettings.DEFAULTS);
        assertThat(UncertaintySettings.DEFAULTS.uncertainty()).isEqualTo(ConditionUncertainty.DEFAULTS);
        assertThat(UncertaintySettings.DEFAULTS.samples()).isEqualTo(10_000);
        assertThat(UncertaintySettings.DEFAULTS.seed()).isEqualTo(1);
    }

    @Test
    void everyFieldIsReadAndWrittenBackAndTheModelsStillRead() throws Exception {
        Path f = file("{\"detection_resolution\": 0.02, \"uncertainty\": {\"doping_relative\": 0.1,"
                + " \"thickness_relative\": 0.03, \"srv_relative\": 0.2, \"injection_relative\": 0.05,"
                + " \"temperature_k\": 2, \"lifetime_relative\": 0.01, \"samples\": 5000, \"seed\": 42}}");
        UncertaintySettings u = PhysicsSettingsFile.readUncertainty(f);
        assertThat(u).isEqualTo(new UncertaintySettings(new ConditionUncertainty(0.1, 0.03, 0.2, 0.05, 2, 0.01),
                5000, 42));
        assertThat(PhysicsSettingsFile.read(f).detectionResolution()).isEqualTo(0.02);
        String json = new ObjectMapper().writeValueAsString(java.util.Map.of("uncertainty", u.toJson()));
        assertThat(PhysicsSettingsFile.readUncertainty(file(json))).isEqualTo(u);
        // a partial block keeps the other defaults
        assertThat(PhysicsSettingsFile.readUncertainty(file("{\"uncertainty\": {\"srv_relative\": 0}}"))
                .uncertainty()).isEqualTo(new ConditionUncertainty(0.05, 0.02, 0, 0.1, 1, 0.03));
        assertThat(PhysicsSettingsFile.read(file("{\"uncertainty\": {}}"))).isEqualTo(PhysicsSettings.DEFAULTS);
    }

    @Test
    void badValuesNameTheFileTheFieldAndTheUnit() throws Exception {
        Path f = file("{\"uncertainty\": {\"temperature_k\": 80}}");
        assertThatThrownBy(() -> PhysicsSettingsFile.readUncertainty(f)).isInstanceOf(InvalidValueException.class)
                .hasMessageStartingWith(f + ": field 'uncertainty.temperature_k'").hasMessageContaining("(K)");
        // the models' reader refuses the same block: one parser
        assertThatThrownBy(() -> PhysicsSettingsFile.read(f)).hasMessageContaining("uncertainty.temperature_k");
        Path g = file("{\"uncertainty\": {\"doping\": 0.1}}");
        assertThatThrownBy(() -> PhysicsSettingsFile.readUncertainty(g))
                .hasMessageContaining("field 'uncertainty.doping': unknown key").hasMessageContaining("doping_relative");
        Path h = file("{\"uncertainty\": {\"samples\": 1.5}}");
        assertThatThrownBy(() -> PhysicsSettingsFile.readUncertainty(h))
                .hasMessageContaining("'uncertainty.samples': must be a whole number in [16, 4194304]");
        Path i = file("{\"uncertainty\": {\"lifetime_relative\": -0.1}}");
        assertThatThrownBy(() -> PhysicsSettingsFile.readUncertainty(i))
                .hasMessageContaining("'uncertainty.lifetime_relative'").hasMessageContaining("relative");
        Path j = file("{\"uncertainty\": [1]}");
        assertThatThrownBy(() -> PhysicsSettingsFile.readUncertainty(j))
                .hasMessageContaining("'uncertainty': must be a JSON object");
        Path k = file("{\"uncertainty\": {\"seed\": \"x\"}}");
        assertThatThrownBy(() -> PhysicsSettingsFile.readUncertainty(k))
                .hasMessageContaining("'uncertainty.seed': must be a whole number");
    }
}
