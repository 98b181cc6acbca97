package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/** Every invalid input exits with 2 and exactly one stderr line that names the flag and what it expects. */
class InvalidInputTest {
    private static final List<String> CALC = List.of("calc", "--lifetime-us", "12.5", "--doping", "p:1e16",
            "--injection", "1e14", "--defect", "fe-i");

    /** The base calc command with the option {@code flag} removed (with its value) and {@code more} added. */
    private static String[] calc(String drop, String... more) {
        List<String> args = new ArrayList<>();
        for (int i = 0; i < CALC.size(); i++) {
            if (CALC.get(i).equals(drop)) {
                i++;
                continue;
            }
            args.add(CALC.get(i));
        }
        args.addAll(List.of(more));
        return args.toArray(String[]::new);
    }

    private static Arguments bad(String[] args, String prefix, String... mustContain) {
        return Arguments.of(String.join(" ", args), args, prefix, mustContain);
    }

    static Stream<Arguments> badInputs() {
        return Stream.of(
                bad(calc("", "--thickness-um", "-5"), "trapmap calc: --thickness-um must be > 0 µm (got -5)"),
                bad(calc("", "--thickness-um", "0.5", "--srv", "10"), "trapmap calc: --thickness-um", "µm", "0.5"),
                bad(calc("", "--thickness-um", "1e5"), "trapmap calc: --thickness-um", "µm"),
                bad(calc("--lifetime-us", "--lifetime-us", "abc"), "trapmap calc: --lifetime-us", "number", "µs",
                        "abc"),
                bad(calc("--lifetime-us", "--lifetime-us", "-1"), "trapmap calc: --lifetime-us must be > 0 µs"),
                bad(calc("--lifetime-us", "--lifetime-us", "NaN"), "trapmap calc: --lifetime-us", "µs"),
                bad(calc("--lifetime-us"), "trapmap calc: --lifetime-us is required", "µs"),
                bad(calc("--doping"), "trapmap calc: --doping is required", "cm^-3", "Ω·cm"),
                bad(calc("--doping", "--doping", "x:1e16"), "trapmap calc: --doping", "p or n", "x:1e16"),
                bad(calc("--doping", "--doping", "1e16"), "trapmap calc: --doping", "cm^-3"),
                bad(calc("--doping", "--doping", "p:1e16furlongs"), "trapmap calc: --doping", "furlongs", "Ω·cm"),
                bad(calc("--doping", "--doping", "p:1e25"), "trapmap calc: --doping density must be in", "cm^-3"),
                bad(calc("--doping", "--doping", "p:1e6ohmcm"), "trapmap calc: --doping resistivity", "Ω·cm"),
                bad(calc("--defect", "--defect", "fe-x"), "trapmap calc: --defect 'fe-x' is not a known", "fe-i"),
                bad(calc("--defect"), "trapmap calc: --defect is required", "trapmap defects"),
                bad(calc("--injection", "--injection", "1e22"), "trapmap calc: --injection must be in", "cm^-3"),
                bad(calc("--injection", "--injection", "0"), "trapmap calc: --injection must be > 0 cm^-3"),
                bad(calc("", "--generation", "1e19"), "trapmap calc: --injection and --generation", "cm^-3 s^-1"),
                bad(calc("--injection"), "trapmap calc: --injection", "--generation", "required"),
                bad(calc("--injection", "--generation", "1e5"), "trapmap calc: --generation must be in",
                        "cm^-3 s^-1"),
                bad(new String[] {"calc", "--lifetime-us", "1000", "--doping", "p:1e16", "--generation", "1e24",
                    "--defect", "fe-i"},
                        "trapmap calc: --generation 1e24 cm^-3 s^-1 with --lifetime-us 1000 µs gives Δn = G·τ_eff"
                                + " = 1e21 cm^-3, but Δn must be in [1e6, 1e19] cm^-3"),
                bad(calc("", "--srv", "10"), "trapmap calc: --srv needs --thickness-um", "µm"),
                bad(calc("", "--thickness-um", "180", "--srv", "-1"), "trapmap calc: --srv must be >= 0 cm/s"),
                bad(calc("", "--temperature", "600"), "trapmap calc: --temperature must be in [77, 500] K (got 600)"),
                bad(calc("", "--temperature", "warm"), "trapmap calc: --temperature", "K"),
                bad(calc("", "--vth", "blue"), "trapmap calc: --vth must be fixed", "green"),
                bad(calc("", "--surface-model", "rough"), "trapmap calc: --surface-model must be sproul", "exact"),
                bad(calc("", "--reference-injection", "1e21"), "trapmap calc: --reference-injection", "cm^-3"),
                bad(calc("", "--injection"), "trapmap calc: --injection needs a value", "cm^-3"),
                bad(calc("", "--lifetime"), "trapmap calc: Unknown option", "--lifetime-us"),
                bad(calc("", "--defect-file", "does-not-exist.json"), "trapmap calc: --defect-file",
                        "does-not-exist.json", "no such"),
                bad(calc("", "--out", "x.csv"), "trapmap calc: --out needs --cases"),
                bad(calc("", "--cases", "x.csv"), "trapmap calc: --cases needs --out"),
                bad(calc("", "--cases", "does-not-exist.csv", "--out", "x.csv"), "trapmap calc: --cases",
                        "does-not-exist.csv", "no such file"),
                bad(new String[] {"calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "n:1e16",
                    "--injection", "1e13"}, "trapmap calc iron: --doping", "p-type"),
                bad(new String[] {"calc", "iron", "--after-us", "8", "--doping", "p:1e16", "--injection", "1e13"},
                        "trapmap calc iron: --before-us is required", "µs"),
                bad(new String[] {"calc", "iron", "--before-us", "20", "--after-us", "8", "--doping", "p:1e16",
                    "--injection", "1e20"}, "trapmap calc iron: --injection must be in", "cm^-3"),
                bad(new String[] {"calc", "iron", "--doping", "p:1e16"}, "trapmap calc iron: --before-us is required",
                        "µs", "also missing: --after-us, --injection"),
                bad(new String[] {"calc", "bo", "--degraded-us", "-40", "--annealed-us", "300"},
                        "trapmap calc bo: --degraded-us must be > 0 µs (got -40)"),
                bad(new String[] {"calc", "pl", "--counts", "1", "--reference-counts", "1", "--reference-lifetime-us",
                    "50", "--doping", "p:1e16"}, "trapmap calc pl: --generation is required", "cm^-3 s^-1"),
                bad(new String[] {"calc", "pl", "--counts", "many", "--reference-counts", "1",
                    "--reference-lifetime-us", "50", "--generation", "1e19", "--doping", "p:1e16"},
                        "trapmap calc pl: --counts must be a number in counts"),
                bad(new String[] {"defects", "--defect-file", "does-not-exist.json"}, "trapmap defects: --defect-file",
                        "does-not-exist.json"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("badInputs")
    void exitsTwoWithOneLine(String name, String[] args, String prefix, String[] mustContain) {
        Cli.Run r = Cli.run(args);
        assertThat(r.code()).as("exit code").isEqualTo(2);
        assertThat(r.out()).as("stdout").isEmpty();
        assertThat(r.errLines()).as("stderr lines").hasSize(1);
        String line = r.errLines().get(0);
        assertThat(line).startsWith(prefix).doesNotContain("Exception").doesNotContain("\tat ").doesNotContain("Usage:");
        for (String part : mustContain) {
            assertThat(line).contains(part);
        }
    }

    @Test
    void invalidFieldInADefectFileNamesFlagFileFieldAndUnit(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("bad.json");
        Files.writeString(file, "{\"id\": \"x1\", \"source\": \"s\", \"level\": {\"reference\": \"Ev\","
                + " \"energy_ev\": 0.3}, \"sigma_n_cm2\": 5.0, \"sigma_p_cm2\": 1e-15}");
        Cli.Run r = Cli.run(calc("", "--defect-file", file.toString()));
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap calc: --defect-file " + file).contains("'sigma_n_cm2'")
                .contains("cm^2");
    }

    @Test
    void malformedDefectFileIsOneLine(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("broken.json");
        Files.writeString(file, "{\"id\": \n\n");
        Cli.Run r = Cli.run("defects", "--defect-file", file.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap defects: --defect-file " + file + ": not valid JSON at line");
    }

    @Test
    void helpIsNotAnError() {
        Cli.Run r = Cli.run("calc", "--help");
        assertThat(r.code()).isZero();
        assertThat(r.err()).isEmpty();
        assertThat(r.out()).contains("Usage: trapmap calc");
    }
}
