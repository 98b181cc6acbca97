package trapmap.maps.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;

/**
 * Writes the left-right mirror image of a map (same grid, conditions and wafer id) for the end-to-end benchmark of
 * {@code compare} ({@code scripts/bench-e2e}): the registration has to find the mirror. An existing output is left
 * as it is.
 *
 * <p>Arguments: {@code IN OUT}. Not a unit test.
 */
public final class BenchMirror {
    private BenchMirror() {
    }

    public static void main(String[] args) throws IOException {
        Path in = Path.of(args[0]);
        Path out = Path.of(args[1]);
        if (Files.exists(out)) {
            System.err.println("bench mirror: reusing " + out);
            return;
        }
        WaferMap map = MapFiles.readSingle(in);
        int w = map.width();
        int h = map.height();
        float[] src = map.raster().samples();
        float[] dst = new float[src.length];
        for (int y = 0; y < h; y++) {
            int row = y * w;
            for (int x = 0; x < w; x++) {
                dst[row + x] = src[row + w - 1 - x];
            }
        }
        WaferMap mirrored = new WaferMap(FloatRaster.wrap(w, h, dst), map.grid(), map.quantity(), map.waferId(),
                map.conditions(), map.provenance().then(ProcessingStep.of("bench-mirror", "axis", "left-right")));
        MapFiles.write(mirrored, out);
    }
}
