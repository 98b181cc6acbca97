package trapmap.physics.uncertainty;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.BeforeAll;
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
import trapmap.physics.defect.Range;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.shared.error.InvalidValueException;

/**
 * The exceedance probability and density quantiles of {@link ExceedanceModel}: against closed forms for a single
 * uncertain input, against a brute-force Monte Carlo that converts every pixel with every sample through
 * {@link TrapDensityConverter}, and its reproducibility and monotony.
 */
class ExceedanceModelTest {
    private static final PhysicsSettings SETTINGS = PhysicsSettings.DEFAULTS;
    private static final double DN = 1e14;
    /** p-type 1e16 cm⁻³, Δn = 1e14 cm⁻³, 300 K, 180 µm with S = 10 cm/s. */
    private static final Conditions WAFER = Conditions.of(Doping.pType(1e16), new Injection.Fixed(DN))
            .withSurface(Surface.sproul(180, 10));
    private static final Defect FE_I = DefectLibrary.byId("fe-i");
    /** Fe_i threshold of the brute-force comparison, cm⁻³. */
    private static final double FE_THRESHOLD = 1e11;
    /** 4 x 4 map of effective lifetimes, µs, across Fe_i's exceedance band at 1e11 cm⁻³. */
    private static final float[] MAP = new float[16];
    private static ExceedanceModel feModel;

    @BeforeAll
    static void prepare() {
        for (int i = 0; i < MAP.length; i++) {
            MAP[i] = (float) (60 * Math.pow(10, 0.8 * i / (MAP.length - 1)));  // 60 µs ... 379 µs
        }
        feModel = ExceedanceModel.prepare(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS, FE_THRESHOLD,
                10_000, 1);
    }

    /**
     * Only σ_n uncertain, log-uniform on [a, b]; ideal surfaces; no condition or lifetime uncertainty. With
     * v_n, v_p the thermal velocities, the SRH factor (Shockley &amp; Read 1952; Hall 1952) is
     * K(σ_n) = α + β/σ_n, α = (n0 + n1 + Δn)/(σ_p v_p (n0 + p0 + Δn)), β = (p0 + p1 + Δn)/(v_n (n0 + p0 + Δn)).
     * A pixel with SRH rate R = 1/τ − 1/τ_intr (above the detection limit) exceeds N* when K·R > N*, i.e.
     * σ_n &lt; c = β/(N* / R − α) (always when N* / R ≤ α), so P = clamp(ln(c/a)/ln(b/a), 0, 1).
     */
    @Test
    void crossSectionOnlyMatchesTheLogUniformClosedForm() {
        double a = 1e-15;
        double b = 1e-13;
        double sigmaP = 1e-16;
        Defect d = Defect.of("test-sigma", "test level", TrapLevel.fromIntrinsic(0.1), 1e-14, sigmaP,
                ThermalVelocityModel.FIXED, "synthetic", new ParameterSpread(Range.of(0.1), new Range(a, b),
                        Range.of(sigmaP), "sigma_n only"));
        Conditions c = Conditions.of(Doping.pType(1e16), new Injection.Fixed(DN));
        double threshold = 1e11;
        int samples = 20_000;
        ExceedanceModel m = ExceedanceModel.prepare(c, d, SETTINGS, ConditionUncertainty.NONE, threshold, samples,
                7);

        Silicon si = c.silicon();
        Carriers eq = c.doping().equilibrium(si.intrinsicPerCm3());
        double n0 = eq.electronsPerCm3();
        double p0 = eq.holesPerCm3();
        double n1 = d.level().n1PerCm3(si);
        double p1 = d.level().p1PerCm3(si);
        double denominator = n0 + p0 + DN;
        double alpha = (n0 + n1 + DN) / (sigmaP * si.holeVthCmPerS() * denominator);
        double beta = (p0 + p1 + DN) / (si.electronVthCmPerS() * denominator);
        double r0 = IntrinsicLifetime.richter2012(c.doping(), si, c.radiativeCm3PerS()).rateConstantPerS(DN);

        int between = 0;
        for (double tauUs = 5; tauUs < 2000; tauUs *= 1.25) {
            double rate = 1e6 / (float) tauUs - r0;
            assertThat(rate).isGreaterThan(c.detectionResolution() * r0);
            double expected;
            if (threshold / rate <= alpha) {
                expected = 1;
            } else {
                double cut = beta / (threshold / rate - alpha);
                expected = Math.max(0, Math.min(1, Math.log(cut / a) / Math.log(b / a)));
            }
            if (expected > 0.05 && expected < 0.95) {
                between++;
            }
            double se = Math.sqrt(expected * (1 - expected) / samples);
            assertThat(m.probability((float) tauUs)).as("tau %s us", tauUs).isCloseTo(expected,
                    org.assertj.core.data.Offset.offset(4 * se + 1e-12));
        }
        assertThat(between).as("lifetimes inside the uncertain band").isGreaterThanOrEqualTo(5);
    }

