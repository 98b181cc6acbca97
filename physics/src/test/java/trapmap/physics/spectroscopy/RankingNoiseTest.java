package trapmap.physics.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;

/**
 * How often the ranking puts the planted defect first with 3 % Gaussian noise on τ_SRH at 4 levels, log-spaced
 * from 1e12 to 1e16 cm^-3 (1000 seeded trials per defect; docs/check-values.md R-ID-4). The SRH equation (Shockley
 * &amp; Read 1952; Hall 1952) makes the curves; N_t is free in the fit, so only the shape of K(Δn) separates two
 * defects. Prints the rank-1 share of each defect and the pairs confused in more than 5 % of the trials, and
 * asserts that each defect wins at least 90 % of its trials once its listed partners (pairs whose curves have the
 * same shape within the noise at this doping: not distinguishable) count as a win; every listed pair must really be
 * confused (more than 5 % in one direction), so the list is the measured one and goes into the docs.
 */
class RankingNoiseTest {
    static final int TRIALS = 1000;
    static final double[] LEVELS = {1e12, Math.pow(10, 12 + 4.0 / 3), Math.pow(10, 12 + 8.0 / 3), 1e16};

    /** Pairs not distinguishable at each doping (measured with seed 20261205; docs/check-values.md R-ID-4). */
    static final Map<String, Set<String>> NOT_DISTINGUISHABLE = Map.of(
            "p:1e15", Set.of("cr-b|fe-b", "au-a|cr-b", "au-d|ni-s"),
            "p:1e16", Set.of("fe-b|midgap", "mo-i|ti-i", "au-d|ni-s", "au-d|midgap", "midgap|ni-s"));

    static String pair(String a, String b) {
        return a.compareTo(b) < 0 ? a + "|" + b : b + "|" + a;
    }

    @ParameterizedTest
    @ValueSource(strings = {"p:1e15", "p:1e16"})
    void plantedDefectRanksFirst(String dop) {
        Doping doping = Doping.parse(dop);
        Silicon si = Silicon.at(300);
        List<Defect> lib = DefectLibrary.all().stream().filter(Defect::hasAbsoluteCrossSections).toList();
        LibraryRanking ranking = new LibraryRanking(DefectLibrary.all(), doping, si, LEVELS);
        Random rnd = new Random(20261205L);
        Set<String> confused = new TreeSet<>();
        List<String> failures = new ArrayList<>();
        StringBuilder table = new StringBuilder("rank-1 share at " + dop + ", 3 % noise, 4 levels 1e12..1e16 cm^-3:\n");
        for (Defect d : lib) {
            double[] exact = LibraryRankingTest.curve(d, doping, 1e11, LEVELS);
            Map<String, Integer> wins = new LinkedHashMap<>();
            for (int t = 0; t < TRIALS; t++) {
                double[] tau = new double[LEVELS.length];
                for (int i = 0; i < tau.length; i++) {
                    tau[i] = exact[i] * (1 + 0.03 * rnd.nextGaussian());
                }
                wins.merge(ranking.rank(tau).hint().best().id(), 1, Integer::sum);
            }
            int own = wins.getOrDefault(d.id(), 0);
            int accepted = own;
            StringBuilder others = new StringBuilder();
            for (Map.Entry<String, Integer> w : wins.entrySet()) {
                if (w.getKey().equals(d.id())) {
                    continue;
                }
                others.append(String.format(Locale.ROOT, " %s %.1f %%", w.getKey(), 100.0 * w.getValue() / TRIALS));
                String pair = pair(d.id(), w.getKey());
                if (w.getValue() > TRIALS / 20) {
                    confused.add(pair);
                }
                if (NOT_DISTINGUISHABLE.get(dop).contains(pair)) {
                    accepted += w.getValue();
                }
            }
            table.append(String.format(Locale.ROOT, "  %-7s %5.1f %%  (others:%s)%n", d.id(), 100.0 * own / TRIALS,
                    others));
            if (accepted < 0.9 * TRIALS) {
                failures.add(d.id() + " " + own + "/" + TRIALS);
            }
        }
        table.append("  pairs confused in > 5 % of one defect's trials: ").append(confused);
        System.out.println(table);
        assertThat(failures).as(table.toString()).isEmpty();
        assertThat(confused).as(table.toString()).containsAll(NOT_DISTINGUISHABLE.get(dop));
    }

    // R-ID-7: with the right model and Gaussian noise of the stated size, χ² of the planted defect follows the χ²
    // distribution with ν = n − 1 (Bevington & Robinson 2003, ch. 11): mean ν, p < 0.01 in about 1 % of trials
    @Test
    void plantedChiSquaredFollowsItsDistribution() {
        Doping doping = Doping.pType(1e16);
        Defect fei = DefectLibrary.byId("fe-i");
        LibraryRanking ranking = new LibraryRanking(List.of(fei), doping, Silicon.at(300), LEVELS);
        double[] exact = LibraryRankingTest.curve(fei, doping, 1e11, LEVELS);
        Random rnd = new Random(7L);
        int n = 4000;
        double sum = 0;
        int low = 0;
        for (int t = 0; t < n; t++) {
            double[] tau = new double[LEVELS.length];
            for (int i = 0; i < tau.length; i++) {
                tau[i] = exact[i] * (1 + 0.03 * rnd.nextGaussian());
            }
            CandidateFit f = ranking.rank(tau).hint().best();
            sum += f.chiSquared();
            low += f.pValue() < 0.01 ? 1 : 0;
        }
        // mean of χ²(3) is 3 with standard error sqrt(6/4000) = 0.04; first-order weights add a few per cent
        assertThat(sum / n).isBetween(2.8, 3.3);
        assertThat(low / (double) n).isBetween(0.004, 0.02);
    }
}
