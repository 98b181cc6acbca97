package trapmap.physics.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.EnumSet;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.Set;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SrhRecombination;

/**
 * The ranking against a straightforward reference that fits every candidate, computes every p-value and writes the
 * reason at once (the weighted least squares through the origin and χ² test of Bevington &amp; Robinson 2003,
 * ch. 6 and 11): on many curves of every status the numbers, p-values, statuses and reason texts of
 * {@link LibraryRanking} (which writes the reason and works out p-values only when read) are identical to it.
 */
class RankingReferenceTest {
    static final double[] LEVELS = {1e12, 1e13, 1e14, 1e15, 1e16};

    /** What a ranking was before its reason and p-values were deferred: everything at once, in one method. */
    static Ranking reference(List<Defect> candidates, Doping doping, Silicon si, double[] dn, double[] tau,
                             double[] u) {
        List<CandidateFit> skipped = new ArrayList<>();
        List<Defect> fitted = new ArrayList<>();
        for (Defect d : candidates) {
            if (d.hasAbsoluteCrossSections()) {
                fitted.add(d);
            } else {
                skipped.add(CandidateFit.notFitted(d, "defect '" + d.id() + "' has no published absolute capture"
                        + " cross-section, so tau_SRH gives no N_t for it (skipped)"));
            }
        }
        int n = 0;
        List<String> unusable = new ArrayList<>();
        for (int i = 0; i < tau.length; i++) {
            if (Double.isFinite(tau[i]) && tau[i] > 0) {
                n++;
            } else {
                unusable.add(String.format(Locale.ROOT, "%.3g", dn[i]));
            }
        }
        List<CandidateFit> out = new ArrayList<>();
        if (n < 2) {
            String why = "only " + n + " of " + tau.length + " levels " + (n == 1 ? "has" : "have")
                    + " a finite positive tau_SRH (s); at least 2 are needed to see the injection dependence";
            for (Defect d : fitted) {
                out.add(CandidateFit.notFitted(d, why));
            }
            out.addAll(skipped);
            return new Ranking(RankingStatus.TOO_FEW_LEVELS, why, n, out, null);
        }
        int nu = n - 1;
        ChiSquaredDistribution chi = new ChiSquaredDistribution(null, nu);
        for (Defect d : fitted) {
            SrhRecombination srh = SrhRecombination.of(d, doping, si);
            double scc = 0;
            double scy = 0;
            for (int i = 0; i < tau.length; i++) {
                if (Double.isFinite(tau[i]) && tau[i] > 0) {
                    double c = srh.ratePerTrapCm3PerS(dn[i]);
                    double y = 1.0 / tau[i];
                    double w = 1.0 / (u[i] * y * u[i] * y);
                    scc += w * c * c;
                    scy += w * c * y;
                }
            }
            double nt = scy / scc;
            double chi2 = 0;
            for (int i = 0; i < tau.length; i++) {
                if (Double.isFinite(tau[i]) && tau[i] > 0) {
                    double r = (1.0 - nt * srh.ratePerTrapCm3PerS(dn[i]) * tau[i]) / u[i];
                    chi2 += r * r;
                }
            }
            double se = 1.0 / Math.sqrt(scc);
            String caution = si.velocityModel() == d.velocityConvention() ? ""
                    : "cross-sections of '" + d.id() + "' belong to the " + d.velocityConvention() + " thermal-velocity"
                    + " convention, fitted with the silicon's " + si.velocityModel() + " velocities";
            out.add(new CandidateFit(d, true, caution, nt, se, Math.max(0, nt - LibraryRanking.BOUNDS_Z * se),
                    nt + LibraryRanking.BOUNDS_Z * se, chi2, nu, 1.0 - chi.cumulativeProbability(chi2)));
        }
        out.sort(Comparator.comparingDouble(CandidateFit::chiSquared));
        CandidateFit best = out.get(0);
        CandidateFit runner = out.size() > 1 ? out.get(1) : null;
        double ratio = runner == null ? Double.NaN
                : best.chiSquared() == 0 ? Double.POSITIVE_INFINITY : runner.chiSquared() / best.chiSquared();
        DefectHint hint = new DefectHint(best, runner, ratio);
        out.addAll(skipped);
        String verdict = String.format(Locale.ROOT, "%s fits best (N_t %.3g cm^-3, chi2 %.3g, p = %.3g)", best.id(),
                best.ntPerCm3(), best.chiSquared(), best.pValue());
        if (runner != null) {
            verdict += String.format(Locale.ROOT, "; runner-up %s (chi2 ratio %.3g)", runner.id(), ratio);
        }
        String left = String.join(", ", unusable);
        if (best.pValue() < 0.01) {
            String reason = String.format(Locale.ROOT, "the best candidate %s has chi2 %.4g with %d degrees of"
                    + " freedom, p = %.3g < %.2g: no single library defect explains the curve", best.id(),
                    best.chiSquared(), nu, best.pValue(), 0.01);
            if (n < tau.length) {
                reason += "; tau_SRH is not finite and positive at " + left + " cm^-3 (left out)";
            }
            return new Ranking(RankingStatus.NO_SINGLE_DEFECT, reason, n, out, hint);
        }
        if (n < tau.length) {
            return new Ranking(RankingStatus.BELOW_LIMIT, String.format(Locale.ROOT, "tau_SRH is not finite and"
                    + " positive at %s cm^-3 (SRH not resolvable there); ranked on the other %d levels: %s", left, n,
                    verdict), n, out, hint);
        }
        return new Ranking(RankingStatus.OK, verdict, n, out, hint);
    }

