package trapmap.maps.stats;

import java.util.Arrays;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Histogram of the samples of a map inside a mask, with linear or logarithmic bins. Lifetimes and trap densities
 * span decades, so logarithmic bins (equal width in log x) are the usual choice for them.
 *
 * <p>Bin i holds edges[i] ≤ x &lt; edges[i+1]; the last bin also holds x = max. Values below the first edge are
 * underflow, above the last edge overflow; in a logarithmic histogram every value ≤ 0 is underflow. NaN pixels are
 * not counted. Fractions are of all counted pixels, underflow and overflow included, so they add up to 1.
 */
public final class Histogram {

    /** How the bin edges are spaced. */
    public enum Spacing {
        /** Equal widths in x. */
        LINEAR,
        /** Equal widths in log x (edges in geometric progression). */
        LOGARITHMIC
    }

    /**
     * Bin layout.
     *
     * @param spacing  linear or logarithmic
     * @param minValue lower edge of the first bin, in the unit of the map (&gt; 0 for logarithmic bins)
     * @param maxValue upper edge of the last bin
     * @param binCount number of bins (≥ 1)
     */
    public record Binning(Spacing spacing, double minValue, double maxValue, int binCount) {
        public Binning {
            Checks.notNull(spacing, "spacing");
            Checks.finite(minValue, "histogramMin", "");
            Checks.finite(maxValue, "histogramMax", "");
            if (!(maxValue > minValue)) {
                throw new InvalidValueException("histogramMax", "", "histogramMax must be > histogramMin "
                        + minValue + " but was " + maxValue);
            }
            if (spacing == Spacing.LOGARITHMIC) {
                Checks.positive(minValue, "histogramMin", "");
            }
            if (binCount < 1) {
                throw new InvalidValueException("binCount", "", "binCount must be >= 1 but was " + binCount);
            }
        }

        public static Binning linear(double minValue, double maxValue, int binCount) {
            return new Binning(Spacing.LINEAR, minValue, maxValue, binCount);
        }

        public static Binning logarithmic(double minValue, double maxValue, int binCount) {
            return new Binning(Spacing.LOGARITHMIC, minValue, maxValue, binCount);
        }

        /** Logarithmic bins, {@code binsPerDecade} of them per factor of ten (rounded to whole bins overall). */
        public static Binning logDecades(double minValue, double maxValue, int binsPerDecade) {
            Checks.positive(minValue, "histogramMin", "");
            Checks.positive(binsPerDecade, "binsPerDecade", "");
            int bins = (int) Math.max(1, Math.round(Math.log10(maxValue / minValue) * binsPerDecade));
            return logarithmic(minValue, maxValue, bins);
        }

        /** The binCount + 1 edges, first = minValue and last = maxValue exactly. */
        public double[] edges() {
            double[] e = new double[binCount + 1];
            if (spacing == Spacing.LINEAR) {
                double width = (maxValue - minValue) / binCount;
                for (int i = 0; i <= binCount; i++) {
                    e[i] = minValue + i * width;
                }
            } else {
                // powers of ten so that decade edges (1, 10, 100 …) come out exact
                double lo = Math.log10(minValue);
                double step = (Math.log10(maxValue) - lo) / binCount;
                for (int i = 0; i <= binCount; i++) {
                    e[i] = Math.pow(10, lo + i * step);
                }
            }
            e[0] = minValue;
            e[binCount] = maxValue;
            return e;
        }
    }

    private final Binning binning;
    private final double[] edges;
    private final long[] counts;
    private final long underflow;
    private final long overflow;
    private final double pixelAreaMm2;

    private Histogram(Binning binning, double[] edges, long[] counts, long underflow, long overflow,
                      double pixelAreaMm2) {
        this.binning = binning;
        this.edges = edges;
        this.counts = counts;
        this.underflow = underflow;
        this.overflow = overflow;
        this.pixelAreaMm2 = pixelAreaMm2;
    }

    /** Histogram of a map over {@code mask} (null: the whole map). */
    public static Histogram of(WaferMap map, Mask mask, Binning binning) {
        Checks.notNull(map, "map");
        return of(map.raster(), mask, map.grid(), binning);
    }

    /** Histogram of {@code raster} over {@code mask} (null: every pixel); {@code grid} gives the pixel area. */
    public static Histogram of(FloatRaster raster, Mask mask, PixelGrid grid, Binning binning) {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        Checks.notNull(binning, "binning");
        MapStatistics.checkSizes(raster, mask, grid);
        double[] e = binning.edges();
        int nb = binning.binCount();
        boolean log = binning.spacing() == Spacing.LOGARITHMIC;
        double origin = log ? Math.log10(binning.minValue()) : binning.minValue();
        double width = ((log ? Math.log10(binning.maxValue()) : binning.maxValue()) - origin) / nb;
        double lowest = e[0];
        double highest = e[nb];
        long[] c = new long[nb];
        long under = 0;
        long over = 0;
        float[] s = raster.samples();
        int i = mask == null ? 0 : mask.nextIndex(0);
        while (i >= 0 && i < s.length) {
            float f = s[i];
            if (f == f) {
                double v = f;
                if (v < lowest) {
                    under++;
                } else if (v > highest) {
                    over++;
                } else {
                    int b = (int) (((log ? Math.log10(v) : v) - origin) / width);
                    b = Math.max(0, Math.min(nb - 1, b));
                    // rounding of the quotient may land one bin off: settle against the edges themselves
                    while (b > 0 && v < e[b]) {
                        b--;
                    }
                    while (b < nb - 1 && v >= e[b + 1]) {
                        b++;
                    }
                    c[b]++;
                }
            }
            i = mask == null ? i + 1 : mask.nextIndex(i + 1);
        }
        return new Histogram(binning, e, c, under, over, grid.pixelAreaMm2());
    }

    public Binning binning() {
        return binning;
    }

    public int binCount() {
        return counts.length;
    }

    /** The binCount + 1 bin edges (a copy). */
    public double[] edges() {
        return edges.clone();
    }

    /** Pixels per bin (a copy). */
    public long[] counts() {
        return counts.clone();
    }

    public long count(int bin) {
        return counts[bin];
    }

    /** Pixels below the first edge (and, for logarithmic bins, every value ≤ 0). */
    public long underflow() {
        return underflow;
    }

    /** Pixels above the last edge. */
    public long overflow() {
        return overflow;
    }

    /** All counted pixels: bins, underflow and overflow. */
    public long total() {
        return Arrays.stream(counts).sum() + underflow + overflow;
    }

    /** Fraction of the counted area in {@code bin}. */
    public double areaFraction(int bin) {
        return fraction(counts[bin]);
    }

    /** Area in {@code bin}, mm². */
    public double areaMm2(int bin) {
        return counts[bin] * pixelAreaMm2;
    }

    public double underflowFraction() {
        return fraction(underflow);
    }

    public double overflowFraction() {
        return fraction(overflow);
    }

    /** Fraction of the counted area at or below the upper edge of {@code bin} (underflow included): the CDF. */
    public double cumulativeFraction(int bin) {
        long sum = underflow;
        for (int b = 0; b <= bin; b++) {
            sum += counts[b];
        }
        return fraction(sum);
    }

    /** Geometric centre of a logarithmic bin, arithmetic centre of a linear one. */
    public double binCentre(int bin) {
        return binning.spacing() == Spacing.LOGARITHMIC ? Math.sqrt(edges[bin] * edges[bin + 1])
                : (edges[bin] + edges[bin + 1]) / 2;
    }

    private double fraction(long n) {
        long t = total();
        return t == 0 ? Double.NaN : (double) n / t;
    }
}
