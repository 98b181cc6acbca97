package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** Text cells a spreadsheet could run get a quote in front (OWASP "CSV Injection"); numbers stay numbers. */
class CsvCellsTest {
    @ParameterizedTest
    @ValueSource(strings = {"=HYPERLINK(\"http://x\")", "=cmd|' /C calc'!A0", "+1+cmd|' /C calc'!A0", "-2+3",
        "@SUM(A1:A2)", "\t=1", "\r=1", "-", "+", "'quoted", "-Inf", "--1"})
    void riskyTextGetsOneQuoteAndReadsBackRaw(String text) {
        String cell = CsvCells.text(text);
        assertThat(cell).isEqualTo("'" + text);
        assertThat(CsvCells.raw(cell)).isEqualTo(text);
    }

    @ParameterizedTest
    @ValueSource(strings = {"-1.5", "+2", "-2.5E-4", "1e14", "-.5", "-Infinity", "NaN", "w07", "", "a=b", " =x",
        "lot-7", "peak_density_cm3"})
    void numbersAndPlainTextStayAsTheyAre(String text) {
        assertThat(CsvCells.text(text)).isEqualTo(text);
        assertThat(CsvCells.raw(CsvCells.text(text))).isEqualTo(text);
    }

    @Test
    void numberObjectsAreNeverQuotedAndFloatingPointOnesAreWrittenShortest() {
        assertThat(CsvCells.cell(-1.5)).isEqualTo("-1.5");
        assertThat(CsvCells.cell(-3)).isEqualTo(-3);
        assertThat(CsvCells.cell(0.1 + 0.2)).isEqualTo("0.30000000000000004");
        assertThat(CsvCells.cell(1e23)).isEqualTo("1E23");
        assertThat(CsvCells.cell(243.05972f)).isEqualTo("243.05972");
        assertThat(CsvCells.cell(Double.NaN)).isEqualTo("");
        assertThat(CsvCells.cell("=1")).isEqualTo("'=1");
    }

    @Test
    void tablesQuoteRiskyTextCellsOnly(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("t.csv");
        TableFiles.writeCsv(f, List.of("name", "value", "unit"),
                List.of(List.of("=cmd|' /C calc'!A0", -1.5, "us"), List.of("w1", "-2.5E-4", "@x")));
        assertThat(Files.readString(f)).isEqualTo("name,value,unit\n'=cmd|' /C calc'!A0,-1.5,us\n"
                + "w1,-2.5E-4,'@x\n");
    }
}
