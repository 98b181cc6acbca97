package trapmap.physics.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.error.InvalidValueException;

/**
 * Edges of the library ranking and the DPSS that the mutation-testing run (scripts/mutation) showed untested: the
 * active bounds of the two-variable non-negative least squares, the best point of each half of the gap, the band's
 * k range, a level with τ_SRH = 0, the runner-up in the verdict, and the refusals of missing or empty input.
 */
class SpectroscopyMutationGuardTest {
    static final Silicon SI = Silicon.at(300);
    static final double[] LEVELS = {1e12, 1e13, 1e14, 1e15, 1e16};

    /** Murphy et al., JAP 111, 113709 (2012), Eq. 4: A_i and B_i of the linear form at E_t − E_i = e. */
    private static double[][] linearForm(Doping doping, double e, double[] dn) {
        double ni = SI.intrinsicPerCm3();
        double n1 = ni * Math.exp(e / SI.thermalEnergyEv());
        double p1 = ni * ni / n1;
        double n0 = doping.equilibrium(ni).electronsPerCm3();
        double p0 = doping.equilibrium(ni).holesPerCm3();
        double[][] ab = new double[2][dn.length];
        for (int i = 0; i < dn.length; i++) {
            ab[0][i] = (p0 + p1 + dn[i]) / (n0 + p0 + dn[i]);
            ab[1][i] = (n0 + n1 + dn[i]) / (n0 + p0 + dn[i]);
        }
        return ab;
    }

