package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;

class CsvMapsTest {
    @TempDir
    Path dir;

    private Path file(String name, String text) throws Exception {
        Path f = dir.resolve(name);
        Files.writeString(f, text);
        return f;
    }

    private static final float NAN = Float.NaN;

    @Test
    void pointListOnARegularGridBecomesARasterWithNanForMissingPoints() throws Exception {
        // 3 x 2 grid at 0.5 mm, point (0.5, 0) missing
        Path f = file("w.csv", "x_mm,y_mm,value\n"
                + "-0.5,0.5,1\n0,0.5,2\n0.5,0.5,3\n"
                + "-0.5,0,4\n0,0,5\n");

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.grid()).isEqualTo(new PixelGrid(3, 2, 0.5, 1, 1));
        assertThat(m.raster().samples()).containsExactly(1, 2, 3, 4, 5, NAN);
        assertThat(m.grid().xMm(0)).isEqualTo(-0.5);
        assertThat(m.grid().yMm(0)).isEqualTo(0.5);
    }

    @Test
    void pitchIsTheMostCommonSpacingAndGapsAreNan() throws Exception {
        // spacing 2 mm with one column missing (a gap of 4 mm) and rows 2 mm apart; points in any order
        Path f = file("w.csv", "value,y,x\n7,2,4\n1,0,0\n2,0,2\n3,0,6\n4,2,0\n5,2,2\n");

        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.grid().pitchMm()).isEqualTo(2.0);
        assertThat(m.width()).isEqualTo(4);
        assertThat(m.raster().samples()).containsExactly(4, 5, 7, NAN, 1, 2, NAN, 3);
    }

    @Test
    void coordinatesWithRoundingNoiseStillFitTheGrid() throws Exception {
        StringBuilder s = new StringBuilder("x_mm,y_mm,value\n");
        for (int y = 0; y < 4; y++) {
            for (int x = 0; x < 5; x++) {
                s.append(String.format(Locale.ROOT, "%.9f,%.9f,%d%n", x * 0.1 + 1e-10 * (x % 3), -y * 0.1, y * 5 + x));
            }
        }
        WaferMap m = MapFiles.readSingle(file("noisy.csv", s.toString()));
        assertThat(m.grid().pitchMm()).isEqualTo(0.1);
        assertThat(m.raster().samples()[19]).isEqualTo(19);
    }

    @Test
    void unitCommentConvertsToMicroseconds() throws Exception {
        WaferMap m = MapFiles.readSingle(file("ms.csv", "# unit=ms\n# wafer_id=A12\nx,y,value\n0,0,1.5\n1,0,2\n"));
        assertThat(m.raster().samples()).containsExactly(1500, 2000);
        assertThat(m.waferId()).isEqualTo("A12");
        assertThat(m.provenance().steps()).contains(ProcessingStep.of("convert-unit", "from", "ms", "to", "µs",
                "factor", "1000"));
    }

    @ParameterizedTest
    @ValueSource(strings = {"value_s", "value(s)", "value [s]", "VALUE_S"})
    void valueColumnMayCarryTheUnit(String column) throws Exception {
        WaferMap m = MapFiles.readSingle(file("s.csv", "x_mm,y_mm," + column + "\n0,0,0.001\n1,0,2e-6\n"));
        assertThat(m.raster().samples()).containsExactly(1000, 2);
    }

    @Test
    void columnAndCommentUnitsMustAgree() throws Exception {
        Path f = file("clash.csv", "# unit=ms\nx,y,value_us\n0,0,1\n");
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": line 2: the value column says unit 'us' but line 1 says unit 'ms'");
    }

    @Test
    void scatteredPointsAreRefusedNamingTheFirstStrayPoint() throws Exception {
        StringBuilder s = new StringBuilder("x_mm,y_mm,value\n");
        for (int y = 0; y < 10; y++) {
            for (int x = 0; x < 10; x++) {
                s.append(x).append(',').append(y).append(",1\n");
            }
        }
        s.append("3.37,4.5,2\n");
        Path f = file("stray.csv", s.toString());

        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessageStartingWith(f + ": line 102: point (3.37, 4.5) mm is not on the regular grid of pitch 1"
                        + " mm inferred from the most common spacing; its x lies between the grid columns at x = 3"
                        + " and 4 mm and its y lies between the grid rows at y = 4 and 5 mm; the points of a CSV map"
                        + " must lie on a regular grid")
                .hasMessageContaining("correct or remove line 102")
                .hasMessageNotContaining("ReadOptions");
    }

    @Test
    void sparsePointsWithDecimalCoordinatesAreTakenAsScattered() throws Exception {
        Path f = file("few.csv", "x,y,value\n0,0,1\n1.3,0.2,2\n0.1,0.9,3\n");
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessageContaining("the 3 points do not form a regular grid")
                .hasMessageContaining("give pixel_pitch_mm").hasMessageNotContaining("ReadOptions");
    }

    private Path scattered(int n, long seed) throws Exception {
        Random r = new Random(seed);
        StringBuilder s = new StringBuilder("x_mm,y_mm,value\n");
        for (int i = 0; i < n; i++) {
            double x = 10 * r.nextDouble();
            double y = 10 * r.nextDouble();
            s.append(String.format(Locale.ROOT, "%.6f,%.6f,%.4f%n", x, y, 100 + x + 2 * y));
        }
        return file("scattered.csv", s.toString());
    }

    @Test
    void scatteredPointsAreResampledByNearestPointWhenAsked() throws Exception {
        Path f = scattered(400, 1);
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessageContaining("scattered");

        WaferMap m = MapFiles.readSingle(f, ReadOptions.DEFAULTS.withCsvResampling(ReadOptions.Resampling.NEAREST)
                .withResamplePitch(0.5));
        assertThat(m.grid().pitchMm()).isEqualTo(0.5);
        assertThat(m.width()).isBetween(19, 21);
        // a plane sampled at nearest points: every pixel within one point spacing of the plane
        for (int y = 0; y < m.height(); y++) {
            for (int x = 0; x < m.width(); x++) {
                float v = m.raster().get(x, y);
                if (v == v) {
                    assertThat((double) v).isCloseTo(100 + m.grid().xMm(x) + 2 * m.grid().yMm(y), within(2.5));
                }
            }
        }
        assertThat(m.raster().validCount()).isGreaterThan(m.raster().size() * 8 / 10);
        assertThat(m.provenance().steps()).anySatisfy(st -> assertThat(st.operation()).isEqualTo("resample"));
    }

    @Test
    void inverseDistanceResamplingReproducesAPlaneCloselyAndEstimatesThePitch() throws Exception {
        Path f = scattered(900, 2);
        WaferMap m = MapFiles.readSingle(f, ReadOptions.DEFAULTS.withCsvResampling(
                ReadOptions.Resampling.INVERSE_DISTANCE));
        // √(area / points) ≈ √(100 / 900)
        assertThat(m.grid().pitchMm()).isCloseTo(1 / 3.0, within(0.02));
        int checked = 0;
        for (int y = 2; y < m.height() - 2; y++) {
            for (int x = 2; x < m.width() - 2; x++) {
                float v = m.raster().get(x, y);
                if (v == v) {
                    assertThat((double) v).isCloseTo(100 + m.grid().xMm(x) + 2 * m.grid().yMm(y), within(1.0));
                    checked++;
                }
            }
        }
        assertThat(checked).isGreaterThan(500);
        assertThat(m.provenance().steps()).anySatisfy(st -> assertThat(st.parameters())
                .containsEntry("method", "inverse-distance"));
    }

    @Test
    void resamplingPointsAlreadyOnAGridKeepsThem() throws Exception {
        Path f = file("g.csv", "x,y,value\n0,0,1\n1,0,2\n0,1,3\n1,1,4\n");
        WaferMap m = MapFiles.readSingle(f, ReadOptions.DEFAULTS.withCsvResampling(ReadOptions.Resampling.NEAREST));
        assertThat(m.raster().samples()).containsExactly(3, 4, 1, 2);
    }

    @Test
    void duplicatePointsAreRefused() throws Exception {
        Path f = file("dup.csv", "x,y,value\n0,0,1\n1,0,2\n0,0,3\n");
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": line 4: point (0, 0) mm falls on the same pixel as the point of line 2");
    }

    @Test
    void badValueNamesLineAndUnit() throws Exception {
        StringBuilder s = new StringBuilder("x_mm,y_mm,value\n");
        for (int i = 0; i < 10; i++) {
            s.append(i).append(",0,").append(i == 8 ? "abc" : "5").append('\n');
        }
        Path f = file("wafer07.csv", s.toString());
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": line 10: value 'abc' is not a number (µs)")
                .satisfies(e -> assertThat(((MapFormatException) e).unit()).isEqualTo("µs"));
    }

    @Test
    void badCoordinateNamesColumnAndMillimetres() throws Exception {
        Path f = file("c.csv", "x_mm,y_mm,value\n0,zero,1\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 2: y_mm 'zero' is not a number (mm)");
    }

    @Test
    void headerWithoutValueColumnIsRefused() throws Exception {
        Path f = file("h.csv", "x_mm,y_mm,tau\n0,0,1\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 1: the header 'x_mm,y_mm,tau' has no"
                + " column value; a point list needs x_mm, y_mm and value");
    }

    @Test
    void shortRecordIsRefused() throws Exception {
        Path f = file("short.csv", "x_mm,y_mm,value\n0,0,1\n1,0\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 3: has 2 fields; the header needs 3");
    }

    @Test
    void valueBeyondFloatRangeIsRefused() throws Exception {
        Path f = file("big.csv", "# unit=counts\n# quantity=pl-counts\nx,y,value\n0,0,1e39\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 4: value '1e39' is beyond the 32-bit"
                + " float range (counts)");
    }

    @Test
    void gridOfCommaSeparatedNumbersWithEmptyAndNanCells() throws Exception {
        Path f = file("grid.csv", "# pixel_pitch_mm=0.5\n1,2,,4\nNaN,6,7,8\n");
        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.raster().samples()).containsExactly(1, 2, NAN, 4, NAN, 6, 7, 8);
        assertThat(m.grid()).isEqualTo(PixelGrid.centred(4, 2, 0.5));
        assertThat(m.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(m.provenance().steps()).extracting(st -> st.parameters().get("note"))
                .contains("unit assumed: µs");
    }

    @Test
    void gridWithSemicolonsAndDecimalCommas() throws Exception {
        WaferMap m = MapFiles.readSingle(file("eu.csv", "1,5;2,25\n3;4e-1\n"));
        assertThat(m.raster().samples()).containsExactly(1.5f, 2.25f, 3, 0.4f);
    }

    @Test
    void gridSeparatedByRunsOfSpaces() throws Exception {
        WaferMap m = MapFiles.readSingle(file("ws.txt", "  1   2  3\n4 nan    6  \n\n"));
        assertThat(m.raster().samples()).containsExactly(1, 2, 3, 4, NAN, 6);
    }

    @Test
    void gridSeparatedByTabsKeepsEmptyCells() throws Exception {
        WaferMap m = MapFiles.readSingle(file("tab.tsv", "1\t\t3\n4\t5\t6\n"));
        assertThat(m.raster().samples()).containsExactly(1, NAN, 3, 4, 5, 6);
    }

    @Test
    void gridWithTrailingDelimitersOnEveryLine() throws Exception {
        WaferMap m = MapFiles.readSingle(file("trail.csv", "1,2,\n3,4,\n"));
        assertThat(m.width()).isEqualTo(2);
        assertThat(m.raster().samples()).containsExactly(1, 2, 3, 4);
    }

    @Test
    void raggedGridIsRefused() throws Exception {
        Path f = file("rag.csv", "# comment\n1,2,3\n4,5\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 3: has 2 values but line 2 has 3; every row"
                + " of a grid needs the same number");
    }

    @Test
    void badCommentMetadataNamesLineAndField() throws Exception {
        Path f = file("meta.csv", "# unit=us\n# pixel_pitch_mm=fine\n1,2\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 2, field 'pixel_pitch_mm': must be a number"
                + " but is a text (\"fine\") (mm)");
    }

    @Test
    void conditionsMayBeGivenInComments() throws Exception {
        WaferMap m = MapFiles.readSingle(file("cond.csv", "# doping=p:1.5ohmcm\n# thickness_um=170\n1,2\n"));
        assertThat(m.conditions().thicknessUm()).isEqualTo(170.0);
        // ASTM F723 boron fit at 1.5 Ω·cm: 9.4175e15 cm^-3 (computed; docs/check-values.md R-ASTM-1), 0.1 %
        assertThat(m.conditions().doping().densityPerCm3()).isCloseTo(9.4175e15,
                org.assertj.core.data.Percentage.withPercentage(0.1));
    }

    @Test
    void writtenCsvReadsBackOntoTheSameGrid() throws Exception {
        WaferMap map = Fixtures.lifetimeMap(13, 11, 6);
        Path f = dir.resolve("out.csv");
        MapFiles.write(map, f);

        String text = Files.readString(f);
        assertThat(text).startsWith("# trapmap map\n# wafer_id=w07\n# quantity=effective-lifetime\n# unit=us\n");
        assertThat(text).contains("\nx_mm,y_mm,value\n").contains("# doping=p:1.5E16");
        WaferMap back = MapFiles.readSingle(f);
        assertThat(back.grid()).isEqualTo(map.grid());
        assertThat(Fixtures.canonicalBits(back.raster().samples()))
                .isEqualTo(Fixtures.canonicalBits(map.raster().samples()));
        assertThat(back.quantity()).isEqualTo(map.quantity());
        assertThat(back.waferId()).isEqualTo("w07");
        assertThat(back.conditions().doping()).isEqualTo(map.conditions().doping());
        assertThat(back.conditions().thicknessUm()).isEqualTo(180.0);
    }

    @Test
    void onlyCommentsIsRefused() throws Exception {
        Path f = file("empty.csv", "# unit=us\n\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": holds no data (only comments or empty lines)");
    }

    @Test
    void notUtf8IsRefused() throws Exception {
        Path f = dir.resolve("latin.csv");
        Files.write(f, new byte[] {'1', ',', (byte) 0xE9, '\n'});
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": is not UTF-8 text");
    }

    @Test
    void quotedFieldsAreAcceptedAndStrayQuotesAreNoNumbers() throws Exception {
        WaferMap m = MapFiles.readSingle(file("q.csv", "\"x_mm\",\"y_mm\",\"value\"\n\"0\",0,\"1.5\"\n"));
        assertThat(m.raster().samples()).containsExactly(1.5f);
        Path f = file("q2.csv", "x,y,value\n0,0,\"1\n1,0,2\n");
        assertThatThrownBy(() -> MapFiles.read(f)).hasMessage(f + ": line 2: value '\"1' is not a number (µs)");
    }

    @Test
    void overlongLinesAreRefusedWithoutReadingThemWhole() throws Exception {
        String row = "1,".repeat(CsvMaps.MAX_LINE_CHARS / 2 + 10);
        Path first = file("long1.csv", row + "\n");
        assertThatThrownBy(() -> MapFiles.read(first)).hasMessage(first + ": line 1: is longer than "
                + CsvMaps.MAX_LINE_CHARS + " characters; this is not a map in CSV form");
        Path later = file("long2.csv", "# c\n1,2\n\n" + row + "\n");
        assertThatThrownBy(() -> MapFiles.read(later)).hasMessage(later + ": line 4: is longer than "
                + CsvMaps.MAX_LINE_CHARS + " characters; this is not a map in CSV form");
    }

    @Test
    void sidecarGivesThePitchOfAPointList() throws Exception {
        Path f = file("p.csv", "x,y,value\n0,0,1\n3,0,2\n");
        Files.writeString(dir.resolve("p.json"), "{\"pixel_pitch_mm\": 1.5}");
        WaferMap m = MapFiles.readSingle(f);
        assertThat(m.grid().pitchMm()).isEqualTo(1.5);
        assertThat(m.raster().samples()).containsExactly(1, NAN, 2);
    }
}
