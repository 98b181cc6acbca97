package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class CsvLayoutTest {
    @Test
    void delimiterPrefersSemicolonThenCommaThenTabElseBlanks() {
        assertThat(CsvLayout.delimiter("1,5;2,5;3")).isEqualTo(';');
        assertThat(CsvLayout.delimiter("1.5,2.5\t3")).isEqualTo(',');
        assertThat(CsvLayout.delimiter("1.5\t2.5 3")).isEqualTo('\t');
        assertThat(CsvLayout.delimiter("1.5  2.5 3")).isEqualTo(' ');
    }

    @Test
    void aLineOfNamesStartsAPointListAndALineOfNumbersAGrid() {
        assertThat(CsvLayout.isPointList("x_mm,y_mm,value")).isTrue();
        assertThat(CsvLayout.isPointList("\"x\";\"y\";\"value [ms]\"")).isTrue();
        assertThat(CsvLayout.isPointList("1.5,NaN,,2e3")).isFalse();
        assertThat(CsvLayout.isPointList("1,5;2,5;nan")).isFalse(); // decimal commas under semicolons
        assertThat(CsvLayout.isPointList("\"1\" \"2\"   -3")).isFalse();
        assertThat(CsvLayout.isPointList("1,2,3a")).isTrue();
    }

    @Test
    void unquoteRemovesOnlyEnclosingDoubleQuotes() {
        assertThat(CsvLayout.unquote("\"value\"")).isEqualTo("value");
        assertThat(CsvLayout.unquote("\"value")).isEqualTo("\"value");
        assertThat(CsvLayout.unquote("\"")).isEqualTo("\"");
    }
}
