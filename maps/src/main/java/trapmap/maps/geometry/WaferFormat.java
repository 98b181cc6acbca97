package trapmap.maps.geometry;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import trapmap.shared.check.Checks;

/**
 * Standard wafer formats with their nominal dimensions and tolerances.
 *
 * <p>Sources (each format names its own in {@link #source()}):
 * <ul>
 *   <li>Round IC wafers: SEMI M1 (Specification for polished single crystal silicon wafers). Diameters, their
 *       tolerances and the primary-flat lengths of 100, 125 and 150 mm were checked against two independent public
 *       tabulations of SEMI M1 (one citing SEMI M1-0302). The 200 mm flat length (57.5 mm) and the notch geometry
 *       (depth 1.00 +0.25/−0.00 mm, opening angle 90° +5°/−1°) are from memory; the SEMI text itself could not be
 *       consulted.</li>
 *   <li>Solar wafers: sides and pseudo-square diameters as tabulated in public educational and trade overviews of
 *       wafer formats (M0/M2; M2, G1, M6 and G12 with their areas; the 182 mm M10 proposal of 2020). M10's 247 mm
 *       diameter and all solar tolerances (±0.25 mm, quoted for
 *       G12 in the 2020 210 mm proposal) are from memory or common practice; SEMI PV22 itself could not be
 *       consulted.</li>
 * </ul>
 *
 * <p>A fitted outline is matched at its map's pixel pitch ({@link #closestTo(WaferShape, double)}): size tolerances
 * widen by {@link #PITCH_TOLERANCE_FACTOR} × pitch, and a flat or notch shallower than
 * {@link #MARK_RESOLVABLE_PITCHES} pixels is reported as not resolved (the wafer keeps its size family, e.g.
 * {@code round-200}), never guessed.
 */
public enum WaferFormat {
    ROUND_100_FLAT("round-100-flat", Kind.ROUND, 100, sym(0.5), Fiducial.flat(32.5), sym(2.5), null, Src.M1),
    ROUND_125_FLAT("round-125-flat", Kind.ROUND, 125, sym(0.5), Fiducial.flat(42.5), sym(2.5), null, Src.M1),
    ROUND_150_FLAT("round-150-flat", Kind.ROUND, 150, sym(0.2), Fiducial.flat(57.5), sym(2.5), null, Src.M1),
    ROUND_200_FLAT("round-200-flat", Kind.ROUND, 200, sym(0.2), Fiducial.flat(57.5), sym(2.5), null,
            Src.M1_MEMORY_FLAT),
    ROUND_200_NOTCH("round-200-notch", Kind.ROUND, 200, sym(0.2), Fiducial.notch(1.0, 90),
            new Tolerance(0, 0.25), new Tolerance(1, 5), Src.M1_MEMORY_NOTCH),
    ROUND_300_NOTCH("round-300-notch", Kind.ROUND, 300, sym(0.2), Fiducial.notch(1.0, 90),
            new Tolerance(0, 0.25), new Tolerance(1, 5), Src.M1_MEMORY_NOTCH),

    M0("m0", 156.0, 200, Src.TRADE),
    M2("m2", 156.75, 210, Src.TRADE),
    G1("g1", 158.75, 223, Src.TRADE),
    M6("m6", 166.0, 223, Src.TRADE),
    M10("m10", 182.0, 247, Src.TRADE_M10),
    G12("g12", 210.0, 295, Src.TRADE),

    SQUARE_156("square-156", 156.0, Src.SQUARE),
    SQUARE_156_75("square-156.75", 156.75, Src.SQUARE),
    SQUARE_158_75("square-158.75", 158.75, Src.SQUARE),
    SQUARE_166("square-166", 166.0, Src.SQUARE),
    SQUARE_182("square-182", 182.0, Src.SQUARE),
    SQUARE_210("square-210", 210.0, Src.SQUARE);

    /** Family of outline. */
    public enum Kind {
        /** Round wafer with a flat or notch (SEMI M1). */
        ROUND,
        /** Mono solar wafer: square with corners on the ingot circle. */
        PSEUDO_SQUARE,
        /** Square with sharp corners (cast or cut-square mono). */
        FULL_SQUARE
    }

