package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.DensityOfStatesModel;
import trapmap.physics.material.Doping;
import trapmap.physics.material.IntrinsicDensityModel;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;

/**
 * Each model's validity range is stated and a conversion outside it warns: the 300 K band of Richter 2012 and the
 * 300 K cross-sections (±3 K, see {@code IntrinsicLifetime.TEMPERATURE_TOLERANCE_K}), the fitted range of the n_i
 * temperature form (275–375 K for Sproul &amp; Green, JAP 70, 846 (1991)), dopant freeze-out below 200 K and
 * Boltzmann statistics without band-gap narrowing above 1e18 cm^-3 (the limits chosen in {@code Doping}), and the
 * conductivity type a library defect suits.
 */
class ValidityRangeWarningsTest {
    private static Set<ConversionWarning> warnings(Doping doping, Silicon si, String defect) {
        Conditions c = Conditions.of(doping, Injection.fixed(1e14)).withSilicon(si);
        return new TrapDensityConverter(c, DefectLibrary.byId(defect)).convert(50).warnings();
    }

    @ParameterizedTest
    @ValueSource(doubles = {297.0, 298.15, 300.0, 303.0})
    void roomTemperatureWithinThreeKelvinIsTreatedAs300K(double t) {
        assertThat(warnings(Doping.pType(1e16), Silicon.at(t), "fe-i")).isEmpty();
    }

    @ParameterizedTest
    @ValueSource(doubles = {296.15, 303.5, 320.0})
    void temperatureOutsideTheBandWarns(double t) {
        assertThat(warnings(Doping.pType(1e16), Silicon.at(t), "fe-i")).contains(ConversionWarning.TEMPERATURE_NOT_300K)
                .doesNotContain(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
    }

    @Test
    void intrinsicDensityFitRangeFollowsTheChosenModel() {
        assertThat(warnings(Doping.pType(1e16), Silicon.at(270), "fe-i"))
                .contains(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
        assertThat(warnings(Doping.pType(1e16), Silicon.at(380), "fe-i"))
                .contains(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
        assertThat(warnings(Doping.pType(1e16), Silicon.at(375), "fe-i"))
                .doesNotContain(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
        // Misiakos & Tsamakis (1993) was fitted over 78–340 K: 350 K is outside it, 250 K inside.
        Silicon misiakos350 = Silicon.of(350, IntrinsicDensityModel.MISIAKOS_1993, DensityOfStatesModel.GREEN_1990,
                ThermalVelocityModel.FIXED);
        Silicon misiakos250 = Silicon.of(250, IntrinsicDensityModel.MISIAKOS_1993, DensityOfStatesModel.GREEN_1990,
                ThermalVelocityModel.FIXED);
        assertThat(warnings(Doping.pType(1e16), misiakos350, "fe-i"))
                .contains(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
        assertThat(warnings(Doping.pType(1e16), misiakos250, "fe-i"))
                .doesNotContain(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
        // An n_i typed in has no fitted range to check.
        assertThat(warnings(Doping.pType(1e16), Silicon.at(380).withIntrinsicDensity(1e11), "fe-i"))
                .doesNotContain(ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT);
    }

    @Test
    void freezeOutBelow200K() {
        assertThat(warnings(Doping.pType(1e16), Silicon.at(150), "fe-i")).contains(ConversionWarning.DOPANT_FREEZE_OUT);
        assertThat(warnings(Doping.pType(1e16), Silicon.at(250), "fe-i"))
                .doesNotContain(ConversionWarning.DOPANT_FREEZE_OUT);
    }

    @Test
    void dopingAboveTheBoltzmannLimitWarns() {
        assertThat(warnings(Doping.pType(2e18), Silicon.at(300), "fe-i"))
                .contains(ConversionWarning.DOPING_ABOVE_BOLTZMANN);
        assertThat(warnings(Doping.pType(1e18), Silicon.at(300), "fe-i"))
                .doesNotContain(ConversionWarning.DOPING_ABOVE_BOLTZMANN);
    }

    @ParameterizedTest
    @ValueSource(strings = {"fe-i", "fe-b", "cr-b"})
    void pTypeDefectOnNTypeWaferWarnsAndNamesTheDefectsForNType(String id) {
        Set<ConversionWarning> w = warnings(Doping.nType(1e15), Silicon.at(300), id);
        assertThat(w).contains(ConversionWarning.P_TYPE_DEFECT_ON_N_TYPE);
        String message = ConversionWarning.P_TYPE_DEFECT_ON_N_TYPE.message();
        assertThat(message).contains("midgap", "cr-i", "au-a").doesNotContain("fe-i", "fe-b", "cr-b");
        assertThat(warnings(Doping.pType(1e15), Silicon.at(300), id))
                .doesNotContain(ConversionWarning.P_TYPE_DEFECT_ON_N_TYPE, ConversionWarning.N_TYPE_DEFECT_ON_P_TYPE);
    }

    @Test
    void defectsOfEitherTypeAndNTypeDefects() {
        assertThat(warnings(Doping.nType(1e15), Silicon.at(300), "midgap")).isEmpty();
        assertThat(warnings(Doping.nType(1e15), Silicon.at(300), "cr-i")).isEmpty();
        assertThat(warnings(Doping.pType(1e15), Silicon.at(300), "au-a"))
                .contains(ConversionWarning.N_TYPE_DEFECT_ON_P_TYPE);
        assertThat(ConversionWarning.N_TYPE_DEFECT_ON_P_TYPE.message()).contains("fe-i", "midgap")
                .doesNotContain("au-a");
        assertThat(DefectLibrary.suitedFor(ConductivityType.N)).containsExactly("cr-i", "au-a", "midgap");
    }

    @Test
    void aUserDefectUnderALibraryIdIsOfUnknownTypeAndNeverWarns() {
        Defect own = DefectLibrary.byId("fe-i").withParameters(0.38, 2e-14, 7e-17);
        Conditions c = Conditions.of(Doping.nType(1e15), Injection.fixed(1e14));
        assertThat(new TrapDensityConverter(c, own).conditionWarnings()).isEmpty();
        assertThat(DefectLibrary.suitability(own).types()).containsExactlyInAnyOrder(ConductivityType.values());
    }

    @Test
    void perPixelWarningBitsFitTheByteOfAWarningRaster() {
        for (ConversionWarning w : ConversionWarning.values()) {
            if (!w.isWaferLevel()) {
                assertThat(w.bit()).as(w.name()).isLessThan(1 << 7);
            }
        }
    }

    @Test
    void waferLevelWarningsNeverComeFromAMaskAndSkipInvalidPixels() {
        Set<ConversionWarning> fromAll = ConversionWarning.fromMask(-1);
        assertThat(fromAll).noneMatch(ConversionWarning::isWaferLevel);
        Conditions c = Conditions.of(Doping.nType(1e15), Injection.fixed(1e14));
        TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId("fe-i"));
        assertThat(conv.conditionWarnings()).containsExactly(ConversionWarning.P_TYPE_DEFECT_ON_N_TYPE);
        assertThat(conv.convert(Double.NaN).warnings()).isEmpty();
    }
}
