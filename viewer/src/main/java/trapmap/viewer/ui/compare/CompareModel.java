package trapmap.viewer.ui.compare;

import java.util.ArrayList;
import java.util.List;
import trapmap.maps.compare.Comparison;
import trapmap.maps.compare.Improvement;
import trapmap.maps.compare.MapComparison;
import trapmap.maps.compare.MapRegistration;
import trapmap.maps.compare.PairedStatistics;
import trapmap.maps.compare.Registration;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.IronMapping;
import trapmap.maps.process.MapConversion;
import trapmap.maps.stats.MapStatistics;
import trapmap.physics.defect.Defect;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;
import trapmap.viewer.graphics.Labels;

/**
 * What the compare view shows, computed without Swing so that it can run on a worker thread and in tests: the
 * after map registered onto the before map ({@link MapRegistration}), the difference, ratio, relative-change and
 * (for densities) reduction maps with the paired statistics ({@link MapComparison}), and in iron mode the
 * interstitial-iron map of a before (FeB paired) / after (FeB dissociated, Fe_i) lifetime pair through the maps
 * module's {@link IronMapping} (Macdonald, Geerligs &amp; Azzizi, JAP 95, 1021 (2004)). The registration keeps the
 * better of the searched and the unregistered placement and carries its warnings.
 */
public final class CompareModel {
    /** The caution of the iron method, shown beside every iron map. */
    public static final String IRON_CAUTION = IronMapping.CAUTION;

    /** The third view. */
    public enum View {
        DIFFERENCE("difference after − before"), RATIO("ratio after / before"),
        RELATIVE_CHANGE("relative change (after − before) / before"), REDUCTION("reduction 1 − after / before"),
        IRON("interstitial iron [Fe_i]"), IRON_STATUS("iron pixel status");

        private final String label;

        View(String label) {
            this.label = label;
        }

        @Override
        public String toString() {
            return label;
        }
    }

    /**
     * How to compare.
     *
     * @param register          find the placement from the data; false: the maps lie on one grid already
     * @param maxRotationDeg    largest small turn searched besides mirrors and quarter turns, degrees
     * @param relativeTolerance changes within ± this fraction count as unchanged
     * @param defect            convert both lifetime maps to this defect's trap density first; null: compare as read
     * @param iron              also compute the Fe_i map (lifetime maps of a FeB-dissociation pair, p-type)
     * @param settings          model choices of the conversions
     */
    public record Options(boolean register, double maxRotationDeg, double relativeTolerance, Defect defect,
                          boolean iron, ConversionSettings settings) {
        public Options {
            settings = settings == null ? ConversionSettings.DEFAULTS : settings;
        }

        /** Register, ±5° turn, ±5 % tolerance, no conversion, no iron. */
        public static Options defaults() {
            return new Options(true, 5, MapComparison.DEFAULT_RELATIVE_TOLERANCE, null, false, null);
        }

        public Options withIron(boolean on) {
            return new Options(register, maxRotationDeg, relativeTolerance, defect, on, settings);
        }

        public Options withRegistration(boolean on) {
            return new Options(on, maxRotationDeg, relativeTolerance, defect, iron, settings);
        }

        public Options withDefect(Defect d) {
            return new Options(register, maxRotationDeg, relativeTolerance, d, iron, settings);
        }

        public Options withSettings(ConversionSettings s) {
            return new Options(register, maxRotationDeg, relativeTolerance, defect, iron, s);
        }
    }

