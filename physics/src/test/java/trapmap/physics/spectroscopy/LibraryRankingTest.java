package trapmap.physics.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.shared.error.InvalidValueException;

/**
 * Library ranking of τ_SRH(Δn) curves (docs/check-values.md R-ID-1 to R-ID-6): exact synthetic curves of the
 * library's defects from the SRH equation (Shockley &amp; Read 1952, Hall 1952), the weighted least-squares fit
 * through the origin (Bevington &amp; Robinson 2003, ch. 6) and χ² p-values against Commons Math.
 */
class LibraryRankingTest {
    static final Silicon SI = Silicon.at(300);
    static final double[] LEVELS = {1e12, 1e13, 1e14, 1e15, 1e16};

    static double[] curve(Defect d, Doping doping, double nt, double[] dn) {
        SrhRecombination srh = SrhRecombination.of(d, doping, SI);
        double[] t = new double[dn.length];
        for (int i = 0; i < dn.length; i++) {
            t[i] = srh.lifetimeS(dn[i], nt);
        }
        return t;
    }

    static List<Defect> withSigma() {
        return DefectLibrary.all().stream().filter(Defect::hasAbsoluteCrossSections).toList();
    }

    // R-ID-1: exact curve of each library defect (SRH equation, Shockley & Read 1952): N_t to 1e-9, rank 1, χ² ≈ 0
    @ParameterizedTest
    @ValueSource(strings = {"p:1e15", "p:1e16", "n:1e15", "n:1e16"})
    void exactCurvesRecoverDensityAndRankThePlantedDefectFirst(String dop) {
        Doping doping = Doping.parse(dop);
        LibraryRanking r = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS);
        for (Defect d : withSigma()) {
            Ranking k = r.rank(curve(d, doping, 3.7e11, LEVELS));
            CandidateFit best = k.hint().best();
            assertThat(best.id()).as(d.id() + " in " + dop).isEqualTo(d.id());
            assertThat(best.ntPerCm3()).isCloseTo(3.7e11, within(3.7e11 * 1e-9));
            assertThat(best.chiSquared()).isLessThan(1e-18);
            assertThat(best.pValue()).isCloseTo(1.0, within(1e-9));
            assertThat(best.degreesOfFreedom()).isEqualTo(LEVELS.length - 1);
            assertThat(k.status()).isEqualTo(RankingStatus.OK);
            assertThat(k.hint().chiSquaredRatio()).isGreaterThan(1e6);
            assertThat(k.reason()).startsWith(d.id() + " fits best");
        }
    }

    // R-ID-2: WLS through the origin by hand (Bevington & Robinson 2003, ch. 6): N = Σwcy/Σwc², σ = 1/sqrt(Σwc²)
    @Test
    void twoLevelFitMatchesTheHandFormula() {
        Doping doping = Doping.pType(1e16);
        Defect fei = DefectLibrary.byId("fe-i");
        double[] dn = {1e13, 1e15};
        double[] tau = {20e-6, 60e-6};
        double[] u = {0.02, 0.05};
        SrhRecombination srh = SrhRecombination.of(fei, doping, SI);
        double c0 = srh.ratePerTrapCm3PerS(dn[0]);
        double c1 = srh.ratePerTrapCm3PerS(dn[1]);
        double w0 = Math.pow(0.02 / 20e-6, -2);
        double w1 = Math.pow(0.05 / 60e-6, -2);
        double scc = w0 * c0 * c0 + w1 * c1 * c1;
        double nt = (w0 * c0 / 20e-6 + w1 * c1 / 60e-6) / scc;
        double chi2 = w0 * Math.pow(1 / 20e-6 - nt * c0, 2) + w1 * Math.pow(1 / 60e-6 - nt * c1, 2);
        CandidateFit f = new LibraryRanking(List.of(fei), doping, SI, dn).rank(tau, u).hint().best();
        assertThat(f.ntPerCm3()).isCloseTo(nt, within(nt * 1e-12));
        assertThat(f.standardErrorPerCm3()).isCloseTo(1 / Math.sqrt(scc), within(1e-12 / Math.sqrt(scc)));
        assertThat(f.lowerPerCm3()).isCloseTo(nt - 1.959963984540054 / Math.sqrt(scc), within(nt * 1e-12));
        assertThat(f.upperPerCm3()).isCloseTo(nt + 1.959963984540054 / Math.sqrt(scc), within(nt * 1e-12));
        assertThat(f.chiSquared()).isCloseTo(chi2, within(chi2 * 1e-9));
        assertThat(chi2).isGreaterThan(1);
        // ν = 1: p = erfc(sqrt(χ²/2)) = 2(1 − Φ(sqrt χ²)) (Abramowitz & Stegun 1964, 26.4.4 with 26.2.2)
        double p = org.apache.commons.math3.special.Erf.erfc(Math.sqrt(chi2 / 2));
        assertThat(f.pValue()).isCloseTo(p, within(1e-9));
    }

    // R-ID-3: p-value of a hand-computed χ² against Commons Math directly, and ν = 2: Q = exp(−χ²/2) (A&S 26.4.21)
    @Test
    void pValueAgreesWithCommonsMathForAHandComputedChiSquared() {
        Doping doping = Doping.pType(1e15);
        Defect feb = DefectLibrary.byId("fe-b");
        double[] dn = {1e12, 1e14, 1e16};
        double[] tau = curve(feb, doping, 1e11, dn);
        tau[1] *= 1.05; // one level 5 % off at 3 % uncertainty
        SrhRecombination srh = SrhRecombination.of(feb, doping, SI);
        double scc = 0;
        double scy = 0;
        for (int i = 0; i < 3; i++) {
            double c = srh.ratePerTrapCm3PerS(dn[i]);
            double w = Math.pow(0.03 / tau[i], -2);
            scc += w * c * c;
            scy += w * c / tau[i];
        }
        double nt = scy / scc;
        double chi2 = 0;
        for (int i = 0; i < 3; i++) {
            chi2 += Math.pow((1 / tau[i] - nt * srh.ratePerTrapCm3PerS(dn[i])) / (0.03 / tau[i]), 2);
        }
        CandidateFit f = new LibraryRanking(List.of(feb), doping, SI, dn).rank(tau).hint().best();
        assertThat(f.chiSquared()).isCloseTo(chi2, within(chi2 * 1e-9));
        assertThat(f.degreesOfFreedom()).isEqualTo(2);
        assertThat(f.pValue()).isCloseTo(1 - new ChiSquaredDistribution(2).cumulativeProbability(chi2), within(1e-12));
        assertThat(f.pValue()).isCloseTo(Math.exp(-chi2 / 2), within(1e-9));
        assertThat(f.pValue()).isBetween(0.01, 0.99);
    }

    @Test
    void levelsWithoutFiniteLifetimeAreLeftOutAndReported() {
        Doping doping = Doping.pType(1e16);
        Defect fei = DefectLibrary.byId("fe-i");
        double[] tau = curve(fei, doping, 1e11, LEVELS);
        tau[4] = Double.POSITIVE_INFINITY;
        tau[0] = -1e-6;
        Ranking r = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS).rank(tau);
        assertThat(r.status()).isEqualTo(RankingStatus.BELOW_LIMIT);
        assertThat(r.usableLevels()).isEqualTo(3);
        assertThat(r.reason()).contains("1.00e+12, 1.00e+16 cm^-3").contains("other 3 levels").contains("fe-i fits best");
        assertThat(r.hint().best().id()).isEqualTo("fe-i");
        assertThat(r.hint().best().degreesOfFreedom()).isEqualTo(2);
        assertThat(r.hint().best().ntPerCm3()).isCloseTo(1e11, within(1e11 * 1e-9));
    }

    @Test
    void fewerThanTwoUsableLevelsRankNothing() {
        Doping doping = Doping.pType(1e16);
        double[] tau = {Double.NaN, 1e-5, 0, Double.NaN, Double.POSITIVE_INFINITY};
        Ranking r = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS).rank(tau);
        assertThat(r.status()).isEqualTo(RankingStatus.TOO_FEW_LEVELS);
        assertThat(r.hint()).isNull();
        assertThat(r.reason()).contains("only 1 of 5 levels has");
        assertThat(r.candidates()).noneMatch(CandidateFit::fitted).hasSize(DefectLibrary.all().size());
    }

    // Two defects at once (rates add, Rein 2005 ch. 5): no single library defect fits at 3 %
    @Test
    void aTwoDefectCurveIsNoSingleDefect() {
        Doping doping = Doping.pType(1e16);
        double[] a = curve(DefectLibrary.byId("fe-i"), doping, 1e11, LEVELS);
        double[] b = curve(DefectLibrary.byId("fe-b"), doping, 3e11, LEVELS);
        double[] tau = new double[LEVELS.length];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = 1 / (1 / a[i] + 1 / b[i]);
        }
        Ranking r = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS).rank(tau);
        assertThat(r.status()).isEqualTo(RankingStatus.NO_SINGLE_DEFECT);
        assertThat(r.hint().best().pValue()).isLessThan(0.01);
        assertThat(r.reason()).contains("no single library defect").contains(r.hint().best().id());
    }

    @Test
    void defectsWithoutAbsoluteCrossSectionsAreSkippedWithTheReason() {
        Doping doping = Doping.pType(1e16);
        Ranking r = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS)
                .rank(curve(DefectLibrary.byId("cr-i"), doping, 1e11, LEVELS));
        CandidateFit bo = r.candidates().stream().filter(c -> c.id().equals("bo-lid")).findFirst().orElseThrow();
        assertThat(bo.fitted()).isFalse();
        assertThat(bo.reason()).contains("bo-lid").contains("absolute capture cross-section").contains("skipped");
        assertThat(r.candidates().get(r.candidates().size() - 1)).isSameAs(bo);
        assertThatThrownBy(() -> new LibraryRanking(List.of(DefectLibrary.byId("bo-lid")), doping, SI, LEVELS))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("absolute capture cross-sections");
    }

    @Test
    void fitsWithAnotherVelocityConventionCarryACaution() {
        Doping doping = Doping.pType(1e16);
        Silicon green = Silicon.at(300, trapmap.physics.material.ThermalVelocityModel.GREEN_1990);
        double[] tau = curve(DefectLibrary.byId("fe-i"), doping, 1e11, LEVELS);
        Ranking plain = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS).rank(tau);
        Ranking other = new LibraryRanking(DefectLibrary.all(), doping, green, LEVELS).rank(tau);
        assertThat(plain.hint().best().reason()).isEmpty();
        assertThat(other.hint().best().reason()).contains("fe-i").contains("thermal-velocity convention");
    }

    @Test
    void badInputNamesTheFieldAndUnit() {
        Doping doping = Doping.pType(1e16);
        LibraryRanking r = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS);
        assertThatThrownBy(() -> r.rank(new double[] {1, 2}))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("tau_SRH (s)")
                .extracting(e -> ((InvalidValueException) e).field()).isEqualTo("tauSrh");
        assertThatThrownBy(() -> r.rank(new double[5], new double[] {0.03, 0.03, 0, 0.03, 0.03}))
                .isInstanceOf(InvalidValueException.class)
                .extracting(e -> ((InvalidValueException) e).field()).isEqualTo("relativeUncertainty");
        assertThatThrownBy(() -> new LibraryRanking(DefectLibrary.all(), doping, SI, new double[] {1e13, -1}))
                .isInstanceOf(InvalidValueException.class)
                .extracting(e -> ((InvalidValueException) e).unit()).isEqualTo("cm^-3");
    }

    @Test
    void oneCallRankingEqualsThePreparedOne() {
        Doping doping = Doping.nType(1e15);
        double[] tau = curve(DefectLibrary.byId("au-a"), doping, 2e10, LEVELS);
        tau[2] *= 1.02;
        Ranking a = LibraryRanking.rank(LifetimeCurve.of(LEVELS, tau), DefectLibrary.all(), doping, SI);
        Ranking b = new LibraryRanking(DefectLibrary.all(), doping, SI, LEVELS).rank(tau);
        assertThat(a).isEqualTo(b);
        assertThat(a.hint().best().id()).isEqualTo("au-a");
    }
}
