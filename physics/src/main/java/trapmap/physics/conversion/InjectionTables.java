package trapmap.physics.conversion;

import java.util.Arrays;
import java.util.concurrent.atomic.AtomicReference;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.shared.units.Units;

/**
 * The two injection-dependent terms of the kernel for fixed generation, 1/τ_intr(Δn) and K(Δn) = (a + b·Δn)/(n0 +
 * p0 + Δn), as tables of short Taylor series, so that a pixel costs a table look-up and two polynomials instead of
 * three powers, two square roots and two divisions. With Δn = 2^e·m, m ∈ [1, 2), and c_j the midpoint of the one of
 * 256 equal parts of [1, 2) that holds m:
 * <pre>
 * Δn = x_j (1 + t),  x_j = 2^e·c_j,  t = (m − c_j)/c_j,  |t| &lt; 2^-9
 * f(Δn) = Σ_k f_k,j t^k,  k = 0 … 5   (the Taylor coefficients of f around x_j in t)
 * </pre>
 * The coefficients of 1/τ_intr are {@link IntrinsicLifetime#rateSeries}; those of K follow from
 * 1/(n0 + p0 + x (1 + t)) = (1/c)·Σ (−u)^k t^k, c = n0 + p0 + x, u = x/c. Both series converge for |t| of order 1,
 * so at |t| ≤ 2^-9 the six terms leave a truncation below 1e-16 relative: like the literal forms, the results carry
 * only rounding (a few units in the last place). The table of one binary exponent e (256 nodes × 12 coefficients,
 * 24 KiB) is built the first time a Δn of that exponent comes (a map of lifetimes over three decades touches about
 * ten); a part is built once, under the lock, and published through a final field, so every thread reads the same
 * numbers. Thread-safe.
 */
final class InjectionTables {
    /** Terms of each series (degree 5). */
    static final int TERMS = 6;
    /** Coefficients per node: the rate's, then K's. */
    static final int STRIDE = 2 * TERMS;
    private static final int NODE_BITS = 8;
    private static final int NODES = 1 << NODE_BITS;
    private static final long MANTISSA = 0x000F_FFFF_FFFF_FFFFL;
    private static final long EXPONENT_OF_ONE = 0x3FF0_0000_0000_0000L;
    /** Biased exponent of infinities and NaN: no table. */
    static final int NOT_FINITE = 0x7FF;
    private static final double[] NODE = new double[NODES];
    private static final double[] INVERSE_NODE = new double[NODES];

    static {
        for (int j = 0; j < NODES; j++) {
            NODE[j] = 1 + (j + 0.5) / NODES;
            INVERSE_NODE[j] = 1 / NODE[j];
        }
    }

    private final IntrinsicLifetime intrinsic;
    /** n0 + p0 of K's denominator, cm^-3. */
    private final double sumN0P0;
    private final double kA;
    private final double kB;
    /**
     * By biased exponent: 256 × {@link #STRIDE} coefficients, or null until first needed. Read without
     * synchronisation: a part is immutable and reached through its final field, so a thread that sees the part
     * sees its coefficients (Java memory model, final-field semantics); one that sees null builds or waits.
     */
    private final Part[] parts = new Part[NOT_FINITE];

    /** Everything the tables depend on: {@link IntrinsicLifetime#seriesParameters()}, n0 + p0, a and b of K. */
    private final double[] key;
    /**
     * The tables made last, shared by the next converter of the same wafer and defect (a command's warm-up and its
     * conversion, the bands of a map), so that their parts are built once per process: building is slow before the
     * compiler has compiled it.
     */
    private static final AtomicReference<InjectionTables> LAST = new AtomicReference<>();

    InjectionTables(IntrinsicLifetime intrinsic, double sumN0P0, double kA, double kB) {
        this.intrinsic = intrinsic;
        this.sumN0P0 = sumN0P0;
        this.kA = kA;
        this.kB = kB;
        double[] p = intrinsic.seriesParameters();
        this.key = Arrays.copyOf(p, p.length + 3);
        key[p.length] = sumN0P0;
        key[p.length + 1] = kA;
        key[p.length + 2] = kB;
    }

