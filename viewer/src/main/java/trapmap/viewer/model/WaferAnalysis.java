package trapmap.viewer.model;

import java.util.BitSet;
import java.util.Set;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.Mask;
import trapmap.maps.region.RegionTable;
import trapmap.maps.stats.MapStatistics;
import trapmap.physics.conversion.ConversionWarning;

/**
 * The derived results of one wafer for one {@link Analysis}.
 *
 * @param analysis        the settings they were computed with
 * @param lifetime        effective-lifetime map (µs) with the applied conditions (PL maps converted)
 * @param conversion      the conversion for the chosen defect, or null when no defect is chosen
 * @param displayed       the map of the displayed quantity
 * @param shape           the fitted wafer outline, or null when none could be fitted
 * @param mask            evaluated pixels: valid lifetime inside the outline less the edge exclusion
 * @param lifetimeStats   statistics of the lifetime over {@code mask} (harmonic mean, median, P1…P99)
 * @param displayedStats  statistics of the displayed map over {@code mask} (P1, P5, P50, P95, P99)
 * @param regions         flagged regions of the displayed map
 * @param flagged         flagged pixels (bit {@code y·width + x}), the pixels of {@code regions}
 * @param flaggedFraction area of the regions over the evaluated area (the batch's flagged_area_fraction)
 * @param key             the gallery's key figure
 * @param verdict         how the wafer was judged: a rules verdict or the quick threshold check
 * @param flagThreshold   the flag threshold in the displayed quantity's unit, NaN when the flag is on another
 *                        quantity (a rules flag on trap density while the lifetime is shown)
 * @param flagUnit        the unit of the regions' peak and mean values (the flagged quantity's)
 * @param edgeExclusionMm the edge exclusion the evaluated pixels leave out, mm (the rules' with a rules file)
 * @param warnings        cautions of the conversion
 * @param exceedance      the probability of exceeding N* prepared for this wafer (with the reason when it cannot
 *                        be), or null when no defect converts it
 */
public record WaferAnalysis(Analysis analysis, WaferMap lifetime, MapConversion.Result conversion,
                            WaferMap displayed, WaferShape shape, Mask mask, MapStatistics lifetimeStats,
                            MapStatistics displayedStats, RegionTable regions, BitSet flagged,
                            double flaggedFraction, KeyFigure key, Verdict verdict, double flagThreshold,
                            String flagUnit, double edgeExclusionMm, Set<ConversionWarning> warnings,
                            ExceedanceLayer exceedance) {

    /** The verdict's outcome. */
    public boolean pass() {
        return verdict.pass();
    }

    /**
     * The figure a gallery card shows.
     *
     * @param label short name, e.g. {@code τ_hm}
     * @param value the value
     * @param unit  its unit, as shown
     */
    public record KeyFigure(String label, double value, String unit) {
        @Override
        public String toString() {
            return label + " " + Units.withUnit(value, unit);
        }
    }

    /**
     * What the probability of exceeding N* was drawn with: the prepared layer's settings (a rules flag's with a
     * confidence, or the analysis's), else the analysis's.
     */
    public ExceedanceSettings exceedanceSettings() {
        return exceedance != null ? exceedance.settings() : analysis.exceedance();
    }

    /** Largest flagged region's area, mm² (0 when none). */
    public double largestRegionMm2() {
        return regions.size() == 0 ? 0 : regions.byArea().get(0).areaMm2();
    }

    /** The same results with another verdict. */
    WaferAnalysis withVerdict(Verdict v) {
        return new WaferAnalysis(analysis, lifetime, conversion, displayed, shape, mask, lifetimeStats, displayedStats,
                regions, flagged, flaggedFraction, key, v, flagThreshold, flagUnit, edgeExclusionMm, warnings,
                exceedance);
    }
}
