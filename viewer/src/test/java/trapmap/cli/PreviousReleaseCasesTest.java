package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Guards the converted values of pixels away from the detection limit. {@code random-cases.csv} is the seeded table
 * of {@code scripts/random-cases} (2000 rows: p/n 1e14–1e17 cm⁻³, fixed Δn or G, 250–400 K, ten defects, ideal or
 * finite surfaces); {@code random-cases-previous-release.csv} holds what {@code trapmap calc --cases} of the release
 * before the two-sided detection limit wrote for it. Every pixel that was OK with an SRH rate above 6 % of the
 * intrinsic + surface rate must still be OK with the same values to 1e-9 relative; those nearer the limit may now be
 * BELOW_LIMIT, with a bound no lower than their former density.
 */
class PreviousReleaseCasesTest {
    private static final List<String> FIELDS = List.of("trap_density_cm3", "trap_density_min_cm3",
            "trap_density_max_cm3", "tau_srh_us", "occupancy", "tau_intrinsic_us", "injection_cm3");

    @TempDir
    Path dir;

    @Test
    void okPixelsAwayFromTheLimitAgreeWithThePreviousRelease() throws IOException {
        Path in = dir.resolve("cases.csv");
        try (InputStream s = getClass().getResourceAsStream("random-cases.csv")) {
            Files.copy(s, in);
        }
        Path out = dir.resolve("out.csv");
        Cli.Run run = Cli.run("calc", "--cases", in.toString(), "--out", out.toString());
        assertThat(run.code()).as(run.err()).isZero();
        List<CSVRecord> now = read(Files.newBufferedReader(out));
        List<CSVRecord> before;
        try (InputStream s = getClass().getResourceAsStream("random-cases-previous-release.csv")) {
            before = read(new java.io.InputStreamReader(s, StandardCharsets.UTF_8));
        }
        assertThat(now).hasSameSizeAs(before).hasSize(2000);
        int compared = 0;
        int nowBelow = 0;
        for (int i = 0; i < before.size(); i++) {
            CSVRecord b = before.get(i);
            CSVRecord n = now.get(i);
            assertThat(n.get("case")).isEqualTo(b.get("case"));
            String at = "case " + b.get("case");
            if (b.get("status").equals("BELOW_LIMIT")) {
                assertThat(n.get("status")).as(at).isEqualTo("BELOW_LIMIT");
                continue;
            }
            double tau = Double.parseDouble(n.get("tau_effective_us"));
            double intrinsicRate = 1 / Double.parseDouble(b.get("tau_intrinsic_us"));
            double surfaceRate = b.get("tau_surface_us").isEmpty() ? 0 : 1 / Double.parseDouble(b.get("tau_surface_us"));
            double share = (1 / tau - intrinsicRate - surfaceRate) / (intrinsicRate + surfaceRate);
            if (share <= 0.06) {
                if (n.get("status").equals("BELOW_LIMIT")) {
                    nowBelow++;
                    assertThat(Double.parseDouble(n.get("trap_density_cm3"))).as(at)
                            .isGreaterThanOrEqualTo(Double.parseDouble(b.get("trap_density_cm3")));
                }
                continue;
            }
            assertThat(n.get("status")).as(at).isEqualTo("OK");
            for (String f : FIELDS) {
                double was = Double.parseDouble(b.get(f));
                double is = Double.parseDouble(n.get(f));
                assertThat(Math.abs(is - was)).as(at + " " + f).isLessThanOrEqualTo(1e-9 * Math.abs(was));
            }
            compared++;
        }
        assertThat(compared).isGreaterThan(1500);
        assertThat(nowBelow).isPositive();
    }

    private static List<CSVRecord> read(Reader r) throws IOException {
        try (r) {
            return CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r).getRecords();
        }
    }
}
