package trapmap.maps.spectroscopy;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CancellationException;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.Workers;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.maps.stats.MapStatistics;
import trapmap.physics.defect.Defect;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.DpssFit;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * Defect identification over a wafer from an injection stack: the library ranking of physics'
 * {@link LibraryRanking} (injection-dependent lifetime spectroscopy) per pixel or per k×k block, and per region with
 * the ranking and the DPSS ({@link DpssFit}).
 * <p>
 * <b>Curves.</b> A pixel's curve is its τ_SRH at every level with the stated relative pixel noise u as the relative
 * uncertainty of every level. A block's or a region's curve is the level-wise arithmetic mean of its pixels' τ_SRH
 * over the pixels whose τ_SRH is finite and positive at every level (n of them); its relative uncertainty at level
 * i is the larger of the standard error of the mean s_i/(sqrt(n)·mean_i) (s_i the sample standard deviation) and
 * u/sqrt(n), the standard error the stated pixel noise alone implies (Bevington &amp; Robinson, Data Reduction and
 * Error Analysis, 3rd ed. (2003), ch. 4), so that a small or very uniform group is not credited with less
 * uncertainty than its noise allows. When no pixel is usable at every level, each level's mean is taken over the
 * pixels usable there (+∞, below the limit, where none is). Under a fixed generation rate the levels of a curve
 * are the Δn of its pixel, or the mean Δn of its pixels, and the ranking is prepared for them (one ranking per
 * curve: the per-pixel cost is then that of preparing a ranking, some microseconds per candidate).
 * <p>
 * <b>Regions.</b> The regions are the 8-connected areas ({@link ThresholdRegions}) of the pixels where, at the first
 * level, SRH recombination dominates (its share τ_eff/τ_SRH of the recombination rate is above
 * {@value #SRH_DOMINANT_SHARE}) and τ_SRH is below a threshold: by default half the median τ_SRH of the first level
 * over the pixels with data (pixels below the detection limit count as infinitely long-lived; when the median is
 * itself below the limit, an SRH-free background, the dominance alone decides). Regions smaller than
 * {@link Options#minRegionPixels()} pixels are dropped. The rule finds the low-lifetime areas whatever defect causes
 * them, so that an area where two defects overlap is one region whose curve no single defect explains; the
 * dominance condition keeps background pixels, whose τ_SRH is only the noise of τ_eff, out of the regions.
 * <p>
 * Pixels and blocks are ranked on {@link Options#threads()} threads; every result is that of one thread.
 */
public final class DefectIdentification {
    /** Smallest region kept, pixels, unless the options say otherwise. */
    public static final int DEFAULT_MIN_REGION_PIXELS = 16;
    /** What every face of an identification says of it: the command line's note and the viewer's dialog. */
    public static final String HINT = "a hint, not a proof: the ranking knows only the library's defects";
    /** Default region threshold as a share of the median τ_SRH of the first level (project choice). */
    public static final double DEFAULT_REGION_FRACTION = 0.5;
    /** Least SRH share τ_eff/τ_SRH of the first level's recombination rate in a region pixel (project choice). */
    public static final double SRH_DOMINANT_SHARE = 0.5;
    /** Largest block side, pixels. */
    public static final int MAX_BLOCK_PX = 1024;
    /** Smallest relative noise of a pixel's τ_SRH accepted (1e-6; the largest is 1). */
    public static final double MIN_RELATIVE_NOISE = 1e-6;

    private DefectIdentification() {
    }

    /**
     * How to identify.
     *
     * @param blockPx           side of the square blocks ranked as one curve, pixels (1: every pixel alone)
     * @param relativeNoise     relative standard uncertainty of one pixel's τ_SRH at every level (0.03 is 3 %)
     * @param regionThresholdUs regions are where the first level's τ_SRH is below this, µs; NaN: the default rule
     * @param minRegionPixels   smallest region kept, pixels
     * @param threads           threads for the pixels and blocks
     */
    public record Options(int blockPx, double relativeNoise, double regionThresholdUs, int minRegionPixels,
                          int threads) {
        /** Pixel by pixel, 3 % noise, the default region rule, all processors. */
        public static final Options DEFAULTS = new Options(1, LifetimeCurve.DEFAULT_RELATIVE_UNCERTAINTY, Double.NaN,
                DEFAULT_MIN_REGION_PIXELS, Runtime.getRuntime().availableProcessors());

        public Options {
            if (blockPx < 1 || blockPx > MAX_BLOCK_PX) {
                throw new InvalidValueException("block", "px", "the block side must be in [1, " + MAX_BLOCK_PX
                        + "] px but was " + blockPx);
            }
            Checks.inRange(relativeNoise, MIN_RELATIVE_NOISE, 1, "noise", "relative");
            if (!Double.isNaN(regionThresholdUs)) {
                Checks.positive(Checks.finite(regionThresholdUs, "regionThreshold", "us"), "regionThreshold", "us");
            }
            if (minRegionPixels < 1) {
                throw new InvalidValueException("minRegion", "px", "the smallest region must be at least 1 px but"
                        + " was " + minRegionPixels);
            }
            if (threads < 1) {
                throw new InvalidValueException("threads", "", "threads must be at least 1 but was " + threads);
            }
        }

        public Options withBlock(int px) {
            return new Options(px, relativeNoise, regionThresholdUs, minRegionPixels, threads);
        }

        public Options withNoise(double relative) {
            return new Options(blockPx, relative, regionThresholdUs, minRegionPixels, threads);
        }

        public Options withRegionThreshold(double us) {
            return new Options(blockPx, relativeNoise, us, minRegionPixels, threads);
        }

        public Options withMinRegionPixels(int px) {
            return new Options(blockPx, relativeNoise, regionThresholdUs, px, threads);
        }

        public Options withThreads(int n) {
            return new Options(blockPx, relativeNoise, regionThresholdUs, minRegionPixels, n);
        }
    }

    /**
     * Converts every level of {@code stack} ({@link StackLifetimes}, with the first candidate that has absolute
     * cross-sections) and identifies as {@link #identify(StackLifetimes, List, Options)}.
     *
     * @throws InvalidValueException for missing conditions or when no candidate has absolute cross-sections
     */
    public static IdentificationResult identify(InjectionStack stack, ConversionSettings settings,
                                                List<Defect> candidates, Options options) {
        return identify(stack, settings, candidates, options, ProgressListener.NONE);
    }

    /**
     * As {@link #identify(InjectionStack, ConversionSettings, List, Options)}, telling {@code progress} (from the
     * working threads) after each level's conversion and each row of blocks ranked; ends with a
     * {@link CancellationException} when the calling thread is interrupted.
     */
    public static IdentificationResult identify(InjectionStack stack, ConversionSettings settings,
                                                List<Defect> candidates, Options options, ProgressListener progress) {
        Checks.notNull(candidates, "candidates");
        Checks.notNull(options, "options");
        Checks.notNull(progress, "progress");
        Defect any = candidates.stream().filter(Defect::hasAbsoluteCrossSections).findFirst()
                .orElseThrow(() -> new InvalidValueException("defects", "", "none of the " + candidates.size()
                        + " candidate defects has absolute capture cross-sections (cm^2), so none can be ranked"));
        progress.progress(0, 0, "converting " + stack.size() + " levels");
        StackLifetimes lt = StackLifetimes.of(stack, any, settings, options.threads());
        if (Thread.currentThread().isInterrupted()) {
            throw new CancellationException("identification cancelled");
        }
        return identify(lt, candidates, options, progress);
    }

    /**
     * Identifies the defect of every pixel (or block) and region of a stack.
     *
     * @param lifetimes  τ_SRH and Δn per pixel and level
     * @param candidates the library defects to rank (those without absolute cross-sections only enter the DPSS)
     * @param options    block, noise, region rule, threads
     * @throws InvalidValueException when no candidate has absolute cross-sections
     */
    public static IdentificationResult identify(StackLifetimes lifetimes, List<Defect> candidates, Options options) {
        return identify(lifetimes, candidates, options, ProgressListener.NONE);
    }

    /**
     * As {@link #identify(StackLifetimes, List, Options)}, telling {@code progress} (from the working threads) after
     * each row of blocks; ends with a {@link CancellationException} when the calling thread is interrupted.
     */
    public static IdentificationResult identify(StackLifetimes lifetimes, List<Defect> candidates, Options options,
                                                ProgressListener progress) {
        Checks.notNull(progress, "progress");
        Checks.notNull(lifetimes, "lifetimes");
        Checks.notNull(candidates, "candidates");
        Checks.notNull(options, "options");
        Engine e = new Engine(lifetimes, candidates, options);
        int w = lifetimes.width();
        int h = lifetimes.height();
        int n = w * h;
        float[] best = nan(n);
        float[] runner = nan(n);
        float[] chi2 = nan(n);
        float[] ratio = nan(n);
        float[] status = nan(n);
        float[] nt = nan(n);
        int k = options.blockPx();
        int blockRows = (h + k - 1) / k;
        AtomicInteger next = new AtomicInteger();
        AtomicReference<Throwable> failure = new AtomicReference<>();
        AtomicInteger doneRows = new AtomicInteger();
        Thread caller = Thread.currentThread();
        Runnable work = () -> {
            try {
                int[] pixels = new int[k * k];
                for (int by = next.getAndIncrement(); by < blockRows && failure.get() == null;
                        by = next.getAndIncrement()) {
                    for (int bx = 0; bx * k < w; bx++) {
                        int count = e.blockPixels(bx, by, pixels);
                        LifetimeCurve curve = e.curve(pixels, count);
                        if (curve == null) {
                            continue;
                        }
                        Ranking r = e.rank(curve);
                        float b = Float.NaN;
                        float ru = Float.NaN;
                        float c2 = Float.NaN;
                        float q = Float.NaN;
                        float d = Float.NaN;
                        if (r.hint() != null) {
                            b = e.index(r.hint().best());
                            ru = r.hint().runnerUp() == null ? Float.NaN : e.index(r.hint().runnerUp());
                            c2 = (float) r.hint().best().chiSquared();
                            q = (float) r.hint().chiSquaredRatio();
                            d = (float) r.hint().best().ntPerCm3();
                        }
                        float s = r.status().ordinal();
                        for (int j = 0; j < count; j++) {
                            int p = pixels[j];
                            if (!e.hasData(p)) {
                                continue;
                            }
                            best[p] = b;
                            runner[p] = ru;
                            chi2[p] = c2;
                            ratio[p] = q;
                            status[p] = s;
                            nt[p] = d;
                        }
                    }
                    progress.progress(doneRows.incrementAndGet(), blockRows, "ranking the defects");
                    if (caller.isInterrupted()) {
                        failure.compareAndSet(null, new CancellationException("identification cancelled"));
                    }
                }
            } catch (RuntimeException | Error ex) {
                failure.compareAndSet(null, ex);
            }
        };
        runAll(work, Math.max(1, Math.min(options.threads(), blockRows)), failure);

        int[] counts = new int[e.fitted.size() + 1];
        int[] statusCounts = new int[RankingStatus.values().length];
        for (int p = 0; p < n; p++) {
            if (Float.isNaN(status[p])) {
                continue;
            }
            int s = (int) status[p];
            statusCounts[s]++;
            if ((s == RankingStatus.OK.ordinal() || s == RankingStatus.BELOW_LIMIT.ordinal()) && !Float.isNaN(best[p])) {
                counts[(int) best[p]]++;
            }
        }
        List<IdentificationResult.LegendEntry> legend = new ArrayList<>();
        for (int i = 0; i < e.fitted.size(); i++) {
            Defect d = e.fitted.get(i);
            legend.add(new IdentificationResult.LegendEntry(i + 1, d.id(), d.name(), counts[i + 1]));
        }

        Regions regions = regions(lifetimes, options);
        List<RegionIdentification> regionResults = new ArrayList<>();
        for (int r = 0; r < regions.table.size(); r++) {
            int[] px = regions.pixels.get(r);
            LifetimeCurve curve = e.curve(px, px.length);
            Region region = regions.table.regions().get(r);
            if (curve == null) {
                regionResults.add(new RegionIdentification(region, 0, null, null, null, "no pixel with data"));
                continue;
            }
            Ranking ranking = e.rank(curve);
            DpssResult dpss = null;
            String note = "";
            try {
                dpss = new DpssFit(lifetimes.doping(), lifetimes.silicon(), curve.injectionPerCm3())
                        .fit(curve, candidates);
            } catch (InvalidValueException ex) {
                note = "DPSS not made: " + ex.getMessage();
            }
            regionResults.add(new RegionIdentification(region, e.completeCount(px, px.length), curve, ranking, dpss,
                    note));
        }
        return new IdentificationResult(lifetimes, candidates, e.fitted, options, legend, best, runner, chi2, ratio,
                status, nt, statusCounts, regions.labels, regions.thresholdUs, regionResults, e);
    }

    private static float[] nan(int n) {
        float[] a = new float[n];
        Arrays.fill(a, Float.NaN);
        return a;
    }

    /** Runs {@code work} on {@code threads} threads (this one among them) and rethrows the first failure. */
    private static void runAll(Runnable work, int threads, AtomicReference<Throwable> failure) {
        Throwable f = Workers.runAll(Collections.nCopies(threads, work), "identify-", failure);
        if (f instanceof InterruptedException) {
            throw new CancellationException("identification cancelled");
        }
        Workers.rethrow(f, "the identification failed");
    }

    /** The region labels and pixels of a stack, with the threshold used. */
    record Regions(RegionTable table, int[] labels, List<int[]> pixels, double thresholdUs) {
    }

    /** The regions of the first level's τ_SRH (see the class description). */
    static Regions regions(StackLifetimes lifetimes, Options options) {
        float[] first = lifetimes.tauSrhUs(0);
        int w = lifetimes.width();
        int h = lifetimes.height();
        double threshold = options.regionThresholdUs();
        if (Double.isNaN(threshold)) {
            float[] values = new float[first.length];
            int m = 0;
            for (float v : first) {
                if (!Float.isNaN(v)) {
                    values[m++] = v;
                }
            }
            double median = median(values, m);
            // an SRH-free background (median below the limit, or no data): no threshold, dominance alone decides
            threshold = Double.isFinite(median) ? DEFAULT_REGION_FRACTION * median : Double.POSITIVE_INFINITY;
        }
        float[] dominant = new float[first.length];
        for (int p = 0; p < first.length; p++) {
            float t = first[p];
            dominant[p] = Float.isNaN(t) || lifetimes.effectiveLifetimeUs(0, p) / t > SRH_DOMINANT_SHARE ? t
                    : Float.POSITIVE_INFINITY;
        }
        first = dominant;
        double pixelArea = lifetimes.stack().grid().pixelAreaMm2();
        // no threshold (+∞): every finite τ_SRH of an SRH-dominated pixel is below the largest float
        RegionCriteria criteria = RegionCriteria.below(Math.min(threshold, Float.MAX_VALUE),
                (options.minRegionPixels() - 0.5) * pixelArea);
        RegionTable table = ThresholdRegions.find(FloatRaster.wrap(w, h, first), lifetimes.stack().grid(), null,
                criteria, null);
        int[] labels = new int[w * h];
        List<int[]> pixels = new ArrayList<>();
        boolean[] seen = new boolean[w * h];
        int[] queue = new int[w * h];
        int id = 0;
        for (int start = 0; start < first.length; start++) {
            if (seen[start] || !criteria.selects(first[start])) {
                continue;
            }
            int head = 0;
            int tail = 0;
            queue[tail++] = start;
            seen[start] = true;
            while (head < tail) {
                int p = queue[head++];
                int x = p % w;
                int y = p / w;
                for (int dy = -1; dy <= 1; dy++) {
                    for (int dx = -1; dx <= 1; dx++) {
                        int nx = x + dx;
                        int ny = y + dy;
                        if (nx < 0 || ny < 0 || nx >= w || ny >= h) {
                            continue;
                        }
                        int q = ny * w + nx;
                        if (!seen[q] && criteria.selects(first[q])) {
                            seen[q] = true;
                            queue[tail++] = q;
                        }
                    }
                }
            }
            if (tail * pixelArea < criteria.minAreaMm2()) {
                continue;
            }
            id++;
            int[] px = Arrays.copyOf(queue, tail);
            Arrays.sort(px);
            for (int p : px) {
                labels[p] = id;
            }
            pixels.add(px);
        }
        if (id != table.size()) {
            throw new IllegalStateException("region labelling found " + id + " regions, the region table "
                    + table.size());
        }
        for (int r = 0; r < id; r++) {
            if (table.regions().get(r).pixelCount() != pixels.get(r).length) {
                throw new IllegalStateException("region " + (r + 1) + " has " + pixels.get(r).length
                        + " labelled pixels but " + table.regions().get(r).pixelCount() + " in the region table");
            }
        }
        return new Regions(table, labels, pixels, threshold);
    }

    /**
     * Median of values[0..n) (NaN-free, reordered here): the middle one of the sorted values, or the mean of the two
     * middle ones for an even count; NaN for none. From the one or two middle order statistics
     * ({@link MapStatistics#orderStatistics}, bit for bit those of a sort) instead of a full sort.
     */
    static double median(float[] values, int n) {
        if (n == 0) {
            return Double.NaN;
        }
        if (n % 2 == 1) {
            return MapStatistics.orderStatistics(values, n, new int[] {n / 2})[0];
        }
        double[] mid = MapStatistics.orderStatistics(values, n, new int[] {n / 2 - 1, n / 2});
        return 0.5 * (mid[0] + mid[1]);
    }

    /** What every pixel, block and region shares: the candidates, the shared ranking, the curves' rule. */
    static final class Engine {
        final StackLifetimes lt;
        final List<Defect> candidates;
        final List<Defect> fitted = new ArrayList<>();
        final Map<String, Integer> indexOf = new HashMap<>();
        final Options options;
        /** The ranking of fixed levels; null under a generation rate (one per curve then). */
        final LibraryRanking shared;
        final double[] fixedLevels;
        final int levels;
        final int w;
        final int h;

        Engine(StackLifetimes lt, List<Defect> candidates, Options options) {
            this.lt = lt;
            this.candidates = List.copyOf(candidates);
            this.options = options;
            for (Defect d : candidates) {
                if (d.hasAbsoluteCrossSections() && !indexOf.containsKey(d.id())) {
                    fitted.add(d);
                    indexOf.put(d.id(), fitted.size());
                }
            }
            if (fitted.isEmpty()) {
                throw new InvalidValueException("defects", "", "none of the " + candidates.size() + " candidate"
                        + " defects has absolute capture cross-sections (cm^2), so none can be ranked");
            }
            fixedLevels = lt.fixedLevelsCm3();
            shared = fixedLevels == null ? null : new LibraryRanking(fitted, lt.doping(), lt.silicon(), fixedLevels);
            levels = lt.levels();
            w = lt.width();
            h = lt.height();
        }

        float index(CandidateFit f) {
            Integer i = indexOf.get(f.id());
            return i == null ? Float.NaN : i;
        }

        Ranking rank(LifetimeCurve c) {
            LibraryRanking r = shared != null ? shared
                    : new LibraryRanking(fitted, lt.doping(), lt.silicon(), c.injectionPerCm3());
            return r.rank(c.tauSrhS(), c.relativeUncertainty());
        }

        /** The pixels of block (bx, by) in raster order, into {@code out}; returns their number. */
        int blockPixels(int bx, int by, int[] out) {
            int k = options.blockPx();
            int n = 0;
            for (int y = by * k, ye = Math.min(h, y + k); y < ye; y++) {
                for (int x = bx * k, xe = Math.min(w, x + k); x < xe; x++) {
                    out[n++] = y * w + x;
                }
            }
            return n;
        }

        /** True when the pixel's τ_SRH is known (finite or +∞ below the limit) at every level. */
        boolean hasData(int p) {
            for (int i = 0; i < levels; i++) {
                if (Double.isNaN(lt.tauSrhUs(i, p))) {
                    return false;
                }
            }
            return true;
        }

        boolean complete(int p) {
            for (int i = 0; i < levels; i++) {
                double t = lt.tauSrhUs(i, p);
                if (!(t > 0 && t < Double.POSITIVE_INFINITY)) {
                    return false;
                }
            }
            return true;
        }

        int completeCount(int[] pixels, int count) {
            int c = 0;
            for (int j = 0; j < count; j++) {
                if (complete(pixels[j])) {
                    c++;
                }
            }
            return c;
        }

        /** The curve of a group of pixels (see the class description), null when none has data. */
        LifetimeCurve curve(int[] pixels, int count) {
            double u = options.relativeNoise();
            double[] tau = new double[levels];
            double[] unc = new double[levels];
            double[] dn = new double[levels];
            if (count == 1) {
                int p = pixels[0];
                if (!hasData(p)) {
                    return null;
                }
                for (int i = 0; i < levels; i++) {
                    tau[i] = lt.tauSrhUs(i, p) * 1e-6;
                    unc[i] = u;
                    dn[i] = fixedLevels != null ? fixedLevels[i] : lt.injectionCm3(i, p);
                }
                return new LifetimeCurve(dn, tau, unc);
            }
            int complete = completeCount(pixels, count);
            int withData = 0;
            for (int j = 0; j < count; j++) {
                if (hasData(pixels[j])) {
                    withData++;
                }
            }
            if (withData == 0) {
                return null;
            }
            for (int i = 0; i < levels; i++) {
                double sum = 0;
                double sumDn = 0;
                int m = 0;
                int mDn = 0;
                for (int j = 0; j < count; j++) {
                    int p = pixels[j];
                    boolean use = complete > 0 ? complete(p) : hasData(p);
                    if (!use) {
                        continue;
                    }
                    sumDn += lt.injectionCm3(i, p);
                    mDn++;
                    double t = lt.tauSrhUs(i, p);
                    if (t > 0 && t < Double.POSITIVE_INFINITY) {
                        sum += t;
                        m++;
                    }
                }
                dn[i] = fixedLevels != null ? fixedLevels[i] : sumDn / mDn;
                if (m == 0) {
                    tau[i] = Double.POSITIVE_INFINITY;
                    unc[i] = u;
                    continue;
                }
                double mean = sum / m;
                double ss = 0;
                for (int j = 0; j < count; j++) {
                    int p = pixels[j];
                    boolean use = complete > 0 ? complete(p) : hasData(p);
                    double t = lt.tauSrhUs(i, p);
                    if (use && t > 0 && t < Double.POSITIVE_INFINITY) {
                        ss += (t - mean) * (t - mean);
                    }
                }
                double sem = m > 1 ? Math.sqrt(ss / (m - 1)) / Math.sqrt(m) / mean : 0;
                tau[i] = mean * 1e-6;
                unc[i] = Math.max(sem, u / Math.sqrt(m));
            }
            return new LifetimeCurve(dn, tau, unc);
        }

        /** The curve of the block holding pixel (col, row), null without data. */
        LifetimeCurve curveAt(int col, int row) {
            int k = options.blockPx();
            int[] px = new int[k * k];
            int n = blockPixels(col / k, row / k, px);
            if (!hasData(row * w + col)) {
                return null;
            }
            return curve(px, n);
        }
    }
}