    private static final class Src {
        static final String M1 = "SEMI M1 (via two public tabulations, one citing SEMI M1-0302)";
        static final String M1_MEMORY_FLAT = "SEMI M1 diameter (via a public tabulation); flat length from memory";
        static final String M1_MEMORY_NOTCH = "SEMI M1 diameter (via a public tabulation); notch depth and angle from"
                + " memory";
        static final String TRADE = "public wafer-format tables (educational and trade overviews); tolerances from"
                + " memory; SEMI PV22 not consulted";
        static final String TRADE_M10 = "side: trade press on the 2020 M10 proposal; Ø247 mm and tolerances from memory;"
                + " SEMI PV22 not consulted";
        static final String SQUARE = "side as the pseudo-square format of the same size; sharp corners; tolerance"
                + " from memory";
    }

    private static final double SOLAR_TOLERANCE_MM = 0.25;

    private final String id;
    private final Kind kind;
    private final double sizeMm;
    private final Tolerance sizeTolerance;
    private final double diagonalMm;
    private final Tolerance diagonalTolerance;
    private final Fiducial fiducial;
    private final Tolerance fiducialTolerance;
    private final Tolerance notchAngleToleranceDeg;
    private final String source;

    /** Round formats. */
    WaferFormat(String id, Kind kind, double diameterMm, Tolerance diameterTolerance, Fiducial fiducial,
                Tolerance fiducialTolerance, Tolerance notchAngleToleranceDeg, String source) {
        this.id = id;
        this.kind = kind;
        this.sizeMm = diameterMm;
        this.sizeTolerance = diameterTolerance;
        this.diagonalMm = diameterMm;
        this.diagonalTolerance = diameterTolerance;
        this.fiducial = fiducial;
        this.fiducialTolerance = fiducialTolerance;
        this.notchAngleToleranceDeg = notchAngleToleranceDeg;
        this.source = source;
    }

    /** Pseudo-square formats. */
    WaferFormat(String id, double sideMm, double diameterMm, String source) {
        this(id, Kind.PSEUDO_SQUARE, sideMm, diameterMm, source);
    }

    /** Full-square formats. */
    WaferFormat(String id, double sideMm, String source) {
        this(id, Kind.FULL_SQUARE, sideMm, sideMm * Math.sqrt(2), source);
    }

    WaferFormat(String id, Kind kind, double sideMm, double diagonalMm, String source) {
        this.id = id;
        this.kind = kind;
        this.sizeMm = sideMm;
        this.sizeTolerance = sym(SOLAR_TOLERANCE_MM);
        this.diagonalMm = diagonalMm;
        this.diagonalTolerance = sym(SOLAR_TOLERANCE_MM);
        this.fiducial = Fiducial.NONE;
        this.fiducialTolerance = null;
        this.notchAngleToleranceDeg = null;
        this.source = source;
    }

    private static Tolerance sym(double mm) {
        return Tolerance.symmetric(mm);
    }

    /** Short name used in files and on the command line, e.g. {@code round-150-flat}, {@code m10}. */
    public String id() {
        return id;
    }

    public Kind kind() {
        return kind;
    }

    /** Diameter of a round wafer or side of a square one, mm. */
    public double sizeMm() {
        return sizeMm;
    }

    public Tolerance sizeTolerance() {
        return sizeTolerance;
    }

    /** Corner-to-corner diameter, mm: the pseudo-square diameter, a·√2 for a full square, the diameter if round. */
    public double diagonalMm() {
        return diagonalMm;
    }

    public Tolerance diagonalTolerance() {
        return diagonalTolerance;
    }

    /** Flat, notch or none (square formats). */
    public Fiducial fiducial() {
        return fiducial;
    }

    /** Tolerance of the flat length or of the notch depth, mm; null without a fiducial. */
    public Tolerance fiducialTolerance() {
        return fiducialTolerance;
    }

    /** Tolerance of the notch opening angle, degrees; null without a notch. */
    public Tolerance notchAngleToleranceDeg() {
        return notchAngleToleranceDeg;
    }

    /** Where the dimensions come from, and which of them are from memory. */
    public String source() {
        return source;
    }

    /** The nominal outline, centred, fiducial at the bottom (270°), sides parallel to the axes. */
    public WaferShape shape() {
        return shape(RoundWafer.BOTTOM_DEG);
    }

    /**
     * The nominal outline, centred; {@code orientationDeg} is the fiducial direction of a round wafer
     * (counter-clockwise from +x, 270 = bottom) or the turn of a square one from its default (270 = no turn).
     */
    public WaferShape shape(double orientationDeg) {
        Checks.finite(orientationDeg, "orientation", "deg");
        if (kind == Kind.ROUND) {
            return new RoundWafer(sizeMm, fiducial, orientationDeg, 0, 0);
        }
        return new SquareWafer(sizeMm, diagonalMm, orientationDeg - RoundWafer.BOTTOM_DEG, 0, 0);
    }