    /** A curve of one or two library defects with noise, some levels made unusable (NaN, 0, −, ∞) at random. */
    static double[] randomCurve(Random rnd, List<Defect> pool, Doping doping, Silicon si, double[] dn) {
        Defect a = pool.get(rnd.nextInt(pool.size()));
        Defect b = pool.get(rnd.nextInt(pool.size()));
        SrhRecombination sa = SrhRecombination.of(a, doping, si);
        SrhRecombination sb = SrhRecombination.of(b, doping, si);
        double nta = Math.pow(10, 9 + 4 * rnd.nextDouble());
        double ntb = rnd.nextInt(3) == 0 ? nta * Math.pow(10, rnd.nextDouble() * 2 - 1) : 0;
        double noise = new double[] {0, 0.001, 0.03, 0.2}[rnd.nextInt(4)];
        double[] tau = new double[dn.length];
        for (int i = 0; i < dn.length; i++) {
            double rate = 1.0 / sa.lifetimeS(dn[i], nta) + (ntb > 0 ? 1.0 / sb.lifetimeS(dn[i], ntb) : 0);
            tau[i] = (1 + noise * rnd.nextGaussian()) / rate;
            int bad = rnd.nextInt(12);
            if (bad == 0) {
                tau[i] = Double.NaN;
            } else if (bad == 1) {
                tau[i] = 0;
            } else if (bad == 2) {
                tau[i] = -tau[i];
            } else if (bad == 3) {
                tau[i] = Double.POSITIVE_INFINITY;
            }
        }
        return tau;
    }

    static void assertSame(Ranking actual, Ranking expected, String what) {
        assertThat(actual.status()).as(what).isEqualTo(expected.status());
        assertThat(actual.usableLevels()).as(what).isEqualTo(expected.usableLevels());
        assertThat(actual.candidates()).as(what).hasSameSizeAs(expected.candidates());
        for (int i = 0; i < expected.candidates().size(); i++) {
            CandidateFit a = actual.candidates().get(i);
            CandidateFit e = expected.candidates().get(i);
            assertThat(a.id()).as(what).isEqualTo(e.id());
            assertThat(Double.doubleToLongBits(a.pValue())).as(what + " p of " + e.id())
                    .isEqualTo(Double.doubleToLongBits(e.pValue()));
            assertThat(a.toString()).as(what).isEqualTo(e.toString());
        }
        assertThat(actual.reason()).as(what).isEqualTo(expected.reason());
        assertThat(actual).as(what).isEqualTo(expected).hasSameHashCodeAs(expected);
        assertThat(actual.toString()).as(what).isEqualTo(expected.toString());
    }

