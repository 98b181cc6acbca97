package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.viewer.model.ConditionFields.Field;

class ConditionFieldsTest {
    private static ConditionFields typed(String thickness, String temperature) {
        return new ConditionFields("p", "", true, thickness, temperature, false, "", "");
    }

    @Test
    void emptyFieldsAreValidAndKeepTheSidecarValues() {
        ConditionFields.Outcome o = typed("", " ").check();
        assertThat(o.errors()).isEmpty();
        assertThat(o.overrides()).isEqualTo(ConditionOverrides.NONE);
    }

    @Test
    void eachBadFieldHasItsOwnMessageNamingFieldAndUnit() {
        ConditionFields.Outcome o = typed("0", "x").check();
        assertThat(o.overrides()).isNull();
        assertThat(o.error(Field.THICKNESS)).contains("thickness").contains("µm").contains("0");
        assertThat(o.error(Field.TEMPERATURE)).isEqualTo("temperature: 'x' is not a number (K)");
        assertThat(o.error(Field.DOPING)).isNull();
    }

    @Test
    void clearingOneBadFieldClearsItsErrorWhileAnotherStaysWrong() {
        ConditionFields.Outcome o = typed("", "x").check();
        assertThat(o.error(Field.THICKNESS)).isNull();
        assertThat(o.error(Field.TEMPERATURE)).isNotNull();
        ConditionFields.Outcome fixed = typed("", "").check();
        assertThat(fixed.errors()).isEmpty();
        assertThat(fixed.overrides()).isEqualTo(ConditionOverrides.NONE);
    }

    @Test
    void validFieldsBecomeTheOverrides() {
        ConditionFields.Outcome o = new ConditionFields("n", "2.5", true, "180", "310", true, "1e17", "10").check();
        assertThat(o.errors()).isEmpty();
        assertThat(o.overrides().thicknessUm()).isEqualTo(180.0);
        assertThat(o.overrides().temperatureK()).isEqualTo(310.0);
        assertThat(o.overrides().generationPerCm3PerS()).isEqualTo(1e17);
        assertThat(o.overrides().injectionPerCm3()).isNull();
        assertThat(o.overrides().srvCmPerS()).isEqualTo(10.0);
        assertThat(o.overrides().parsedDoping().fromResistivity()).isTrue();
        ConditionFields.Outcome bad = new ConditionFields("n", "abc", false, "", "", false, "1e30", "").check();
        assertThat(bad.error(Field.DOPING)).contains("doping").contains("cm⁻³");
        assertThat(bad.error(Field.EXCITATION)).contains("injection").contains("cm^-3");
    }
}
