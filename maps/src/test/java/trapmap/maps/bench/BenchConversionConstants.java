package trapmap.maps.bench;

import java.io.IOException;
import java.nio.file.Path;
import java.util.Locale;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.recombination.SrhRecombination;

/**
 * Prints, as one JSON object, the wafer-level constants of a fixed-generation conversion the way {@code trapmap
 * convert MAP --defect ID --doping DOPING --generation G} sets it up (the map's embedded conditions overridden by the
 * two flags, default physics settings): equilibrium densities, SRH n1/p1 and capture coefficients, the surface rate,
 * B_low, the temperature and the detection resolution. {@code scripts/numpy_convert.py} does the per-pixel
 * arithmetic with them, so the NumPy comparison of {@code scripts/bench-e2e} computes the same quantity.
 *
 * <p>Arguments: {@code MAP DEFECT DOPING GENERATION}. Not a unit test.
 */
public final class BenchConversionConstants {
    private BenchConversionConstants() {
    }

    public static void main(String[] args) throws IOException {
        MeasurementConditions mc = MapFiles.readSingle(Path.of(args[0])).conditions()
                .withDoping(MapFiles.parseDoping(args[2]))
                .withInjection(null)
                .withGeneration(Double.parseDouble(args[3]));
        Conditions c = MapConversion.physicsConditions(mc, ConversionSettings.DEFAULTS);
        TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId(args[1]));
        SrhRecombination s = conv.srh();
        double surfaceUs = conv.surfaceLifetimeUs();
        System.out.printf(Locale.ROOT, "{\"n0_cm3\": %.17g, \"p0_cm3\": %.17g, \"n1_cm3\": %.17g, \"p1_cm3\": %.17g,"
                        + " \"cn_cm3_s\": %.17g, \"cp_cm3_s\": %.17g, \"surface_rate_per_s\": %.17g,"
                        + " \"b_low_cm3_s\": %.17g, \"temperature_k\": %.17g, \"detection_resolution\": %.17g,"
                        + " \"generation_cm3_s\": %.17g, \"lifetime_floor_us\": %.17g}%n",
                s.n0PerCm3(), s.p0PerCm3(), s.n1PerCm3(), s.p1PerCm3(), s.electronCaptureCm3PerS(),
                s.holeCaptureCm3PerS(), Double.isInfinite(surfaceUs) ? 0.0 : 1e6 / surfaceUs, c.radiativeCm3PerS(),
                c.silicon().temperatureK(), c.detectionResolution(), Double.parseDouble(args[3]),
                TrapDensityConverter.LIFETIME_FLOOR_US);
    }
}