    /**
     * Only the lifetime noise uncertain (log-normal, σ_ln = u): with the nominal threshold lifetime τ*, a pixel
     * measured at τ exceeds when τ·exp(−u z) &lt; τ*, so P = 1 − Φ(ln(τ/τ*)/u).
     */
    @Test
    void lifetimeNoiseOnlyMatchesTheLogNormalClosedForm() {
        Defect nominal = new Defect(FE_I.id(), FE_I.name(), FE_I.level(), FE_I.electronCrossSectionCm2(),
                FE_I.holeCrossSectionCm2(), FE_I.captureRatio(), FE_I.velocityConvention(), FE_I.source(), null);
        double u = 0.1;
        int samples = 20_000;
        ExceedanceModel m = ExceedanceModel.prepare(WAFER, nominal, SETTINGS,
                ConditionUncertainty.NONE.withLifetimeRelative(u), FE_THRESHOLD, samples, 3);
        TrapDensityConverter conv = new TrapDensityConverter(WAFER, nominal);
        double k = conv.srh().lifetimeDensityProductSCm3(DN);
        double r0 = conv.intrinsic().rateConstantPerS(DN) + 1e6 / conv.surfaceLifetimeUs();
        double tauStarUs = 1e6 / (r0 + Math.max(FE_THRESHOLD / k, WAFER.detectionResolution() * r0));
        NormalDistribution normal = new NormalDistribution();
        for (double f = 0.7; f < 1.4; f += 0.05) {
            float tau = (float) (tauStarUs * f);
            double expected = 1 - normal.cumulativeProbability(Math.log(tau / tauStarUs) / u);
            double se = Math.sqrt(expected * (1 - expected) / samples);
            assertThat(m.probability(tau)).as("tau/tau* %s", f).isCloseTo(expected,
                    org.assertj.core.data.Offset.offset(4 * se + 1e-12));
        }
    }

    /** The samples of a seed, converted once each (the straightforward reference path). */
    private static List<UncertaintySampler.Sample> draws(long seed, int n, List<TrapDensityConverter> converters) {
        UncertaintySampler sampler = new UncertaintySampler(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS,
                seed);
        List<UncertaintySampler.Sample> out = new ArrayList<>(n);
        for (int s = 0; s < n; s++) {
            UncertaintySampler.Sample draw = sampler.next();
            out.add(draw);
            converters.add(new TrapDensityConverter(draw.conditions(), draw.defect()));
        }
        return out;
    }

    private static boolean exceeds(TrapDensityConverter conv, UncertaintySampler.Sample draw, float tauUs,
                                   double threshold) {
        PixelResult r = conv.convert(tauUs / draw.lifetimeFactor());
        return r.status() == PixelStatus.OK && r.trapDensityPerCm3() > threshold;
    }

    /**
     * With the model's own samples, converting every pixel with every sample through the converter counts the same
     * exceedances as the sorted thresholds and one binary search (ties at rounding aside: at most one sample).
     */
    @Test
    void sortedThresholdsCountWhatPerPixelConversionCounts() {
        List<TrapDensityConverter> converters = new ArrayList<>();
        List<UncertaintySampler.Sample> samples = draws(1, feModel.samples(), converters);
        for (float tau : MAP) {
            int count = 0;
            for (int s = 0; s < samples.size(); s++) {
                count += exceeds(converters.get(s), samples.get(s), tau, FE_THRESHOLD) ? 1 : 0;
            }
            assertThat(feModel.probability(tau) * feModel.samples()).as("tau %s us", tau)
                    .isCloseTo(count, org.assertj.core.data.Offset.offset(1.0));
        }
    }

