package trapmap.physics.uncertainty;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.data.Offset.offset;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.stat.correlation.PearsonsCorrelation;
import org.apache.commons.math3.stat.descriptive.SummaryStatistics;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.Surface;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.ParameterSpread;
import trapmap.physics.material.Doping;

/**
 * The distributions {@link UncertaintySampler} draws: each quantity's sample against the distribution the class
 * comment states (Kolmogorov–Smirnov test of Commons Math at the 0.1 % level, Massey, JASA 46, 68 (1951); sample
 * standard deviations within 5 %), independence, and the nominal values kept when an uncertainty is 0.
 */
class UncertaintySamplerTest {
    private static final int N = 20_000;
    private static final Conditions WAFER = Conditions.of(Doping.pType(1e16), new Injection.Fixed(1e14))
            .withSurface(Surface.sproul(180, 10));
    private static final Defect FE_I = DefectLibrary.byId("fe-i");
    private static final ConditionUncertainty U = ConditionUncertainty.DEFAULTS;
    private static final double[] energy = new double[N];
    private static final double[] lnSigmaN = new double[N];
    private static final double[] lnSigmaP = new double[N];
    private static final double[] temperature = new double[N];
    private static final double[] lnDoping = new double[N];
    private static final double[] lnThickness = new double[N];
    private static final double[] lnSrv = new double[N];
    private static final double[] lnInjection = new double[N];
    private static final double[] lnLifetime = new double[N];

    @BeforeAll
    static void draw() {
        UncertaintySampler sampler = new UncertaintySampler(WAFER, FE_I, PhysicsSettings.DEFAULTS, U, 11);
        for (int i = 0; i < N; i++) {
            UncertaintySampler.Sample s = sampler.next();
            energy[i] = s.defect().level().energyEv();
            lnSigmaN[i] = Math.log(s.defect().electronCrossSectionCm2());
            lnSigmaP[i] = Math.log(s.defect().holeCrossSectionCm2());
            temperature[i] = s.conditions().silicon().temperatureK();
            lnDoping[i] = Math.log(s.conditions().doping().densityPerCm3() / 1e16);
            lnThickness[i] = Math.log(s.conditions().surface().thicknessUm() / 180);
            lnSrv[i] = Math.log(s.conditions().surface().srvCmPerS() / 10);
            lnInjection[i] = Math.log(((Injection.Fixed) s.conditions().injection()).excessPerCm3() / 1e14);
            lnLifetime[i] = Math.log(s.lifetimeFactor());
            assertThat(s.conditions().silicon()).isEqualTo(PhysicsSettings.DEFAULTS.silicon(temperature[i]));
            assertThat(s.conditions().doping().type()).isEqualTo(WAFER.doping().type());
        }
    }

    private static void assertFits(double[] x, org.apache.commons.math3.distribution.RealDistribution d,
                                   String what) {
        double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(d, x);
        assertThat(p).as("KS p-value of %s", what).isGreaterThan(1e-3);
    }

    @Test
    void levelEnergyIsUniformOverThePublishedRange() {
        ParameterSpread spread = FE_I.spread();
        assertFits(energy, new UniformRealDistribution(spread.energyEv().min(), spread.energyEv().max()), "E_t");
    }

    @Test
    void crossSectionsAreLogUniformOverThePublishedRanges() {
        ParameterSpread spread = FE_I.spread();
        assertFits(lnSigmaN, new UniformRealDistribution(Math.log(spread.electronCrossSectionCm2().min()),
                Math.log(spread.electronCrossSectionCm2().max())), "ln sigma_n");
        assertFits(lnSigmaP, new UniformRealDistribution(Math.log(spread.holeCrossSectionCm2().min()),
                Math.log(spread.holeCrossSectionCm2().max())), "ln sigma_p");
    }

