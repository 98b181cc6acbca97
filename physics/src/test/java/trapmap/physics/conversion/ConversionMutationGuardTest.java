package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.function.IntFunction;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.recombination.SrhBounds;
import trapmap.physics.material.Silicon;
import trapmap.shared.error.InvalidValueException;

/**
 * Exact invariants and branch conditions of the conversion that the reference tests leave open: the parallel array
 * path, output shape checks, the detection limit's proportionality to the resolution, surface validation, and
 * defects without absolute cross-sections. The mutation-testing run (scripts/mutation) showed these gaps.
 */
class ConversionMutationGuardTest {
    private static final Defect FE_I = DefectLibrary.byId("fe-i");

    private static TrapDensityConverter generationConverter() {
        Conditions c = Conditions.of(Doping.pType(1e16), new Injection.Generation(1e19))
                .withSurface(Surface.sproul(180, 10));
        return new TrapDensityConverter(c, FE_I);
    }

    /** A raster of lifetimes spread log-uniformly over 0.5–2000 µs, every 41st pixel without data (NaN). */
    private static float[] raster(int width, int rows) {
        float[] tau = new float[width * rows];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = i % 41 == 7 ? Float.NaN : (float) (0.5 * Math.pow(4000, (i * 0.6180339887) % 1.0));
        }
        return tau;
    }

    // The class contract of TrapDensityConverter: the array path gives exactly the single-pixel results rounded
    // to float, whatever the number of threads (rows are split into blocks over a ForkJoinPool).
    @Test
    void parallelArrayPathEqualsTheSinglePixelResultOnEveryThreadCount() {
        TrapDensityConverter conv = generationConverter();
        int width = 37;
        int rows = 23;
        float[] tau = raster(width, rows);
        for (int threads : new int[] {1, 2, 3, 8}) {
            ConversionOutput out = ConversionOutput.allocateAll(tau.length);
            conv.convert(tau, width, out, threads);
            for (int i = 0; i < tau.length; i++) {
                if (Float.isNaN(tau[i])) {
                    assertThat(out.status[i]).isEqualTo(PixelStatus.NO_DATA.code());
                    assertThat(out.trapDensity[i]).isNaN();
                    continue;
                }
                PixelResult r = conv.convert(tau[i]);
                assertThat(out.trapDensity[i]).as("pixel %d on %d threads", i, threads)
                        .isEqualTo((float) r.trapDensityPerCm3());
                assertThat(out.injection[i]).isEqualTo((float) r.injectionPerCm3());
                assertThat(out.status[i]).isEqualTo(r.status().code());
            }
        }
        ConversionOutput all = ConversionOutput.allocateAll(tau.length);
        conv.convert(tau, width, all);
        ConversionOutput one = ConversionOutput.allocateAll(tau.length);
        conv.convert(tau, width, one, 1);
        assertThat(all.trapDensity).containsExactly(one.trapDensity);
        assertThat(all.status).containsExactly(one.status);
    }

    @Test
    void rasterThatIsNotWholeRowsIsRefused() {
        TrapDensityConverter conv = generationConverter();
        ConversionOutput out = ConversionOutput.allocateAll(10);
        assertThatThrownBy(() -> conv.convert(new float[10], 0, out, 1)).hasMessageContaining("rows of 0");
        assertThatThrownBy(() -> conv.convert(new float[10], 3, out, 1)).hasMessageContaining("10 pixels");
    }

    // Every output array, if present, must have one value per input pixel; a wrong length is refused before any
    // pixel is written.
    @Test
    void everyOutputOfTheWrongLengthIsRefused() {
        TrapDensityConverter conv = generationConverter();
        float[] tau = raster(5, 2);
        for (int wrong = 0; wrong < 9; wrong++) {
            int w = wrong;
            IntFunction<float[]> f = k -> new float[k == w ? 9 : 10];
            ConversionOutput out = new ConversionOutput(f.apply(0), f.apply(1), f.apply(2), f.apply(3), f.apply(4),
                    f.apply(5), f.apply(6), new byte[w == 7 ? 9 : 10], new byte[w == 8 ? 9 : 10]);
            assertThatThrownBy(() -> conv.convert(tau, 5, out, 1)).as("output %d", w)
                    .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("10");
        }
    }

    // The detection limit is the density whose SRH rate δ·(1/τ_intr + 1/τ_surf) would lower the limit lifetime by
    // the relative resolution δ (class comment of TrapDensityConverter): it is proportional to δ.
    @Test
    void detectionLimitIsProportionalToTheResolution() {
        Conditions c = Conditions.of(Doping.pType(1e16), new Injection.Fixed(1e15)).withSurface(Surface.sproul(180, 10));
        TrapDensityConverter coarse = new TrapDensityConverter(c.withDetectionResolution(0.05), FE_I);
        TrapDensityConverter fine = new TrapDensityConverter(c.withDetectionResolution(0.01), FE_I);
        PixelResult a = coarse.convert(1e6);
        PixelResult b = fine.convert(1e6);
        assertThat(a.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
        assertThat(b.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
        assertThat(b.trapDensityPerCm3() / a.trapDensityPerCm3()).isCloseTo(0.2, within(1e-12));
        assertThat(fine.conditions().detectionResolution()).isEqualTo(0.01);
    }

    @Test
    void idealSurfacesHaveAnInfiniteSurfaceLifetime() {
        TrapDensityConverter ideal = new TrapDensityConverter(Conditions.of(Doping.pType(1e16),
                new Injection.Fixed(1e15)), FE_I);
        assertThat(ideal.surfaceLifetimeUs()).isInfinite();
        assertThat(ideal.convert(100).surfaceLifetimeUs()).isInfinite();
        assertThat(generationConverter().surfaceLifetimeUs()).isFinite().isPositive();
    }

    // A surface with a recombination velocity needs a thickness (µm), and a given thickness is checked even on an
    // ideal surface: the message names the field and the unit.
    @Test
    void surfaceNeedsAValidThicknessWhenEitherIsGiven() {
        InvalidValueException e = org.junit.jupiter.api.Assertions.assertThrows(InvalidValueException.class,
                () -> new Surface(Double.NaN, 100, trapmap.physics.recombination.SurfaceModel.SPROUL));
        assertThat(e.field()).isEqualTo("thickness");
        assertThat(e.unit()).isEqualTo("um");
        InvalidValueException t = org.junit.jupiter.api.Assertions.assertThrows(InvalidValueException.class,
                () -> new Surface(0.5, 0, trapmap.physics.recombination.SurfaceModel.SPROUL));
        assertThat(t.field()).isEqualTo("thickness");
        assertThat(Surface.IDEAL.ideal()).isTrue();
    }

    // A defect published only with a capture-cross-section ratio (no absolute σ) gives no absolute density; the
    // converter and the bounds refuse it and say what to use instead.
    @Test
    void defectWithoutAbsoluteCrossSectionsIsRefused() {
        Defect relative = new Defect("rel-only", "ratio only", FE_I.level(), Double.NaN, Double.NaN, 10,
                FE_I.velocityConvention(), "test", null);
        Conditions c = Conditions.of(Doping.pType(1e16), new Injection.Fixed(1e15));
        assertThatThrownBy(() -> new TrapDensityConverter(c, relative)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("rel-only").hasMessageContaining("normalised density");
        assertThatThrownBy(() -> SrhBounds.of(relative, Doping.pType(1e16), Silicon.at(300)))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("rel-only");
    }

    // Without a surface term there is no surface caution, even far above low injection (Δn = N_dop).
    @Test
    void idealSurfacesRaiseNoSurfaceWarnings() {
        TrapDensityConverter ideal = new TrapDensityConverter(Conditions.of(Doping.pType(1e15),
                new Injection.Fixed(1e15)), FE_I);
        for (double tau : new double[] {0.1, 10, 1000}) {
            assertThat(ideal.convert(tau).warnings()).as("%s us", tau)
                    .doesNotContain(ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY, ConversionWarning.SURFACE_LIMITED);
        }
    }

    // An output raster reused for a second conversion holds only the second raster's values: pixels without data
    // get NO_DATA and no warnings, whatever the first conversion left there.
    @Test
    void reusedOutputHoldsOnlyTheSecondRastersValues() {
        Conditions c = Conditions.of(Doping.pType(1e16), new Injection.Fixed(1e15))
                .withSilicon(Silicon.at(300, trapmap.physics.material.ThermalVelocityModel.GREEN_1990));
        TrapDensityConverter conv = new TrapDensityConverter(c, FE_I);
        float[] first = {10, 20, 30, 40};
        ConversionOutput out = ConversionOutput.allocateAll(4);
        conv.convert(first, 2, out, 1);
        assertThat(out.warnings[0]).as("velocity convention differs").isNotZero();
        float[] none = {Float.NaN, Float.NaN, Float.NaN, Float.NaN};
        conv.convert(none, 2, out, 1);
        for (int i = 0; i < 4; i++) {
            assertThat(out.warnings[i]).isZero();
            assertThat(out.status[i]).isEqualTo(PixelStatus.NO_DATA.code());
            assertThat(out.occupancy[i]).isNaN();
            assertThat(out.lifetimeAtReferenceUs[i]).isNaN();
        }
    }

    // Cautions travel as ConversionWarnings with a text (DEVELOPERS.md, "No silent defaults in results").
    @Test
    void everyWarningHasATextAndTheSweepNamesItsUnit() {
        for (ConversionWarning w : ConversionWarning.values()) {
            assertThat(w.message()).as(w.name()).isNotBlank();
        }
        assertThat(InjectionSweep.unit()).isNotBlank();
    }
}
