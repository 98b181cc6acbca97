package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.util.List;

/** Runs {@code trapmap} in-process with captured output. */
final class Cli {
    private static final ObjectMapper JSON = new ObjectMapper();

    private Cli() {
    }

    /** Exit code and captured streams of one run. */
    record Run(int code, String out, String err) {
        List<String> errLines() {
            return err.isEmpty() ? List.of() : List.of(err.split("\\R"));
        }
    }

    static Run run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = TrapmapCommand.run(new PrintWriter(out), new PrintWriter(err), args);
        return new Run(code, out.toString(), err.toString());
    }

    /** Runs a command that must succeed and print JSON, and parses its output. */
    static JsonNode json(String... args) {
        Run r = run(args);
        assertThat(r.err()).as("stderr").isEmpty();
        assertThat(r.code()).as("exit code").isZero();
        return parse(r.out());
    }

    static JsonNode parse(String text) {
        try {
            return JSON.readTree(text);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new UncheckedIOException(e);
        }
    }
}