    /**
     * Independent brute-force Monte Carlo: for each pixel of a 4 x 4 map, 10^4 fresh samples (a seed per pixel),
     * each converted through the converter. Agrees with the prepared model within 0.01 on average over the map
     * and, per pixel, within four standard errors of the difference of two independent estimates.
     */
    @Test
    void agreesWithIndependentBruteForcePerPixel() {
        int n = 10_000;
        double sumAbs = 0;
        int between = 0;
        for (int i = 0; i < MAP.length; i++) {
            UncertaintySampler sampler = new UncertaintySampler(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS,
                    1000 + i);
            int count = 0;
            for (int s = 0; s < n; s++) {
                UncertaintySampler.Sample draw = sampler.next();
                count += exceeds(new TrapDensityConverter(draw.conditions(), draw.defect()), draw, MAP[i],
                        FE_THRESHOLD) ? 1 : 0;
            }
            double brute = (double) count / n;
            double model = feModel.probability(MAP[i]);
            double p = (brute + model) / 2;
            double se = Math.sqrt(p * (1 - p) * (1.0 / n + 1.0 / feModel.samples()));
            assertThat(model).as("pixel %d, tau %s us", i, MAP[i]).isCloseTo(brute,
                    org.assertj.core.data.Offset.offset(4 * se + 1e-4));
            sumAbs += Math.abs(model - brute);
            System.out.printf("pixel %2d  tau %8.2f us  model %.4f  brute force %.4f  q05 %.3e  q95 %.3e%n", i,
                    MAP[i], model, brute, feModel.quantile(MAP[i], 0.05), feModel.quantile(MAP[i], 0.95));
            if (brute > 0.05 && brute < 0.95) {
                between++;
            }
        }
        assertThat(sumAbs / MAP.length).isLessThan(0.01);
        assertThat(between).as("pixels inside the uncertain band").isGreaterThanOrEqualTo(4);
    }

    /** The quantile equals the empirical quantile (definition 1) of the densities the converter reports. */
    @Test
    void quantileIsTheEmpiricalQuantileOfConvertedDensities() {
        List<TrapDensityConverter> converters = new ArrayList<>();
        List<UncertaintySampler.Sample> samples = draws(1, feModel.samples(), converters);
        double[] nt = new double[samples.size()];
        for (float tau : new float[] {MAP[0], MAP[7], MAP[15]}) {
            for (int s = 0; s < nt.length; s++) {
                nt[s] = converters.get(s).convert(tau / samples.get(s).lifetimeFactor()).trapDensityPerCm3();
            }
            Arrays.sort(nt);
            for (double q : new double[] {0.05, 0.5, 0.95}) {
                double expected = nt[(int) Math.ceil(q * nt.length) - 1];
                assertThat(feModel.quantile(tau, q)).as("tau %s, q %s", tau, q)
                        .isCloseTo(expected, org.assertj.core.data.Percentage.withPercentage(1e-7));
            }
        }
    }

    /** probability(τ) > 1 − q exactly when quantile(τ, q) > N* (N* above every detection limit here). */
    @Test
    void probabilityAndQuantileAgree() {
        int checked = 0;
        int exceeded = 0;
        for (float tau = 10; tau < 2000; tau *= 1.07f) {
            double p = feModel.probability(tau);
            for (double q : new double[] {0.05, 0.5, 0.95}) {
                double x = feModel.quantile(tau, q);
                double marginSamples = Math.abs(p - (1 - q)) * feModel.samples();
                if (marginSamples >= 1) {
                    assertThat(x > FE_THRESHOLD).as("tau %s, q %s, p %s", tau, q, p).isEqualTo(p > 1 - q);
                    checked++;
                    exceeded += x > FE_THRESHOLD ? 1 : 0;
                }
            }
        }
        assertThat(checked).isGreaterThan(100);
        assertThat(exceeded).isBetween(20, checked - 20);
    }

    @Test
    void monotonicInLifetimeAndOrderedInQ() {
        double lastP = 1;
        double last5 = Double.POSITIVE_INFINITY;
        double last95 = Double.POSITIVE_INFINITY;
        boolean sawMiddle = false;
        for (float tau = 1; tau < 5000; tau *= 1.1f) {
            double p = feModel.probability(tau);
            double q5 = feModel.quantile(tau, 0.05);
            double q95 = feModel.quantile(tau, 0.95);
            assertThat(p).isLessThanOrEqualTo(lastP).isBetween(0.0, 1.0);
            assertThat(q5).isLessThanOrEqualTo(last5).isLessThanOrEqualTo(q95);
            assertThat(q95).isLessThanOrEqualTo(last95);
            sawMiddle |= p > 0.1 && p < 0.9;
            lastP = p;
            last5 = q5;
            last95 = q95;
        }
        assertThat(sawMiddle).isTrue();
        assertThat(feModel.probability(1f)).isEqualTo(1.0);
        assertThat(feModel.probability(5000f)).isEqualTo(0.0);
    }

    @Test
    void sameSeedSameResultOtherSeedOtherSamples() {
        ExceedanceModel again = ExceedanceModel.prepare(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS,
                FE_THRESHOLD, 10_000, 1);
        ExceedanceModel other = ExceedanceModel.prepare(WAFER, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS,
                FE_THRESHOLD, 10_000, 2);
        assertThat(again.thresholdLifetimesUs()).containsExactly(feModel.thresholdLifetimesUs());
        assertThat(other.thresholdLifetimesUs()).isNotEqualTo(feModel.thresholdLifetimesUs());
        float[] a = new float[MAP.length];
        float[] b = new float[MAP.length];
        again.probabilities(MAP, a);
        feModel.probabilities(MAP, b);
        assertThat(a).containsExactly(b);
    }

