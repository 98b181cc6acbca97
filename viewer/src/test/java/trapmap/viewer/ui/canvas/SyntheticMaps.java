package trapmap.viewer.ui.canvas;

import java.util.SplittableRandom;
import java.util.stream.IntStream;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/** Generated maps for canvas tests and the viewer benchmark. */
final class SyntheticMaps {
    private SyntheticMaps() {
    }

    /** A map wrapping {@code samples} with the given pitch, centred grid. */
    static WaferMap of(int w, int h, double pitchMm, float[] samples) {
        return new WaferMap(FloatRaster.wrap(w, h, samples), PixelGrid.centred(w, h, pitchMm),
                Quantity.EFFECTIVE_LIFETIME, "synthetic", MeasurementConditions.UNKNOWN, Provenance.of("synthetic"));
    }

    /**
     * A {@code n}×{@code n} lifetime map of a 156 mm round wafer: NaN outside the disk, 50–1000 µs inside with a
     * radial fall-off, a few dark spots and deterministic noise.
     */
    static WaferMap wafer(int n) {
        float[] s = new float[n * n];
        double pitch = 160.0 / n;
        double r = 78;
        IntStream.range(0, n).parallel().forEach(y -> {
            SplittableRandom rnd = new SplittableRandom(y * 7919L + 13);
            for (int x = 0; x < n; x++) {
                double xm = (x - (n - 1) / 2.0) * pitch;
                double ym = ((n - 1) / 2.0 - y) * pitch;
                double d = Math.hypot(xm, ym);
                if (d > r) {
                    s[y * n + x] = Float.NaN;
                    continue;
                }
                double v = 900 * (1 - 0.7 * Math.pow(d / r, 4));
                v /= 1 + 6 * Math.exp(-((xm - 30) * (xm - 30) + (ym + 20) * (ym + 20)) / 60);
                v /= 1 + 3 * Math.exp(-((xm + 40) * (xm + 40) + (ym - 35) * (ym - 35)) / 20);
                v *= 1 + 0.08 * (rnd.nextDouble() - 0.5);
                s[y * n + x] = (float) v;
            }
        });
        return of(n, n, pitch, s);
    }
}