    @Test
    void conditionsAndLifetimeFollowTheirStatedDistributions() {
        assertFits(temperature, new NormalDistribution(300, U.temperatureK()), "temperature");
        assertFits(lnDoping, new NormalDistribution(0, U.dopingRelative()), "ln doping");
        assertFits(lnThickness, new NormalDistribution(0, U.thicknessRelative()), "ln thickness");
        assertFits(lnSrv, new NormalDistribution(0, U.srvRelative()), "ln SRV");
        assertFits(lnInjection, new NormalDistribution(0, U.injectionRelative()), "ln injection");
        assertFits(lnLifetime, new NormalDistribution(0, U.lifetimeRelative()), "ln lifetime factor");
        SummaryStatistics doping = new SummaryStatistics();
        for (double v : lnDoping) {
            doping.addValue(v);
        }
        assertThat(doping.getStandardDeviation()).isCloseTo(U.dopingRelative(), offset(0.05 * U.dopingRelative()));
    }

    @Test
    void quantitiesAreDrawnIndependently() {
        double[][] all = {energy, lnSigmaN, lnSigmaP, temperature, lnDoping, lnThickness, lnSrv, lnInjection,
            lnLifetime};
        PearsonsCorrelation pearson = new PearsonsCorrelation();
        double bound = 4 / Math.sqrt(N);
        for (int i = 0; i < all.length; i++) {
            for (int j = i + 1; j < all.length; j++) {
                assertThat(Math.abs(pearson.correlation(all[i], all[j]))).as("correlation %d-%d", i, j)
                        .isLessThan(bound);
            }
        }
    }

    @Test
    void zeroUncertaintyKeepsTheNominalValuesAndOtherDrawsAreNotReshuffled() {
        UncertaintySampler fixed = new UncertaintySampler(WAFER, FE_I, PhysicsSettings.DEFAULTS,
                ConditionUncertainty.NONE, 11);
        UncertaintySampler.Sample s = fixed.next();
        assertThat(s.conditions().doping()).isEqualTo(WAFER.doping());
        assertThat(s.conditions().silicon()).isEqualTo(WAFER.silicon());
        assertThat(s.conditions().surface()).isEqualTo(WAFER.surface());
        assertThat(s.conditions().injection()).isEqualTo(WAFER.injection());
        assertThat(s.lifetimeFactor()).isEqualTo(1.0);
        // Same seed: the defect draw is the one of the default uncertainties' first sample.
        assertThat(s.defect().level().energyEv()).isEqualTo(energy[0]);
        assertThat(Math.log(s.defect().electronCrossSectionCm2())).isCloseTo(lnSigmaN[0], offset(1e-12));

        Defect noSpread = new Defect(FE_I.id(), FE_I.name(), FE_I.level(), FE_I.electronCrossSectionCm2(),
                FE_I.holeCrossSectionCm2(), FE_I.captureRatio(), FE_I.velocityConvention(), FE_I.source(), null);
        UncertaintySampler nominal = new UncertaintySampler(WAFER, noSpread, PhysicsSettings.DEFAULTS, U, 11);
        assertThat(nominal.next().defect()).isEqualTo(noSpread);
    }

    @Test
    void aTemperatureUncertaintyNeedsTheSettingsOwnSilicon() {
        Conditions green = WAFER.withSilicon(PhysicsSettings.DEFAULTS
                .withVelocities(trapmap.physics.material.ThermalVelocityModel.GREEN_1990).silicon(300));
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> new UncertaintySampler(green, FE_I,
                PhysicsSettings.DEFAULTS, U, 1)).isInstanceOf(trapmap.shared.error.InvalidValueException.class)
                .hasMessageContaining("temperature uncertainty (K)");
        UncertaintySampler.Sample s = new UncertaintySampler(green, FE_I, PhysicsSettings.DEFAULTS,
                new ConditionUncertainty(0.05, 0.02, 0.5, 0.1, 0, 0.03), 1).next();
        assertThat(s.conditions().silicon()).isEqualTo(green.silicon());
    }
}
