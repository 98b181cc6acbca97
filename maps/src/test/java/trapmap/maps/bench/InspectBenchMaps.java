package trapmap.maps.bench;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;

/**
 * Writes the maps of the batch-inspection benchmark ({@code scripts/bench-inspect}): {@code count} lifetime maps of
 * {@code size}² pixels of an M2 pseudo-square wafer (no data outside it) with the conditions of the example rules
 * embedded (p-type 1.5 Ω·cm, Δn = 1e14 cm^-3, 180 µm, 10 cm/s). Each map has a grain-like background (200-700 µs), an
 * iron-rich left edge zone and a low-lifetime spot at a position that moves from map to map, plus 1.5 % noise; four
 * backgrounds are computed once and reused, the spot and the noise differ per map. The same arguments give the same
 * files. A folder that already holds a complete set (its marker file) is left as it is.
 *
 * <p>Arguments: {@code DIR [count] [size]} (defaults 1000 and 1024). Not a unit test.
 */
public final class InspectBenchMaps {
    private static final int BACKGROUNDS = 4;

    private InspectBenchMaps() {
    }

    public static void main(String[] args) throws IOException {
        Path dir = Path.of(args[0]);
        int count = args.length > 1 ? Integer.parseInt(args[1]) : 1000;
        int size = args.length > 2 ? Integer.parseInt(args[2]) : 1024;
        Path marker = dir.resolve(String.format(Locale.ROOT, ".complete-%d-%d", count, size));
        if (Files.exists(marker)) {
            System.err.println("bench maps: reusing " + count + " maps of " + size + "x" + size + " in " + dir);
            return;
        }
        Files.createDirectories(dir);
        long t0 = System.nanoTime();
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = PixelGrid.centred(size, size, (format.sizeMm() + 6) / size);
        WaferShape shape = format.shape();
        float[][] backgrounds = new float[Math.min(BACKGROUNDS, count)][];
        for (int b = 0; b < backgrounds.length; b++) {
            backgrounds[b] = background(grid, shape, new Random(1000 + b));
        }
        MeasurementConditions c = new MeasurementConditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180.0,
                300.0, 1e14, null, 10.0, null, null, Map.of("data", "invented benchmark data"));
        for (int i = 0; i < count; i++) {
            Random rnd = new Random(7_000_003L * i + 11);
            float[] tau = backgrounds[i % backgrounds.length].clone();
            double sx = (rnd.nextDouble() * 2 - 1) * 60;
            double sy = (rnd.nextDouble() * 2 - 1) * 60;
            double radius = 2 + 3 * rnd.nextDouble();
            for (int k = 0; k < tau.length; k++) {
                if (tau[k] == tau[k]) {
                    int x = k % size;
                    int y = k / size;
                    double r = Math.hypot(grid.xMm(x) - sx, grid.yMm(y) - sy);
                    double v = r < radius ? 8 : tau[k];
                    tau[k] = (float) (v * (1 + 0.015 * Math.max(-3, Math.min(3, rnd.nextGaussian()))));
                }
            }
            String id = String.format(Locale.ROOT, "BENCH-%04d", i);
            WaferMap map = new WaferMap(FloatRaster.wrap(size, size, tau), grid, Quantity.EFFECTIVE_LIFETIME, id, c,
                    Provenance.of("trapmap inspection benchmark (invented data)").then(
                            ProcessingStep.of("bench-generate", "map", Integer.toString(i))));
            MapFiles.write(map, dir.resolve(id + ".tif"));
        }
        Files.writeString(marker, "complete\n", StandardCharsets.UTF_8);
        System.err.printf(Locale.ROOT, "bench maps: wrote %d maps of %dx%d into %s in %.1f s%n", count, size, size,
                dir, (System.nanoTime() - t0) / 1e9);
    }

    /** Lifetimes (µs) of a grain pattern with an edge zone on the left; NaN outside the wafer. */
    private static float[] background(PixelGrid grid, WaferShape shape, Random rnd) {
        int w = grid.width();
        int h = grid.height();
        double[] fx = new double[6];
        double[] fy = new double[6];
        double[] ph = new double[6];
        for (int k = 0; k < fx.length; k++) {
            fx[k] = (rnd.nextDouble() * 2 - 1) * 0.15;
            fy[k] = (rnd.nextDouble() * 2 - 1) * 0.15;
            ph[k] = rnd.nextDouble() * 2 * Math.PI;
        }
        double half = WaferFormat.M2.sizeMm() / 2;
        float[] tau = new float[w * h];
        for (int y = 0; y < h; y++) {
            double ym = grid.yMm(y);
            for (int x = 0; x < w; x++) {
                double xm = grid.xMm(x);
                if (!shape.contains(xm, ym)) {
                    tau[y * w + x] = Float.NaN;
                    continue;
                }
                double g = 0;
                for (int k = 0; k < fx.length; k++) {
                    g += Math.sin(fx[k] * xm + fy[k] * ym + ph[k]);
                }
                double grains = 450 + 250 * Math.tanh(g); // 200-700 µs
                double edge = 30 * Math.exp(-(xm + half) / 4.0); // iron from the crucible wall
                tau[y * w + x] = (float) (1 / (1 / grains + edge / 300));
            }
        }
        return tau;
    }
}