    /**
     * The format with this id (case-insensitive; {@code m12} is accepted for {@code g12}).
     *
     * @throws IllegalArgumentException listing the known ids
     */
    public static WaferFormat byId(String id) {
        Checks.notNull(id, "waferFormat");
        String k = id.trim().toLowerCase(Locale.ROOT);
        if (k.equals("m12")) {
            k = "g12";
        }
        for (WaferFormat f : values()) {
            if (f.id.equals(k)) {
                return f;
            }
        }
        throw new IllegalArgumentException("unknown wafer format '" + id + "' (known: " + String.join(", ", ids())
                + ")");
    }

    /** Every id, in declaration order. */
    public static List<String> ids() {
        List<String> out = new ArrayList<>();
        for (WaferFormat f : values()) {
            out.add(f.id);
        }
        return out;
    }

    /**
     * Widening of every size tolerance per millimetre of pixel pitch when a fitted outline is classified. An edge of
     * an outline fitted to pixel data is located to within about half a pixel (a straight edge along the pixel
     * rows, to exactly a whole pixel), so a size measured across two edges is known to about one pitch: the allowed
     * deviation is the nominal tolerance + 1 × pitch. Common practice for measurements on a sampled grid; the demo's
     * axis-aligned wafers come out up to 0.94 pitch larger than nominal (whole pixels), which this covers.
     */
    public static final double PITCH_TOLERANCE_FACTOR = 1.0;

    /**
     * Depth of the mark, in pixels, from which the outline fit reliably shows it: the fit takes rim points more than
     * max(3σ, 1.5 pitch) inside the circle as a mark ({@link OutlineDetection}), plus half a pixel for where the
     * mark's bottom falls on the grid.
     */
    public static final double MARK_RESOLVABLE_PITCHES = 2.0;

    /**
     * How far the mark reaches into the wafer circle, mm: a flat's sagitta R − √(R² − (L/2)²), a notch's depth; 0 for
     * formats without a mark.
     */
    public double markDepthMm() {
        if (fiducial instanceof Fiducial.Flat f) {
            double r = sizeMm / 2;
            double half = f.lengthMm() / 2;
            return r - Math.sqrt(r * r - half * half);
        }
        if (fiducial instanceof Fiducial.Notch n) {
            return n.depthMm();
        }
        return 0;
    }

    /**
     * True when a map of this pixel pitch shows this format's mark: its depth is at least
     * {@link #MARK_RESOLVABLE_PITCHES} pixels (a 1 mm notch needs a pitch of 0.5 mm or finer; the 57.5 mm flat of a
     * 200 mm wafer, 4.2 mm deep, 2.1 mm). Always true for formats without a mark.
     */
    public boolean markResolvable(double pitchMm) {
        Checks.nonNegative(pitchMm, "pitch", "mm");
        return fiducial instanceof Fiducial.None || markDepthMm() >= MARK_RESOLVABLE_PITCHES * pitchMm;
    }

    /**
     * The family of wafers of this size whatever their mark: {@code round-200} for {@code round-200-flat} and
     * {@code round-200-notch}; the id itself for square formats.
     */
    public String sizeFamily() {
        return kind == Kind.ROUND ? "round-" + number(sizeMm) : id;
    }

    private static String number(double mm) {
        return mm == Math.rint(mm) ? Long.toString((long) mm) : Double.toString(mm);
    }

    /**
     * Every family id a wafer can be filed under: the format ids and the round size families ({@code round-100} …
     * {@code round-300}), in declaration order.
     */
    public static List<String> familyIds() {
        List<String> out = new ArrayList<>();
        for (WaferFormat f : values()) {
            if (!out.contains(f.sizeFamily())) {
                out.add(f.sizeFamily());
            }
            out.add(f.id);
        }
        return out;
    }

    /**
     * True when a wafer of family {@code waferFamily} belongs to {@code wanted}: the same id, or a round size family
     * ({@code round-200}) that holds the wafer's format ({@code round-200-flat}, {@code round-200-notch}, or
     * {@code round-200} itself when the mark was not resolved). A format id never takes a wafer whose mark was not
     * resolved: {@code round-200-notch} does not match {@code round-200}.
     */
    public static boolean familyMatches(String wanted, String waferFamily) {
        if (wanted == null || waferFamily == null) {
            return false;
        }
        if (wanted.equals(waferFamily)) {
            return true;
        }
        for (WaferFormat f : values()) {
            if (f.id.equals(waferFamily)) {
                return f.kind == Kind.ROUND && f.sizeFamily().equals(wanted);
            }
        }
        return false;
    }

