package trapmap.maps.raster;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;

/**
 * A row-major raster of 32-bit samples; NaN means "no data". The only class that knows the layout
 * ({@code samples[y * width + x]}, row 0 at the top). The array is shared, not copied, by {@link #samples()} so that
 * whole-map loops stay allocation-free: code that did not create a raster must treat its samples as read-only.
 */
public final class FloatRaster {
    private final int width;
    private final int height;
    private final float[] samples;

    private FloatRaster(int width, int height, float[] samples) {
        this.width = width;
        this.height = height;
        this.samples = samples;
    }

    /**
     * Wraps {@code samples} (not copied).
     *
     * @throws IllegalArgumentException when the sizes do not match
     */
    public static FloatRaster wrap(int width, int height, float[] samples) {
        if (width <= 0 || height <= 0) {
            throw new IllegalArgumentException("raster size must be positive but was " + width + "x" + height);
        }
        if ((long) width * height != samples.length) {
            throw new IllegalArgumentException("raster " + width + "x" + height + " needs " + (long) width * height
                    + " samples but got " + samples.length);
        }
        return new FloatRaster(width, height, samples);
    }

    /** A raster of {@code width}×{@code height} filled with {@code value}. */
    public static FloatRaster filled(int width, int height, float value) {
        float[] s = new float[Math.multiplyExact(width, height)];
        Arrays.fill(s, value);
        return wrap(width, height, s);
    }

    public int width() {
        return width;
    }

    public int height() {
        return height;
    }

    /** Number of pixels. */
    public int size() {
        return samples.length;
    }

    /** Sample at column x, row y (0-based, row 0 at the top). */
    public float get(int x, int y) {
        return samples[y * width + x];
    }

    /** True when (x, y) lies inside the raster. */
    public boolean contains(int x, int y) {
        return x >= 0 && y >= 0 && x < width && y < height;
    }

    /** The backing array (shared; read-only unless you created the raster). */
    public float[] samples() {
        return samples;
    }

    /** An independent copy. */
    public FloatRaster copy() {
        return new FloatRaster(width, height, samples.clone());
    }

    /** A new raster with {@code f} applied to every sample (NaN stays NaN unless {@code f} says otherwise). */
    public FloatRaster map(DoubleUnaryOperator f) {
        float[] out = new float[samples.length];
        for (int i = 0; i < out.length; i++) {
            out[i] = (float) f.applyAsDouble(samples[i]);
        }
        return new FloatRaster(width, height, out);
    }

    /** Number of samples that are not NaN. */
    public int validCount() {
        int n = 0;
        for (float v : samples) {
            if (v == v) {
                n++;
            }
        }
        return n;
    }

    /** True when both rasters have the same size and bit-identical samples (NaN equals NaN). */
    public boolean sameSamples(FloatRaster other) {
        return width == other.width && height == other.height && Arrays.equals(samples, other.samples);
    }

    @Override
    public String toString() {
        return "FloatRaster[" + width + "x" + height + "]";
    }
}
