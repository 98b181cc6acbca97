package trapmap.maps.compare;

import java.util.concurrent.CancellationException;
import java.util.function.ToDoubleFunction;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * The registration search, coarse to fine:
 * <ol>
 *   <li>both maps are drawn on a square canvas of {@code coarseSizePx} pixels in wafer coordinates (log samples,
 *       standardised, edge-tapered, reduced resolution);</li>
 *   <li>each of the eight mirror/quarter-turn placements is phase-correlated with the before map; the three
 *       strongest peaks of each are judged by normalised cross-correlation (NCC) and the best placement kept;</li>
 *   <li>fine turns within ±{@code maxRotationDeg} are scanned the same way and the best turn interpolated;</li>
 *   <li>turn and shift are refined together by maximising the taper-weighted NCC with a downhill simplex on
 *       successively finer levels, down to at most {@code refineSizePx} pixels across;</li>
 *   <li>the score is the plain NCC at that level, the overlap is counted on the before map's own grid.</li>
 * </ol>
 */
final class RegistrationSearch {
    private static final int PEAKS = 3;
    /**
     * Least overlap of a candidate placement, as a share of the smaller map's data: two maps of one wafer overlap
     * mostly, while a strong correlation over a small overlap is usually chance.
     */
    private static final double MIN_OVERLAP_SHARE = 0.5;
    /** Canvas side relative to the larger half-extent of the maps: room for shifts and zero padding. */
    private static final double CANVAS_SPAN = 2.5;
    private static final int STAGES = 4;

    private final Pyramid before;
    private final Pyramid after;
    private final RegistrationOptions options;
    private final ProgressListener progress;
    private final int canvasPx;
    private final double canvasPitchMm;
    private final boolean countOverlap;

    /**
     * @param countOverlap whether {@link #evaluate} counts the overlap on the before grid (a pass over every pixel);
     *                     otherwise it is left 0 for a caller that counts it on the resampled map
     */
    RegistrationSearch(Pyramid before, Pyramid after, RegistrationOptions options, ProgressListener progress,
                       boolean countOverlap) {
        this.countOverlap = countOverlap;
        this.before = before;
        this.after = after;
        this.options = options;
        this.progress = progress;
        double extent = Math.max(halfExtentMm(before.grid()), halfExtentMm(after.grid()));
        double finest = Math.min(before.grid().pitchMm(), after.grid().pitchMm());
        int n = options.coarseSizePx();
        while (n > 32 && CANVAS_SPAN * extent / (n / 2) <= finest) {
            n /= 2;
        }
        this.canvasPx = n;
        this.canvasPitchMm = CANVAS_SPAN * extent / n;
    }

    /** The before map's pyramid (to search again with other options without rebuilding it). */
    Pyramid beforePyramid() {
        return before;
    }

    /** The after map's pyramid. */
    Pyramid afterPyramid() {
        return after;
    }

    /** The full search. */
    Registration search() {
        progress.progress(0, STAGES, "preparing maps");
        Pyramid.Level a = before.level(before.levelNear(canvasPitchMm));
        Pyramid.Level b = after.level(after.levelNear(canvasPitchMm));
        requireTexture(a, "before");
        requireTexture(b, "after");
        PhaseCorrelation pc = new PhaseCorrelation(a, canvasPx, canvasPitchMm);
        checkCancelled();

        progress.progress(1, STAGES, "searching mirror and quarter turns");
        Candidate best = null;
        for (int mirror = 0; mirror < (options.searchOrientations() ? 2 : 1); mirror++) {
            for (int quarter = 0; quarter < (options.searchOrientations() ? 4 : 1); quarter++) {
                Candidate c = bestShift(pc, a, b, Registration.explicit(mirror == 1, false, 90.0 * quarter, 0, 0));
                best = better(best, c);
            }
        }
        if (best == null) {
            throw new InvalidValueException("after", "", "the after map does not overlap the before map in any"
                    + " placement with enough data to correlate");
        }
        checkCancelled();

        progress.progress(2, STAGES, "scanning fine rotation");
        Registration start = best.registration;
        if (options.maxRotationDeg() > 0) {
            start = scanRotation(pc, a, b, best);
        }
        checkCancelled();

        progress.progress(3, STAGES, "refining");
        Registration r = refine(start);
        progress.progress(STAGES, STAGES, "registered");
        return r;
    }

