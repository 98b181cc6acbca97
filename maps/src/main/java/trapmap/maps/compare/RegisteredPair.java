package trapmap.maps.compare;

import java.util.List;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/**
 * A before/after pair registered, resampled and summarised in one go, as the {@code compare} command needs it: the
 * registration report (with its warnings), the after map on the before grid and the paired statistics. The outline
 * fits behind the size warning ({@link RegistrationWarnings}) run on the common fork-join pool while the pair is
 * registered, resampled and summarised on the caller's thread, so a comparison keeps two cores busy; every result
 * is the one the steps give one after another.
 *
 * @param report     the registration kept and its warnings
 * @param aligned    the after map resampled onto the before map's grid
 * @param statistics paired statistics over every pixel with data in both
 */
public record RegisteredPair(RegistrationReport report, WaferMap aligned, PairedStatistics statistics) {

    public RegisteredPair {
        Checks.notNull(report, "report");
        Checks.notNull(aligned, "aligned");
        Checks.notNull(statistics, "statistics");
    }

    /**
     * Registers {@code after} onto {@code before} ({@link MapRegistration#registerChecked}), or takes the maps as
     * aligned when {@code options} is null ({@link MapRegistration#unregistered}; the maps must then be of one
     * size), resamples ({@link MapRegistration#apply}) and takes the paired statistics
     * ({@link MapComparison#statistics(WaferMap, WaferMap, trapmap.maps.raster.Mask, double, Improvement)}).
     *
     * @throws InvalidValueException when unregistered maps differ in size, and as the steps
     */
    public static RegisteredPair of(WaferMap before, WaferMap after, RegistrationOptions options,
                                    double relativeTolerance, Improvement improvement, ProgressListener progress) {
        Checks.notNull(before, "before");
        Checks.notNull(after, "after");
        Checks.notNull(improvement, "improvement");
        Checks.notNull(progress, "progress");
        if (options == null && (before.width() != after.width() || before.height() != after.height())) {
            throw new InvalidValueException("after", "px", "without registration the maps must be of one size,"
                    + " but the before map is " + before.width() + "x" + before.height() + " px and the after map "
                    + after.width() + "x" + after.height() + " px");
        }
        RegistrationWarnings.SizeCheck size = RegistrationWarnings.SizeCheck.start(before, after);
        try {
            RegistrationReport report;
            WaferMap aligned;
            PairedStatistics statistics;
            if (options == null) {
                aligned = after.withGrid(before.grid());
                report = MapRegistration.unregisteredUnchecked(before, after);
                statistics = MapComparison.statistics(before, aligned, null, relativeTolerance, improvement);
            } else {
                // the overlap is counted on the resampled map, in the pass that takes the statistics
                RegistrationReport found = MapRegistration.registerUnchecked(before, after, options, progress, false);
                Registration r = found.registration();
                FloatRaster samples = MapRegistration.resampled(before, after, r);
                PairedPass.Result paired = MapComparison.statisticsAndOverlap(before,
                        MapRegistration.aligned(before, after, r, samples), relativeTolerance, improvement);
                Registration counted = r.withQuality(r.score(), paired.overlap());
                report = new RegistrationReport(counted, found.kept(), found.searchScore(), found.identityScore(),
                        List.of());
                aligned = MapRegistration.aligned(before, after, counted, samples);
                statistics = paired.statistics();
            }
            return new RegisteredPair(MapRegistration.withWarnings(before, after, report, size), aligned, statistics);
        } finally {
            size.cancel();
        }
    }
}