    /**
     * The compared pair.
     *
     * @param before       the before map (converted when a defect was chosen)
     * @param after        the after map registered and resampled onto the before map's grid
     * @param report       the placement kept (the search's or the identity, whichever scores higher; the identity
     *                     when not registering) with its warnings
     * @param comparison   the per-pixel maps and paired statistics
     * @param iron         the Fe_i map, its status map and figures ({@link IronMapping}), null when not asked for
     */
    public record Result(WaferMap before, WaferMap after, RegistrationReport report, Comparison comparison,
                         IronMapping.Result iron) {

        /** The placement kept. */
        public Registration registration() {
            return report.registration();
        }

        /**
         * How the after map was placed, for the window's status line: registered by the search, kept as the maps lie
         * because the search scored no higher, or taken as aligned without a search ("unregistered" in compare's
         * output).
         */
        public String placementLine() {
            Registration g = report.registration();
            String placed = String.format(java.util.Locale.ROOT, "shift (%s, %s) mm, turn %s°%s, score %s",
                    Labels.number(g.shiftXMm()), Labels.number(g.shiftYMm()), Labels.number(g.rotationDeg()),
                    g.mirrored() ? ", mirrored" : "", Labels.number(g.score()));
            return switch (report.kept()) {
                case SEARCH -> "Registered: " + placed;
                case IDENTITY -> "Kept as the maps lie (the search scored " + Labels.number(report.searchScore())
                        + "): " + placed;
                case UNREGISTERED -> "Not registered (taken as aligned): " + placed;
            };
        }

        /** Registration warnings (different wafer ids or sizes, a low score), one line each. */
        public List<String> warnings() {
            return report.warnings();
        }

        /** The map of the third view, null when there is none (reduction of a non-density, iron not computed). */
        public WaferMap derived(View v) {
            return switch (v) {
                case DIFFERENCE -> comparison.difference();
                case RATIO -> comparison.ratio();
                case RELATIVE_CHANGE -> comparison.relativeChange();
                case REDUCTION -> comparison.reduction();
                case IRON -> iron == null ? null : iron.iron();
                case IRON_STATUS -> iron == null ? null : iron.status();
            };
        }

        /** The unit of the third view's values ("" for dimensionless). */
        public String unit(View v) {
            return switch (v) {
                case DIFFERENCE -> before.quantity().unit();
                case IRON -> Quantity.IRON_DENSITY.unit();
                case IRON_STATUS -> "";
                default -> "";
            };
        }

        /** The values of the three maps at a position in the before map's wafer coordinates. */
        public Probe probe(double xMm, double yMm, View v) {
            return new Probe(xMm, yMm, sample(before, xMm, yMm), sample(after, xMm, yMm),
                    derived(v) == null ? Double.NaN : sample(derived(v), xMm, yMm));
        }

        /** The paired statistics as rows with units, then the registration. */
        public List<String[]> statisticsRows() {
            PairedStatistics s = comparison.statistics();
            String u = Labels.unit(s.unit());
            List<String[]> r = new ArrayList<>();
            Registration g = report.registration();
            r.add(new String[] {"registration shift x", Labels.number(g.shiftXMm()), "mm"});
            r.add(new String[] {"registration shift y", Labels.number(g.shiftYMm()), "mm"});
            r.add(new String[] {"registration rotation", Labels.number(g.rotationDeg()), "°"});
            r.add(new String[] {"mirrored", g.mirrored() ? "yes" : "no", ""});
            r.add(new String[] {"registration score (0–1)", Labels.number(g.score()), ""});
            r.add(new String[] {"placement kept", switch (report.kept()) {
                case SEARCH -> "searched (unregistered: " + Labels.number(report.identityScore()) + ")";
                case IDENTITY -> "as the maps lie (search: " + Labels.number(report.searchScore()) + ")";
                case UNREGISTERED -> "as the maps lie (not registered)";
            }, ""});
            r.add(new String[] {"overlap", Integer.toString(g.overlapPixels()), "px"});
            r.add(new String[] {"pixels compared", Integer.toString(s.count()), "px"});
            r.add(new String[] {"mean difference", Labels.number(s.meanDifference()), u});
            r.add(new String[] {"median difference", Labels.number(s.medianDifference()), u});
            r.add(new String[] {"mean ratio", Labels.number(s.meanRatio()), ""});
            r.add(new String[] {"median ratio", Labels.number(s.medianRatio()), ""});
            r.add(new String[] {"harmonic mean before", Labels.number(s.harmonicMeanBefore()), u});
            r.add(new String[] {"harmonic mean after", Labels.number(s.harmonicMeanAfter()), u});
            String tol = "±" + Labels.number(100 * s.relativeTolerance()) + " %";
            r.add(new String[] {"improved (beyond " + tol + ")", Labels.percent(s.improvedFraction()), ""});
            r.add(new String[] {"unchanged (within " + tol + ")", Labels.percent(s.unchangedFraction()), ""});
            r.add(new String[] {"degraded (beyond " + tol + ")", Labels.percent(s.degradedFraction()), ""});
            if (!Double.isNaN(s.medianReduction())) {
                r.add(new String[] {"median reduction", Labels.percent(s.medianReduction()), ""});
            }
            if (iron != null) {
                MapStatistics f = iron.statistics();
                String cm3 = Labels.unit(Quantity.IRON_DENSITY);
                boolean any = f.count() > 0;
                r.add(new String[] {"Fe_i at Δn", Labels.number(iron.injectionPerCm3()), "cm⁻³"});
                r.add(new String[] {"Fe_i/FeB crossover Δn", Labels.number(iron.crossoverPerCm3()), "cm⁻³"});
                r.add(new String[] {"[Fe_i] median", Labels.number(iron.medianPerCm3()), cm3});
                r.add(new String[] {"[Fe_i] mean", Labels.number(any ? f.mean() : Double.NaN), cm3});
                r.add(new String[] {"[Fe_i] P95", Labels.number(iron.p95PerCm3()), cm3});
                r.add(new String[] {"[Fe_i] maximum", Labels.number(any ? f.max() : Double.NaN), cm3});
                for (IronMapping.IronStatus st : IronMapping.IronStatus.values()) {
                    r.add(new String[] {"iron pixels " + st.key(), Integer.toString(iron.count(st)), "px"});
                }
            }
            for (String w : report.warnings()) {
                r.add(new String[] {"warning", w, ""});
            }
            return r;
        }
    }

