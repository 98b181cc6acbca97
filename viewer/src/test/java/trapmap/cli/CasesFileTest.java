package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class CasesFileTest {
    @TempDir
    Path dir;

    private static List<CSVRecord> read(Path file, List<String> header) throws Exception {
        try (Reader r = Files.newBufferedReader(file);
             CSVParser p = CSVParser.parse(r, CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get())) {
            header.addAll(p.getHeaderNames());
            return p.getRecords();
        }
    }

    @Test
    void roundTripWithAnErrorRow() throws Exception {
        Path in = dir.resolve("in.csv");
        Path out = dir.resolve("out.csv");
        Files.writeString(in, String.join("\n",
                "wafer,lifetime_us,doping,injection,defect,temperature,thickness_um,srv,generation,vth",
                "A1,12.5,p:1e16,1e14,fe-i,,,,,",
                "A2,30,p:1.5ohmcm,,cr-i,310,180,10,1e19,green",
                "A3,12.5,p:1e16,1e14,fe-i,,-5,,,",
                "# a comment line",
                "A4,8,,,,,,,,",
                ""));
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", out.toString(), "--doping", "n:5e15",
                "--injection", "1e15", "--defect", "au-a");
        assertThat(r.code()).as("a row failed").isEqualTo(1);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("1 of 4 cases failed").contains(out.toString());
        assertThat(r.out()).contains("wrote 4 cases");

        List<String> header = new ArrayList<>();
        List<CSVRecord> rows = read(out, header);
        List<String> expected = new ArrayList<>(List.of("wafer", "lifetime_us", "doping", "injection", "defect",
                "temperature", "thickness_um", "srv", "generation", "vth"));
        for (String f : Calculation.FIELDS) {
            expected.add(f.equals("defect") ? "result_defect" : f);
        }
        expected.add("error");
        assertThat(header).containsExactlyElementsOf(expected);
        assertThat(rows).hasSize(4);

        // Each good row equals the single-case command with the same flags.
        JsonNode a1 = Cli.json("calc", "--lifetime-us", "12.5", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--json");
        assertRowMatches(rows.get(0), a1);
        assertThat(rows.get(0).get("wafer")).isEqualTo("A1");
        assertThat(rows.get(0).get("tau_surface_us")).as("null is an empty cell").isEmpty();
        JsonNode a2 = Cli.json("calc", "--lifetime-us", "30", "--doping", "p:1.5ohmcm", "--generation", "1e19",
                "--defect", "cr-i", "--temperature", "310", "--thickness-um", "180", "--srv", "10", "--vth", "green",
                "--json");
        assertRowMatches(rows.get(1), a2);
        assertThat(rows.get(1).get("warnings")).contains(a2.get("warnings").get(0).asText());

        CSVRecord bad = rows.get(2);
        assertThat(bad.get("wafer")).isEqualTo("A3");
        assertThat(bad.get("thickness_um")).as("input kept").isEqualTo("-5");
        assertThat(bad.get("status")).isEqualTo("ERROR");
        assertThat(bad.get("error")).isEqualTo("thickness_um must be > 0 µm (got -5)");
        assertThat(bad.get("trap_density_cm3")).isEmpty();

        // Blank cells take the command-line values.
        JsonNode a4 = Cli.json("calc", "--lifetime-us", "8", "--doping", "n:5e15", "--injection", "1e15",
                "--defect", "au-a", "--json");
        assertRowMatches(rows.get(3), a4);
        assertThat(rows.get(3).get("result_defect")).isEqualTo("au-a");

        try (Stream<Path> files = Files.list(dir)) {
            assertThat(files.map(p -> p.getFileName().toString())).as("no temporary file left")
                    .containsExactlyInAnyOrder("in.csv", "out.csv");
        }
    }

    private static void assertRowMatches(CSVRecord row, JsonNode json) {
        assertThat(row.get("status")).isEqualTo(json.get("status").asText());
        assertThat(row.get("error")).isEmpty();
        for (String f : List.of("trap_density_cm3", "trap_density_min_cm3", "trap_density_max_cm3", "occupancy",
                "tau_srh_us", "tau_intrinsic_us", "injection_cm3", "doping_cm3", "n1_cm3", "p1_cm3")) {
            assertThat(Double.parseDouble(row.get(f))).as(f).isEqualTo(json.get(f).asDouble());
        }
        if (!json.get("tau_surface_us").isNull()) {
            assertThat(Double.parseDouble(row.get("tau_surface_us"))).isEqualTo(json.get("tau_surface_us").asDouble());
        }
        assertThat(row.get("caution")).isEqualTo(Calculation.CAUTION);
    }

    @Test
    void allGoodRowsExitZeroAndReplaceTheOutput() throws Exception {
        Path in = dir.resolve("in.csv");
        Path out = dir.resolve("out.csv");
        Files.writeString(in, "Lifetime_US,doping,injection,defect,reference_injection\n"
                + "12.5,p:1e16,1e14,fe-i,1e15\n40,p:1e16,1e14,midgap,\n");
        Files.writeString(out, "old content\n");
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", out.toString());
        assertThat(r.code()).isZero();
        assertThat(r.err()).isEmpty();
        List<String> header = new ArrayList<>();
        List<CSVRecord> rows = read(out, header);
        assertThat(header.get(0)).as("input header kept as written").isEqualTo("Lifetime_US");
        assertThat(rows).extracting(x -> x.get("status")).containsExactly("OK", "OK");
        assertThat(Double.parseDouble(rows.get(0).get("lifetime_at_reference_us"))).isPositive();
        assertThat(rows.get(1).get("lifetime_at_reference_us")).isEmpty();
    }

    @Test
    void rowWithTooManyValuesIsAnErrorRow() throws Exception {
        Path in = dir.resolve("in.csv");
        Path out = dir.resolve("out.csv");
        Files.writeString(in, "lifetime_us,doping,injection,defect\n12.5,p:1e16,1e14,fe-i,extra\n"
                + "12.5,p:1e16,1e14,fe-i\n");
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", out.toString());
        assertThat(r.code()).isEqualTo(1);
        List<CSVRecord> rows = read(out, new ArrayList<>());
        assertThat(rows.get(0).get("status")).isEqualTo("ERROR");
        assertThat(rows.get(0).get("error")).contains("5 values").contains("4 columns");
        assertThat(rows.get(1).get("status")).isEqualTo("OK");
    }

    @Test
    void missingFoldersOfTheOutputAreCreatedAndTheFileIsTheSame() throws Exception {
        Path in = dir.resolve("in.csv");
        Files.writeString(in, "lifetime_us,doping,injection,defect,note\n12.5,p:1e16,1e14,fe-i,\"a, b\"\n"
                + "x,p:1e16,1e14,fe-i,bad\n");
        Path beside = dir.resolve("beside.csv");
        Path out = dir.resolve("missing-dir").resolve("deeper").resolve("out.csv");
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", beside.toString());
        Cli.Run created = Cli.run("calc", "--cases", in.toString(), "--out", out.toString());
        assertThat(created.code()).isEqualTo(r.code()).isEqualTo(1);
        assertThat(created.err()).doesNotContain("cannot write");
        assertThat(Files.readAllBytes(out)).isEqualTo(Files.readAllBytes(beside));
        try (var files = Files.list(out.getParent())) {
            assertThat(files).as("no temporary file left").containsExactly(out);
        }
    }

    @Test
    void unwritableOutputIsInvalidInput() throws Exception {
        Path in = dir.resolve("in.csv");
        Files.writeString(in, "lifetime_us,doping,injection,defect\n12.5,p:1e16,1e14,fe-i\n");
        Path file = dir.resolve("a-file");
        Files.writeString(file, "not a folder\n");
        Path out = file.resolve("out.csv");
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", out.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap calc: --out " + out + ": cannot write it");
        assertThat(Files.readString(file)).isEqualTo("not a folder\n");
    }

    @Test
    void sameFileForInputAndOutputIsRefused() throws Exception {
        Path in = dir.resolve("in.csv");
        Files.writeString(in, "lifetime_us\n1\n");
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", in.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.err()).contains("--out must differ from --cases");
        assertThat(Files.readString(in)).isEqualTo("lifetime_us\n1\n");
    }

    @Test
    void aBinaryCasesFileIsSaidToBeNoText() throws Exception {
        Path in = dir.resolve("map.csv");
        Files.write(in, new byte[] {'I', 'I', 42, 0, 8, 0, 0, 0, (byte) 0xfe, (byte) 0xff, (byte) 0x80, 10});
        Path out = dir.resolve("out.csv");
        Cli.Run r = Cli.run("calc", "--cases", in.toString(), "--out", out.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).containsExactly("trapmap calc: --cases " + in + ": is not UTF-8 text (a binary"
                + " file?); a CSV table of cases with a header row was expected");
        assertThat(out).doesNotExist();
    }
}
