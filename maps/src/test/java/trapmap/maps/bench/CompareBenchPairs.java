package trapmap.maps.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;

/**
 * "After" maps for the {@code compare} benchmark, made from one square map by moving whole pixels (no resampling):
 * {@code mirror.tif}, mirrored left–right, and {@code transpose-shift.tif}, transposed (a mirror and a quarter turn)
 * and shifted by 23 columns left and 41 rows down, with no data where nothing moved in. Written uncompressed with
 * the source's grid. Arguments: {@code SOURCE OUT_DIR}. Not a unit test: run it from {@code scripts/bench-compare}.
 */
public final class CompareBenchPairs {
    private static final int SHIFT_X_PX = 23;
    private static final int SHIFT_Y_PX = 41;

    private CompareBenchPairs() {
    }

    public static void main(String[] args) throws Exception {
        WaferMap source = MapFiles.readSingle(Path.of(args[0]));
        Path out = Files.createDirectories(Path.of(args[1]));
        int n = source.width();
        if (source.height() != n) {
            throw new IllegalArgumentException(args[0] + " is " + n + "x" + source.height() + " px; a square map is"
                    + " needed");
        }
        float[] s = source.raster().samples();
        float[] mirror = new float[s.length];
        float[] moved = new float[s.length];
        Arrays.fill(moved, Float.NaN);
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                mirror[y * n + x] = s[y * n + n - 1 - x];
            }
        }
        // moved[y][x] = s[x + ...]: the transpose t[y][x] = s[x][y], then moved[y][x] = t[y - 41][x + 23]
        for (int y = SHIFT_Y_PX; y < n; y++) {
            for (int x = 0; x < n - SHIFT_X_PX; x++) {
                moved[y * n + x] = s[(x + SHIFT_X_PX) * n + (y - SHIFT_Y_PX)];
            }
        }
        write(source, mirror, "mirrored left-right", out.resolve("mirror.tif"));
        write(source, moved, "transposed, shifted 23 px left and 41 px down", out.resolve("transpose-shift.tif"));
    }

    private static void write(WaferMap source, float[] samples, String what, Path file) throws Exception {
        WaferMap m = source.derive(FloatRaster.wrap(source.width(), source.height(), samples), source.quantity(),
                ProcessingStep.of("benchmark pair", "moved", what));
        MapFiles.write(m, file);
        System.out.println(file);
    }
}