    /**
     * True when {@code r} turns at most {@code maxRotationDeg} away from the nearest of the eight mirror/quarter-turn
     * placements (the limit every stage keeps to).
     */
    static boolean withinTurnLimit(Registration r, double maxRotationDeg) {
        return Math.abs(r.fineRotationDeg()) <= maxRotationDeg + 1e-9;
    }

    private Registration scanRotation(PhaseCorrelation pc, Pyramid.Level a, Pyramid.Level b, Candidate upright) {
        int m = Math.max(1, (int) Math.ceil(options.maxRotationDeg() / options.rotationStepDeg() - 1e-9));
        double step = options.maxRotationDeg() / m;
        Registration o = upright.registration;
        Candidate[] scan = new Candidate[2 * m + 1];
        int bestIndex = m;
        scan[m] = upright;
        for (int j = -m; j <= m; j++) {
            if (j != 0) {
                scan[j + m] = bestShift(pc, a, b, Registration.explicit(o.flipX(), o.flipY(),
                        o.rotationDeg() + j * step, 0, 0));
            }
            if (scan[j + m] != null && scan[j + m].ncc > scan[bestIndex].ncc) {
                bestIndex = j + m;
            }
        }
        Candidate c = scan[bestIndex];
        double turn = 0;
        if (bestIndex > 0 && bestIndex < 2 * m && scan[bestIndex - 1] != null && scan[bestIndex + 1] != null) {
            double l = scan[bestIndex - 1].ncc;
            double r = scan[bestIndex + 1].ncc;
            double d = l - 2 * c.ncc + r;
            if (d < 0) {
                turn = Math.max(-0.5, Math.min(0.5, 0.5 * (l - r) / d)) * step;
            }
        }
        Registration cr = c.registration;
        return Registration.explicit(cr.flipX(), cr.flipY(), cr.rotationDeg() + turn, cr.shiftXMm(), cr.shiftYMm());
    }

    /** Local refinement from {@code start} (mirror kept), then score and overlap. */
    Registration refine(Registration start) {
        double quarterDeg = 90.0 * Math.round(start.rotationDeg() / 90.0);
        int last = before.levelWithin(options.refineSizePx());
        int first = Math.max(last, before.levelNear(canvasPitchMm));
        Registration r = start;
        for (int k = first; k >= last; k--) {
            Pyramid.Level a = before.level(k);
            Pyramid.Level b = after.level(after.levelNear(before.pitchMm(k)));
            if (k == first) {
                requireTexture(a, "before");
                requireTexture(b, "after");
            }
            r = simplex(a, b, r, quarterDeg, k == last ? 0.02 : 0.05, k == first ? 1.0 : 0.6);
            checkCancelled();
        }
        return evaluate(r);
    }

    /**
     * {@code r} with its score (plain NCC at the refinement level) and overlap on the before grid (0 when the
     * overlap is not counted here).
     */
    Registration evaluate(Registration r) {
        int last = before.levelWithin(options.refineSizePx());
        Pyramid.Level a = before.level(last);
        Pyramid.Level b = after.level(after.levelNear(before.pitchMm(last)));
        double ncc = Correlation.plain(a, b, r).ncc();
        double score = Double.isNaN(ncc) ? 0 : Math.max(0, Math.min(1, ncc));
        int overlap = countOverlap ? Resampling.overlap(before.raster(), after.raster(),
                PixelMapping.of(before.grid(), after.grid(), r)) : 0;
        return Registration.explicit(r.flipX(), r.flipY(), r.rotationDeg(), r.shiftXMm(), r.shiftYMm())
                .withQuality(score, overlap);
    }

