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
 * The command line's refusals before any Spark work (one line naming the option, exit status 2) and the rules the
 * cluster job cannot judge map by map: an injection stack is refused, the iron section is named as left out.
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
    void aMissingRequiredOptionIsAUsageError() {
        StringWriter err = new StringWriter();
        assertThat(run(err, "--input", "maps", "--output", "out")).isEqualTo(2);
        assertThat(err.toString()).contains("--rules");
    }

    @Test
    void rulesWithAnInjectionStackAreRefusedNamingTheProfile() throws Exception {
        Path rules = DEMO.resolve("injection-stack").resolve("rules-identify.json");
        Shipment s = new Shipment(Files.readString(rules), rules.toString());
        assertThatThrownBy(s::parse).isInstanceOf(RulesException.class)
                .hasMessageStartingWith(rules + ": profile '").hasMessageContaining("'stack'")
                .hasMessageContaining("use inspect");
    }

    @Test
    void theIronSectionIsNamedAsLeftOut() throws Exception {
        Path rules = DEMO.resolve("rules-example.json");
        Shipment s = new Shipment(Files.readString(rules), rules.toString());
        assertThat(s.parse().rules().allProfiles()).isNotEmpty();
        assertThat(s.leftOut()).singleElement().asString().startsWith(rules + ": the 'iron' section is left out");
        Path plain = Files.writeString(dir.resolve("plain.json"), Files.readString(rules)
                .replaceAll("(?s),\\s*\"iron\":\\s*\\{.*?\\}\\}\\}", ""));
        assertThat(new Shipment(Files.readString(plain), plain.toString()).parse().rules().allProfiles()).isNotEmpty();
        assertThat(new Shipment(Files.readString(plain), plain.toString()).leftOut()).isEmpty();
    }
}
