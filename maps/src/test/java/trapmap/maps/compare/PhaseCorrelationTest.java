package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The phase-correlation surface (JTransforms' FFT) against the same formula evaluated with a plain discrete Fourier
 * transform, X(k) = Σ x(j)·e^{−2πi·k·j/n}, on small random images, square canvases of power-of-two and other sizes.
 */
class PhaseCorrelationTest {

    private static double[] random(Random r, int n) {
        double[] s = new double[n * n];
        for (int i = 0; i < s.length; i++) {
            s[i] = r.nextGaussian();
        }
        return s;
    }

    /** Plain 2-D DFT (sign −1 forward, +1 inverse without scaling) of complex n×n samples. */
    private static double[][] dft(double[] re, double[] im, int n, int sign) {
        double[] outRe = new double[n * n];
        double[] outIm = new double[n * n];
        for (int ky = 0; ky < n; ky++) {
            for (int kx = 0; kx < n; kx++) {
                double sr = 0;
                double si = 0;
                for (int y = 0; y < n; y++) {
                    for (int x = 0; x < n; x++) {
                        double a = sign * 2 * Math.PI * ((double) kx * x / n + (double) ky * y / n);
                        double c = Math.cos(a);
                        double s = Math.sin(a);
                        double vr = re[y * n + x];
                        double vi = im[y * n + x];
                        sr += vr * c - vi * s;
                        si += vr * s + vi * c;
                    }
                }
                outRe[ky * n + kx] = sr;
                outIm[ky * n + kx] = si;
            }
        }
        return new double[][] {outRe, outIm};
    }

    /** The whitened, damped cross-power surface by plain DFTs. */
    private static double[] plainSurface(double[] reference, double[] moving, int n) {
        double[][] a = dft(reference, new double[n * n], n, -1);
        double[][] b = dft(moving, new double[n * n], n, -1);
        double[] cr = new double[n * n];
        double[] ci = new double[n * n];
        double d = PhaseCorrelation.DAMPING_CYCLES_PER_PX;
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                int i = y * n + x;
                double re = a[0][i] * b[0][i] + a[1][i] * b[1][i];
                double im = a[1][i] * b[0][i] - a[0][i] * b[1][i];
                double fx = (x < n / 2 ? x : x - n) / (double) n;
                double fy = (y < n / 2 ? y : y - n) / (double) n;
                double k = Math.exp(-(fx * fx + fy * fy) / (d * d)) / Math.hypot(re, im);
                cr[i] = re * k;
                ci[i] = im * k;
            }
        }
        double[] out = dft(cr, ci, n, 1)[0];
        for (int i = 0; i < out.length; i++) {
            out[i] /= (double) n * n;
        }
        return out;
    }

    @ParameterizedTest
    @ValueSource(ints = {8, 12, 16})
    void theSurfaceAgreesWithAPlainDft(int n) {
        Random r = new Random(31L * n);
        double[] reference = random(r, n);
        double[] moving = random(r, n);
        double[] fast = new PhaseCorrelation.Surface(reference, n).of(moving);
        double[] plain = plainSurface(reference, moving, n);
        for (int i = 0; i < plain.length; i++) {
            assertThat(fast[i]).as("pixel %d", i).isCloseTo(plain[i], within(1e-12));
        }
    }

    @ParameterizedTest
    @ValueSource(ints = {16, 24, 32})
    void aCircularShiftPeaksAtMinusTheShift(int n) {
        Random r = new Random(7L * n);
        double[] reference = random(r, n);
        int dx = 3;
        int dy = -5;
        double[] moving = new double[n * n];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                moving[Math.floorMod(y + dy, n) * n + Math.floorMod(x + dx, n)] = reference[y * n + x];
            }
        }
        double[] surface = new PhaseCorrelation.Surface(reference, n).of(moving);
        int best = 0;
        for (int i = 1; i < surface.length; i++) {
            if (surface[i] > surface[best]) {
                best = i;
            }
        }
        assertThat(best % n).isEqualTo(Math.floorMod(-dx, n));
        assertThat(best / n).isEqualTo(Math.floorMod(-dy, n));
        double[] plain = plainSurface(reference, moving, n);
        assertThat(surface[best]).isCloseTo(plain[best], within(1e-12));
    }
}
