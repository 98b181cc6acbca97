package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;

/**
 * The iron step for one file with its partner lookup and map reading given (as a Spark job gives them): the same
 * columns as the batch's step, the numbers behind them unrounded, a missing partner or an unreadable map an error.
 */
class IronPairsStepTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final Path FEB = DEMO.resolve("LOT-A03-W02-feb-state.tif");
    private static final Path FEI = DEMO.resolve("LOT-A03-W02-fe-i-state.tif");

    @Test
    void givenLookupAndReaderGiveTheBatchsColumnsAndTheirNumbers() throws Exception {
        Path rulesFile = DEMO.resolve("rules-example.json");
        Rules rules = Rules.read(rulesFile);
        IronPairRules iron = IronPairRules.read(rulesFile).orElseThrow();
        IronPairs batch = new IronPairs(iron, rules, MapFiles::readSingle, List.of(FEB, FEI));
        IronPairs.Evaluation e = IronPairs.evaluate(iron, rules, FEB.getFileName().toString(), FEB.toString(),
                n -> n.equals(FEI.getFileName().toString()) ? FEI.toString() : null,
                f -> MapFiles.readSingle(Path.of(f)));
        assertThat(e.columns()).isEqualTo(batch.evaluate(FEB));
        assertThat(e.columns().get(IronPairs.PARTNER)).isEqualTo(FEI.toString());
        // the limited figures are written in full: their text is the number's
        assertThat(e.columns().get("iron_median_cm3")).isEqualTo(NumberText.of(e.values().get("iron_median_cm3")));
        assertThat(e.values().get("iron_median_cm3")).isPositive();
        assertThat(e.values().get("iron_p95_cm3")).isGreaterThanOrEqualTo(e.values().get("iron_median_cm3"));

        IronPairs.Evaluation fei = IronPairs.evaluate(iron, rules, FEI.getFileName().toString(), FEI.toString(),
                n -> FEB.toString(), f -> {
                    throw new AssertionError("the Fe_i-state side reads no map");
                });
        assertThat(fei.columns()).isEqualTo(batch.evaluate(FEI));
        assertThat(fei.columns().get(IronPairs.STATUS)).isEqualTo("paired");
        assertThat(fei.values()).isEmpty();

        IronPairs.Evaluation missing = IronPairs.evaluate(iron, rules, FEB.getFileName().toString(), FEB.toString(),
                n -> null, f -> MapFiles.readSingle(Path.of(f)));
        assertThat(missing.columns().get(IronPairs.STATUS)).isEqualTo("error");
        assertThat(missing.columns().get(IronPairs.NOTE)).isEqualTo("no Fe_i-state partner "
                + FEI.getFileName() + " among the inspected files");

        IronPairs.Evaluation unreadable = IronPairs.evaluate(iron, rules, FEB.getFileName().toString(),
                FEB.toString(), n -> "gone/" + n, f -> MapFiles.readSingle(Path.of(f)));
        assertThat(unreadable.columns().get(IronPairs.STATUS)).isEqualTo("error");
        assertThat(unreadable.columns().get(IronPairs.NOTE)).startsWith("iron map of " + FEB.getFileName() + " and "
                + FEI.getFileName() + ": ").contains("no such file");
        assertThat(unreadable.values()).isEmpty();
    }
}
