package trapmap.viewer.graphics;

import java.util.ArrayList;
import java.util.List;

/**
 * Tick values of a base-10 logarithmic scale, the one choice used by the charts' log axes
 * ({@link ChartStyle#logAxis}) and the map colour bar: 1, 2 and 5 × 10^k (10, 20, 50, 100, 200, 500 …) when they fit,
 * else whole decades (every second, third … decade when even those are too many). A range too narrow to hold two of
 * the 1-2-5 values gets round linear steps (1, 2 or 5 × 10^k apart) instead, e.g. 150, 200, 250 … 400.
 */
public final class LogTicks {
    private LogTicks() {
    }

    /**
     * The ticks inside [low, high], ascending, at most {@code maxTicks} of them.
     *
     * @throws IllegalArgumentException unless 0 &lt; low ≤ high and both finite, or when maxTicks &lt; 1
     */
    public static double[] ticks(double low, double high, int maxTicks) {
        if (!(low > 0) || !(high >= low) || !Double.isFinite(high) || maxTicks < 1) {
            throw new IllegalArgumentException("log ticks need 0 < low <= high and maxTicks >= 1 but were low "
                    + low + ", high " + high + ", maxTicks " + maxTicks);
        }
        int e0 = (int) Math.floor(Math.log10(low) + 1e-9);
        int e1 = (int) Math.floor(Math.log10(high) + 1e-9);
        List<Double> oneTwoFive = new ArrayList<>();
        for (int e = e0; e <= e1; e++) {
            for (int m : new int[] {1, 2, 5}) {
                double v = round(m, e);
                if (v >= low * (1 - 1e-9) && v <= high * (1 + 1e-9)) {
                    oneTwoFive.add(v);
                }
            }
        }
        if (oneTwoFive.size() < 2) {
            return linear(low, high, maxTicks);
        }
        if (oneTwoFive.size() <= maxTicks) {
            return toArray(oneTwoFive);
        }
        int first = (int) Math.ceil(Math.log10(low) - 1e-9);
        int decades = e1 - first + 1;
        int every = (decades + maxTicks - 1) / maxTicks;
        List<Double> t = new ArrayList<>();
        for (int e = first; e <= e1; e += every) {
            t.add(round(1, e));
        }
        return toArray(t);
    }

    /** m × 10^e as the nearest double to the decimal value (so that 2 × 10⁻³ is 0.002 exactly as parsed). */
    private static double round(int m, int e) {
        return Double.parseDouble(m + "e" + e);
    }

    /** Multiples of a 1, 2 or 5 × 10^k step inside [low, high], at most {@code maxTicks}. */
    public static double[] linear(double low, double high, int maxTicks) {
        if (high == low) {
            return new double[] {low};
        }
        double step = niceStep((high - low) / Math.max(1, maxTicks - 1));
        while (true) {
            long first = (long) Math.ceil(low / step - 1e-9);
            long last = (long) Math.floor(high / step + 1e-9);
            if (last - first + 1 <= maxTicks) {
                double[] t = new double[(int) Math.max(0, last - first + 1)];
                double scale = Math.pow(10, Math.max(0, -Math.floor(Math.log10(step) + 1e-9)));
                for (int i = 0; i < t.length; i++) {
                    // whole numbers of the step's last decimal, divided once, so 3 × 0.1 gives 0.3; never -0
                    double v = Math.round((first + i) * step * scale) / scale;
                    t[i] = v == 0 ? 0 : v;
                }
                return t;
            }
            step = niceStep(step * 1.5);
        }
    }

    /** The smallest 1, 2 or 5 × 10^k not below {@code v}. */
    static double niceStep(double v) {
        double p = Math.pow(10, Math.floor(Math.log10(v)));
        double m = v / p;
        double n = m <= 1 + 1e-9 ? 1 : m <= 2 + 1e-9 ? 2 : m <= 5 + 1e-9 ? 5 : 10;
        return n * p;
    }

    private static double[] toArray(List<Double> t) {
        return t.stream().mapToDouble(Double::doubleValue).toArray();
    }
}
