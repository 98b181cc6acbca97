package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/**
 * {@code stats --threshold} in text form lists the flagged regions with their peak (the demonstration README's
 * walkthrough runs it on a demonstration map).
 */
class StatsRegionsTextTest {
    @Test
    void textOutputListsTheRegionsWithTheirPeak() {
        Path map = Path.of("..", "demo-data", "LOT-A01-W02.tif");
        Cli.Run r = Cli.run("stats", map.toString(), "--threshold", "20");
        assertThat(r.code()).as(r.err()).isZero();
        assertThat(r.out()).contains("flagged regions").containsPattern("#1 .* mm² at \\(.*\\) mm.*, peak [0-9.]+ µs");
    }
}
