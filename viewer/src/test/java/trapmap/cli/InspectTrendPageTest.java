package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.HistoryScenario;

/**
 * The batch summary's trend page: present only with {@code --store} (the rules' {@code trend} block, else their default
 * trend, said so), on pages of its own after the summary's, which stay as they are without it; on the invented history (tube T2 drifts from
 * {@link HistoryScenario#CHANGE_AT}) the second run's page shows the drift on T2's chart at its own wafers and no
 * point beyond 3σ on T1's.
 */
class InspectTrendPageTest {
    private static final String TITLE = "Trend over the results store: trap_density_p50_cm3";

    @TempDir
    static Path dir;
    static Path history;
    static Path withBlock;
    static Path withoutBlock;

    @BeforeAll
    static void history() throws Exception {
        history = dir.resolve("history");
        HistoryScenario.write(history);
        withBlock = history.resolve(HistoryScenario.RULES);
        ObjectMapper json = new ObjectMapper();
        ObjectNode rules = (ObjectNode) json.readTree(withBlock.toFile());
        assertThat(rules.has("trend")).isTrue();
        rules.remove("trend");
        withoutBlock = Files.createDirectories(dir.resolve("plain")).resolve(HistoryScenario.RULES);
        Files.writeString(withoutBlock, json.writeValueAsString(rules));
    }

    /** The history's maps of lots {@code from} to {@code to} (1-based, inclusive). */
    private static List<String> lots(int from, int to) throws Exception {
        try (Stream<Path> s = Files.list(history)) {
            return s.map(p -> p.getFileName().toString()).filter(n -> n.matches("L\\d{4}-S\\d{2}\\.tif"))
                    .filter(n -> {
                        int lot = Integer.parseInt(n.substring(1, 5));
                        return lot >= from && lot <= to;
                    }).sorted().map(n -> history.resolve(n).toString()).toList();
        }
    }

    private static Cli.Run inspect(List<String> maps, Path rules, Path out, Path store) {
        List<String> args = new ArrayList<>(List.of("inspect"));
        args.addAll(maps);
        args.addAll(List.of("--rules", rules.toString(), "--out", out.toString(), "--no-thumbnails"));
        if (store != null) {
            args.addAll(List.of("--store", store.toString()));
        }
        Cli.Run r = Cli.run(args.toArray(String[]::new));
        assertThat(r.code()).as(r.err()).isIn(Exit.OK, Exit.SOME_WAFERS_NOT_PASSED);
        return r;
    }

    /** The text of each page of the folder's summary, its folder, page numbers and time in words of their own. */
    private static List<String> pages(Path out) throws Exception {
        List<String> pages = new ArrayList<>();
        try (PDDocument d = Loader.loadPDF(out.resolve("summary.pdf").toFile())) {
            PDFTextStripper s = new PDFTextStripper();
            for (int p = 1; p <= d.getNumberOfPages(); p++) {
                s.setStartPage(p);
                s.setEndPage(p);
                pages.add(s.getText(d).replace(out.toString(), "OUT").replaceAll("page \\d+ of \\d+", "page N")
                        .replaceAll("\\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2} UTC", "TIME UTC"));
            }
        }
        return pages;
    }

    @Test
    void withoutAStoreTheSummaryIsUnchangedAndWithOneItGainsTheTrendPagesOfTheBlockOrTheDefaults() throws Exception {
        List<String> maps = lots(1, 6);
        inspect(maps, withBlock, dir.resolve("no-store"), null);
        inspect(maps, withoutBlock, dir.resolve("no-block"), dir.resolve("no-block.db"));
        inspect(maps, withBlock, dir.resolve("both"), dir.resolve("both.db"));
        List<String> plain = pages(dir.resolve("no-store"));
        assertThat(String.join("", plain)).doesNotContain("Trend over");
        // a store without the block: the same pages, then the trend of the rules' defaults, said so
        List<String> noBlock = pages(dir.resolve("no-block"));
        assertThat(noBlock.size()).isGreaterThan(plain.size());
        assertThat(noBlock.subList(0, plain.size())).isEqualTo(plain);
        String fallback = trapmap.maps.batch.Rules.read(withoutBlock).defaultTrend().figure();
        assertThat(noBlock.get(plain.size())).startsWith("Trend over the results store: " + fallback);
        assertThat(noBlock.get(plain.size()).replace("\n", " ")).contains("by lot", "first 20 wafers",
                "the rules have no trend block", "18 stored wafers");

        List<String> both = pages(dir.resolve("both"));
        assertThat(both.size()).isGreaterThan(plain.size());
        assertThat(both.subList(0, plain.size())).isEqualTo(plain);
        List<String> trend = both.subList(plain.size(), both.size());
        assertThat(trend.get(0)).startsWith(TITLE);
        assertThat(trend.get(0).replace("\n", " ")).contains("by furnace_tube", "baseline wafers measured before"
                + " 2026-10-12T00:00:00Z", "18 stored wafers", "No signal after the baseline",
                "Control limits describe the baseline period only");
        // one chart per tube: two pictures on the trend's first page
        try (PDDocument d = Loader.loadPDF(dir.resolve("both").resolve("summary.pdf").toFile())) {
            int images = 0;
            for (var name : d.getPage(plain.size()).getResources().getXObjectNames()) {
                images += d.getPage(plain.size()).getResources().isImageXObject(name) ? 1 : 0;
            }
            assertThat(images).isEqualTo(2);
        }
    }

    @Test
    void theSecondRunsPageShowsTheDriftAtItsOwnWafersOnTubeT2Only() throws Exception {
        Path store = dir.resolve("history.db");
        inspect(lots(1, 30), withBlock, dir.resolve("days-1-10"), store);
        inspect(lots(31, 63), withBlock, dir.resolve("days-11-21"), store);
        List<String> pages = pages(dir.resolve("days-11-21"));
        int first = 0;
        while (!pages.get(first).startsWith(TITLE)) {
            first++;
        }
        String trend = String.join("\n", pages.subList(first, pages.size()));
        assertThat(trend).contains("189 stored wafers");
        int[] t1 = counts(trend, "T1");
        int[] t2 = counts(trend, "T2");
        // T1 is steady: its zone rules may fire, but no point lies beyond 3 sigma (the alarm rule) after the baseline
        assertThat(t1[2]).as("T1 points by an alarm rule").isZero();
        // T2 drifts: many points beyond 3 sigma, nearly all after the change, in this second run
        assertThat(t2[2]).as("T2 points by an alarm rule").isGreaterThan(20);
        assertThat(t2[1]).as("T2 points of this run").isGreaterThanOrEqualTo(t2[2]);
        assertThat(trend).contains("1 point beyond 3 sigma (up)");
    }

    /** Points with a signal, of this run, by an alarm rule, from the page's line for the chart of {@code tube}. */
    private static int[] counts(String text, String tube) {
        Matcher m = Pattern.compile("individuals \\(X\\) of " + tube + ": (\\d+) point\\(s\\) with a signal after"
                + " the baseline, (\\d+) of this run; (\\d+) by an alarm rule").matcher(text.replace("\n", " "));
        assertThat(m.find()).as("the line of " + tube).isTrue();
        return new int[] {Integer.parseInt(m.group(1)), Integer.parseInt(m.group(2)), Integer.parseInt(m.group(3))};
    }
}
