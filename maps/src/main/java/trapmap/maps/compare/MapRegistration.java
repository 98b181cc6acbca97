package trapmap.maps.compare;

import java.util.List;
import java.util.Locale;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * Registers an "after" map B of a wafer onto a "before" map A of the same wafer, from the data alone, and resamples
 * B onto A's grid. The maps may come from different tools: B may be mirrored, turned by quarter turns and a few
 * degrees, shifted, and have another pixel pitch (pitches are taken from the {@link PixelGrid}s, so all results are
 * in mm). A lifetime map can be registered against a density map: the contrast of B is then inverted.
 *
 * <p>Stages: both maps are log-transformed (when positive), standardised and edge-tapered at reduced resolution;
 * the eight mirror/quarter-turn placements are phase-correlated on a square canvas of
 * {@link RegistrationOptions#coarseSizePx()} pixels and the strongest peaks judged by normalised cross-correlation
 * (NCC); fine turns within ±{@link RegistrationOptions#maxRotationDeg()} are scanned the same way; turn and shift
 * are then refined together by maximising the NCC with a downhill simplex on finer levels, up to
 * {@link RegistrationOptions#refineSizePx()} pixels across. The cost therefore hardly grows with the map size;
 * only the overlap count and {@link #apply} touch every pixel.
 *
 * <p>The score is the NCC of the fine structure of the log samples (local mean removed) at the refinement level:
 * in tests on synthetic wafers, same-wafer pairs with a few percent pixel noise score about 0.95–0.99 (about 0.6
 * at 40 % noise, still correctly placed) and maps of different wafers below 0.3. The placement found is only kept
 * when it scores higher than the maps as they lie (the identity), and no stage turns farther than
 * {@link RegistrationOptions#maxRotationDeg()} from a mirror/quarter-turn placement. {@link #registerChecked} adds
 * the {@link RegistrationWarnings} (different wafer ids or sizes, a score below
 * {@link RegistrationWarnings#SCORE_FLOOR}).
 */
public final class MapRegistration {
    /** Shortest side a map must have to be registered from its data, pixels. */
    private static final int MIN_SIDE_PX = 8;

    private MapRegistration() {
    }

    /** Searches with {@link RegistrationOptions#DEFAULTS}. */
    public static Registration register(WaferMap before, WaferMap after) {
        return register(before, after, RegistrationOptions.DEFAULTS, ProgressListener.NONE);
    }

    /**
     * Finds the placement of {@code after} on {@code before}; when the identity placement (the maps as they lie)
     * scores at least as high, the identity is returned, so the result never scores below the unregistered maps.
     * The turn stays within {@link RegistrationOptions#maxRotationDeg()} of a mirror/quarter-turn placement. A mirror is reported as {@code flipX} (never
     * {@code flipY}) with the turn in (−180°, 180°]; {@link Registration#canonical()} gives the smallest turn.
     *
     * @throws trapmap.shared.error.InvalidValueException when a map is flat or the maps do not overlap
     * @throws java.util.concurrent.CancellationException when the thread is interrupted
     */
    public static Registration register(WaferMap before, WaferMap after, RegistrationOptions options,
                                        ProgressListener progress) {
        return choose(search(before, after, options, progress), options).registration();
    }

    /**
     * Searches as {@link #register(WaferMap, WaferMap, RegistrationOptions, ProgressListener)}, scores the identity
     * placement too and keeps the better one (the identity on a tie), so that the placement returned never scores
     * below the unregistered maps; every candidate keeps within {@link RegistrationOptions#maxRotationDeg()} of a
     * mirror/quarter-turn placement. The report carries both scores and the {@link RegistrationWarnings}.
     */
    public static RegistrationReport registerChecked(WaferMap before, WaferMap after, RegistrationOptions options,
                                                     ProgressListener progress) {
        RegistrationWarnings.SizeCheck size = RegistrationWarnings.SizeCheck.start(before, after);
        try {
            return withWarnings(before, after, registerUnchecked(before, after, options, progress, true), size);
        } finally {
            size.cancel();
        }
    }

    /**
     * Registers a map known to lie almost as the before map does (another measurement of the same wafer in the same
     * tool), translation first: no mirror or quarter turn is searched whatever {@code options} says, and a placement
     * is kept only when it beats every simpler one by more than {@code marginScore} (score units, 0–1): a shift must
     * score above the maps as they lie (the identity) by more than the margin, and a shift with a fine turn within
     * {@link RegistrationOptions#maxRotationDeg()} above both the identity and the best shift alone by more than the
     * margin. Maps whose contrast differs (e.g. one wafer at different injection levels) can correlate better in a
     * wrong placement than in the right one; confining the search to near-identity placements and demanding a clear
     * win keeps them as measured unless they really moved. The report's {@code searchScore} is the higher of the two
     * searched placements' scores.
     *
     * @throws trapmap.shared.error.InvalidValueException when a map is flat or the maps do not overlap
     * @throws java.util.concurrent.CancellationException when the thread is interrupted
     */
    public static RegistrationReport registerNearIdentity(WaferMap before, WaferMap after,
                                                          RegistrationOptions options, double marginScore,
                                                          ProgressListener progress) {
        Checks.inRange(marginScore, 0, 1, "margin", "");
        Checks.notNull(options, "options");
        RegistrationOptions upright = options.withSearchOrientations(false);
        RegistrationWarnings.SizeCheck size = RegistrationWarnings.SizeCheck.start(before, after);
        try {
            RegistrationSearch shiftSearch = search(before, after, upright.withMaxRotation(0), progress, true);
            Registration identity = shiftSearch.evaluate(Registration.identity());
            Registration shifted = shiftSearch.search();
            Registration kept = identity;
            if (shifted.score() > identity.score() + marginScore) {
                kept = shifted;
            }
            double searchScore = shifted.score();
            if (upright.maxRotationDeg() > 0) {
                Registration turned = new RegistrationSearch(shiftSearch.beforePyramid(),
                        shiftSearch.afterPyramid(), upright, progress, true).search();
                searchScore = Math.max(searchScore, turned.score());
                if (RegistrationSearch.withinTurnLimit(turned, upright.maxRotationDeg())
                        && turned.score() > Math.max(identity.score(), shifted.score()) + marginScore) {
                    kept = turned;
                }
            }
            RegistrationReport r = new RegistrationReport(kept, kept == identity ? RegistrationReport.Kept.IDENTITY
                    : RegistrationReport.Kept.SEARCH, searchScore, identity.score(), List.of());
            return withWarnings(before, after, r, size);
        } finally {
            size.cancel();
        }
    }

    /**
     * As {@link #registerChecked} without the warnings: the outline size check is left to the caller; with
     * {@code countOverlap} false the overlap of the registration is left 0 for the caller to count on the resampled
     * map (the pass of {@link MapComparison} that takes the paired statistics).
     */
    static RegistrationReport registerUnchecked(WaferMap before, WaferMap after, RegistrationOptions options,
                                                ProgressListener progress, boolean countOverlap) {
        return choose(search(before, after, options, progress, countOverlap), options);
    }

    /** {@code r} with the warnings of the pair, the size check's among them. */
    static RegistrationReport withWarnings(WaferMap before, WaferMap after, RegistrationReport r,
                                           RegistrationWarnings.SizeCheck size) {
        return new RegistrationReport(r.registration(), r.kept(), r.searchScore(), r.identityScore(),
                RegistrationWarnings.of(before, after, r.registration(), size.warning()));
    }

    /** The search's placement or the identity, whichever scores higher (the identity on a tie); no warnings. */
    private static RegistrationReport choose(RegistrationSearch s, RegistrationOptions options) {
        Registration found = s.search();
        Registration identity = s.evaluate(Registration.identity());
        boolean searchWins = found.score() > identity.score()
                && RegistrationSearch.withinTurnLimit(found, options.maxRotationDeg());
        return new RegistrationReport(searchWins ? found : identity, searchWins ? RegistrationReport.Kept.SEARCH
                : RegistrationReport.Kept.IDENTITY, found.score(), identity.score(), List.of());
    }

    /**
     * The maps taken as aligned (no search): the identity placement, scored, with the
     * {@link RegistrationWarnings}.
     */
    public static RegistrationReport unregistered(WaferMap before, WaferMap after) {
        RegistrationWarnings.SizeCheck size = RegistrationWarnings.SizeCheck.start(before, after);
        try {
            return withWarnings(before, after, unregisteredUnchecked(before, after), size);
        } finally {
            size.cancel();
        }
    }

    /** As {@link #unregistered} without the warnings. */
    static RegistrationReport unregisteredUnchecked(WaferMap before, WaferMap after) {
        Registration identity = evaluate(before, after, Registration.identity());
        return new RegistrationReport(identity, RegistrationReport.Kept.UNREGISTERED, Double.NaN, identity.score(),
                List.of());
    }

    /**
     * Refines a known or guessed placement locally (turn and shift; the mirror is kept) without the exhaustive
     * search, e.g. when the tools' conventions fix the orientation. With {@code maxRotationDeg} 0 only the shift
     * is refined.
     */
    public static Registration refine(WaferMap before, WaferMap after, Registration start,
                                      RegistrationOptions options) {
        Checks.notNull(start, "registration");
        return search(before, after, options, ProgressListener.NONE).refine(start);
    }

    /** {@code r} as given, with its score and overlap filled in. */
    public static Registration evaluate(WaferMap before, WaferMap after, Registration r) {
        Checks.notNull(r, "registration");
        return search(before, after, RegistrationOptions.DEFAULTS, ProgressListener.NONE).evaluate(r);
    }

    /** Registers with the defaults and resamples. */
    public static WaferMap align(WaferMap before, WaferMap after) {
        return apply(before, after, register(before, after));
    }

    /**
     * {@code after} resampled onto {@code before}'s grid through {@code r}: a map of the after quantity, wafer and
     * conditions, with the before map's grid and a {@code register} step in its history. Sampling is bilinear and
     * NaN-aware: neighbours without data drop out and the rest are renormalised; a pixel gets data when those with
     * data carry at least half the weight, so pixels of A that fall outside B's data are NaN and a placement that
     * maps pixel centres onto pixel centres copies samples exactly.
     */
    public static WaferMap apply(WaferMap before, WaferMap after, Registration r) {
        Checks.notNull(before, "before");
        Checks.notNull(after, "after");
        Checks.notNull(r, "registration");
        return aligned(before, after, r, resampled(before, after, r));
    }

    /** The samples of {@link #apply}. */
    static FloatRaster resampled(WaferMap before, WaferMap after, Registration r) {
        PixelMapping m = PixelMapping.of(before.grid(), after.grid(), r);
        return Resampling.resample(after.raster(), m, before.width(), before.height());
    }

    /** The map of {@link #apply} around its samples {@code aligned}. */
    static WaferMap aligned(WaferMap before, WaferMap after, Registration r, FloatRaster aligned) {
        ProcessingStep step = ProcessingStep.of("register",
                "onto", before.waferId().isEmpty() ? before.provenance().source() : before.waferId(),
                "flip_x", Boolean.toString(r.flipX()),
                "flip_y", Boolean.toString(r.flipY()),
                "rotation_deg", format(r.rotationDeg()),
                "shift_x_mm", format(r.shiftXMm()),
                "shift_y_mm", format(r.shiftYMm()),
                "score", Double.isNaN(r.score()) ? "not evaluated" : format(r.score()),
                "overlap_px", Integer.toString(r.overlapPixels()),
                "pitch_mm", format(after.grid().pitchMm()) + " -> " + format(before.grid().pitchMm()),
                "resampling", "bilinear, NaN-aware");
        return new WaferMap(aligned, before.grid(), after.quantity(), after.waferId(), after.conditions(),
                after.provenance().then(step));
    }

    private static RegistrationSearch search(WaferMap before, WaferMap after, RegistrationOptions options,
                                             ProgressListener progress) {
        return search(before, after, options, progress, true);
    }

    private static RegistrationSearch search(WaferMap before, WaferMap after, RegistrationOptions options,
                                             ProgressListener progress, boolean countOverlap) {
        Checks.notNull(before, "before");
        Checks.notNull(after, "after");
        Checks.notNull(options, "options");
        Checks.notNull(progress, "progress");
        requireSize(before, "before");
        requireSize(after, "after");
        boolean invert = Improvement.opposite(before.quantity(), after.quantity());
        return new RegistrationSearch(new Pyramid(before.raster(), before.grid(), false),
                new Pyramid(after.raster(), after.grid(), invert), options, progress, countOverlap);
    }

    private static void requireSize(WaferMap m, String which) {
        if (Math.min(m.width(), m.height()) < MIN_SIDE_PX) {
            throw new InvalidValueException(which, "px", "the " + which + " map is " + m.width() + "x" + m.height()
                    + " px; registration needs at least " + MIN_SIDE_PX + "x" + MIN_SIDE_PX + " px");
        }
    }

    private static String format(double v) {
        return String.format(Locale.ROOT, "%.4f", v);
    }
}