    /**
     * Values of the three maps at one position (NaN where a map has no data).
     *
     * @param xMm     position x in the before map's wafer coordinates, mm
     * @param yMm     position y, mm
     * @param before  before value, in the before map's unit
     * @param after   after value (registered), same unit
     * @param derived value of the third view
     */
    public record Probe(double xMm, double yMm, double before, double after, double derived) {
    }

    private CompareModel() {
    }

    /** The sample of the pixel holding a wafer position (NaN outside the map). */
    static double sample(WaferMap m, double xMm, double yMm) {
        int x = (int) Math.round(m.grid().xPx(xMm));
        int y = (int) Math.round(m.grid().yPx(yMm));
        return m.raster().contains(x, y) ? m.raster().get(x, y) : Double.NaN;
    }

    /**
     * Registers and compares; heavy (seconds for large maps): run it off the Event Dispatch Thread.
     *
     * @throws InvalidValueException for maps of different quantities, missing conditions, or an iron pair that is
     *                               not a p-type lifetime pair at one fixed injection
     * @throws java.util.concurrent.CancellationException when the thread is interrupted during registration
     */
    public static Result compute(WaferMap before, WaferMap after, Options o, ProgressListener progress) {
        ProgressListener p = progress == null ? ProgressListener.NONE : progress;
        IronMapping.Result iron = null;
        WaferMap b = before;
        WaferMap a = after;
        if (o.defect() != null) {
            b = MapConversion.convert(before, o.defect(), o.settings()).get(Quantity.TRAP_DENSITY);
            a = MapConversion.convert(after, o.defect(), o.settings()).get(Quantity.TRAP_DENSITY);
        }
        if (b.quantity() != a.quantity()) {
            throw new InvalidValueException("quantity", "", "the before map holds " + b.quantity().key()
                    + " but the after map " + a.quantity().key() + "; compare maps of one quantity");
        }
        RegistrationReport report;
        WaferMap aligned;
        if (o.register()) {
            report = MapRegistration.registerChecked(b, a, RegistrationOptions.DEFAULTS
                    .withMaxRotation(o.maxRotationDeg()), p);
            aligned = MapRegistration.apply(b, a, report.registration());
        } else {
            if (b.width() != a.width() || b.height() != a.height()) {
                throw new InvalidValueException("after", "px", "without registration the maps must be of one size,"
                        + " but they are " + b.width() + "x" + b.height() + " and " + a.width() + "x" + a.height()
                        + " px");
            }
            aligned = a.withGrid(b.grid());
            report = MapRegistration.unregistered(b, aligned);
        }
        Comparison c = MapComparison.compare(b, aligned, null, o.relativeTolerance(), Improvement.of(b.quantity()));
        if (o.iron()) {
            // iron works on the lifetimes: the pair as read, placed by the registration kept
            WaferMap lifeAfter = o.defect() == null ? aligned : MapRegistration.apply(before, after,
                    report.registration());
            iron = IronMapping.map(before, lifeAfter, o.settings(), null);
        }
        return new Result(b, aligned, report, c, iron);
    }
}
