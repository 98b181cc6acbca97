package trapmap.physics.uncertainty;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.apache.commons.math3.random.Well19937c;
import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.ParameterSpread;
import trapmap.shared.error.InvalidValueException;

/**
 * Sample-by-sample and edge checks of the uncertainty package that the mutation-testing run (scripts/mutation)
 * showed untested: every draw inside the test method (PIT does not attribute what a {@code @BeforeAll} covers to
 * the tests), against the distributions the class comments state, evaluated from an independent WELL19937c of the
 * same seed in the documented draw order.
 */
class UncertaintyMutationGuardTest {
    private static final Conditions WAFER = Conditions.of(trapmap.physics.material.Doping.pType(1e16),
            new Injection.Fixed(1e14)).withSurface(Surface.sproul(180, 10));
    private static final Defect FE_I = DefectLibrary.byId("fe-i");
    private static final PhysicsSettings SETTINGS = PhysicsSettings.DEFAULTS;

    private static Defect withoutSpread(Defect d) {
        return new Defect(d.id(), d.name(), d.level(), d.electronCrossSectionCm2(), d.holeCrossSectionCm2(),
                d.captureRatio(), d.velocityConvention(), d.source(), null);
    }

    // UncertaintySampler's class comment: per sample E_t ~ U[E_min, E_max] (Jaynes 1957), ln σ ~ U[ln a, ln b]
    // (Jeffreys 1961), each condition x = x0·exp(u_rel·z) (log-normal), T = T0 + u_T·z (normal), and the lifetime
    // factor exp(u_τ·z), from the nine numbers u1, u2, u3, z_T, z_doping, z_W, z_S, z_Δn, z_τ drawn in that order.
    @Test
    void everySampleIsTheStatedFunctionOfItsNineDraws() {
        ConditionUncertainty u = new ConditionUncertainty(0.05, 0.02, 0.5, 0.1, 2.0, 0.03);
        UncertaintySampler sampler = new UncertaintySampler(WAFER, FE_I, SETTINGS, u, 42);
        Well19937c ref = new Well19937c(42L);
        ParameterSpread sp = FE_I.spread();
        double eMin = sp.energyEv().min();
        double eMax = sp.energyEv().max();
        assertThat(eMax).isGreaterThan(eMin);
        for (int s = 0; s < 200; s++) {
            double u1 = ref.nextDouble();
            double u2 = ref.nextDouble();
            double u3 = ref.nextDouble();
            double[] z = new double[6];
            for (int i = 0; i < z.length; i++) {
                z[i] = ref.nextGaussian();
            }
            UncertaintySampler.Sample x = sampler.next();
            Defect d = x.defect();
            assertThat(d.level().energyEv()).isCloseTo(eMin + (eMax - eMin) * u1, within(1e-12));
            double a = sp.electronCrossSectionCm2().min();
            double b = sp.electronCrossSectionCm2().max();
            assertThat(d.electronCrossSectionCm2()).isCloseTo(a * Math.pow(b / a, u2), within(1e-9 * b));
            a = sp.holeCrossSectionCm2().min();
            b = sp.holeCrossSectionCm2().max();
            assertThat(d.holeCrossSectionCm2()).isCloseTo(a * Math.pow(b / a, u3), within(1e-9 * b));
            double t = 300 + 2.0 * z[0];
            assertThat(x.conditions().silicon().temperatureK()).isCloseTo(t, within(1e-9));
            assertThat(x.conditions().silicon()).isEqualTo(SETTINGS.silicon(x.conditions().silicon().temperatureK()));
            assertThat(x.conditions().doping().densityPerCm3()).isCloseTo(1e16 * Math.exp(0.05 * z[1]),
                    within(1e16 * 1e-12));
            assertThat(x.conditions().surface().thicknessUm()).isCloseTo(180 * Math.exp(0.02 * z[2]),
                    within(180 * 1e-12));
            assertThat(x.conditions().surface().srvCmPerS()).isCloseTo(10 * Math.exp(0.5 * z[3]), within(1e-9));
            assertThat(((Injection.Fixed) x.conditions().injection()).excessPerCm3())
                    .isCloseTo(1e14 * Math.exp(0.1 * z[4]), within(1e14 * 1e-12));
            assertThat(x.lifetimeFactor()).isCloseTo(Math.exp(0.03 * z[5]), within(1e-12));
        }
    }