    /**
     * The tables for these terms: those made last when they depend on the same numbers (bit for bit, so their
     * coefficients are the same), else new ones.
     */
    static InjectionTables of(IntrinsicLifetime intrinsic, double sumN0P0, double kA, double kB) {
        InjectionTables made = new InjectionTables(intrinsic, sumN0P0, kA, kB);
        InjectionTables last = LAST.get();
        if (last != null && Arrays.equals(last.key, made.key)) {
            return last;
        }
        LAST.set(made);
        return made;
    }

    /** The biased binary exponent of a positive double's bits (1 … 2046 for normal finite values). */
    static int exponent(long bits) {
        return (int) (bits >>> 52);
    }

    /** The offset in the table of an exponent of the node that holds the mantissa of {@code bits}. */
    static int nodeOffset(long bits) {
        return ((int) (bits >>> (52 - NODE_BITS)) & (NODES - 1)) * STRIDE;
    }

    /** t = (m − c_j)/c_j of a positive normal double's bits (m − c_j is exact). */
    static double offset(long bits) {
        int j = (int) (bits >>> (52 - NODE_BITS)) & (NODES - 1);
        double m = Double.longBitsToDouble((bits & MANTISSA) | EXPONENT_OF_ONE);
        return (m - NODE[j]) * INVERSE_NODE[j];
    }

    /**
     * Σ c[at + k]·t^k, k = 0 … 5, by Estrin's scheme with fused multiply–adds (three levels instead of Horner's five
     * dependent steps).
     */
    static double series(double[] c, int at, double t) {
        double t2 = t * t;
        double low = Math.fma(t, c[at + 1], c[at]);
        double mid = Math.fma(t, c[at + 3], c[at + 2]);
        double high = Math.fma(t, c[at + 5], c[at + 4]);
        return Math.fma(t2, Math.fma(t2, high, mid), low);
    }

    /** The coefficients of one binary exponent: immutable once built, reached through a final field. */
    private static final class Part {
        final double[] c;

        Part(double[] c) {
            this.c = c;
        }
    }

    /**
     * The table of the biased exponent {@code e}, which must have been built ({@link #prepare}): for loops that keep
     * the building and its test out of their body.
     */
    double[] built(int e) {
        return parts[e].c;
    }

    /**
     * Builds the tables of every Δn = {@code generation}·τ for the lifetimes τ (µs) of {@code tau[from, to)}
     * that the kernel converts (τ ≥ {@code floorUs}, finite): those of the exponents from the smallest Δn's to the
     * largest's, since Δn rounds monotonically with τ.
     */
    void prepare(float[] tau, int from, int to, double generation, double floorUs) {
        float lo = Float.POSITIVE_INFINITY;
        float hi = 0;
        for (int i = from; i < to; i++) {
            float t = tau[i];
            if (t >= floorUs && t < lo) {
                lo = t;
            }
            if (t > hi && t != Float.POSITIVE_INFINITY) {
                hi = t;
            }
        }
        if (hi < floorUs) {
            return; // nothing converted
        }
        int first = exponent(Double.doubleToRawLongBits(generation * (lo * Units.S_PER_US)));
        int last = exponent(Double.doubleToRawLongBits(generation * (hi * Units.S_PER_US)));
        for (int e = first; e <= last && e < NOT_FINITE; e++) {
            if (parts[e] == null) {
                table(e);
            }
        }
    }

    /** The table of the biased exponent {@code e} (1 … 2046), built on first use. */
    double[] table(int e) {
        Part p = parts[e];
        return p != null ? p.c : build(e);
    }

    private synchronized double[] build(int e) {
        if (parts[e] != null) {
            return parts[e].c;
        }
        double[] t = new double[NODES * STRIDE];
        double scale = Math.scalb(1.0, e - 1023);
        for (int j = 0; j < NODES; j++) {
            double x = scale * NODE[j]; // exact: a power of two times a node
            int at = j * STRIDE;
            intrinsic.rateSeries(x, t, at, TERMS);
            // K = (a + b x + b x t)/(c (1 + u t)) = Σ [(a + b x)(−u)^k + b x (−u)^(k−1)]/c · t^k
            double c = sumN0P0 + x;
            double u = x / c;
            double num0 = kA + kB * x;
            double num1 = kB * x;
            double power = 1; // (−u)^k
            double previous = 0; // (−u)^(k−1)
            for (int k = 0; k < TERMS; k++) {
                t[at + TERMS + k] = (num0 * power + num1 * previous) / c;
                previous = power;
                power *= -u;
            }
        }
        parts[e] = new Part(t);
        return t;
    }
}
