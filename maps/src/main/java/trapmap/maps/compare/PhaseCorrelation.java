package trapmap.maps.compare;

import java.util.ArrayList;
import java.util.List;
import trapmap.maps.raster.PixelGrid;

/**
 * Translation candidates by phase correlation (Kuglin & Hines, Proc. IEEE Int. Conf. Cybernetics and Society,
 * 163 (1975)) on a square canvas in wafer coordinates. The before level is drawn on the canvas once; each after
 * placement (mirror and turn, no shift) is drawn and correlated with it. The cross-power spectrum is whitened and
 * damped by a Gaussian so that the peak is a few pixels wide and can be located to a fraction of a pixel.
 */
final class PhaseCorrelation {
    /** Gaussian damping of the whitened spectrum, e-folding frequency in cycles per pixel. */
    private static final double DAMPING_CYCLES_PER_PX = 0.2;
    private static final int PEAK_EXCLUSION_PX = 3;

    private final int n;
    private final PixelGrid canvas;
    private final Fft fft;
    private final double[] refRe;
    private final double[] refIm;
    private final double[] damping;

    PhaseCorrelation(Pyramid.Level before, int n, double pitchMm) {
        this.n = n;
        this.canvas = new PixelGrid(n, n, pitchMm, n / 2.0, n / 2.0);
        this.fft = new Fft(n);
        this.refRe = draw(before, Registration.identity());
        this.refIm = new double[n * n];
        fft.forward2d(refRe, refIm);
        this.damping = new double[n * n];
        for (int y = 0; y < n; y++) {
            double fy = (y < n / 2 ? y : y - n) / (double) n;
            for (int x = 0; x < n; x++) {
                double fx = (x < n / 2 ? x : x - n) / (double) n;
                damping[y * n + x] = Math.exp(-(fx * fx + fy * fy) / (DAMPING_CYCLES_PER_PX * DAMPING_CYCLES_PER_PX));
            }
        }
    }

    /**
     * Up to {@code count} shifts (mm) of the after level under {@code placement} (its shift ignored), strongest
     * correlation peak first, each refined to a fraction of a canvas pixel.
     */
    List<double[]> shiftsMm(Pyramid.Level after, Registration placement, int count) {
        Registration unshifted = Registration.explicit(placement.flipX(), placement.flipY(),
                placement.rotationDeg(), 0, 0);
        double[] re = draw(after, unshifted);
        double[] im = new double[n * n];
        fft.forward2d(re, im);
        for (int i = 0; i < re.length; i++) {
            // reference × conj(after), whitened and damped
            double cr = refRe[i] * re[i] + refIm[i] * im[i];
            double ci = refIm[i] * re[i] - refRe[i] * im[i];
            double mag = Math.hypot(cr, ci);
            double k = mag > 1e-12 ? damping[i] / mag : 0;
            re[i] = cr * k;
            im[i] = ci * k;
        }
        fft.inverse2d(re, im);
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

    /** Radix-2 complex FFT of a fixed power-of-two length, with 2-D helpers on row-major n×n arrays. */
    static final class Fft {
        private final int n;
        private final double[] cos;
        private final double[] sin;
        private final int[] reversed;

        Fft(int n) {
            if (Integer.bitCount(n) != 1) {
                throw new IllegalArgumentException("FFT length must be a power of two but was " + n);
            }
            this.n = n;
            cos = new double[n / 2];
            sin = new double[n / 2];
            for (int i = 0; i < n / 2; i++) {
                cos[i] = Math.cos(2 * Math.PI * i / n);
                sin[i] = Math.sin(2 * Math.PI * i / n);
            }
            reversed = new int[n];
            int bits = Integer.numberOfTrailingZeros(n);
            for (int i = 0; i < n; i++) {
                reversed[i] = bits == 0 ? 0 : Integer.reverse(i) >>> (32 - bits);
            }
        }

        /** In place; sign −1 forward (e^{−2πikn/N}), +1 inverse (unnormalised). */
        void transform(double[] re, double[] im, int sign) {
            for (int i = 0; i < n; i++) {
                int j = reversed[i];
                if (j > i) {
                    double t = re[i];
                    re[i] = re[j];
                    re[j] = t;
                    t = im[i];
                    im[i] = im[j];
                    im[j] = t;
                }
            }
            for (int size = 2; size <= n; size <<= 1) {
                int half = size >> 1;
                int step = n / size;
                for (int start = 0; start < n; start += size) {
                    for (int k = 0; k < half; k++) {
                        double wr = cos[k * step];
                        double wi = sign * sin[k * step];
                        int a = start + k;
                        int b = a + half;
                        double tr = re[b] * wr - im[b] * wi;
                        double ti = re[b] * wi + im[b] * wr;
                        re[b] = re[a] - tr;
                        im[b] = im[a] - ti;
                        re[a] += tr;
                        im[a] += ti;
                    }
                }
            }
        }

        void forward2d(double[] re, double[] im) {
            transform2d(re, im, -1);
        }

        void inverse2d(double[] re, double[] im) {
            transform2d(re, im, 1);
            double s = 1.0 / ((double) n * n);
            for (int i = 0; i < re.length; i++) {
                re[i] *= s;
                im[i] *= s;
            }
        }

        private void transform2d(double[] re, double[] im, int sign) {
            double[] r = new double[n];
            double[] i = new double[n];
            for (int y = 0; y < n; y++) {
                System.arraycopy(re, y * n, r, 0, n);
                System.arraycopy(im, y * n, i, 0, n);
                transform(r, i, sign);
                System.arraycopy(r, 0, re, y * n, n);
                System.arraycopy(i, 0, im, y * n, n);
            }
            for (int x = 0; x < n; x++) {
                for (int y = 0; y < n; y++) {
                    r[y] = re[y * n + x];
                    i[y] = im[y * n + x];
                }
                transform(r, i, sign);
                for (int y = 0; y < n; y++) {
                    re[y * n + x] = r[y];
                    im[y * n + x] = i[y];
                }
            }
        }
    }
}