    /**
     * Downhill simplex over (turn, shift x, shift y) in units of about one pixel of level {@code a}: a turn unit
     * moves a point at the data's rms radius by one pixel. Turns farther than {@code maxRotationDeg} from
     * {@code quarterDeg} (the mirror/quarter-turn placement being refined) are not allowed.
     */
    private Registration simplex(Pyramid.Level a, Pyramid.Level b, Registration r0, double quarterDeg,
                                 double tolerance, double stepPx) {
        double p = a.grid.pitchMm();
        double degPerUnit = Math.toDegrees(p / Math.max(a.rmsRadiusMm, 4 * p));
        boolean turn = options.maxRotationDeg() > 0;
        double minOverlap = minOverlap(a, b);
        double limit = options.maxRotationDeg() + 1e-9;
        ToDoubleFunction<double[]> f = u -> {
            double rotation = r0.rotationDeg() + (turn ? u[2] * degPerUnit : 0);
            if (Math.abs(Registration.normaliseDeg(rotation - quarterDeg)) > limit) {
                return Double.NaN; // beyond --max-rotation-deg: never taken
            }
            Correlation.Result c = Correlation.weighted(a, b, Registration.explicit(r0.flipX(), r0.flipY(),
                    rotation, u[0] * p, u[1] * p));
            return c.pixels() >= minOverlap ? -c.ncc() : Double.NaN;
        };
        double[] startPoint = turn ? new double[] {r0.shiftXMm() / p, r0.shiftYMm() / p, 0}
                : new double[] {r0.shiftXMm() / p, r0.shiftYMm() / p};
        double[] steps = turn ? new double[] {stepPx, stepPx, stepPx} : new double[] {stepPx, stepPx};
        SimplexSearch.Minimum m = SimplexSearch.minimise(f, startPoint, steps, tolerance, 400);
        if (!Double.isFinite(m.value())) {
            return r0;
        }
        double[] u = m.point();
        return Registration.explicit(r0.flipX(), r0.flipY(), r0.rotationDeg() + (turn ? u[2] * degPerUnit : 0),
                u[0] * p, u[1] * p);
    }

    private Candidate bestShift(PhaseCorrelation pc, Pyramid.Level a, Pyramid.Level b, Registration placement) {
        Candidate best = null;
        for (double[] s : pc.shiftsMm(b, placement, PEAKS)) {
            Registration r = Registration.explicit(placement.flipX(), placement.flipY(), placement.rotationDeg(),
                    s[0], s[1]);
            Correlation.Result c = Correlation.weighted(a, b, r);
            if (!Double.isNaN(c.ncc()) && c.pixels() >= minOverlap(a, b)) {
                best = better(best, new Candidate(r, c.ncc()));
            }
        }
        return best;
    }

    /** {@link #MIN_OVERLAP_SHARE} of the smaller map's data, in pixels of level {@code a}. */
    private static double minOverlap(Pyramid.Level a, Pyramid.Level b) {
        double scale = b.grid.pitchMm() / a.grid.pitchMm();
        return MIN_OVERLAP_SHARE * Math.min(a.validCount, b.validCount * scale * scale);
    }

    private static Candidate better(Candidate a, Candidate b) {
        if (a == null) {
            return b;
        }
        return b != null && b.ncc > a.ncc ? b : a;
    }

    private static void requireTexture(Pyramid.Level l, String which) {
        if (!l.textured) {
            throw new InvalidValueException(which, "", "the " + which + " map is flat or has too few samples with"
                    + " data to register; give the registration explicitly");
        }
    }

    private static void checkCancelled() {
        if (Thread.currentThread().isInterrupted()) {
            throw new CancellationException("registration cancelled");
        }
    }

    /** Largest |x| or |y| of the raster's corner pixels, mm. */
    private static double halfExtentMm(PixelGrid g) {
        double x = Math.max(Math.abs(g.xMm(0)), Math.abs(g.xMm(g.width() - 1)));
        double y = Math.max(Math.abs(g.yMm(0)), Math.abs(g.yMm(g.height() - 1)));
        return Math.max(x, y);
    }

    private record Candidate(Registration registration, double ncc) {
    }
}
