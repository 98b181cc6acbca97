package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * {@link OutlineFits.FitCache}: threads that fit the same mask at the same time share one fit (the batch's workers
 * all start on maps of one mask); different masks are fitted side by side; a failed fit is not kept.
 */
class OutlineFitCacheTest {
    private static final PixelGrid GRID = PixelGrid.centred(48, 48, 1.0);

    /** A round wafer of radius {@code r} px (a new array at every call: equal masks, not the same array). */
    private static boolean[] disc(double r) {
        boolean[] v = new boolean[GRID.width() * GRID.height()];
        for (int y = 0; y < GRID.height(); y++) {
            for (int x = 0; x < GRID.width(); x++) {
                double dx = x + 0.5 - GRID.width() / 2.0;
                double dy = y + 0.5 - GRID.height() / 2.0;
                v[y * GRID.width() + x] = dx * dx + dy * dy <= r * r;
            }
        }
        return v;
    }

    private static OutlineFit direct(boolean[] valid) {
        return OutlineDetection.fit(Mask.of(GRID.width(), GRID.height(), i -> valid[i]), GRID);
    }

    private static void await(CountDownLatch latch) {
        try {
            if (!latch.await(20, TimeUnit.SECONDS)) {
                throw new IllegalStateException("the other fits never came");
            }
        } catch (InterruptedException e) {
            throw new IllegalStateException(e);
        }
    }

    @Test
    void threadsFittingOneMaskTogetherShareOneFit() throws Exception {
        int threads = 4;
        AtomicInteger fitted = new AtomicInteger();
        CountDownLatch arrived = new CountDownLatch(threads);
        // each fit waits until every thread has come to the cache: fitted apart, there would be one per thread
        OutlineFits.FitCache cache = new OutlineFits.FitCache(4, (valid, grid) -> {
            fitted.incrementAndGet();
            await(arrived);
            return direct(valid);
        });
        ExecutorService pool = Executors.newFixedThreadPool(threads);
        try {
            List<Future<OutlineFit>> fits = new ArrayList<>();
            for (int t = 0; t < threads; t++) {
                fits.add(pool.submit(() -> {
                    boolean[] mask = disc(20);
                    arrived.countDown();
                    return cache.fit(mask, GRID);
                }));
            }
            OutlineFit first = fits.get(0).get(30, TimeUnit.SECONDS);
            for (Future<OutlineFit> f : fits) {
                assertThat(f.get(30, TimeUnit.SECONDS)).isSameAs(first);
            }
            assertThat(first).isEqualTo(direct(disc(20)));
            assertThat(fitted).hasValue(1);
            assertThat(cache.fit(disc(20), GRID)).isSameAs(first); // kept
            assertThat(fitted).hasValue(1);
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void differentMasksAreFittedSideBySide() throws Exception {
        CountDownLatch started = new CountDownLatch(2);
        // each fit waits for the other to start: fitted one after the other, neither would finish
        OutlineFits.FitCache cache = new OutlineFits.FitCache(4, (valid, grid) -> {
            started.countDown();
            await(started);
            return direct(valid);
        });
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            Future<OutlineFit> a = pool.submit(() -> cache.fit(disc(20), GRID));
            Future<OutlineFit> b = pool.submit(() -> cache.fit(disc(15), GRID));
            assertThat(a.get(30, TimeUnit.SECONDS)).isEqualTo(direct(disc(20)));
            assertThat(b.get(30, TimeUnit.SECONDS)).isEqualTo(direct(disc(15)));
            assertThat(cache.kept()).isEqualTo(2);
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void aFailedFitIsThrownToItsThreadAndNotKept() {
        AtomicInteger calls = new AtomicInteger();
        OutlineFits.FitCache cache = new OutlineFits.FitCache(4, (valid, grid) -> {
            if (calls.incrementAndGet() == 1) {
                throw new IllegalArgumentException("no wafer in the mask");
            }
            return direct(valid);
        });
        assertThatThrownBy(() -> cache.fit(disc(20), GRID)).isInstanceOf(IllegalArgumentException.class)
                .hasMessage("no wafer in the mask");
        assertThat(cache.kept()).isZero();
        assertThat(cache.fit(disc(20), GRID)).isEqualTo(direct(disc(20)));
        assertThat(cache.kept()).isEqualTo(1);
    }

    @Test
    void onlyTheLastFewMasksAreKept() {
        OutlineFits.FitCache cache = new OutlineFits.FitCache(2);
        OutlineFit a = cache.fit(disc(20), GRID);
        cache.fit(disc(15), GRID);
        cache.fit(disc(10), GRID);
        assertThat(cache.kept()).isEqualTo(2);
        OutlineFit again = cache.fit(disc(20), GRID); // dropped: fitted anew, the same outline
        assertThat(again).isEqualTo(a).isNotSameAs(a);
    }
}
