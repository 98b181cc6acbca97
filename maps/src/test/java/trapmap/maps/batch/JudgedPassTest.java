package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.stats.InvalidArea;
import trapmap.maps.stats.MapStatistics;
import trapmap.physics.conversion.PixelStatus;

/**
 * The one pass of {@link WaferInspection#judged} gives what the straightforward steps give one by one: the judged
 * densities, the ranked ones, {@link InvalidArea.Tally#add} for every pixel, and lifetime and density figures equal
 * to those of {@link Sample#ofPacked} and {@link MapStatistics#percentiles} (from the radix buckets it counted).
 */
class JudgedPassTest {
    private static final double[] PERCENTS = {0.5, 5, 95, 99.5};

    @ParameterizedTest
    @CsvSource({"1, false, true", "7, true, true", "5000, false, true", "300000, false, true", "300000, true, true",
        "300000, false, false", "20, false, false",
        // the pass runs a strip of WaferInspection.STRIP (16384) pixels per call: counts at and around a strip's end
        "16384, false, true", "16385, true, true", "32768, false, false", "32769, false, true"})
    void onePassEqualsTheStepsOneByOne(int n, boolean atBound, boolean convert) {
        Random rnd = new Random(n);
        float[] life = new float[n];
        float[] converted = new float[n + 3];
        byte[] status = new byte[n + 3];
        byte[] codes = {PixelStatus.OK.code(), PixelStatus.OK.code(), PixelStatus.OK.code(),
            PixelStatus.BELOW_LIMIT.code(), PixelStatus.INVALID.code()};
        for (int k = 0; k < n; k++) {
            int kind = rnd.nextInt(20);
            life[k] = kind == 0 ? 0f : kind == 1 ? -3f : kind == 2 ? 5e-4f : kind == 3 ? Float.POSITIVE_INFINITY
                    : kind == 4 ? Float.NEGATIVE_INFINITY : (float) (50 + 400 * rnd.nextDouble());
            status[k] = codes[rnd.nextInt(codes.length)];
            converted[k] = status[k] == PixelStatus.INVALID.code() ? Float.NaN
                    : (float) (1e10 * Math.exp(3 * rnd.nextGaussian()));
        }
        float[] convertedBefore = converted.clone();
        InspectionBuffers buffers = new InspectionBuffers();
        int missing = 11;
        double pixelArea = 0.0256;
        WaferInspection.Judged j = WaferInspection.judged(life, n, convert ? converted : null, status, atBound,
                missing, pixelArea, buffers);

        // the invalid area: every pixel through the tally
        InvalidArea.Tally tally = new InvalidArea.Tally(true);
        for (int k = 0; k < n; k++) {
            tally.add(life[k], convert ? status[k] : -1);
        }
        tally.addMissing(missing);
        assertThat(j.invalid()).isEqualTo(tally.result(pixelArea));

        // the lifetimes: harmonic mean and percentiles as Sample.ofPacked gives them
        PixelGrid grid = PixelGrid.centred(n, 1, Math.sqrt(pixelArea));
        Sample lifeWant = Sample.ofPacked(life.clone(), n, grid, PERCENTS, true);
        Sample lifeGot = Sample.ofCounted(life.clone(), n, grid, PERCENTS, j.lifePositive(), j.lifeReciprocalSum(),
                buffers.lifeBuckets());
        assertSameFigures(lifeGot, lifeWant);
        if (!convert) {
            assertThat(j.judged()).isNull();
            return;
        }
        // the judged densities: OK ones (and below-limit ones at their bound when so asked), NaN elsewhere
        float[] judged = new float[n];
        for (int k = 0; k < n; k++) {
            boolean counts = status[k] == PixelStatus.OK.code()
                    || atBound && status[k] == PixelStatus.BELOW_LIMIT.code();
            judged[k] = counts || atBound ? convertedBefore[k] : Float.NaN;
        }
        assertThat(Arrays.equals(Arrays.copyOf(j.judged(), n), judged)).as("judged densities").isTrue();
        float[] ranked = new float[n];
        int m = 0;
        for (float d : judged) {
            if (d == d) {
                ranked[m++] = d;
            }
        }
        assertThat(j.rankedCount()).isEqualTo(m);
        assertThat(Arrays.equals(Arrays.copyOf(j.ranked(), m), Arrays.copyOf(ranked, m))).as("ranked densities")
                .isTrue();
        Sample densWant = Sample.ofValid(ranked, m, grid, PERCENTS);
        Sample densGot = Sample.ofCounted(j.ranked(), m, grid, PERCENTS, 0, 0, buffers.densityBuckets());
        assertSameFigures(densGot, densWant);
    }

    /** The same figures bit for bit (NaN equal to NaN). */
    private static void assertSameFigures(Sample got, Sample want) {
        assertThat(got.count()).isEqualTo(want.count());
        double[] g = {got.areaMm2(), got.harmonicMean(), got.median()};
        double[] w = {want.areaMm2(), want.harmonicMean(), want.median()};
        assertThat(Arrays.equals(g, w)).as("area, harmonic mean, median: %s vs %s", Arrays.toString(g),
                Arrays.toString(w)).isTrue();
        assertThat(Arrays.equals(got.values(), want.values())).as("percentiles %s vs %s",
                Arrays.toString(got.values()), Arrays.toString(want.values())).isTrue();
    }
}
