package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.HistoryScenario;

/** {@code watch --pdf}: the summary after a round has the trend page with {@code --store}, and none without. */
class WatchTrendPageTest {
    private static final String TITLE = "Trend over the results store: trap_density_p50_cm3";

    @Test
    void theRoundsSummaryHasTheTrendPageOnlyWithAStore(@TempDir Path dir) throws Exception {
        Path history = HistoryScenario.write(dir.resolve("history")).get(0).getParent();
        Path in = Files.createDirectories(dir.resolve("in"));
        try (Stream<Path> s = Files.list(history)) {
            for (Path p : s.filter(p -> p.getFileName().toString().matches("L000[1-4]-S\\d{2}\\.(tif|json)"))
                    .toList()) {
                Files.copy(p, in.resolve(p.getFileName()));
            }
        }
        String rules = history.resolve(HistoryScenario.RULES).toString();
        Path stored = dir.resolve("stored");
        Cli.Run withStore = Cli.run("watch", in.toString(), "--rules", rules, "--out", stored.toString(),
                "--settle-s", "0", "--exit-idle-s", "1", "--threads", "1", "--no-thumbnails", "--pdf", "--store",
                dir.resolve("results.db").toString());
        assertThat(withStore.code()).as(withStore.err()).isZero();
        Path plain = dir.resolve("plain");
        Cli.Run without = Cli.run("watch", in.toString(), "--rules", rules, "--out", plain.toString(),
                "--settle-s", "0", "--exit-idle-s", "1", "--threads", "1", "--no-thumbnails", "--pdf");
        assertThat(without.code()).as(without.err()).isZero();

        String trend = text(stored);
        assertThat(trend).contains(TITLE);
        assertThat(trend.replace("\n", " ")).contains("12 stored wafers", "by furnace_tube");
        assertThat(text(plain)).doesNotContain("Trend over");
    }

    private static String text(Path out) throws Exception {
        try (PDDocument d = Loader.loadPDF(out.resolve("summary.pdf").toFile())) {
            return new PDFTextStripper().getText(d);
        }
    }
}