    /** The standard format closest to an exact outline; see {@link #closestTo(WaferShape, double)} at pitch 0. */
    public static FormatMatch closestTo(WaferShape shape) {
        return closestTo(shape, 0);
    }

    /**
     * The standard format closest to an outline fitted to a map of pixel pitch {@code pitchMm}.
     *
     * <p>Round outline: the formats of the nearest nominal diameter are the candidates; the size is within tolerance
     * when the diameter lies within the SEMI M1 tolerance + {@link #PITCH_TOLERANCE_FACTOR} × pitch. The mark decides
     * among the candidates: the one with the fitted mark's kind (flat or notch) is the format. When none has it, the
     * format is left open and the wafer is filed under its size family ({@code round-200}): the mark is
     * {@link FormatMatch.Mark#NOT_RESOLVED not resolved} when some candidate's mark is too small for the pitch
     * ({@link #markResolvable}), else {@link FormatMatch.Mark#NOT_FOUND not found}. A plain disk is never guessed to
     * carry a flat. The mark's dimensions are not compared: the fit measures a flat's or a notch's depth only to
     * about a pixel.
     *
     * <p>Square outline: among the pseudo- and full-square formats the smallest of the larger of the side and
     * diagonal deviations; within tolerance when both lie within ±0.25 mm + {@link #PITCH_TOLERANCE_FACTOR} × pitch.
     */
    public static FormatMatch closestTo(WaferShape shape, double pitchMm) {
        Checks.notNull(shape, "shape");
        Checks.nonNegative(pitchMm, "pitch", "mm");
        double widen = PITCH_TOLERANCE_FACTOR * pitchMm;
        if (shape instanceof RoundWafer r) {
            double nearest = Double.NaN;
            double bestDev = Double.POSITIVE_INFINITY;
            for (WaferFormat f : values()) {
                double dev = Math.abs(r.diameterMm() - f.sizeMm);
                if (f.kind == Kind.ROUND && dev < bestDev) {
                    bestDev = dev;
                    nearest = f.sizeMm;
                }
            }
            List<WaferFormat> candidates = new ArrayList<>();
            for (WaferFormat f : values()) {
                if (f.kind == Kind.ROUND && f.sizeMm == nearest) {
                    candidates.add(f);
                }
            }
            WaferFormat first = candidates.get(0);
            Tolerance t = widened(first.sizeTolerance, widen);
            boolean within = t.accepts(nearest, r.diameterMm());
            double tol = Math.max(t.minus(), t.plus());
            String mark = r.fiducial().kind();
            for (WaferFormat f : candidates) {
                if (f.fiducial.kind().equals(mark)) {
                    return new FormatMatch(f, f.id, candidates, bestDev, tol, within, FormatMatch.Mark.RESOLVED,
                            pitchMm);
                }
            }
            boolean unresolvable = candidates.stream().anyMatch(f -> !f.markResolvable(pitchMm));
            return new FormatMatch(null, first.sizeFamily(), candidates, bestDev, tol, within,
                    unresolvable ? FormatMatch.Mark.NOT_RESOLVED : FormatMatch.Mark.NOT_FOUND, pitchMm);
        }
        SquareWafer s = (SquareWafer) shape;
        WaferFormat best = null;
        double bestDev = Double.POSITIVE_INFINITY;
        for (WaferFormat f : values()) {
            if (f.kind == Kind.ROUND) {
                continue;
            }
            double dev = Math.max(Math.abs(s.sideMm() - f.sizeMm), Math.abs(s.diagonalMm() - f.diagonalMm));
            if (dev < bestDev) {
                bestDev = dev;
                best = f;
            }
        }
        Tolerance side = widened(best.sizeTolerance, widen);
        Tolerance diagonal = widened(best.diagonalTolerance, widen);
        boolean within = side.accepts(best.sizeMm, s.sideMm()) && diagonal.accepts(best.diagonalMm, s.diagonalMm());
        return new FormatMatch(best, best.id, List.of(best), bestDev, Math.max(side.plus(), side.minus()), within,
                FormatMatch.Mark.NONE, pitchMm);
    }

    private static Tolerance widened(Tolerance t, double mm) {
        return new Tolerance(t.minus() + mm, t.plus() + mm);
    }
}
