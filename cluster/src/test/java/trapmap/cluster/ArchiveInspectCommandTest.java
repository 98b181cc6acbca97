package trapmap.cluster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;
import trapmap.maps.batch.RulesException;

/**
 * The command line's refusals before any Spark work (one line naming the option, exit status 2) and the rules that
 * judge maps together, shipped whole: a profile's injection stack, the iron section (a bad one refused in one line).
 */
class ArchiveInspectCommandTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    Path dir;

    private static int run(StringWriter err, String... args) {
        CommandLine cl = new CommandLine(new ArchiveInspect());
        cl.setErr(new PrintWriter(err, true));
        return cl.execute(args);
    }

    @Test
    void anUnknownPartitionColumnIsRefusedInOneLine() {
        StringWriter err = new StringWriter();
        int status = run(err, "--input", "maps", "--rules", "r.json", "--output", "out", "--partition-by", "week");
        assertThat(status).isEqualTo(2);
        assertThat(err.toString().strip()).isEqualTo("trapmap-cluster: --partition-by: 'week' is not a partition"
                + " column; expected day or lot");
    }

    @Test
    void aNegativeStoreBatchIsRefusedInOneLine() {
        StringWriter err = new StringWriter();
        int status = run(err, "--input", "maps", "--rules", "r.json", "--output", "out", "--store", "s.db",
                "--store-batch", "-1");
        assertThat(status).isEqualTo(2);
        assertThat(err.toString().strip()).isEqualTo("trapmap-cluster: --store-batch: -1 wafers; give 0 or more");
    }

    @Test
    void aMissingRequiredOptionIsAUsageError() {
        StringWriter err = new StringWriter();
        assertThat(run(err, "--input", "maps", "--output", "out")).isEqualTo(2);
        assertThat(err.toString()).contains("--rules");
    }

    @Test
    void rulesWithAnInjectionStackAreTakenWithTheirStack() throws Exception {
        Path rules = DEMO.resolve("injection-stack").resolve("rules-identify.json");
        Shipment.Judge judge = new Shipment(Files.readString(rules), rules.toString()).parse();
        assertThat(judge.hasStacks()).isTrue();
        assertThat(judge.iron()).isNull();
    }

    @Test
    void theIronSectionIsShippedWithTheRulesAndABadOneRefusedNamingItsField() throws Exception {
        Path rules = DEMO.resolve("rules-example.json");
        String text = Files.readString(rules);
        Shipment.Judge judge = new Shipment(text, rules.toString()).parse();
        assertThat(judge.hasStacks()).isFalse();
        assertThat(judge.iron().febState()).isEqualTo("*-feb-state.*");
        assertThat(judge.iron().feiNameFor("LOT-A03-W02-feb-state.tif")).contains("LOT-A03-W02-fe-i-state.tif");
        String bad = text.replace("\"fei_state\": \"*-fe-i-state.*\"", "\"fei_state\": 7");
        assertThat(bad).isNotEqualTo(text);
        assertThatThrownBy(new Shipment(bad, rules.toString())::parse).isInstanceOf(RulesException.class)
                .hasMessageStartingWith(rules + ": ").hasMessageContaining("iron.fei_state");
        Path plain = Files.writeString(dir.resolve("plain.json"), text
                .replaceAll("(?s),\\s*\"iron\":\\s*\\{.*?\\}\\}\\}", ""));
        assertThat(new Shipment(Files.readString(plain), plain.toString()).parse().iron()).isNull();
    }
}
