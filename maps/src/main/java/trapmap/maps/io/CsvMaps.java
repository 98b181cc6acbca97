package trapmap.maps.io;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.Reader;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import trapmap.maps.model.WaferMap;

/**
 * CSV maps, read with commons-csv. Two layouts are recognised from the first line that is not a comment:
 * <ul>
 *   <li><b>Point list</b> — a header with columns {@code x_mm}, {@code y_mm} (or {@code x}, {@code y}; millimetres
 *       from the wafer centre, y upwards) and {@code value}, in any order, further columns ignored. The value column
 *       may carry the unit: {@code value_us}, {@code value(ms)}, {@code value [s]}. The points must lie on one
 *       regular square grid: the pitch is the most common positive spacing between distinct coordinates (smaller of
 *       x and y; distinct means more than 10⁻⁶ relative apart), each point must lie within 10⁻⁶ (relative) of a
 *       grid node, and grid nodes without a point are NaN. A pitch given in the comments or the sidecar is used
 *       instead of the inferred one. Points not on such a grid are refused unless {@link ReadOptions#csvResampling()}
 *       is on (see {@link ReadOptions.Resampling}); the resampled grid then has the pitch of
 *       {@link ReadOptions#resamplePitchMm()}, else the file's, else √(bounding-box area / points).</li>
 *   <li><b>Grid</b> — a plain matrix of numbers, one image row per line (first line = top row), separated by
 *       commas, semicolons (then a decimal comma is accepted), tabs or runs of spaces; an empty cell or
 *       {@code NaN} means no data.</li>
 * </ul>
 * Fields may be enclosed in double quotes, which are removed; a field cannot hold the delimiter or a line break, so
 * every record is one line (at most {@link CsvLines#MAX_LINE_CHARS} characters). Comment lines start with {@code #}. Those before the first data line may carry metadata as {@code # key=value}:
 * every top-level scalar field of the sidecar schema ({@code unit}, {@code quantity}, {@code wafer_id},
 * {@code pixel_pitch_mm}, {@code centre_x_px}, ...), every field of its {@code conditions} ({@code doping=p:1e16},
 * {@code thickness_um=180}, ...), and for point lists {@code width} and {@code height} (pixels; with the centre and
 * pitch they fix the raster exactly, as trapmap writes them). A sidecar beside the file takes precedence.
 *
 * <p>This class reads the leading comments and the first data line and hands the rest to the part for the layout:
 * {@link CsvLines} (lines and their limit), {@link CsvHeader} (metadata in comments), {@link CsvLayout} (delimiter,
 * point list or grid), {@link CsvPointList} with {@link PointGridding}, {@link CsvGrid}, {@link CsvNumbers}; and
 * {@link CsvMapWriter} writes.
 */
final class CsvMaps {
    /** Longest line accepted, characters (see {@link CsvLines#MAX_LINE_CHARS}). */
    static final int MAX_LINE_CHARS = CsvLines.MAX_LINE_CHARS;

    private CsvMaps() {
    }

    static MapBuilder.Raw read(MapSource file, String name, String source, Sidecar sidecar, ReadOptions options)
            throws MapFormatException {
        var decoder = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        try (BufferedReader in = new BufferedReader(new InputStreamReader(file.stream(), decoder),
                1 << 16)) {
            List<String> comments = new ArrayList<>();
            String first = null;
            int consumed = 0;
            for (String line = CsvLines.readLine(in, name, 1); line != null;
                 line = CsvLines.readLine(in, name, consumed + 2)) {
                consumed++;
                String t = CsvLines.stripBom(line, consumed).trim();
                if (t.isEmpty() || t.startsWith("#")) {
                    comments.add(t);
                    continue;
                }
                first = CsvLines.stripBom(line, consumed);
                break;
            }
            if (first == null) {
                throw new MapFormatException(name, null, "holds no data (only comments or empty lines)");
            }
            int offset = consumed - 1;
            CsvHeader header = CsvHeader.parse(comments, name);
            Sidecar meta = sidecar == null ? header.meta() : header.meta().overriddenBy(sidecar);
            char delimiter = CsvLayout.delimiter(first);
            boolean pointList = CsvLayout.isPointList(first);
            Reader rest = new CsvLines.LineLimitReader(
                    new CsvLines.ConcatReader(new StringReader(first + "\n"), in), offset);
            if (delimiter == ' ') {
                rest = new CsvLines.WhitespaceReader(rest);
                delimiter = '\t';
            }
            // No quote handling: a record is one line, so the line limit bounds every record (quotes are stripped
            // from single fields below).
            CSVFormat format = CSVFormat.DEFAULT.builder().setDelimiter(delimiter).setCommentMarker('#')
                    .setQuote(null).setIgnoreEmptyLines(true).setIgnoreSurroundingSpaces(true).setTrim(true).get();
            try (CSVParser parser = CSVParser.parse(rest, format)) {
                return pointList
                        ? CsvPointList.read(parser, offset, name, source, header, meta, options, delimiter)
                        : CsvGrid.read(parser, offset, name, source, header, meta, options, delimiter);
            }
        } catch (MapFormatException e) {
            throw e;
        } catch (CharacterCodingException e) {
            throw new MapFormatException(name, null, "is not UTF-8 text", "", e);
        } catch (UncheckedIOException e) {
            if (e.getCause() instanceof CharacterCodingException c) {
                throw new MapFormatException(name, null, "is not UTF-8 text", "", c);
            }
            if (e.getCause() instanceof CsvLines.LineTooLong t) {
                throw CsvLines.tooLong(name, t.line);
            }
            throw new MapFormatException(name, null, "cannot be read as CSV (" + e.getMessage() + ")", "", e);
        } catch (IOException e) {
            throw new MapFormatException(name, null, "cannot be read (" + e.getMessage() + ")", "", e);
        }
    }

    /**
     * Writes a point list {@code x_mm,y_mm,value} (no-data pixels left out) under comment lines giving wafer id,
     * quantity, unit, pitch, centre, raster size and conditions, so that the file reads back onto the same grid.
     */
    static void write(WaferMap map, Path target) throws IOException {
        CsvMapWriter.write(map, target);
    }
}
