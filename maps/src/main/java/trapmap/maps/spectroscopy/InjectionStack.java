package trapmap.maps.spectroscopy;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import trapmap.maps.compare.MapRegistration;
import trapmap.maps.compare.Registration;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.ReadOptions;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * Lifetime or PL maps of one wafer measured at two or more injection levels, each level placed onto the first one's
 * grid. Made by {@link #of}, which checks that the maps belong together (same wafer id, doping, thickness and
 * temperature; one injection level or generation rate each, all distinct) and registers every level onto the first
 * with {@link MapRegistration#registerNearIdentity} (the shifts are kept in each {@link StackLevel#registration()});
 * a level on the same grid whose placement moves no pixel by more than {@link #SUBPIXEL_PX} is kept as measured.
 *
 * <p>The levels of a stack are measurements of one wafer in one tool, so their registration is restricted (see
 * {@link #REGISTRATION}, {@link #IDENTITY_MARGIN}): the levels differ in contrast (a defect dark at one injection
 * level can vanish or turn bright at another), and an unrestricted search as in {@code compare} may then prefer a
 * mirrored or half-turned placement that lays one defect's spot onto another's.
 */
public final class InjectionStack {
    /** Fewest levels a stack has: the injection dependence needs two. */
    public static final int MIN_LEVELS = 2;
    /**
     * A level on the first level's grid whose placement moves no pixel by more than this many pixels is kept as
     * measured, not resampled: bilinear resampling by a fraction of a pixel mixes each pixel with its neighbours
     * (blurring sharp defect edges into mixed curves), while a placement that small is within what registration of
     * noisy maps resolves (project choice).
     */
    public static final double SUBPIXEL_PX = 0.5;
    /**
     * How the levels of a stack are searched: upright only (no mirror or quarter turn), fine turns within ±2° in 1°
     * steps, the search and refinement resolutions of {@link RegistrationOptions#DEFAULTS} (project choice: one tool
     * puts one wafer back within a few mm and a degree or two; anything else is not a stack of one measurement).
     */
    public static final RegistrationOptions REGISTRATION = RegistrationOptions.DEFAULTS.withSearchOrientations(false)
            .withMaxRotation(2);
    /**
     * How much higher (in registration score, 0–1) a shift must score than the levels as they lie, and a turn than
     * both the levels as they lie and the best shift, to be kept
     * (project choice: on the demonstration stack, whose levels did not move, the search gains less than 0.001 over
     * the levels as they lie; on square test levels with only two defect discs for texture a spurious fine turn
     * gained 0.025 over the correct shift; a real shift of a few pixels raises the score by 0.3 or more).
     */
    public static final double IDENTITY_MARGIN = 0.05;
    /** Relative difference below which two thicknesses or temperatures count as the same. */
    static final double SAME_VALUE_TOLERANCE = 1e-9;

    /**
     * How the levels are placed onto the first one.
     *
     * @param register     true: search the placement of every level
     *                     ({@link MapRegistration#registerNearIdentity} with {@link #IDENTITY_MARGIN}); false: take
     *                     the maps as aligned (they must then have the same size)
     * @param registration how hard the search works and how far it may turn (mirrors and quarter turns are never
     *                     searched for a stack)
     * @param sameWaferId  true: refuse maps whose wafer ids differ; false: take them as one wafer whatever their ids
     *                     (e.g. files named after their level without a sidecar {@code wafer_id})
     */
    public record Options(boolean register, RegistrationOptions registration, boolean sameWaferId) {
        /** Registered with {@link #REGISTRATION}, one wafer id. */
        public static final Options DEFAULTS = new Options(true, REGISTRATION, true);

        public Options {
            Checks.notNull(registration, "registration");
        }

        /** With the wafer ids checked. */
        public Options(boolean register, RegistrationOptions registration) {
            this(register, registration, true);
        }
    }

    /** Maps read for a stack, each with the name its messages use (the file, and the page of a multi-page file). */
    public record Loaded(List<WaferMap> maps, List<String> names) {
        public Loaded {
            maps = List.copyOf(maps);
            names = List.copyOf(names);
            if (maps.size() != names.size()) {
                throw new IllegalArgumentException(maps.size() + " maps but " + names.size() + " names");
            }
        }
    }

    private final List<StackLevel> levels;

    private InjectionStack(List<StackLevel> levels) {
        this.levels = List.copyOf(levels);
    }

    /**
     * Reads the maps of a stack: one file per level, or one multi-page file whose pages are the levels (its
     * sidecar's {@code pages} objects give each page's {@code injection_cm3} or {@code generation_cm3_s}). Every map
     * gets {@code overrides} (the command line's conditions) over its own.
     *
     * @throws IOException naming the file that cannot be read
     */
    public static Loaded read(List<Path> files, ReadOptions options, MeasurementConditions overrides)
            throws IOException {
        Checks.notNull(files, "files");
        List<WaferMap> maps = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (Path f : files) {
            List<WaferMap> pages = MapFiles.read(f, options);
            for (int i = 0; i < pages.size(); i++) {
                WaferMap m = pages.get(i);
                maps.add(overrides == null ? m : m.withConditions(m.conditions().overriddenBy(overrides)));
                names.add(pages.size() == 1 ? f.toString() : f + " page " + (i + 1));
            }
        }
        return new Loaded(maps, names);
    }

    /** {@link #of(List, List, Options)} of maps read by {@link #read}. */
    public static InjectionStack of(Loaded loaded, Options options) {
        return of(loaded.maps(), loaded.names(), options);
    }

    /**
     * Checks the maps and places every level onto the first.
     *
     * @param maps    one effective-lifetime or PL map per level, the first being the reference of the placement
     * @param names   the name of each map in messages (its file)
     * @param options registration or not
     * @throws InvalidValueException naming the map, the field and its unit when the maps do not form a stack
     */
    public static InjectionStack of(List<WaferMap> maps, List<String> names, Options options) {
        Checks.notNull(maps, "maps");
        Checks.notNull(names, "names");
        Checks.notNull(options, "options");
        if (names.size() != maps.size()) {
            throw new IllegalArgumentException(maps.size() + " maps but " + names.size() + " names");
        }
        if (maps.size() < MIN_LEVELS) {
            throw new InvalidValueException("levels", "", "an injection stack needs at least " + MIN_LEVELS
                    + " maps of one wafer at different injection levels, but " + (maps.isEmpty() ? "none was given"
                    : "only " + names.get(0) + " (1 level) was given; give more files or a multi-page file whose"
                    + " sidecar gives each page's injection_cm3"));
        }
        WaferMap first = maps.get(0);
        String firstName = names.get(0);
        for (int i = 0; i < maps.size(); i++) {
            checkLevel(maps.get(i), names.get(i));
        }
        MeasurementConditions c0 = first.conditions();
        for (int i = 1; i < maps.size(); i++) {
            WaferMap m = maps.get(i);
            String n = names.get(i);
            MeasurementConditions c = m.conditions();
            if (options.sameWaferId() && !first.waferId().equals(m.waferId())) {
                throw new InvalidValueException("wafer_id", "", n + ": wafer id '" + m.waferId() + "' differs from '"
                        + first.waferId() + "' of " + firstName + "; a stack holds maps of one wafer (give the same"
                        + " wafer_id in the sidecars, or take them as one wafer on purpose)");
            }
            if (!Objects.equals(c0.doping(), c.doping())) {
                throw new InvalidValueException("doping", "cm^-3", n + ": field 'doping' is " + c.doping() + " but "
                        + c0.doping() + " in " + firstName + " (cm^-3); the levels of a stack share the doping");
            }
            sameValue(c0.thicknessUm(), c.thicknessUm(), "thickness_um", "um", firstName, n);
            sameValue(c0.temperatureK(), c.temperatureK(), "temperature_k", "K", firstName, n);
            for (int j = 0; j < i; j++) {
                MeasurementConditions o = maps.get(j).conditions();
                if (c.injectionPerCm3() != null && o.injectionPerCm3() != null
                        && same(c.injectionPerCm3(), o.injectionPerCm3())) {
                    throw new InvalidValueException("injection_cm3", "cm^-3", n + " and " + names.get(j)
                            + " have the same field 'injection_cm3' " + fmt(c.injectionPerCm3()) + " cm^-3; the"
                            + " levels of a stack must differ");
                }
                if (c.generationPerCm3PerS() != null && o.generationPerCm3PerS() != null
                        && same(c.generationPerCm3PerS(), o.generationPerCm3PerS())) {
                    throw new InvalidValueException("generation_cm3_s", "cm^-3 s^-1", n + " and " + names.get(j)
                            + " have the same field 'generation_cm3_s' " + fmt(c.generationPerCm3PerS())
                            + " cm^-3 s^-1; the levels of a stack must differ");
                }
            }
        }
        List<StackLevel> levels = new ArrayList<>();
        levels.add(new StackLevel(label(first, firstName), firstName, first, null, false));
        for (int i = 1; i < maps.size(); i++) {
            WaferMap m = maps.get(i);
            String n = names.get(i);
            RegistrationReport report;
            WaferMap placed;
            boolean resampled = false;
            if (options.register()) {
                try {
                    report = MapRegistration.registerNearIdentity(first, m, options.registration(),
                            IDENTITY_MARGIN, ProgressListener.NONE);
                } catch (InvalidValueException e) {
                    throw new InvalidValueException(e.field(), e.unit(), n + " cannot be registered onto "
                            + firstName + ": " + e.getMessage());
                }
                resampled = !m.grid().equals(first.grid())
                        || largestDisplacementPx(report.registration(), first.grid()) > SUBPIXEL_PX;
                placed = resampled ? MapRegistration.apply(first, m, report.registration()) : m;
            } else {
                if (m.width() != first.width() || m.height() != first.height()) {
                    throw new InvalidValueException("size", "px", n + " is " + m.width() + "x" + m.height()
                            + " px but " + firstName + " is " + first.width() + "x" + first.height() + " px; maps"
                            + " taken as aligned (no registration) must have the same size");
                }
                report = MapRegistration.unregistered(first, m);
                placed = m;
            }
            levels.add(new StackLevel(label(m, n), n, placed, report, resampled));
        }
        return new InjectionStack(levels);
    }

    /**
     * The largest distance, in pixels of {@code grid}, by which {@code r} moves a corner of the grid (the largest
     * over the raster, the placement being affine).
     */
    static double largestDisplacementPx(Registration r, PixelGrid grid) {
        double most = 0;
        for (double x : new double[] {0, grid.width() - 1}) {
            for (double y : new double[] {0, grid.height() - 1}) {
                double xm = grid.xMm(x);
                double ym = grid.yMm(y);
                double[] to = r.toAfterMm(xm, ym);
                most = Math.max(most, Math.hypot(to[0] - xm, to[1] - ym));
            }
        }
        return most / grid.pitchMm();
    }

    private static void checkLevel(WaferMap m, String name) {
        if (m.quantity() != Quantity.EFFECTIVE_LIFETIME && m.quantity() != Quantity.PL_COUNTS) {
            throw new InvalidValueException("quantity", "", name + " is a " + m.quantity().key() + " map; a stack"
                    + " holds effective-lifetime (us) or PL-counts maps");
        }
        MeasurementConditions c = m.conditions();
        if (c.doping() == null) {
            throw new InvalidValueException("doping", "cm^-3", name + ": field 'doping' is unknown; give it as"
                    + " p:<cm^-3> or n:<cm^-3> in the sidecar or with --doping");
        }
        if ((c.injectionPerCm3() == null) == (c.generationPerCm3PerS() == null)) {
            throw new InvalidValueException("injection_cm3", "cm^-3", name + (c.injectionPerCm3() == null
                    ? ": neither field 'injection_cm3' (cm^-3) nor 'generation_cm3_s' (cm^-3 s^-1) is known; each"
                    + " level of a stack needs one (in its sidecar or its page object of 'pages')"
                    : ": both field 'injection_cm3' (cm^-3) and 'generation_cm3_s' (cm^-3 s^-1) are given; keep one"));
        }
    }

    private static void sameValue(Double a, Double b, String field, String unit, String firstName, String name) {
        if (a == null && b == null) {
            return;
        }
        if (a == null || b == null || !same(a, b)) {
            throw new InvalidValueException(field, unit, name + ": field '" + field + "' is " + text(b) + " but "
                    + text(a) + " in " + firstName + " (" + unit + "); the levels of a stack share it");
        }
    }

    private static boolean same(double a, double b) {
        return Math.abs(a - b) <= SAME_VALUE_TOLERANCE * Math.max(Math.abs(a), Math.abs(b));
    }

    private static String text(Double v) {
        return v == null ? "unknown" : fmt(v);
    }

    private static String fmt(double v) {
        return String.format(Locale.ROOT, "%.6g", v);
    }

    /** The page label when the map has one, else its injection or generation, e.g. {@code dn 1e+13 cm^-3}. */
    private static String label(WaferMap m, String name) {
        String page = m.conditions().extra().get("page");
        if (page != null && !page.isBlank()) {
            return page;
        }
        MeasurementConditions c = m.conditions();
        return c.injectionPerCm3() != null ? String.format(Locale.ROOT, "dn %.3g cm^-3", c.injectionPerCm3())
                : String.format(Locale.ROOT, "G %.3g cm^-3 s^-1", c.generationPerCm3PerS());
    }

    /** The levels in the order given; the first is the reference of the placement. */
    public List<StackLevel> levels() {
        return levels;
    }

    /** Number of levels. */
    public int size() {
        return levels.size();
    }

    /** Level {@code i} (0-based). */
    public StackLevel level(int i) {
        return levels.get(i);
    }

    /** The grid every level lies on (the first level's). */
    public PixelGrid grid() {
        return levels.get(0).map().grid();
    }

    public int width() {
        return grid().width();
    }

    public int height() {
        return grid().height();
    }

    /** The wafer id shared by the levels. */
    public String waferId() {
        return levels.get(0).map().waferId();
    }

    /** True when every level has a fixed injection level (no generation rate). */
    public boolean fixedInjection() {
        return levels.stream().allMatch(l -> l.map().conditions().injectionPerCm3() != null);
    }
}
