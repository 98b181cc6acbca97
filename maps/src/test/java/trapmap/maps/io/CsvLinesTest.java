package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.Reader;
import java.io.StringReader;
import org.junit.jupiter.api.Test;

class CsvLinesTest {
    private static String readAll(Reader r) throws IOException {
        StringBuilder b = new StringBuilder();
        char[] buf = new char[3]; // small on purpose: state must carry across reads
        for (int n = r.read(buf, 0, buf.length); n >= 0; n = r.read(buf, 0, buf.length)) {
            b.append(buf, 0, n);
        }
        return b.toString();
    }

    @Test
    void readLineSplitsOnLfCrLfAndLoneCr() throws Exception {
        BufferedReader in = new BufferedReader(new StringReader("a\nb\r\nc\rd"));

        assertThat(CsvLines.readLine(in, "w.csv", 1)).isEqualTo("a");
        assertThat(CsvLines.readLine(in, "w.csv", 2)).isEqualTo("b");
        assertThat(CsvLines.readLine(in, "w.csv", 3)).isEqualTo("c");
        assertThat(CsvLines.readLine(in, "w.csv", 4)).isEqualTo("d");
        assertThat(CsvLines.readLine(in, "w.csv", 5)).isNull();
    }

    @Test
    void readLineRefusesALineBeyondTheLimitNamingItsNumber() {
        BufferedReader in = new BufferedReader(new StringReader("x".repeat(CsvLines.MAX_LINE_CHARS + 1)));

        assertThatThrownBy(() -> CsvLines.readLine(in, "w.csv", 7)).isInstanceOf(MapFormatException.class)
                .hasMessageContaining("w.csv").hasMessageContaining("line 7")
                .hasMessageContaining("longer than " + CsvLines.MAX_LINE_CHARS + " characters");
    }

    @Test
    void byteOrderMarkIsDroppedOnTheFirstLineOnly() {
        assertThat(CsvLines.stripBom("\uFEFFx_mm,y_mm", 1)).isEqualTo("x_mm,y_mm");
        assertThat(CsvLines.stripBom("\uFEFFx_mm,y_mm", 2)).isEqualTo("\uFEFFx_mm,y_mm");
    }

    @Test
    void concatReaderReadsTheFirstReaderThenTheSecond() throws Exception {
        Reader r = new CsvLines.ConcatReader(new StringReader("1,2\n"), new StringReader("3,4\n5,6"));

        assertThat(readAll(r)).isEqualTo("1,2\n3,4\n5,6");
    }

    @Test
    void lineLimitReaderPassesShortLinesAndCountsLinesAfterTheOffset() throws Exception {
        String text = "1,2\r\n3,4\r5,6\n";
        assertThat(readAll(new CsvLines.LineLimitReader(new StringReader(text), 0))).isEqualTo(text);

        String tooLong = "1\r\n2\n" + "9".repeat(CsvLines.MAX_LINE_CHARS + 1);
        assertThatThrownBy(() -> readAll(new CsvLines.LineLimitReader(new StringReader(tooLong), 10)))
                .isInstanceOfSatisfying(CsvLines.LineTooLong.class, e -> assertThat(e.line).isEqualTo(13));
    }

    @Test
    void whitespaceReaderTurnsRunsOfBlanksIntoOneTabAndDropsThemAtLineEnds() throws Exception {
        Reader r = new CsvLines.WhitespaceReader(new StringReader("  1   2\t \t3  \n4 5\r\n\t6\t"));

        assertThat(readAll(r)).isEqualTo("1\t2\t3\n4\t5\r\n6");
    }
}
