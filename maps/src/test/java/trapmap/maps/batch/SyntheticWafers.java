package trapmap.maps.batch;

import java.io.IOException;
import java.nio.file.Path;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/** Round 100 mm lifetime maps at 0.5 mm pitch, written with {@link MapFiles}, optionally with a low-lifetime spot. */
final class SyntheticWafers {
    static final int N = 201;
    static final double PITCH_MM = 0.5;
    static final double RADIUS_MM = 50;

    private SyntheticWafers() {
    }

    /** A uniform wafer of {@code baseUs}. */
    static Path clean(Path dir, String name, double baseUs) throws IOException {
        return write(dir, name, map(name, baseUs, 0, 0, 0, baseUs));
    }

    /** A wafer of {@code baseUs} with a disc of {@code spotUs} of radius {@code spotRadiusMm} at (x, y) mm. */
    static Path spot(Path dir, String name, double baseUs, double xMm, double yMm, double spotRadiusMm,
                     double spotUs) throws IOException {
        return write(dir, name, map(name, baseUs, xMm, yMm, spotRadiusMm, spotUs));
    }

    static WaferMap map(String id, double baseUs, double sx, double sy, double sr, double spotUs) {
        float[] s = new float[N * N];
        PixelGrid g = PixelGrid.centred(N, N, PITCH_MM);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x);
                double ym = g.yMm(y);
                double v = Math.hypot(xm, ym) > RADIUS_MM ? Float.NaN
                        : Math.hypot(xm - sx, ym - sy) <= sr ? spotUs : baseUs;
                s[y * N + x] = (float) v;
            }
        }
        return new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, id,
                MeasurementConditions.UNKNOWN, Provenance.of("synthetic"));
    }

    static Path write(Path dir, String name, WaferMap m) throws IOException {
        Path f = dir.resolve(name + ".tif");
        MapFiles.write(m, f);
        return f;
    }
}
