package trapmap.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.Random;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.model.WaferMap;

/**
 * Small generated lifetime maps for the batch's run tests: 80 mm round wafers of 80 µs on an 81 × 81 grid of
 * 1.05 mm, every other one (from the second) with a 4 µs spot of 4 mm radius at one of three places (seeded), so
 * that some wafers fail, regions are listed and the recurrence map has a hot spot.
 */
final class CrashTestMaps {
    private static final int N = 81;
    private static final double PITCH_MM = 1.05;
    private static final double[][] SPOTS = {{15, 10}, {-20, 5}, {5, -25}};

    private CrashTestMaps() {
    }

    /** Writes {@code count} maps {@code m00.tif}, {@code m01.tif}, … into {@code folder}. */
    static void write(Path folder, int count, long seed) throws IOException {
        Random rnd = new Random(seed);
        PixelGrid g = PixelGrid.centred(N, N, PITCH_MM);
        for (int k = 0; k < count; k++) {
            double[] spot = k % 2 == 1 ? SPOTS[rnd.nextInt(SPOTS.length)] : null;
            float base = 70f + rnd.nextInt(20);
            float[] s = new float[N * N];
            for (int y = 0; y < N; y++) {
                for (int x = 0; x < N; x++) {
                    double xm = g.xMm(x);
                    double ym = g.yMm(y);
                    s[y * N + x] = Math.hypot(xm, ym) > 40 ? Float.NaN
                            : spot != null && Math.hypot(xm - spot[0], ym - spot[1]) <= 4 ? 4f : base;
                }
            }
            String name = String.format(java.util.Locale.ROOT, "m%02d", k);
            MapFiles.write(new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, name,
                    MeasurementConditions.UNKNOWN, Provenance.of("test")), folder.resolve(name + ".tif"));
        }
    }
}
