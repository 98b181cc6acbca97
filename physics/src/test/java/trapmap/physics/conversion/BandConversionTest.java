package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * One conversion, however it is split: on 1, 2 or 5 threads, or band by band through
 * {@link TrapDensityConverter#convertRows} into band-sized planes (as a strip-by-strip reader does), every plane is
 * bit-identical and the {@link TrapDensityConverter.Tally} counts are the same, and equal to counting the status and
 * warning planes.
 */
class BandConversionTest {
    private static final int WIDTH = 37;
    private static final int HEIGHT = 53;

    @ParameterizedTest(name = "generation={0}")
    @ValueSource(booleans = {false, true})
    void threadsAndBandsGiveTheSameResult(boolean generation) {
        Conditions c = Conditions.of(Doping.nType(3e15), generation ? Injection.generation(3e19)
                : Injection.fixed(2e14)).withSurface(Surface.sproul(160, 30)).withReferenceInjection(1e15);
        TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId("fe-i"));
        float[] tau = raster(WIDTH * HEIGHT, 7L);
        ConversionOutput one = ConversionOutput.allocateAll(tau.length);
        TrapDensityConverter.Tally t1 = conv.convert(tau, WIDTH, one, 1);
        assertThat(t1.statusCounts()).isEqualTo(countStatus(one.status));
        assertThat(t1.warningPixels()).isEqualTo(countWarnings(one.warnings));
        assertThat(t1.count(PixelStatus.OK)).isPositive();
        assertThat(t1.count(PixelStatus.BELOW_LIMIT)).isPositive();
        assertThat(t1.belowFloor()).isEqualTo(2);
        assertThat(t1.belowFloorLikeSeconds()).isEqualTo(1);
        for (int threads : new int[] {2, 5}) {
            ConversionOutput many = ConversionOutput.allocateAll(tau.length);
            TrapDensityConverter.Tally t = conv.convert(tau, WIDTH, many, threads);
            assertSamePlanes(many, 0, one, 0, tau.length, threads + " threads");
            assertSameTally(t, t1);
        }
        // Band by band, each band converted as its own raster into band-sized planes.
        TrapDensityConverter.Tally sum = new TrapDensityConverter.Tally();
        for (int r0 = 0, band = 1; r0 < HEIGHT; r0 += band, band = band % 9 + 2) {
            int r1 = Math.min(HEIGHT, r0 + band);
            float[] strip = Arrays.copyOfRange(tau, r0 * WIDTH, r1 * WIDTH);
            ConversionOutput part = ConversionOutput.allocateAll(strip.length);
            conv.convertRows(strip, WIDTH, 0, r1 - r0, part, sum);
            assertSamePlanes(part, 0, one, r0 * WIDTH, strip.length, "rows " + r0 + "-" + r1);
        }
        assertSameTally(sum, t1);
    }

    /**
     * A raster of several kernel blocks given as one row (as the batch gives a wafer's evaluated pixels) converts like
     * the same pixels one at a time: same planes bit for bit, same counts, also for a length that is not a whole
     * number of blocks.
     */
    @ParameterizedTest(name = "generation={0}")
    @ValueSource(booleans = {false, true})
    void oneLongRowConvertsLikeSinglePixels(boolean generation) {
        Conditions c = Conditions.of(Doping.pType(1e16), generation ? Injection.generation(1e19)
                : Injection.fixed(1e14)).withSurface(Surface.sproul(180, 10)).withReferenceInjection(1e15);
        TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId("fe-i"));
        int n = 3 * TrapDensityConverter.BLOCK_PIXELS + 17;
        float[] tau = raster(n, 11L);
        ConversionOutput whole = ConversionOutput.allocateAll(n);
        TrapDensityConverter.Tally wholeTally = new TrapDensityConverter.Tally();
        conv.convertRows(tau, n, 0, 1, whole, wholeTally);
        ConversionOutput single = ConversionOutput.allocateAll(n);
        TrapDensityConverter.Tally singleTally = new TrapDensityConverter.Tally();
        for (int i = 0; i < n; i++) {
            conv.convertRows(tau, 1, i, i + 1, single, singleTally);
        }
        assertSamePlanes(whole, 0, single, 0, n, "one row of " + n + " pixels");
        assertSameTally(wholeTally, singleTally);
        assertThat(wholeTally.statusCounts()).isEqualTo(countStatus(whole.status));
        assertThat(wholeTally.warningPixels()).isEqualTo(countWarnings(whole.warnings));
    }

    @ParameterizedTest(name = "rowTo={0}")
    @ValueSource(ints = {-1, 4})
    void rowsOutsideTheRasterAreRefused(int rowTo) {
        TrapDensityConverter conv = new TrapDensityConverter(Conditions.of(Doping.pType(1e16), Injection.fixed(1e14)),
                DefectLibrary.byId("fe-i"));
        float[] tau = new float[3 * 5];
        ConversionOutput out = ConversionOutput.allocateAll(tau.length);
        assertThatThrownBy(() -> conv.convertRows(tau, 5, 0, rowTo, out, new TrapDensityConverter.Tally()))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("do not lie in a raster of 15");
    }

    private static float[] raster(int n, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        float[] tau = new float[n];
        for (int i = 0; i < n; i++) {
            tau[i] = rnd.nextInt(20) == 0 ? Float.NaN : (float) Math.pow(10, -1 + 5 * rnd.nextDouble());
        }
        tau[3] = 5e-4f; // below the 1e-3 us floor; read as seconds, 500 us: an ordinary lifetime
        tau[7] = 1e-12f; // below the floor; read as seconds, 1e-6 us: still below it
        tau[11] = -2f;
        tau[12] = Float.POSITIVE_INFINITY;
        return tau;
    }

    private static int[] countStatus(byte[] status) {
        int[] c = new int[PixelStatus.values().length];
        for (byte s : status) {
            c[s]++;
        }
        return c;
    }

    private static int[] countWarnings(byte[] warnings) {
        int[] c = new int[8];
        for (byte w : warnings) {
            for (int b = 0; b < 8; b++) {
                c[b] += (w >> b) & 1;
            }
        }
        return c;
    }

    private static void assertSameTally(TrapDensityConverter.Tally a, TrapDensityConverter.Tally b) {
        assertThat(a.statusCounts()).isEqualTo(b.statusCounts());
        assertThat(a.warningPixels()).isEqualTo(b.warningPixels());
        assertThat(a.warningBits()).isEqualTo(b.warningBits());
        assertThat(a.belowFloor()).isEqualTo(b.belowFloor());
        assertThat(a.belowFloorLikeSeconds()).isEqualTo(b.belowFloorLikeSeconds());
    }

    private static void assertSamePlanes(ConversionOutput a, int from, ConversionOutput b, int bFrom, int n,
                                         String what) {
        float[][] pa = {a.trapDensity, a.trapDensityMin, a.trapDensityMax, a.occupancy, a.srhLifetimeUs, a.injection,
            a.lifetimeAtReferenceUs};
        float[][] pb = {b.trapDensity, b.trapDensityMin, b.trapDensityMax, b.occupancy, b.srhLifetimeUs, b.injection,
            b.lifetimeAtReferenceUs};
        for (int p = 0; p < pa.length; p++) {
            for (int i = 0; i < n; i++) {
                assertThat(Float.floatToIntBits(pa[p][from + i])).as(what + " plane " + p + " pixel " + i)
                        .isEqualTo(Float.floatToIntBits(pb[p][bFrom + i]));
            }
        }
        assertThat(Arrays.copyOfRange(a.status, from, from + n)).as(what)
                .isEqualTo(Arrays.copyOfRange(b.status, bFrom, bFrom + n));
        assertThat(Arrays.copyOfRange(a.warnings, from, from + n)).as(what)
                .isEqualTo(Arrays.copyOfRange(b.warnings, bFrom, bFrom + n));
    }
}