    @Test
    void rankingsOfEveryStatusEqualTheReferenceNumberForNumberAndWordForWord() {
        Random rnd = new Random(20261205L);
        List<Defect> all = DefectLibrary.all();
        List<Defect> pool = all.stream().filter(Defect::hasAbsoluteCrossSections).toList();
        Set<RankingStatus> seen = EnumSet.noneOf(RankingStatus.class);
        int withoutRunner = 0;
        for (String dop : List.of("p:1e15", "p:1e16", "n:1e15", "n:5e16")) {
            Doping doping = Doping.parse(dop);
            for (Silicon si : List.of(Silicon.at(300), Silicon.at(300, ThermalVelocityModel.GREEN_1990))) {
                for (double[] dn : List.of(LEVELS, new double[] {1e13, 1e14, 1e15}, new double[] {3e14, 2e15})) {
                    LibraryRanking ranking = new LibraryRanking(all, doping, si, dn);
                    List<Defect> one = List.of(pool.get(rnd.nextInt(pool.size())));
                    LibraryRanking single = new LibraryRanking(one, doping, si, dn);
                    for (int k = 0; k < 40; k++) {
                        double[] tau = randomCurve(rnd, pool, doping, si, dn);
                        double[] u = new double[dn.length];
                        for (int i = 0; i < u.length; i++) {
                            u[i] = rnd.nextBoolean() ? LifetimeCurve.DEFAULT_RELATIVE_UNCERTAINTY
                                    : 0.005 + 0.1 * rnd.nextDouble();
                        }
                        String what = dop + " " + si.velocityModel() + " " + dn.length + " levels, case " + k;
                        Ranking r = ranking.rank(tau, u);
                        assertSame(r, reference(all, doping, si, dn, tau, u), what);
                        seen.add(r.status());
                        Ranking s = single.rank(tau, u);
                        assertSame(s, reference(one, doping, si, dn, tau, u), what + " (one candidate)");
                        withoutRunner += s.hint() != null && s.hint().runnerUp() == null ? 1 : 0;
                    }
                }
            }
        }
        assertThat(seen).containsExactlyInAnyOrder(RankingStatus.values());
        assertThat(withoutRunner).isGreaterThan(100);
    }

    /** {@code d} under another id: the same fit, so a χ² tie that only the library order breaks. */
    static Defect twin(Defect d, String id) {
        return new Defect(id, d.name(), d.level(), d.electronCrossSectionCm2(), d.holeCrossSectionCm2(),
                d.captureRatio(), d.velocityConvention(), d.source(), d.spread());
    }

    @Test
    void tiesKeepTheLibraryOrderForBestRunnerUpAndList() {
        Doping doping = Doping.parse("p:1e16");
        Silicon si = Silicon.at(300);
        Defect fei = DefectLibrary.byId("fe-i");
        Defect cri = DefectLibrary.byId("cr-i");
        List<Defect> lib = List.of(cri, twin(fei, "fe-i-b"), fei, twin(cri, "cr-i-b"), twin(fei, "fe-i-c"),
                DefectLibrary.byId("bo-lid"));
        Random rnd = new Random(3);
        List<Defect> pool = List.of(fei, cri);
        LibraryRanking ranking = new LibraryRanking(lib, doping, si, LEVELS);
        int fe = 0;
        int cr = 0;
        for (int k = 0; k < 200; k++) {
            double[] tau = randomCurve(rnd, pool, doping, si, LEVELS);
            double[] u = {0.03, 0.03, 0.03, 0.03, 0.03};
            Ranking r = ranking.rank(tau, u);
            assertSame(r, reference(lib, doping, si, LEVELS, tau, u), "case " + k);
            if (r.hint() != null && r.hint().best().id().equals("fe-i-b")) {
                assertThat(r.hint().runnerUp().id()).isEqualTo("fe-i");
                fe++;
            } else if (r.hint() != null && r.hint().best().id().equals("cr-i")) {
                assertThat(r.hint().runnerUp().id()).isEqualTo("cr-i-b");
                cr++;
            }
        }
        assertThat(fe).isGreaterThan(20);
        assertThat(cr).isGreaterThan(20);
    }

