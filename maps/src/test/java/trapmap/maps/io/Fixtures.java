package trapmap.maps.io;

import java.awt.image.Raster;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Iterator;
import java.util.Map;
import java.util.Random;
import javax.imageio.ImageReader;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.spi.IIORegistry;
import javax.imageio.spi.ImageReaderSpi;
import javax.imageio.stream.FileImageInputStream;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.material.Doping;

/** Maps to write and an independent second TIFF reader (the JDK plugin, used directly). */
final class Fixtures {
    private Fixtures() {
    }

    /** Log-uniform lifetimes 1-1000 µs with some NaN (no data), including a NaN with a payload. */
    static float[] lifetimes(int width, int height, long seed) {
        Random r = new Random(seed);
        float[] s = new float[width * height];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) Math.pow(10, 3 * r.nextDouble());
        }
        s[0] = Float.NaN;
        s[s.length - 1] = Float.intBitsToFloat(0x7fc00123); // NaN with a payload
        s[s.length / 2] = Float.MIN_VALUE;
        s[s.length / 3] = -0.0f;
        return s;
    }

    static MeasurementConditions conditions() {
        return new MeasurementConditions(Doping.pType(1.5e16), 180.0, 300.0, 1e14, null, 10.0, null, null,
                Map.of("passivation", "AlOx, 20 nm", "note", "µ-PCD \"quoted\" text"));
    }

    static WaferMap lifetimeMap(int width, int height, long seed) {
        Provenance p = Provenance.of("generated w07").then(ProcessingStep.of("make", "seed", Long.toString(seed)))
                .then(ProcessingStep.of("mask", "edge_mm", "3"));
        return new WaferMap(FloatRaster.wrap(width, height, lifetimes(width, height, seed)),
                new PixelGrid(width, height, 0.35, (width - 1) / 2.0 + 0.25, (height - 1) / 2.0 - 1.5),
                Quantity.EFFECTIVE_LIFETIME, "w07", conditions(), p);
    }

    /** Samples of a page read with the JDK TIFF plugin selected by class, pixel by pixel. */
    static float[] readWithJdk(Path file, int page) throws IOException {
        ImageReader r = jdkReader();
        try (FileImageInputStream in = new FileImageInputStream(file.toFile())) {
            r.setInput(in);
            Raster raster = r.read(page).getRaster();
            float[] out = new float[raster.getWidth() * raster.getHeight()];
            for (int y = 0; y < raster.getHeight(); y++) {
                for (int x = 0; x < raster.getWidth(); x++) {
                    out[y * raster.getWidth() + x] = raster.getSampleFloat(x, y, 0);
                }
            }
            return out;
        } finally {
            r.dispose();
        }
    }

    static int pagesWithJdk(Path file) throws IOException {
        ImageReader r = jdkReader();
        try (FileImageInputStream in = new FileImageInputStream(file.toFile())) {
            r.setInput(in);
            return r.getNumImages(true);
        } finally {
            r.dispose();
        }
    }

    /** The tags of a page as the JDK plugin reads them. */
    static TIFFDirectory directoryWithJdk(Path file, int page) throws IOException {
        ImageReader r = jdkReader();
        try (FileImageInputStream in = new FileImageInputStream(file.toFile())) {
            r.setInput(in);
            return TIFFDirectory.createFromMetadata(r.getImageMetadata(page));
        } finally {
            r.dispose();
        }
    }

    static ImageReader jdkReader() throws IOException {
        Iterator<ImageReaderSpi> it = IIORegistry.getDefaultInstance().getServiceProviders(ImageReaderSpi.class,
                true);
        while (it.hasNext()) {
            ImageReaderSpi spi = it.next();
            if (spi.getClass().getName().equals("com.sun.imageio.plugins.tiff.TIFFImageReaderSpi")) {
                return spi.createReaderInstance();
            }
        }
        throw new IllegalStateException("no JDK TIFF reader");
    }

    /** Bit patterns with every NaN made the canonical NaN (-0 still differs from 0). */
    static int[] canonicalBits(float[] s) {
        int[] b = new int[s.length];
        for (int i = 0; i < s.length; i++) {
            b[i] = Float.floatToIntBits(s[i]);
        }
        return b;
    }

    /** Raw bit patterns, so that NaN payloads and -0 count. */
    static int[] bits(float[] s) {
        int[] b = new int[s.length];
        for (int i = 0; i < s.length; i++) {
            b[i] = Float.floatToRawIntBits(s[i]);
        }
        return b;
    }
}
