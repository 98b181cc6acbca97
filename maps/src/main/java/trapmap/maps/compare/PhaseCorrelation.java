package trapmap.maps.compare;

import java.util.ArrayList;
import java.util.List;
import org.jtransforms.fft.DoubleFFT_2D;
import trapmap.maps.raster.PixelGrid;

/**
 * Translation candidates by phase correlation (Kuglin & Hines, Proc. IEEE Int. Conf. Cybernetics and Society,
 * 163 (1975)) on a square canvas in wafer coordinates. The before level is drawn on the canvas once; each after
 * placement (mirror and turn, no shift) is drawn and correlated with it. The cross-power spectrum is whitened and
 * damped by a Gaussian so that the peak is a few pixels wide and can be located to a fraction of a pixel. The
 * transforms are JTransforms' complex 2-D FFT (any canvas size; unnormalised forward, scaled inverse).
 */
final class PhaseCorrelation {
    /** Gaussian damping of the whitened spectrum, e-folding frequency in cycles per pixel. */
    static final double DAMPING_CYCLES_PER_PX = 0.2;
    private static final int PEAK_EXCLUSION_PX = 3;

    private final int n;
    private final PixelGrid canvas;
    private final Surface surface;

    PhaseCorrelation(Pyramid.Level before, int n, double pitchMm) {
        this.n = n;
        this.canvas = new PixelGrid(n, n, pitchMm, n / 2.0, n / 2.0);
        this.surface = new Surface(draw(before, Registration.identity()), n);
    }

    /**
     * Up to {@code count} shifts (mm) of the after level under {@code placement} (its shift ignored), strongest
     * correlation peak first, each refined to a fraction of a canvas pixel.
     */
    List<double[]> shiftsMm(Pyramid.Level after, Registration placement, int count) {
        Registration unshifted = Registration.explicit(placement.flipX(), placement.flipY(),
                placement.rotationDeg(), 0, 0);
        double[] re = surface.of(draw(after, unshifted));
        List<double[]> out = new ArrayList<>();
        boolean[] taken = new boolean[n * n];
        for (int c = 0; c < count; c++) {
            int best = -1;
            for (int i = 0; i < re.length; i++) {
                if (!taken[i] && (best < 0 || re[i] > re[best])) {
                    best = i;
                }
            }
            if (best < 0 || re[best] <= 0) {
                break;
            }
            int px = best % n;
            int py = best / n;
            for (int dy = -PEAK_EXCLUSION_PX; dy <= PEAK_EXCLUSION_PX; dy++) {
                for (int dx = -PEAK_EXCLUSION_PX; dx <= PEAK_EXCLUSION_PX; dx++) {
                    taken[Math.floorMod(py + dy, n) * n + Math.floorMod(px + dx, n)] = true;
                }
            }
            double sx = wrap(px) + vertex(at(re, px - 1, py), re[best], at(re, px + 1, py));
            double sy = wrap(py) + vertex(at(re, px, py - 1), re[best], at(re, px, py + 1));
            // a column shift is +x in mm, a row shift is −y
            out.add(new double[] {sx * canvas.pitchMm(), -sy * canvas.pitchMm()});
        }
        return out;
    }

    private double at(double[] s, int x, int y) {
        return s[Math.floorMod(y, n) * n + Math.floorMod(x, n)];
    }

    private int wrap(int i) {
        return i < n / 2 ? i : i - n;
    }

    /** Offset of the vertex of the parabola through (−1, l), (0, c), (1, r), limited to ±½. */
    private static double vertex(double l, double c, double r) {
        double d = l - 2 * c + r;
        if (!(d < 0)) {
            return 0;
        }
        return Math.max(-0.5, Math.min(0.5, 0.5 * (l - r) / d));
    }

    /** The tapered level drawn on the canvas through {@code r} (bilinear). */
    private double[] draw(Pyramid.Level level, Registration r) {
        PixelMapping m = PixelMapping.of(canvas, level.grid, r);
        double[] out = new double[n * n];
        float[] t = level.tapered;
        int w = level.width;
        int h = level.height;
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                double bx = m.bx(x, y);
                double by = m.by(x, y);
                if (!(bx >= 0 && by >= 0 && bx < w - 1 && by < h - 1)) {
                    continue;
                }
                int ix = (int) bx;
                int iy = (int) by;
                double fx = bx - ix;
                double fy = by - iy;
                int i = iy * w + ix;
                out[y * n + x] = (1 - fy) * ((1 - fx) * t[i] + fx * t[i + 1])
                        + fy * ((1 - fx) * t[i + w] + fx * t[i + w + 1]);
            }
        }
        return out;
    }

    /**
     * The correlation surface of a fixed n×n reference image against moving images: the inverse transform of
     * reference × conj(moving) in the frequency domain, whitened (unit magnitude) and damped by
     * exp(−(fx² + fy²)/{@link #DAMPING_CYCLES_PER_PX}²), real part. A moving image that is the reference shifted
     * by (dx, dy) pixels (circularly) peaks at (−dx, −dy) modulo n. The reference spectrum is taken once.
     */
    static final class Surface {
        private final int n;
        private final DoubleFFT_2D fft;
        /** Spectrum of the reference, real and imaginary parts interleaved (JTransforms' layout). */
        private final double[] reference;
        private final double[] damping;

        Surface(double[] referenceSamples, int n) {
            this.n = n;
            this.fft = new DoubleFFT_2D(n, n);
            this.reference = spectrum(referenceSamples);
            this.damping = new double[n * n];
            for (int y = 0; y < n; y++) {
                double fy = (y < n / 2 ? y : y - n) / (double) n;
                for (int x = 0; x < n; x++) {
                    double fx = (x < n / 2 ? x : x - n) / (double) n;
                    damping[y * n + x] = Math.exp(-(fx * fx + fy * fy)
                            / (DAMPING_CYCLES_PER_PX * DAMPING_CYCLES_PER_PX));
                }
            }
        }

        /** The surface of {@code moving} (n×n, row-major) against the reference, n×n. */
        double[] of(double[] moving) {
            double[] s = spectrum(moving);
            for (int i = 0; i < damping.length; i++) {
                // reference × conj(moving), whitened and damped
                double refRe = reference[2 * i];
                double refIm = reference[2 * i + 1];
                double re = s[2 * i];
                double im = s[2 * i + 1];
                double cr = refRe * re + refIm * im;
                double ci = refIm * re - refRe * im;
                double mag = Math.hypot(cr, ci);
                double k = mag > 1e-12 ? damping[i] / mag : 0;
                s[2 * i] = cr * k;
                s[2 * i + 1] = ci * k;
            }
            fft.complexInverse(s, true);
            double[] out = new double[n * n];
            for (int i = 0; i < out.length; i++) {
                out[i] = s[2 * i];
            }
            return out;
        }

        /** The complex 2-D spectrum of the real n×n samples {@code s}, interleaved. */
        private double[] spectrum(double[] s) {
            if (s.length != n * n) {
                throw new IllegalArgumentException("expected " + n + "x" + n + " samples but got " + s.length);
            }
            double[] c = new double[2 * s.length];
            for (int i = 0; i < s.length; i++) {
                c[2 * i] = s[i];
            }
            fft.complexForward(c);
            return c;
        }
    }
}
