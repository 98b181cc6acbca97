package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;
import trapmap.maps.io.DefectFileException;
import trapmap.maps.io.DefectFiles;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.EnergyReference;
import trapmap.physics.defect.Range;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.viewer.model.DefectForm.Spread;

class DefectFormTest {
    private static DefectForm form(String degeneracy, String vth, Spread energy, Spread sn, Spread sp) {
        return new DefectForm("my-defect", "", "Ev", "0.40", degeneracy, "1e-14", "1e-15", vth, energy, sn, sp,
                "", "own measurement");
    }

    @Test
    void emptyOptionalFieldsTakeTheDefectFileDefaults() throws Exception {
        Defect d = form("", "", Spread.NONE, Spread.NONE, Spread.NONE).toDefect();
        Defect fromFile = DefectFiles.parse("{\"id\": \"my-defect\", \"source\": \"own measurement\", \"level\":"
                + " {\"reference\": \"Ev\", \"energy_ev\": 0.40}, \"sigma_n_cm2\": 1e-14, \"sigma_p_cm2\": 1e-15}",
                "f.json").get(0);
        assertThat(d).isEqualTo(fromFile);
        assertThat(d.level().degeneracy()).isEqualTo(Double.parseDouble(DefectForm.DEFAULT_DEGENERACY)).isEqualTo(1.0);
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.FIXED);
        assertThat(d.spread().electronCrossSectionCm2()).isEqualTo(Range.of(1e-14));
        assertThat(d.name()).isEqualTo("my-defect");
    }

    @Test
    void degeneracySpreadsAndConventionReachTheDefectAsFromAFile() throws Exception {
        Defect d = form("4", "green", new Spread("0.35", "0.45"), new Spread("5e-15", "5e-14"), Spread.NONE)
                .toDefect();
        Defect fromFile = DefectFiles.parse("{\"id\": \"my-defect\", \"source\": \"own measurement\", \"level\":"
                + " {\"reference\": \"Ev\", \"energy_ev\": 0.40, \"degeneracy\": 4}, \"sigma_n_cm2\": 1e-14,"
                + " \"sigma_p_cm2\": 1e-15, \"vth_convention\": \"green\", \"spread\": {\"energy_ev\": [0.35, 0.45],"
                + " \"sigma_n_cm2\": [5e-15, 5e-14]}}", "f.json").get(0);
        assertThat(d.level()).isEqualTo(fromFile.level());
        assertThat(d.level().reference()).isEqualTo(EnergyReference.VALENCE_BAND);
        assertThat(d.level().degeneracy()).isEqualTo(4.0);
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(d.spread().energyEv()).isEqualTo(new Range(0.35, 0.45)).isEqualTo(fromFile.spread().energyEv());
        assertThat(d.spread().electronCrossSectionCm2()).isEqualTo(new Range(5e-15, 5e-14));
        assertThat(d.spread().holeCrossSectionCm2()).isEqualTo(Range.of(1e-15));
    }

    @Test
    void badValuesAreNamedByFieldAndUnit() {
        assertThatThrownBy(() -> form("x", "", Spread.NONE, Spread.NONE, Spread.NONE).toDefect())
                .isInstanceOf(DefectFileException.class).hasMessageStartingWith("New defect: field 'level.degeneracy'")
                .hasMessageContaining("'x'");
        assertThatThrownBy(() -> form("", "", Spread.NONE, new Spread("1e-13", "1e-12"), Spread.NONE).toDefect())
                .hasMessageContaining("field 'spread.sigma_n_cm2'").hasMessageContaining("cm^2")
                .hasMessageContaining("must contain the nominal value");
        assertThatThrownBy(() -> form("", "", new Spread("0.3", ""), Spread.NONE, Spread.NONE).toDefect())
                .hasMessageContaining("field 'spread.energy_ev'").hasMessageContaining("eV");
        assertThatThrownBy(() -> form("", "warm", Spread.NONE, Spread.NONE, Spread.NONE).toDefect())
                .hasMessageContaining("field 'vth_convention'").hasMessageContaining("fixed, green");
        assertThatThrownBy(() -> new DefectForm("fe-i", "", "Ev", "0.38", "", "1e-14", "1e-16", "", Spread.NONE,
                Spread.NONE, Spread.NONE, "", "x").toDefect()).hasMessageContaining("built-in defect id");
    }
}
