package trapmap.maps.batch;

import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.FutureTask;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.ReducedOutline;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The wafer outline of a map's valid pixels as every face fits it ({@link ReducedOutline}: large maps on a
 * block-reduced validity mask), with the last few fits kept for maps that share their mask.
 */
public final class OutlineFits {
    private OutlineFits() {
    }

    /** Size, px, that block reduction brings a large map's validity mask down to for the outline fit. */
    static final int FIT_PX = ReducedOutline.FIT_PX;

    /**
     * The outline of the valid pixels, as {@link ReducedOutline#fit} gives it (a large map on its block-reduced
     * validity mask); the last few fits are kept for maps that share their reduced mask.
     */
    public static OutlineFit fit(float[] tau, PixelGrid grid) {
        int w = grid.width();
        int h = grid.height();
        int k = ReducedOutline.factor(grid);
        if (k <= 1) {
            return ReducedOutline.fit(FloatRaster.wrap(w, h, tau), grid);
        }
        return FIT_CACHE.fit(reducedValidity(tau, w, h, k), ReducedOutline.grid(grid, k));
    }

    /**
     * As {@link ReducedOutline#validity}, on the calling thread: the batch runs one map per worker, and the rows of
     * one map handed to the common pool would only add the hand-over to the work.
     */
    static boolean[] reducedValidity(float[] tau, int w, int h, int k) {
        return ReducedOutline.validity(tau, w, h, k, false);
    }

    /** Fitted outlines of the last few validity masks seen (see {@link FitCache}). */
    private static final FitCache FIT_CACHE = new FitCache(16);

    /**
     * The outline fit is a pure function of the validity mask and its grid, and the maps of one tool often share
     * their reduced mask exactly (same stage, same crop): the last {@code capacity} fits are kept, keyed by the mask's
     * bits and the grid, and a mask equal to one of them reuses its fit. A mask that is being fitted on another
     * thread waits for that fit instead of fitting it too (the workers of a batch all start on maps of the same mask,
     * and their first fit runs in the interpreter: each copy costs tens of milliseconds of CPU); should that fit
     * fail, the waiting thread fits the mask itself. Thread-safe.
     */
    static final class FitCache {
        private record Key(int hash, boolean[] valid, PixelGrid grid) {
            @Override
            public boolean equals(Object o) {
                return o instanceof Key k && k.hash == hash && k.grid.equals(grid)
                        && Arrays.equals(k.valid, valid);
            }

            @Override
            public int hashCode() {
                return hash;
            }
        }

        /** Fits a validity mask on its grid. */
        @FunctionalInterface
        interface Fitter {
            OutlineFit fit(boolean[] valid, PixelGrid grid);
        }

        /** The kept fits, least recently used first; guards {@link #running}. */
        private final Map<Key, OutlineFit> fits;
        /** The fits under way, by mask. */
        private final Map<Key, FutureTask<OutlineFit>> running = new HashMap<>();
        private final Fitter fitter;

        FitCache(int capacity) {
            this(capacity, (valid, grid) -> OutlineDetection.fit(Mask.of(grid.width(), grid.height(),
                    i -> valid[i]), grid));
        }

        /** With another fitter (a test counting the fits). */
        FitCache(int capacity, Fitter fitter) {
            this.fitter = fitter;
            fits = new LinkedHashMap<>(capacity, 0.75f, true) {
                @Override
                protected boolean removeEldestEntry(Map.Entry<Key, OutlineFit> eldest) {
                    return size() > capacity;
                }
            };
        }

        OutlineFit fit(boolean[] valid, PixelGrid grid) {
            Key key = new Key(31 * Arrays.hashCode(valid) + grid.hashCode(), valid, grid);
            FutureTask<OutlineFit> task;
            boolean mine = false;
            synchronized (fits) {
                OutlineFit kept = fits.get(key);
                if (kept != null) {
                    return kept;
                }
                task = running.get(key);
                if (task == null) {
                    task = new FutureTask<>(() -> fitter.fit(valid, grid));
                    running.put(key, task);
                    mine = true;
                }
            }
            if (mine) {
                task.run();
                synchronized (fits) {
                    running.remove(key);
                    if (!task.isCancelled()) {
                        try {
                            fits.put(key, task.get());
                        } catch (ExecutionException | InterruptedException e) {
                            // not kept: the failure is thrown below
                        }
                    }
                }
            }
            try {
                return task.get();
            } catch (ExecutionException e) {
                if (!mine) {
                    return fitter.fit(valid, grid); // its own failure, on its own thread
                }
                if (e.getCause() instanceof RuntimeException r) {
                    throw r;
                }
                if (e.getCause() instanceof Error r) {
                    throw r;
                }
                throw new IllegalStateException(e.getCause());
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt(); // the interruption stays for the caller to see
                return fitter.fit(valid, grid);
            }
        }

        /** How many fits are kept (a test's view). */
        int kept() {
            synchronized (fits) {
                return fits.size();
            }
        }
    }
}
