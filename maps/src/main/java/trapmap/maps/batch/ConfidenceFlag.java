package trapmap.maps.batch;

import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.maps.region.RegionCriteria;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;

/**
 * A trap-density flag with a confidence c ({@link Rules.Flag#confidence()}): a pixel is flagged when the probability
 * that its equivalent trap density exceeds the flag's threshold N* is at least c. That probability falls as the
 * measured lifetime rises, so the flag is one lifetime limit per wafer, τ_c ({@link ExceedanceMaps#confidentLifetimeUs}):
 * flagged exactly when τ_c &gt; τ ≥ 1 ns (the conversion's floor; shorter lifetimes are invalid, never flagged). The one
 * verdict of inspect, reports and the viewer's overlay.
 */
public final class ConfidenceFlag {
    private ConfidenceFlag() {
    }

    /**
     * The lifetime limit τ_c, µs, of a flag with a confidence for a wafer with these conditions.
     *
     * @throws IllegalArgumentException when the flag has no confidence
     * @throws trapmap.shared.error.InvalidValueException naming a missing condition or an unsupported case
     */
    public static double lifetimeLimitUs(Rules.Flag flag, MeasurementConditions conditions, Defect defect,
                                         ConversionSettings settings) {
        if (!flag.confident()) {
            throw new IllegalArgumentException("the flag has no confidence");
        }
        return prepare(flag, conditions, defect, settings).confidentLifetimeUs(flag.confidence());
    }

    /**
     * The exceedance of a trap-density flag's threshold for a wafer with these conditions, drawn with the flag's
     * uncertainty settings.
     */
    public static ExceedanceMaps prepare(Rules.Flag flag, MeasurementConditions conditions, Defect defect,
                                         ConversionSettings settings) {
        if (flag.quantity() != Rules.FlagQuantity.TRAP_DENSITY) {
            throw new IllegalArgumentException("an exceedance needs a trap-density flag");
        }
        return ExceedanceMaps.prepare(conditions, defect, settings, flag.uncertainty().uncertainty(),
                flag.threshold(), flag.uncertainty().samples(), flag.uncertainty().seed());
    }

    /** The number of the first {@code count} lifetimes flagged under the limit {@code limitUs}. */
    public static int countFlagged(float[] lifetimesUs, int count, double limitUs) {
        int n = 0;
        for (int i = 0; i < count; i++) {
            n += flagged(lifetimesUs[i], limitUs) ? 1 : 0;
        }
        return n;
    }

    /** The region criteria on lifetimes of such a flag with limit {@code limitUs} (see {@link #flaggable}). */
    public static RegionCriteria criteria(Rules.Flag flag, double limitUs) {
        return RegionCriteria.below(limitUs, flag.minAreaMm2());
    }

    /** True when a pixel measured at {@code tauUs} µs is flagged under the limit {@code limitUs}. */
    public static boolean flagged(float tauUs, double limitUs) {
        return tauUs >= TrapDensityConverter.LIFETIME_FLOOR_US && tauUs < limitUs;
    }

    /**
     * The first {@code count} lifetimes with those below the conversion's floor (never flagged) as NaN, what the
     * {@link #criteria} read.
     */
    public static float[] flaggable(float[] lifetimesUs, int count) {
        float[] out = new float[count];
        for (int i = 0; i < count; i++) {
            float t = lifetimesUs[i];
            out[i] = t >= TrapDensityConverter.LIFETIME_FLOOR_US ? t : Float.NaN;
        }
        return out;
    }
}