    private static double[] curve(double[][] ab, double tn, double tp) {
        double[] tau = new double[ab[0].length];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = tn * ab[0][i] + tp * ab[1][i];
        }
        return tau;
    }

    private static double chi2(double[][] ab, double[] tau, double u, double tn, double tp) {
        double c = 0;
        for (int i = 0; i < tau.length; i++) {
            c += Math.pow((tau[i] - tn * ab[0][i] - tp * ab[1][i]) / (u * tau[i]), 2);
        }
        return c;
    }

    private static DpssPoint at(DpssResult r, double e) {
        return r.points().stream().filter(p -> Math.abs(p.energyFromIntrinsicEv() - e) < 1e-9).findFirst()
                .orElseThrow();
    }

    @Test
    void missingOrEmptyLevelsAreRefusedWithTheField() {
        Doping doping = Doping.pType(1e16);
        assertThatThrownBy(() -> new DpssFit(doping, SI, null)).isInstanceOf(InvalidValueException.class)
                .extracting(x -> ((InvalidValueException) x).field()).isEqualTo("injection");
        assertThatThrownBy(() -> new LibraryRanking(DefectLibrary.all(), doping, SI, null))
                .isInstanceOf(InvalidValueException.class)
                .extracting(x -> ((InvalidValueException) x).field()).isEqualTo("injection");
        assertThatThrownBy(() -> LifetimeCurve.of(null, new double[] {1e-5}))
                .isInstanceOf(InvalidValueException.class)
                .extracting(x -> ((InvalidValueException) x).field()).isEqualTo("injection");
        assertThatThrownBy(() -> LifetimeCurve.of(new double[0], new double[0]))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("at least one injection level");
        assertThatThrownBy(() -> new LifetimeCurve(new double[] {1e13, 1e14, 1e15}, new double[] {1e-5, 2e-5},
                new double[] {0.03, 0.03, 0.03})).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("3 levels, 2 lifetimes, 3 uncertainties");
        assertThatThrownBy(() -> new LifetimeCurve(new double[] {1e13, 1e14}, new double[] {1e-5, 2e-5},
                new double[] {0.03})).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("2 levels, 2 lifetimes, 1 uncertainties");
    }

    // A record over arrays compares, hashes and prints their contents (java.util.Arrays), not their identities.
    @Test
    void curvesCompareByTheirValues() {
        LifetimeCurve a = LifetimeCurve.of(new double[] {1e13, 1e15}, new double[] {1e-5, 3e-5});
        LifetimeCurve b = LifetimeCurve.of(new double[] {1e13, 1e15}, new double[] {1e-5, 3e-5});
        assertThat(a).isEqualTo(b).hasSameHashCodeAs(b).isNotEqualTo("a curve");
        assertThat(a).isNotEqualTo(LifetimeCurve.of(new double[] {1e13, 1e16}, new double[] {1e-5, 3e-5}));
        assertThat(a).isNotEqualTo(LifetimeCurve.of(new double[] {1e13, 1e15}, new double[] {1e-5, 4e-5}));
        assertThat(a).isNotEqualTo(new LifetimeCurve(new double[] {1e13, 1e15}, new double[] {1e-5, 3e-5},
                new double[] {0.03, 0.05}));
        // each of the three arrays enters the hash: curves that differ in one array only hash differently here
        java.util.Set<Integer> hashes = new java.util.HashSet<>(List.of(a.hashCode(),
                LifetimeCurve.of(new double[] {1e13, 1e16}, new double[] {1e-5, 3e-5}).hashCode(),
                LifetimeCurve.of(new double[] {1e13, 1e15}, new double[] {1e-5, 4e-5}).hashCode(),
                new LifetimeCurve(new double[] {1e13, 1e15}, new double[] {1e-5, 3e-5}, new double[] {0.03, 0.05})
                        .hashCode()));
        assertThat(hashes).hasSize(4);
        assertThat(a.toString()).isEqualTo("LifetimeCurve[injectionPerCm3=[1.0E13, 1.0E15], tauSrhS=[1.0E-5, 3.0E-5],"
                + " relativeUncertainty=[0.03, 0.03]]");
        LibraryRanking r = new LibraryRanking(DefectLibrary.all(), Doping.pType(1e16), SI, LEVELS);
        assertThat(r.injectionPerCm3()).containsExactly(LEVELS);
        r.injectionPerCm3()[0] = 7;
        assertThat(r.injectionPerCm3()[0]).isEqualTo(1e12);
    }

    // The grid runs from −(E_i − E_v) to E_c − E_i in whole steps (DpssFit's class comment): when the step divides
    // E_i − E_v (or E_c − E_i) exactly, the band edge itself is on the grid.
    @Test
    void theGridReachesABandEdgeThatTheStepDivides() {
        double kt = SI.thermalEnergyEv();
        double down = kt * Math.log(SI.valenceDosPerCm3() / SI.intrinsicPerCm3());
        double up = kt * Math.log(SI.conductionDosPerCm3() / SI.intrinsicPerCm3());
        double[] g = new DpssFit(Doping.pType(1e16), SI, LEVELS, down / 40, 1, 2).gridEv();
        assertThat(g[0]).isCloseTo(-down, within(1e-12));
        assertThat(g.length).isEqualTo(40 + (int) Math.floor(up / (down / 40)) + 1);
        double[] h = new DpssFit(Doping.pType(1e16), SI, LEVELS, up / 40, 1, 2).gridEv();
        assertThat(h[h.length - 1]).isCloseTo(up, within(1e-12));
        assertThat(h.length).isEqualTo((int) Math.floor(down / (up / 40)) + 40 + 1);
    }

    // Two parameters need two usable levels, and two suffice: an exact two-level curve is fitted exactly at its level.
    @Test
    void twoUsableLevelsAreEnough() {
        Doping doping = Doping.nType(5e15);
        double[][] ab = linearForm(doping, 0.1, LEVELS);
        double[] tau = curve(ab, 2e-6, 7e-5);
        tau[0] = Double.NaN;
        tau[2] = 0;
        tau[3] = Double.POSITIVE_INFINITY;
        DpssResult r = new DpssFit(doping, SI, LEVELS, 0.01, 1, 2).fit(tau, List.of());
        assertThat(r.usableLevels()).isEqualTo(2);
        assertThat(r.points()).isNotEmpty();
        assertThat(at(r, 0.1).tauN0S()).isCloseTo(2e-6, within(2e-6 * 1e-9));
        assertThat(at(r, 0.1).tauP0S()).isCloseTo(7e-5, within(7e-5 * 1e-9));
    }

    // Lawson & Hanson, Solving Least Squares Problems (1974), ch. 23 (Kuhn–Tucker conditions): when the free
    // solution has τ_p0 < 0, the NNLS optimum is τ_p0 = 0 with the one-variable weighted least squares through the
    // origin τ_n0 = Σ(A_i/τ_i) / Σ(A_i/τ_i)² (Bevington & Robinson 2003, ch. 6), optimal because ∂χ²/∂τ_p0 ≥ 0
    // there; k = 0. The mirror case (τ_n0 < 0) gives τ_n0 = 0, τ_p0 = Σ(B_i/τ_i) / Σ(B_i/τ_i)² and k = +∞.
    @Test
    void anActiveBoundGivesTheOneVariableLeastSquares() {
        Doping doping = Doping.nType(5e15);
        double e = 0.1;
        double u = 0.03;
        double[][] ab = linearForm(doping, e, LEVELS);
        DpssFit fit = new DpssFit(doping, SI, LEVELS);
        double[] us = {u, u, u, u, u};
        for (int side = 0; side < 2; side++) {
            // side 0: τ = 1e-4 A − 1e-9 B (free τ_p0 < 0); side 1: τ = −1e-6 A + 1e-5 B (free τ_n0 < 0)
            double[] tau = side == 0 ? curve(ab, 1e-4, -1e-9) : curve(ab, -1e-6, 1e-5);
            double[] x = ab[side];
            double[] other = ab[1 - side];
            double sxy = 0;
            double sxx = 0;
            for (int i = 0; i < tau.length; i++) {
                assertThat(tau[i]).isPositive();
                sxy += x[i] / tau[i];
                sxx += Math.pow(x[i] / tau[i], 2);
            }
            double t = sxy / sxx;
            // ∂χ²/∂(other) at (t, 0): −2 Σ other_i (τ_i − t x_i)/(u τ_i)² must be ≥ 0
            double gradient = 0;
            for (int i = 0; i < tau.length; i++) {
                gradient += -2 * other[i] * (tau[i] - t * x[i]) / Math.pow(u * tau[i], 2);
            }
            assertThat(gradient).as("Kuhn-Tucker, side %d", side).isPositive();
            DpssPoint p = fit.solve(e, LEVELS, tau, us);
            double tn = side == 0 ? t : 0;
            double tp = side == 0 ? 0 : t;
            assertThat(p.tauN0S()).isCloseTo(tn, within(Math.abs(tn) * 1e-9));
            assertThat(p.tauP0S()).isCloseTo(tp, within(Math.abs(tp) * 1e-9));
            assertThat(p.chiSquared()).isCloseTo(chi2(ab, tau, u, tn, tp), within(chi2(ab, tau, u, tn, tp) * 1e-9));
            assertThat(p.chiSquared()).isGreaterThan(1e-6);
            assertThat(p.captureRatio()).isEqualTo(side == 0 ? 0.0 : Double.POSITIVE_INFINITY);
        }
    }

    // The best point of the grid and of each half is the least-χ² point there (DpssResult), the band is the runs of
    // points within Δχ² = 1 of the least χ², and its k range spans the finite positive k of its points. A curve with
    // no SRH shape (no single level fits it) has a clear minimum, and no library defect lies on it.
    @Test
    void bestPointsBandAndRatioRangeFollowTheirDefinitions() {
        Doping doping = Doping.nType(1e16);
        double[] tau = {10e-6, 12e-6, 30e-6, 80e-6, 90e-6};
        DpssResult r = new DpssFit(doping, SI, LEVELS).fit(tau, DefectLibrary.all());
        List<DpssPoint> pts = r.points();
        Comparator<DpssPoint> byChi = Comparator.comparingDouble(DpssPoint::chiSquared);
        DpssPoint best = pts.stream().min(byChi).orElseThrow();
        assertThat(best.chiSquared()).isLessThan(pts.get(0).chiSquared() - 1);
        assertThat(r.best()).isEqualTo(best);
        DpssPoint lo = pts.stream().filter(p -> p.energyFromIntrinsicEv() < 0).min(byChi).orElseThrow();
        DpssPoint hi = pts.stream().filter(p -> p.energyFromIntrinsicEv() > 0).min(byChi).orElseThrow();
        assertThat(r.bestLowerHalf()).isEqualTo(lo);
        assertThat(r.bestUpperHalf()).isEqualTo(hi);
        assertThat(lo).isNotEqualTo(pts.get(0));
        assertThat(hi).isNotEqualTo(at(r, DpssFit.DEFAULT_STEP_EV));
        double limit = best.chiSquared() + 1;
        List<double[]> band = new ArrayList<>();
        double kMin = Double.POSITIVE_INFINITY;
        double kMax = 0;
        for (int j = 0; j < pts.size(); j++) {
            DpssPoint p = pts.get(j);
            if (p.chiSquared() > limit) {
                continue;
            }
            if (j == 0 || pts.get(j - 1).chiSquared() > limit) {
                band.add(new double[] {p.energyFromIntrinsicEv(), p.energyFromIntrinsicEv()});
            }
            band.get(band.size() - 1)[1] = p.energyFromIntrinsicEv();
            if (p.captureRatio() > 0 && p.captureRatio() < Double.POSITIVE_INFINITY) {
                kMin = Math.min(kMin, p.captureRatio());
                kMax = Math.max(kMax, p.captureRatio());
            }
        }
        assertThat(r.band()).usingRecursiveFieldByFieldElementComparator().hasSameSizeAs(band);
        for (int i = 0; i < band.size(); i++) {
            assertThat(r.band().get(i)).containsExactly(band.get(i));
        }
        assertThat(r.bandRatioRange()).containsExactly(kMin, kMax);
        assertThat(r.onCurve()).isEmpty();
        assertThat(r.reason()).endsWith("; no library defect on the curve");
    }

    // An exact Fe-B curve in p-type (Rein et al. 2002): some band points lie on a bound (k = 0); the band's k range
    // counts only finite positive k, so its least k stays positive.
    @Test
    void theBandsRatioRangeLeavesOutBoundPoints() {
        Doping doping = Doping.pType(1e15);
        double[] tau = LibraryRankingTest.curve(DefectLibrary.byId("fe-b"), doping, 1e11, LEVELS);
        DpssResult r = new DpssFit(doping, SI, LEVELS).fit(tau, DefectLibrary.all());
        double limit = r.best().chiSquared() + 1;
        assertThat(r.points()).anyMatch(p -> p.chiSquared() <= limit && p.captureRatio() == 0);
        double kMin = r.points().stream().filter(p -> p.chiSquared() <= limit && p.captureRatio() > 0
                && p.captureRatio() < Double.POSITIVE_INFINITY).mapToDouble(DpssPoint::captureRatio).min()
                .orElseThrow();
        assertThat(r.bandRatioRange()[0]).isEqualTo(kMin).isPositive();
    }

    // A midgap level (E_t = E_i, n1 = p1 = n_i) in n-type with τ_p0'/τ_n0' = 1e-8, i.e. τ(Δn) = (α + βΔn)/(n0 + p0 +
    // Δn) with α = τ_n0'(p0 + n_i) + τ_p0'(n0 + n_i), β = τ_n0' + τ_p0' (Murphy et al. 2012). At a trial level the exact
    // solution is τ_p0 = (α − β p1)/(n0 + n1 − p1) (p0 ≈ 0), τ_n0 = β − τ_p0. Below E_i (p1 &gt; 1.01 n_i at every grid
    // level) α − β p1 &lt; 0, so τ_p0 &lt; 0 while n0 + n1 &gt; p1, and τ_n0 &lt; 0 beyond: the lower half cannot fit
    // exactly and its best point lies strictly below E_i, worse than E_i itself. The p-type mirror (τ_n0'/τ_p0' =
    // 1e-8) does the same for the upper half.
    @Test
    void aHalfThatCannotFitAMidgapLevelHasItsOwnBestPoint() {
        Doping n = Doping.nType(1e16);
        DpssResult r = new DpssFit(n, SI, LEVELS).fit(curve(linearForm(n, 0, LEVELS), 1e-5, 1e-13), List.of());
        assertThat(at(r, 0).chiSquared()).isLessThan(1e-20);
        assertThat(r.bestLowerHalf().energyFromIntrinsicEv()).isNegative();
        assertThat(r.bestLowerHalf().chiSquared()).isGreaterThan(1e-6);
        assertThat(r.ambiguousHalf()).isTrue();
        Doping p = Doping.pType(1e16);
        DpssResult s = new DpssFit(p, SI, LEVELS).fit(curve(linearForm(p, 0, LEVELS), 1e-13, 1e-5), List.of());
        assertThat(at(s, 0).chiSquared()).isLessThan(1e-20);
        assertThat(s.bestUpperHalf().energyFromIntrinsicEv()).isPositive();
        assertThat(s.bestUpperHalf().chiSquared()).isGreaterThan(1e-6);
    }

    // A level with τ_SRH = 0 is not finite-positive: it is left out (BELOW_LIMIT), and the fit of the other levels
    // is the one of a ranking prepared on those levels alone.
    @Test
    void aZeroLifetimeLevelIsLeftOutOfTheFit() {
        Doping doping = Doping.pType(1e16);
        Defect fei = DefectLibrary.byId("fe-i");
        double[] tau = LibraryRankingTest.curve(fei, doping, 1e11, LEVELS);
        tau[1] = 0;
        Ranking r = new LibraryRanking(List.of(fei), doping, SI, LEVELS).rank(tau);
        double[] four = {1e12, 1e14, 1e15, 1e16};
        Ranking ref = new LibraryRanking(List.of(fei), doping, SI, four)
                .rank(LibraryRankingTest.curve(fei, doping, 1e11, four));
        assertThat(r.status()).isEqualTo(RankingStatus.BELOW_LIMIT);
        assertThat(r.reason()).contains("1.00e+13 cm^-3");
        CandidateFit f = r.hint().best();
        assertThat(f.ntPerCm3()).isCloseTo(1e11, within(1e11 * 1e-9));
        assertThat(f.ntPerCm3()).isCloseTo(ref.hint().best().ntPerCm3(), within(1e11 * 1e-12));
        assertThat(f.chiSquared()).isLessThan(1e-18);
        assertThat(f.degreesOfFreedom()).isEqualTo(3);
    }

    // The defect hint: runner-up and χ² ratio (second least χ² over the least) in the verdict.
    @Test
    void theVerdictNamesTheRunnerUpAndTheRatio() {
        Doping doping = Doping.pType(1e16);
        Defect fei = DefectLibrary.byId("fe-i");
        Defect cri = DefectLibrary.byId("cr-i");
        double[] tau = LibraryRankingTest.curve(fei, doping, 1e11, LEVELS);
        tau[2] *= 1.02;
        Ranking r = new LibraryRanking(List.of(cri, fei), doping, SI, LEVELS).rank(tau);
        CandidateFit best = r.candidates().stream().filter(c -> c.id().equals("fe-i")).findFirst().orElseThrow();
        CandidateFit second = r.candidates().stream().filter(c -> c.id().equals("cr-i")).findFirst().orElseThrow();
        assertThat(best.chiSquared()).isPositive().isLessThan(second.chiSquared());
        assertThat(r.hint().best()).isEqualTo(best);
        assertThat(r.hint().runnerUp()).isEqualTo(second);
        assertThat(r.hint().chiSquaredRatio()).isCloseTo(second.chiSquared() / best.chiSquared(),
                within(1e-9 * second.chiSquared() / best.chiSquared()));
        assertThat(r.reason()).contains("; runner-up cr-i (chi2 ratio ");
        Ranking alone = new LibraryRanking(List.of(fei), doping, SI, LEVELS).rank(tau);
        assertThat(alone.hint().runnerUp()).isNull();
        assertThat(alone.hint().chiSquaredRatio()).isNaN();
        assertThat(alone.reason()).doesNotContain("runner-up");
    }

    // NO_SINGLE_DEFECT names the left-out levels only when some are left out.
    @Test
    void noSingleDefectNamesLeftOutLevelsOnlyWhenThereAreAny() {
        Doping doping = Doping.pType(1e16);
        double[] a = LibraryRankingTest.curve(DefectLibrary.byId("fe-i"), doping, 1e11, LEVELS);
        double[] b = LibraryRankingTest.curve(DefectLibrary.byId("fe-b"), doping, 3e11, LEVELS);
        double[] tau = new double[LEVELS.length];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = 1 / (1 / a[i] + 1 / b[i]);
        }
        LibraryRanking ranking = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS);
        Ranking all = ranking.rank(tau);
        assertThat(all.status()).isEqualTo(RankingStatus.NO_SINGLE_DEFECT);
        assertThat(all.reason()).doesNotContain("left out").doesNotContain("not finite");
        tau[0] = Double.NaN;
        Ranking four = ranking.rank(tau);
        assertThat(four.status()).isEqualTo(RankingStatus.NO_SINGLE_DEFECT);
        assertThat(four.reason()).contains("; tau_SRH is not finite and positive at 1.00e+12 cm^-3 (left out)");
    }
}
