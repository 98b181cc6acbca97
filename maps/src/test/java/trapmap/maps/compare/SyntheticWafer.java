package trapmap.maps.compare;

import java.util.Random;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/**
 * A seeded, made-up multicrystalline wafer: a lifetime field (µs) defined analytically in wafer coordinates (mm), so
 * that a map of it can be drawn on any grid and under any known placement without resampling errors. Grains with
 * their own lifetime level, darker grain boundaries, dislocation clusters and a one-sided edge zone make it
 * asymmetric, so every mirror and quarter turn gives a different map.
 */
final class SyntheticWafer {
    private final double radiusMm;
    private final double[] seedX;
    private final double[] seedY;
    private final double[] grainLog;
    private final double[] blobX;
    private final double[] blobY;
    private final double[] blobSigma;
    private final double[] blobDepth;
    private final double edgeAngle;

    private SyntheticWafer(long seed, double radiusMm, int grains, int blobs) {
        this.radiusMm = radiusMm;
        Random r = new Random(seed);
        seedX = new double[grains];
        seedY = new double[grains];
        grainLog = new double[grains];
        for (int i = 0; i < grains; i++) {
            double a = 2 * Math.PI * r.nextDouble();
            double d = 1.1 * radiusMm * Math.sqrt(r.nextDouble());
            seedX[i] = d * Math.cos(a);
            seedY[i] = d * Math.sin(a);
            grainLog[i] = Math.log(60) + 0.5 * r.nextGaussian();
        }
        blobX = new double[blobs];
        blobY = new double[blobs];
        blobSigma = new double[blobs];
        blobDepth = new double[blobs];
        for (int i = 0; i < blobs; i++) {
            double a = 2 * Math.PI * r.nextDouble();
            double d = radiusMm * Math.sqrt(r.nextDouble());
            blobX[i] = d * Math.cos(a);
            blobY[i] = d * Math.sin(a);
            blobSigma[i] = 1.5 + 4 * r.nextDouble();
            blobDepth[i] = 0.4 + 0.5 * r.nextDouble();
        }
        edgeAngle = 2 * Math.PI * r.nextDouble();
    }

    /** About 60 grains and 15 clusters on a wafer of {@code radiusMm}. */
    static SyntheticWafer random(long seed, double radiusMm) {
        return new SyntheticWafer(seed, radiusMm, 60, 15);
    }

    double radiusMm() {
        return radiusMm;
    }

    /** Lifetime at (x, y) mm, µs; NaN off the wafer. */
    double lifetimeUs(double x, double y) {
        double rr = x * x + y * y;
        if (rr > radiusMm * radiusMm) {
            return Double.NaN;
        }
        int n1 = -1;
        int n2 = -1;
        double d1 = Double.MAX_VALUE;
        double d2 = Double.MAX_VALUE;
        for (int i = 0; i < seedX.length; i++) {
            double dx = x - seedX[i];
            double dy = y - seedY[i];
            double d = dx * dx + dy * dy;
            if (d < d1) {
                d2 = d1;
                n2 = n1;
                d1 = d;
                n1 = i;
            } else if (d < d2) {
                d2 = d;
                n2 = i;
            }
        }
        double tauLog = grainLog[n1];
        double sep = Math.hypot(seedX[n1] - seedX[n2], seedY[n1] - seedY[n2]);
        double toBoundary = (d2 - d1) / (2 * sep);
        tauLog += Math.log(1 - 0.5 * Math.exp(-toBoundary / 0.4));
        for (int i = 0; i < blobX.length; i++) {
            double dx = x - blobX[i];
            double dy = y - blobY[i];
            tauLog += Math.log(1 - blobDepth[i] * Math.exp(-(dx * dx + dy * dy) / (2 * blobSigma[i] * blobSigma[i])));
        }
        double r = Math.sqrt(rr);
        double side = 0.5 * (1 + Math.cos(Math.atan2(y, x) - edgeAngle));
        tauLog += Math.log(1 - 0.7 * side * Math.exp(-(radiusMm - r) / 6));
        return Math.exp(tauLog);
    }

    /** The wafer drawn on {@code grid} (point samples, no noise). */
    WaferMap before(PixelGrid grid) {
        return before(grid, 0, 0);
    }

    /** The wafer drawn on {@code grid} with multiplicative noise of relative standard deviation {@code noise}. */
    WaferMap before(PixelGrid grid, double noise, long noiseSeed) {
        return draw(grid, Registration.identity(), 1, noise, noiseSeed, "before");
    }

    /**
     * The wafer after a made-up gettering step, drawn by a tool whose map is placed on the before map by
     * {@code truth}: lifetime × {@code gain} with a smooth ±15 % non-uniformity, and multiplicative noise of
     * relative standard deviation {@code noise}.
     */
    WaferMap after(PixelGrid grid, Registration truth, double gain, double noise, long noiseSeed) {
        return draw(grid, truth, gain, noise, noiseSeed, "after");
    }

    private WaferMap draw(PixelGrid grid, Registration truth, double gain, double noise, long noiseSeed,
                          String name) {
        Random r = new Random(noiseSeed);
        float[] s = new float[grid.width() * grid.height()];
        for (int y = 0; y < grid.height(); y++) {
            for (int x = 0; x < grid.width(); x++) {
                double[] p = truth.toBeforeMm(grid.xMm(x), grid.yMm(y));
                double tau = lifetimeUs(p[0], p[1]);
                if (gain != 1) {
                    tau *= gain * Math.exp(0.15 * Math.sin(p[0] / 23) * Math.cos(p[1] / 31));
                }
                if (noise > 0) {
                    tau *= Math.exp(noise * r.nextGaussian());
                }
                s[y * grid.width() + x] = (float) tau;
            }
        }
        return new WaferMap(FloatRaster.wrap(grid.width(), grid.height(), s), grid, Quantity.EFFECTIVE_LIFETIME,
                name, MeasurementConditions.UNKNOWN, Provenance.of("synthetic " + name));
    }
}
