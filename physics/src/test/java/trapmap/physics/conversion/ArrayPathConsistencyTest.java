package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * The array path must give exactly the single-pixel results rounded to float, on every output raster, for any
 * raster shape and thread count. NaN is "no data" in rasters ({@link PixelStatus#NO_DATA}); the single-pixel call
 * reports it as {@link PixelStatus#INVALID}.
 */
class ArrayPathConsistencyTest {
    /** Inputs the kernel treats specially. */
    private static final float[] SPECIAL = {Float.NaN, 0f, -0f, -1f, -250f, Float.POSITIVE_INFINITY,
        Float.NEGATIVE_INFINITY, Float.MIN_VALUE, Float.MAX_VALUE, 1e-3f, 1e6f, 3000f};

    static Stream<Arguments> cases() {
        Injection[] injections = {Injection.fixed(1e14), Injection.generation(1e19)};
        int[][] shapes = {{7, 3}, {1, 301}, {301, 1}};
        Stream.Builder<Arguments> b = Stream.builder();
        for (Injection inj : injections) {
            for (int[] shape : shapes) {
                for (boolean reference : new boolean[] {false, true}) {
                    b.add(Arguments.of(inj, shape[0], shape[1], reference));
                }
            }
        }
        return b.build();
    }

    @ParameterizedTest(name = "{0}, {1}x{2}, reference={3}")
    @MethodSource("cases")
    void arrayEqualsSinglePixel(Injection injection, int width, int height, boolean reference) {
        Conditions c = Conditions.of(Doping.pType(1e16), injection).withSurface(Surface.sproul(180, 10));
        if (reference) {
            c = c.withReferenceInjection(1e15);
        }
        TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId("fe-i"));
        float[] tau = raster(width * height, 42L + width);
        for (int threads : new int[] {1, 2, 3}) {
            ConversionOutput out = ConversionOutput.allocateAll(tau.length);
            conv.convert(tau, width, out, threads);
            for (int i = 0; i < tau.length; i++) {
                checkPixel(conv, tau[i], out, i, "pixel " + i + " (tau=" + tau[i] + ", threads=" + threads + ")");
            }
        }
    }

    /**
     * Asking for the trap density and/or status alone (what the command line, statistics and inspection ask for)
     * gives the same planes and counts as asking for all planes, for rasters converted whole or row by row.
     */
    @ParameterizedTest(name = "{0}, {1}x{2}, reference={3}")
    @MethodSource("cases")
    void densityAloneEqualsAllPlanes(Injection injection, int width, int height, boolean reference) {
        Conditions c = Conditions.of(Doping.pType(1e16), injection).withSurface(Surface.sproul(180, 10));
        if (reference) {
            c = c.withReferenceInjection(1e15);
        }
        TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId("fe-i"));
        float[] tau = raster(width * height, 7L + height);
        ConversionOutput all = ConversionOutput.allocateAll(tau.length);
        TrapDensityConverter.Tally expected = conv.convert(tau, width, all, 1);
        int n = tau.length;
        ConversionOutput[] fast = {
            new ConversionOutput(new float[n], null, null, null, null, null, null, new byte[n], null),
            new ConversionOutput(new float[n], null, null, null, null, null, null, null, null),
            new ConversionOutput(null, null, null, null, null, null, null, new byte[n], null)};
        for (ConversionOutput out : fast) {
            for (int threads : new int[] {1, 2}) {
                TrapDensityConverter.Tally t = conv.convert(tau, width, out, threads);
                assertThat(t.statusCounts()).isEqualTo(expected.statusCounts());
                assertThat(t.warningPixels()).isEqualTo(expected.warningPixels());
                assertThat(t.belowFloor()).isEqualTo(expected.belowFloor());
                check(out, all, "threads=" + threads);
            }
            TrapDensityConverter.Tally rows = new TrapDensityConverter.Tally();
            for (int row = 0; row < height; row++) {
                conv.convertRows(tau, width, row, row + 1, out, rows);
            }
            assertThat(rows.statusCounts()).isEqualTo(expected.statusCounts());
            assertThat(rows.warningPixels()).isEqualTo(expected.warningPixels());
            check(out, all, "row by row");
        }
    }

    private static void check(ConversionOutput out, ConversionOutput all, String at) {
        if (out.trapDensity != null) {
            for (int i = 0; i < all.trapDensity.length; i++) {
                assertThat(Float.floatToIntBits(out.trapDensity[i])).as(at + " pixel " + i)
                        .isEqualTo(Float.floatToIntBits(all.trapDensity[i]));
            }
        }
        if (out.status != null) {
            assertThat(out.status).as(at).isEqualTo(all.status);
        }
    }

    /** Seeded log-uniform lifetimes over 0.1 µs–100 ms with the special values scattered in. */
    private static float[] raster(int n, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        float[] tau = new float[n];
        for (int i = 0; i < n; i++) {
            tau[i] = (float) Math.pow(10, -1 + 6 * rnd.nextDouble());
        }
        for (int k = 0; k < SPECIAL.length; k++) {
            tau[(int) ((long) k * n / SPECIAL.length)] = SPECIAL[k];
        }
        return tau;
    }

    private static void checkPixel(TrapDensityConverter conv, float tau, ConversionOutput out, int i, String at) {
        PixelResult r = conv.convert(tau);
        if (Float.isNaN(tau)) {
            assertThat(r.status()).as(at).isEqualTo(PixelStatus.INVALID);
            assertThat(out.status[i]).as(at).isEqualTo(PixelStatus.NO_DATA.code());
            assertThat(out.warnings[i]).as(at).isZero();
        } else {
            assertThat(out.status[i]).as(at).isEqualTo(r.status().code());
            int mask = 0;
            for (ConversionWarning w : r.warnings()) {
                mask |= w.bit();
            }
            assertThat(out.warnings[i]).as(at).isEqualTo((byte) mask);
        }
        assertSame(out.trapDensity[i], r.trapDensityPerCm3(), at + " N_t");
        assertSame(out.trapDensityMin[i], r.trapDensityMinPerCm3(), at + " N_t,min");
        assertSame(out.trapDensityMax[i], r.trapDensityMaxPerCm3(), at + " N_t,max");
        assertSame(out.occupancy[i], r.occupancy(), at + " f_t");
        assertSame(out.srhLifetimeUs[i], r.srhLifetimeUs(), at + " tau_SRH");
        assertSame(out.injection[i], r.injectionPerCm3(), at + " dn");
        assertSame(out.lifetimeAtReferenceUs[i], r.lifetimeAtReferenceUs(), at + " tau_ref");
    }

    /** Bit-identical to the double rounded to float (all NaNs alike). */
    private static void assertSame(float actual, double single, String what) {
        assertThat(Float.floatToIntBits(actual)).as(what + ": " + actual + " vs " + single)
                .isEqualTo(Float.floatToIntBits((float) single));
    }
}
