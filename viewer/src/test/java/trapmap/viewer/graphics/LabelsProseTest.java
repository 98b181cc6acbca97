package trapmap.viewer.graphics;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.EnumSet;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/** The engine's ASCII texts as they read on screen ({@link Labels#prose}). */
class LabelsProseTest {
    private static final double[] LEVELS = {1e13, 1e14, 1e15};

    @Test
    void unitsAndSymbolsReadAsTypesetAndNothingElseChanges() {
        assertThat(Labels.prose("fe-i fits best (N_t 2.00e+11 cm^-3, chi2 1.2e-20, p = 1.00); runner-up cr-i"
                + " (chi2 ratio 3.4e+05)")).isEqualTo("fe-i fits best (N_t 2.00e+11 cm⁻³, χ² 1.2e-20, p = 1.00);"
                + " runner-up cr-i (χ² ratio 3.4e+05)");
        assertThat(Labels.prose("least chi2 0.5 at E_t - E_i = +0.120 eV; ambiguous half: both halves of the gap fit"
                + " within delta chi2 1.00")).isEqualTo("least χ² 0.5 at E_t − E_i = +0.120 eV; ambiguous half:"
                + " both halves of the gap fit within Δχ² 1.00");
        assertThat(Labels.prose("tau_SRH is not finite and positive at 1.00e+13 cm^-3 (left out); sigma (cm^2)"))
                .isEqualTo("τ_SRH is not finite and positive at 1.00e+13 cm⁻³ (left out); sigma (cm²)");
        assertThat(Labels.prose("see hint-chi2.tif and /data/chi2 and my_tau_SRH and chi2x"))
                .isEqualTo("see hint-chi2.tif and /data/chi2 and my_tau_SRH and chi2x");
        assertThat(Labels.prose("")).isEmpty();
        assertThat(Labels.prose(null)).isEmpty();
    }

    /** Back from screen to ASCII, to check that {@link Labels#prose} only swaps notations. */
    private static String ascii(String screen) {
        return screen.replace("cm⁻³", "cm^-3").replace("cm²", "cm^2").replace("Δχ²", "delta chi2")
                .replace("χ²", "chi2").replace("τ_SRH", "tau_SRH").replace("E_t − E_i", "E_t - E_i");
    }

    @Test
    void everyReasonOfTheRankingReadsWithoutAsciiNotation() {
        Doping doping = Doping.pType(1e15);
        Silicon green = Silicon.at(300, ThermalVelocityModel.GREEN_1990);
        LibraryRanking ranking = new LibraryRanking(DefectLibrary.all(), doping, green, LEVELS);
        List<double[]> curves = List.of(
                new double[] {1e-5, 2e-5, 3e-5},                  // some fits best or none does
                new double[] {1e-5, 1.1e-5, Double.NaN},          // one level left out
                new double[] {1e-5, -1, 0},                       // too few levels
                new double[] {3e-6, 1e-4, 2e-6});                 // no single defect
        Set<RankingStatus> seen = EnumSet.noneOf(RankingStatus.class);
        for (double[] tau : curves) {
            Ranking r = ranking.rank(tau);
            seen.add(r.status());
            String shown = Labels.prose(r.reason());
            assertThat(shown).doesNotContain("cm^-3").doesNotContain("chi2").doesNotContain("tau_SRH");
            assertThat(ascii(shown)).isEqualTo(r.reason());
            for (CandidateFit f : r.candidates()) {
                assertThat(ascii(Labels.prose(f.reason()))).isEqualTo(f.reason());
                assertThat(Labels.prose(f.reason())).doesNotContain("tau_SRH");
            }
        }
        assertThat(seen).contains(RankingStatus.BELOW_LIMIT, RankingStatus.TOO_FEW_LEVELS,
                RankingStatus.NO_SINGLE_DEFECT);
    }
}