    @Test
    void bulkRowsEqualSinglePixelsAndUnconvertibleLifetimesGiveNaN() {
        float[] row = {MAP[3], Float.NaN, 0.0001f, Float.POSITIVE_INFINITY, MAP[9]};
        float[] p = new float[row.length];
        float[] q = new float[row.length];
        feModel.probabilities(row, p);
        feModel.quantiles(row, 0.95, q);
        for (int i = 0; i < row.length; i++) {
            assertThat(Float.compare(p[i], (float) feModel.probability(row[i]))).isZero();
            assertThat(Float.compare(q[i], (float) feModel.quantile(row[i], 0.95))).isZero();
        }
        assertThat(p[1]).isNaN();
        assertThat(p[2]).isNaN();
        assertThat(q[3]).isNaN();
        assertThatThrownBy(() -> feModel.quantiles(row, 0.95, new float[2]))
                .hasMessageContaining("2 values for 5 lifetimes");
        assertThatThrownBy(() -> feModel.quantile(100f, 1.0)).hasMessageContaining("(0, 1)");
    }

    /**
     * Fixed generation (Δn = G·τ per pixel): with the model's own samples, converting every pixel with every sample
     * through {@link TrapDensityConverter} under the drawn G counts the same exceedances as the solved threshold
     * lifetimes (a tie at the root aside: at most one sample), and a fresh brute force agrees within 0.01.
     */
    @Test
    void fixedGenerationThresholdsCountWhatTheConverterCounts() {
        Conditions generation = WAFER.withInjection(new Injection.Generation(1e19));
        int n = 4000;
        ExceedanceModel m = ExceedanceModel.prepare(generation, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS,
                FE_THRESHOLD, n, 5);
        assertThat(m.fixedGeneration()).isTrue();
        UncertaintySampler sampler = new UncertaintySampler(generation, FE_I, SETTINGS, ConditionUncertainty.DEFAULTS,
                5);
        List<UncertaintySampler.Sample> draws = new ArrayList<>();
        List<TrapDensityConverter> converters = new ArrayList<>();
        for (int s = 0; s < n; s++) {
            UncertaintySampler.Sample d = sampler.next();
            assertThat(d.conditions().injection()).isInstanceOf(Injection.Generation.class);
            draws.add(d);
            converters.add(new TrapDensityConverter(d.conditions(), d.defect()));
        }
        float[] taus = new float[25];
        List<Integer> band = new ArrayList<>();
        for (int i = 0; i < taus.length; i++) {
            taus[i] = (float) (20 * Math.pow(10, 2.0 * i / (taus.length - 1)));  // 20 µs … 2 ms
            int count = 0;
            for (int s = 0; s < n; s++) {
                count += exceeds(converters.get(s), draws.get(s), taus[i], FE_THRESHOLD) ? 1 : 0;
            }
            assertThat(Math.abs(count - m.probability(taus[i]) * n)).as("tau %s us", taus[i])
                    .isLessThanOrEqualTo(1);
            if (count > 0.05 * n && count < 0.95 * n) {
                band.add(i);
            }
        }
        assertThat(band).as("pixels inside the uncertain band").hasSizeGreaterThanOrEqualTo(3);
        assertThat(m.probability(taus[0])).isEqualTo(1.0);
        assertThat(m.probability(taus[taus.length - 1])).isEqualTo(0.0);
        // independent draws, three pixels of the band
        for (int i : new int[] {band.get(0), band.get(band.size() / 2), band.get(band.size() - 1)}) {
            UncertaintySampler fresh = new UncertaintySampler(generation, FE_I, SETTINGS,
                    ConditionUncertainty.DEFAULTS, 7000 + i);
            int count = 0;
            int samples = 10_000;
            for (int s = 0; s < samples; s++) {
                UncertaintySampler.Sample d = fresh.next();
                count += exceeds(new TrapDensityConverter(d.conditions(), d.defect()), d, taus[i], FE_THRESHOLD)
                        ? 1 : 0;
            }
            assertThat(m.probability(taus[i])).isCloseTo((double) count / samples,
                    org.assertj.core.data.Offset.offset(0.01 + 4 * Math.sqrt(0.25 / n)));
        }
        assertThatThrownBy(() -> m.quantile(100f, 0.95)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("fixed generation").hasMessageContaining("injection level");
    }

    @Test
    void aDefectWithoutAbsoluteCrossSectionsIsRefused() {
        assertThatThrownBy(() -> ExceedanceModel.prepare(WAFER, DefectLibrary.byId("bo-lid"), SETTINGS,
                ConditionUncertainty.DEFAULTS, 1e11, 100, 1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("bo-lid");
    }
}
