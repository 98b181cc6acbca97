package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.recombination.SrhRecombination;

/**
 * The tabulated injection terms of the fixed-generation kernel ({@link InjectionTables}) against the straightforward
 * forms they replace: 1/τ_intr by {@link IntrinsicLifetime#rateConstantPerS} (Richter 2012 as written, with its
 * powers) and K = [(n0 + n1)/c_p + (p0 + p1)/c_n + (1/c_p + 1/c_n)·Δn]/(n0 + p0 + Δn), over both doping types and
 * 1e10–1e19 cm^-3, 200–500 K, every library defect with absolute cross-sections, and Δn over the whole range the
 * tables cover (G = 1e10–1e24 cm^-3 s^-1 times 1 ns–1 s), including values next to the table nodes and binary
 * exponent edges. The series are truncated below 1e-16, so what is left is rounding: the worst relative difference
 * must stay below 1e-14 (measured: 7.5e-16 for the rate, 5.5e-16 for K).
 */
class InjectionTablesTest {
    private static final double TOLERANCE = 1e-14;

    @Test
    void seriesMatchTheLiteralFormsOverAWideGrid() {
        SplittableRandom rnd = new SplittableRandom(20261205L);
        double worstRate = 0;
        double worstK = 0;
        int compared = 0;
        for (Defect defect : DefectLibrary.all()) {
            if (!defect.hasAbsoluteCrossSections()) {
                continue;
            }
            for (int wafer = 0; wafer < 12; wafer++) {
                double dop = Math.pow(10, 10 + 9 * rnd.nextDouble());
                Doping doping = rnd.nextBoolean() ? Doping.pType(dop) : Doping.nType(dop);
                Silicon si = Silicon.at(wafer == 0 ? 300 : 200 + 300 * rnd.nextDouble());
                double g = Math.pow(10, 10 + 14 * rnd.nextDouble());
                IntrinsicLifetime intrinsic = IntrinsicLifetime.richter2012(doping, si);
                SrhRecombination srh = SrhRecombination.of(defect, doping, si);
                double cn = srh.electronCaptureCm3PerS();
                double cp = srh.holeCaptureCm3PerS();
                double sum0 = srh.n0PerCm3() + srh.p0PerCm3();
                double ka = (srh.n0PerCm3() + srh.n1PerCm3()) / cp + (srh.p0PerCm3() + srh.p1PerCm3()) / cn;
                double kb = 1 / cp + 1 / cn;
                InjectionTables tables = new InjectionTables(intrinsic, sum0, ka, kb);
                for (int k = 0; k < 400; k++) {
                    double dn = g * Math.pow(10, -9 + 9 * rnd.nextDouble());
                    if (k % 5 == 1) { // next to a node: the mantissa on a part's midpoint or edge
                        long bits = Double.doubleToRawLongBits(dn) & ~((1L << 44) - 1);
                        dn = Double.longBitsToDouble(bits | (k % 10 == 1 ? 1L << 43 : 0));
                    }
                    if (k % 7 == 3) {
                        dn = Math.nextDown(Math.scalb(1.0, Math.getExponent(dn) + 1));
                    }
                    long bits = Double.doubleToRawLongBits(dn);
                    double[] table = tables.table(InjectionTables.exponent(bits));
                    int at = InjectionTables.nodeOffset(bits);
                    double t = InjectionTables.offset(bits);
                    double rate = InjectionTables.series(table, at, t);
                    double kFast = InjectionTables.series(table, at + InjectionTables.TERMS, t);
                    double rateLiteral = intrinsic.rateConstantPerS(dn);
                    double kLiteral = (ka + kb * dn) / (sum0 + dn);
                    worstRate = Math.max(worstRate, Math.abs(rate - rateLiteral) / rateLiteral);
                    worstK = Math.max(worstK, Math.abs(kFast - kLiteral) / kLiteral);
                    compared++;
                }
            }
        }
        assertThat(compared).isGreaterThan(10_000);
        assertThat(worstRate).as("worst relative difference of 1/tau_intr").isLessThan(TOLERANCE);
        assertThat(worstK).as("worst relative difference of K").isLessThan(TOLERANCE);
    }
}
