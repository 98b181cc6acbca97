package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Arrays;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * The one-go comparison against the steps taken one after another, and the parallel parts (resampling, overlap,
 * derived maps, the outline fits in the background) against one thread: every result must be the same.
 */
class RegisteredPairTest {
    private static final SyntheticWafer WAFER = SyntheticWafer.random(17, 50);
    private static final PixelGrid GRID = PixelGrid.centred(200, 200, 0.5);
    private static final WaferMap BEFORE = WAFER.before(GRID, 0.03, 5);
    private static final Registration TRUTH = Registration.explicit(true, false, 92.5, 1.7, -2.3);
    private static final WaferMap AFTER = WAFER.after(PixelGrid.centred(230, 210, 0.45), TRUTH, 2.0, 0.03, 9);
    private static final RegistrationOptions OPTIONS = RegistrationOptions.DEFAULTS;

    private static RegisteredPair inPool(int threads, WaferMap before, WaferMap after, RegistrationOptions o) {
        ForkJoinPool pool = new ForkJoinPool(threads);
        try {
            return pool.submit(() -> RegisteredPair.of(before, after, o, 0.05, Improvement.HIGHER_IS_BETTER,
                    ProgressListener.NONE)).join();
        } finally {
            pool.shutdown();
        }
    }

    @Test
    void givesWhatTheStepsGiveOneAfterAnother() {
        RegisteredPair pair = RegisteredPair.of(BEFORE, AFTER, OPTIONS, 0.05, Improvement.HIGHER_IS_BETTER,
                ProgressListener.NONE);
        RegistrationReport report = MapRegistration.registerChecked(BEFORE, AFTER, OPTIONS, ProgressListener.NONE);
        WaferMap aligned = MapRegistration.apply(BEFORE, AFTER, report.registration());
        PairedStatistics statistics = MapComparison.statistics(BEFORE, aligned, null, 0.05,
                Improvement.HIGHER_IS_BETTER);
        assertThat(pair.report()).isEqualTo(report);
        assertThat(pair.aligned().raster().samples()).isEqualTo(aligned.raster().samples());
        assertThat(pair.aligned().grid()).isEqualTo(BEFORE.grid());
        assertThat(pair.aligned().provenance()).isEqualTo(aligned.provenance());
        assertThat(pair.statistics()).isEqualTo(statistics);
        assertThat(report.registration().mirrored()).isTrue();
        assertThat(report.registration().score()).isGreaterThan(0.9);
    }

    @Test
    void theOverlapCountedOnTheResampledMapIsTheSearchCount() {
        for (Registration r : new Registration[] {Registration.identity(), TRUTH,
                Registration.explicit(false, true, -33, 5.25, 0.5), Registration.explicit(false, false, 0, 30, -12)}) {
            PixelMapping m = PixelMapping.of(BEFORE.grid(), AFTER.grid(), r);
            int direct = Resampling.overlap(BEFORE.raster(), AFTER.raster(), m);
            int counted = MapComparison.statisticsAndOverlap(BEFORE, MapRegistration.apply(BEFORE, AFTER, r), 0.05,
                    Improvement.of(BEFORE.quantity())).overlap();
            assertThat(counted).as("%s", r).isEqualTo(direct);
        }
    }

    @Test
    void resultsDoNotDependOnTheNumberOfThreads() {
        RegisteredPair one = inPool(1, BEFORE, AFTER, OPTIONS);
        RegisteredPair three = inPool(3, BEFORE, AFTER, OPTIONS);
        assertThat(three.report()).isEqualTo(one.report());
        assertThat(Arrays.equals(three.aligned().raster().samples(), one.aligned().raster().samples())).isTrue();
        assertThat(three.statistics()).isEqualTo(one.statistics());
    }

    @Test
    void derivedMapsDoNotDependOnTheNumberOfThreads() {
        WaferMap aligned = inPool(1, BEFORE, AFTER, OPTIONS).aligned();
        ForkJoinPool one = new ForkJoinPool(1);
        ForkJoinPool four = new ForkJoinPool(4);
        try {
            float[] a = one.submit(() -> MapComparison.relativeChange(BEFORE, aligned)).join().raster().samples();
            float[] b = four.submit(() -> MapComparison.relativeChange(BEFORE, aligned)).join().raster().samples();
            assertThat(Arrays.equals(a, b)).isTrue();
            // and each pixel is the formula's
            float[] before = BEFORE.raster().samples();
            float[] after = aligned.raster().samples();
            for (int i = 0; i < a.length; i++) {
                double vb = before[i];
                double va = after[i];
                float expected = Double.isFinite(vb) && Double.isFinite(va) && vb > 0 && va > 0
                        ? (float) ((va - vb) / vb) : Float.NaN;
                assertThat(Float.compare(a[i], expected)).as("pixel %d: %s, not %s", i, a[i], expected).isZero();
            }
        } finally {
            one.shutdown();
            four.shutdown();
        }
    }

    @Test
    void withoutRegistrationTheMapsAreTakenAsTheyLie() {
        WaferMap again = WAFER.after(GRID, Registration.identity(), 1.5, 0.03, 21);
        RegisteredPair pair = inPool(2, BEFORE, again, null);
        assertThat(pair.report().kept()).isEqualTo(RegistrationReport.Kept.UNREGISTERED);
        assertThat(pair.report()).isEqualTo(MapRegistration.unregistered(BEFORE, again));
        assertThat(pair.aligned().raster().samples()).isEqualTo(again.raster().samples());
        assertThat(pair.statistics().medianRatio()).isBetween(1.3, 1.7);
    }

    @Test
    void withoutRegistrationMapsOfDifferentSizesAreRefused() {
        assertThatThrownBy(() -> RegisteredPair.of(BEFORE, AFTER, null, 0.05, Improvement.HIGHER_IS_BETTER,
                ProgressListener.NONE)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("200x200 px").hasMessageContaining("230x210 px");
    }
}