    @Test
    void theStatusFromChiSquaredAloneIsTheOneOfThePValueAtEveryChiSquared() {
        int levels = 36;
        double[] dn = new double[levels];
        for (int i = 0; i < levels; i++) {
            dn[i] = Math.pow(10, 11 + 0.15 * i);
        }
        LibraryRanking ranking = new LibraryRanking(DefectLibrary.all(), Doping.parse("p:1e16"), Silicon.at(300), dn);
        Defect fei = DefectLibrary.byId("fe-i");
        int checked = 0;
        for (int nu : new int[] {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 31, 32, 35}) {
            ChiSquaredDistribution chi = new ChiSquaredDistribution(null, nu);
            double critical = chi.inverseCumulativeProbability(0.99);
            List<Double> grid = new ArrayList<>(List.of(0.0, Double.MIN_VALUE, Double.NaN, Double.POSITIVE_INFINITY,
                    Double.MAX_VALUE, critical, Math.nextUp(critical), Math.nextDown(critical)));
            for (double f = 1e-4; f < 1e4; f *= 1.01) {
                grid.add(f * critical);
            }
            for (double f = 0.85; f < 1.15; f += 1e-4) {
                grid.add(f * critical);
            }
            for (double c : grid) {
                Boolean expected;
                try {
                    expected = 1.0 - chi.cumulativeProbability(c) < LibraryRanking.NO_SINGLE_DEFECT_P;
                } catch (RuntimeException e) {
                    expected = null; // the distribution function fails here (an infinite χ²): so must the status
                }
                CandidateFit fit = new CandidateFit(fei, true, "", 1e11, 1e9, 0, 2e11, c, nu, chi);
                int dof = nu;
                if (expected == null) {
                    assertThatThrownBy(() -> ranking.noSingleDefect(fit, dof)).as("nu " + nu + ", chi2 " + c)
                            .isInstanceOf(RuntimeException.class);
                } else {
                    assertThat(ranking.noSingleDefect(fit, nu)).as("nu " + nu + ", chi2 " + c).isEqualTo(expected);
                }
                checked++;
            }
        }
        assertThat(checked).isGreaterThan(15 * 1000);
    }

    @Test
    void unusableCurvesGiveTheReferenceText() {
        Doping doping = Doping.parse("p:1e16");
        Silicon si = Silicon.at(300);
        LibraryRanking ranking = new LibraryRanking(DefectLibrary.all(), doping, si, LEVELS);
        double[][] curves = {
            {Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN},
            {0, -1e-5, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, 0},
            {Double.NaN, 2e-5, Double.NaN, Double.NaN, Double.NaN},
            {Double.NaN, 2e-5, 3e-5, Double.NaN, Double.NaN},
            {1e-5, 1e-5, 1e-5, 1e-5, 1e-5},
        };
        for (double[] tau : curves) {
            assertSame(ranking.rank(tau), reference(DefectLibrary.all(), doping, si, LEVELS, tau,
                    new double[] {0.03, 0.03, 0.03, 0.03, 0.03}), java.util.Arrays.toString(tau));
        }
        assertThat(ranking.rank(curves[0]).status()).isEqualTo(RankingStatus.TOO_FEW_LEVELS);
        assertThat(ranking.rank(curves[2]).reason()).startsWith("only 1 of 5 levels has");
        assertThat(ranking.rank(curves[3]).status()).isIn(RankingStatus.BELOW_LIMIT, RankingStatus.NO_SINGLE_DEFECT);
    }

    @Test
    void aReasonAndPValueReadFromManyThreadsAtOnceAreTheOnesOfOneThread() throws Exception {
        Doping doping = Doping.parse("p:1e16");
        Silicon si = Silicon.at(300);
        LibraryRanking ranking = new LibraryRanking(DefectLibrary.all(), doping, si, LEVELS);
        Random rnd = new Random(7);
        List<Defect> pool = DefectLibrary.all().stream().filter(Defect::hasAbsoluteCrossSections).toList();
        ExecutorService pool4 = Executors.newFixedThreadPool(4);
        try {
            for (int k = 0; k < 200; k++) {
                double[] tau = randomCurve(rnd, pool, doping, si, LEVELS);
                Ranking shared = ranking.rank(tau);
                Ranking expected = reference(DefectLibrary.all(), doping, si, LEVELS, tau,
                        new double[] {0.03, 0.03, 0.03, 0.03, 0.03});
                List<Callable<String>> reads = new ArrayList<>();
                for (int t = 0; t < 4; t++) {
                    reads.add(() -> shared.reason() + " | " + shared.candidates().stream()
                            .map(c -> Double.toString(c.pValue())).toList());
                }
                String want = expected.reason() + " | " + expected.candidates().stream()
                        .map(c -> Double.toString(c.pValue())).toList();
                for (Future<String> f : pool4.invokeAll(reads)) {
                    assertThat(f.get()).isEqualTo(want);
                }
            }
        } finally {
            pool4.shutdownNow();
        }
    }
}
