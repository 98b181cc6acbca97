package trapmap.maps.compare;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.ForkJoinTask;
import trapmap.maps.geometry.FormatMatch;
import trapmap.maps.geometry.ReducedOutline;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.geometry.SquareWafer;
import trapmap.maps.geometry.Tolerance;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.WaferMap;
import trapmap.shared.check.Checks;

/**
 * Signs that a before/after pair is not two maps of one wafer, or that its placement is not to be trusted. Each
 * warning is one line of text naming what differs, with its unit:
 * <ul>
 *   <li>the two maps name different wafer ids (both non-empty);</li>
 *   <li>the fitted outlines ({@link ReducedOutline}, as every face fits them) differ in kind (round / square) or
 *       in size (diameter of a round wafer, side of a square one) by more than the allowance: the width of the
 *       size tolerance of the standard format closest to the before outline
 *       ({@link trapmap.maps.geometry.WaferFormat#sizeTolerance()}, both maps may lie anywhere within it) plus the
 *       coarser pitch of the two grids the outlines are fitted on (the precision of a fitted edge);</li>
 *   <li>the registration score is below {@link #SCORE_FLOOR}.</li>
 * </ul>
 */
public final class RegistrationWarnings {
    /**
     * Least registration score of a trusted placement. On synthetic same-wafer pairs with a few percent pixel noise
     * the score is 0.95–0.99 and about 0.6 at 40 % noise; the demonstration gettering pair (lifetimes rising
     * threefold) scores about 0.59 unregistered; maps of different wafers score below 0.3 (tests in
     * {@code MapRegistrationTest}, {@code RegistrationHonestyTest}).
     */
    public static final double SCORE_FLOOR = 0.4;

    private RegistrationWarnings() {
    }

    /** The warnings of the pair placed by {@code registration} (whose score must have been evaluated). */
    public static List<String> of(WaferMap before, WaferMap after, Registration registration) {
        Checks.notNull(before, "before");
        Checks.notNull(after, "after");
        Checks.notNull(registration, "registration");
        return of(before, after, registration, sizeWarning(before, after));
    }

    /** The warnings, with the size warning (null: none) already made. */
    static List<String> of(WaferMap before, WaferMap after, Registration registration, String sizeWarning) {
        List<String> out = new ArrayList<>();
        if (!before.waferId().isEmpty() && !after.waferId().isEmpty()
                && !before.waferId().equals(after.waferId())) {
            out.add("different wafer ids: the before map is of " + before.waferId() + " but the after map of "
                    + after.waferId());
        }
        if (sizeWarning != null) {
            out.add(sizeWarning);
        }
        if (!(registration.score() >= SCORE_FLOOR)) {
            out.add(String.format(Locale.ROOT, "registration score %.3f is below %.2f: the placement is not to be"
                    + " trusted (different wafers, too little texture, or a change so strong that the patterns"
                    + " differ)", Double.isNaN(registration.score()) ? 0.0 : registration.score(), SCORE_FLOOR));
        }
        return List.copyOf(out);
    }

    /** The size warning, or null when the outlines agree. */
    static String sizeWarning(WaferMap before, WaferMap after) {
        return sizeWarning(before, after, Outline.of(before), Outline.of(after));
    }

    /** The size warning from the two fitted outlines, or null when they agree. */
    private static String sizeWarning(WaferMap before, WaferMap after, Outline outlineBefore, Outline outlineAfter) {
        OutlineFit fb = outlineBefore.fitOrNull();
        OutlineFit fa = outlineAfter.fitOrNull();
        if (fb == null || fa == null) {
            return "wafer sizes not compared: no outline could be fitted ("
                    + (fb == null ? outlineBefore : outlineAfter).failure().getMessage() + ")";
        }
        WaferShape b = fb.shape();
        WaferShape a = fa.shape();
        double pitch = Math.max(fitPitchMm(before), fitPitchMm(after));
        FormatMatch match = fb.closestFormat();
        // a round outline whose mark the pitch cannot resolve matches its size family: every candidate of that
        // size has the same size tolerance
        WaferFormat format = match.format() != null ? match.format() : match.candidates().get(0);
        Tolerance t = format.sizeTolerance();
        double allowance = t.minus() + t.plus() + pitch;
        if (b instanceof RoundWafer rb && a instanceof RoundWafer ra) {
            return compare("diameters", rb.diameterMm(), ra.diameterMm(), allowance, format, pitch);
        }
        if (b instanceof SquareWafer sb && a instanceof SquareWafer sa) {
            return compare("sides", sb.sideMm(), sa.sideMm(), allowance, format, pitch);
        }
        return "different wafer outlines: the before map fits " + b.describe() + " but the after map "
                + a.describe();
    }

    /** The pitch, mm, of the grid the outline of {@code m} is fitted on ({@link ReducedOutline}). */
    private static double fitPitchMm(WaferMap m) {
        return m.grid().pitchMm() * Math.max(1, ReducedOutline.factor(m.grid()));
    }

    /** A fitted outline, or why none could be fitted. */
    private record Outline(OutlineFit fitOrNull, IllegalArgumentException failure) {
        static Outline of(WaferMap m) {
            try {
                return new Outline(ReducedOutline.fit(m.raster(), m.grid()), null);
            } catch (IllegalArgumentException e) {
                return new Outline(null, e);
            }
        }
    }

    /**
     * The size check of a pair running in the background: both outlines are fitted on the common fork-join pool
     * while the caller registers and compares the maps (the fits need the whole maps and take as long as the
     * rest of a comparison). {@link #warning()} waits for them; a fit not yet started when it is asked for runs on
     * the caller's thread.
     */
    static final class SizeCheck {
        private final WaferMap before;
        private final WaferMap after;
        private final ForkJoinTask<Outline> outlineBefore;
        private final ForkJoinTask<Outline> outlineAfter;

        private SizeCheck(WaferMap before, WaferMap after) {
            this.before = before;
            this.after = after;
            this.outlineBefore = ForkJoinPool.commonPool().submit(() -> Outline.of(before));
            this.outlineAfter = ForkJoinPool.commonPool().submit(() -> Outline.of(after));
        }

        /** Starts fitting both outlines. */
        static SizeCheck start(WaferMap before, WaferMap after) {
            Checks.notNull(before, "before");
            Checks.notNull(after, "after");
            return new SizeCheck(before, after);
        }

        /** The size warning (null: the outlines agree), once both fits are done. */
        String warning() {
            // the pool takes the older task first; a task still queued when joined runs on this thread
            Outline a = outlineAfter.join();
            Outline b = outlineBefore.join();
            return sizeWarning(before, after, b, a);
        }

        /** Drops fits that have not started (when the comparison failed). */
        void cancel() {
            outlineBefore.cancel(false);
            outlineAfter.cancel(false);
        }
    }

    private static String compare(String what, double before, double after, double allowance, WaferFormat format,
                                  double pitch) {
        double d = Math.abs(before - after);
        if (d <= allowance) {
            return null;
        }
        return String.format(Locale.ROOT, "different wafer sizes: fitted %s %.2f mm (before) and %.2f mm (after)"
                + " differ by %.2f mm, beyond the %.2f mm allowed (size tolerance %s mm of %s plus a %.3f mm pixel)",
                what, before, after, d, allowance, format.sizeTolerance(), format.id(), pitch);
    }
}