    // Ideal surfaces (S = 0) have no surface term to draw: they stay ideal in every sample.
    @Test
    void idealSurfacesStayIdeal() {
        Conditions ideal = WAFER.withSurface(Surface.IDEAL);
        UncertaintySampler sampler = new UncertaintySampler(ideal, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS, 3);
        for (int s = 0; s < 20; s++) {
            assertThat(sampler.next().conditions().surface()).isEqualTo(Surface.IDEAL);
        }
    }

    // The constructor's documented refusal: a defect without absolute σ gives no N_t (no sample is drawn).
    @Test
    void theSamplerRefusesADefectWithoutAbsoluteCrossSections() {
        assertThatThrownBy(() -> new UncertaintySampler(WAFER, DefectLibrary.byId("bo-lid"), SETTINGS,
                ConditionUncertainty.DEFAULTS, 1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("bo-lid");
    }

    // Hyndman & Fan, Am. Stat. 50, 361 (1996), definition 1: the q quantile of S values is the ⌈qS⌉-th smallest.
    @Test
    void rankIndexIsDefinitionOneAndTheLevelMustLieStrictlyInside() {
        ExceedanceModel m = ExceedanceModel.prepare(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS, 1e11, 100,
                1);
        assertThat(m.rankIndex(0.001)).isEqualTo(0);   // ⌈0.1⌉ = 1st
        assertThat(m.rankIndex(0.05)).isEqualTo(4);    // ⌈5⌉ = 5th
        assertThat(m.rankIndex(0.051)).isEqualTo(5);   // ⌈5.1⌉ = 6th
        assertThat(m.rankIndex(0.5)).isEqualTo(49);
        assertThat(m.rankIndex(0.999)).isEqualTo(99);  // ⌈99.9⌉ = 100th
        assertThatThrownBy(() -> m.quantile(100f, 0.0)).hasMessageContaining("(0, 1)");
        assertThatThrownBy(() -> m.quantile(100f, 1.0)).hasMessageContaining("(0, 1)");
        assertThat(m.thresholdPerCm3()).isEqualTo(1e11);
        assertThat(m.samples()).isEqualTo(100);
        assertThatThrownBy(() -> m.probabilities(new float[5], new float[2]))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("2 values for 5 lifetimes");
        QuantileTable table = m.quantileTable(0.5, 5, 3000);
        assertThatThrownBy(() -> table.quantiles(new float[5], new float[6]))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("6 values for 5 lifetimes");
    }

    // TrapDensityConverter's class comment: below the detection limit a pixel is BELOW_LIMIT and reports the density
    // of the detectable rate. With no uncertainty every sample is the nominal wafer, so every quantile of a pixel
    // just below the base lifetime is the converter's reported limit density.
    @Test
    void aPixelBelowTheDetectionLimitReportsTheConvertersLimitDensity() {
        Defect fe = withoutSpread(FE_I);
        ExceedanceModel m = ExceedanceModel.prepare(WAFER, fe, SETTINGS, ConditionUncertainty.NONE, 1e11,
                ExceedanceModel.MIN_SAMPLES, 1);
        TrapDensityConverter conv = new TrapDensityConverter(WAFER, fe);
        double baseRate = conv.intrinsic().rateConstantPerS(1e14) + 1e6 / conv.surfaceLifetimeUs();
        float tau = (float) (0.9999 * 1e6 / baseRate);
        PixelResult px = conv.convert(tau);
        assertThat(px.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
        for (double q : new double[] {0.05, 0.5, 0.95}) {
            assertThat(m.quantile(tau, q)).isCloseTo(px.trapDensityPerCm3(),
                    within(1e-9 * px.trapDensityPerCm3()));
        }
    }

    // The table's cells are CELL_RATIO = 1.01 wide: ⌈ln(max/min)/ln 1.01⌉ of them, and each holds the quantile
    // sample itself, so at least one candidate per cell (QuantileTable's class comment).
    @Test
    void theTableHasOnePerCentCellsEachWithItsQuantileSample() {
        ExceedanceModel m = ExceedanceModel.prepare(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS, 1e11, 400,
                7);
        QuantileTable table = m.quantileTable(0.5, 5, 3000);
        assertThat(table.cells()).isEqualTo((int) Math.ceil(Math.log(600) / Math.log(1.01)));  // 643
        assertThat(table.cells()).isEqualTo(643);
        assertThat(table.meanCandidates()).isGreaterThanOrEqualTo(1.0);
        assertThat(m.quantileTable(0.5, 7, 7).cells()).isEqualTo(1);
    }
}
