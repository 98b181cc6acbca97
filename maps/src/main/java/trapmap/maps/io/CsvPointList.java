package trapmap.maps.io;

import static trapmap.maps.io.CsvLayout.unquote;
import static trapmap.maps.io.CsvNumbers.abbreviate;
import static trapmap.maps.io.CsvNumbers.coordinate;
import static trapmap.maps.io.CsvNumbers.lifetimeFactor;
import static trapmap.maps.io.CsvNumbers.unitForMessages;
import static trapmap.maps.io.CsvNumbers.value;

import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.model.ProcessingStep;

/**
 * The records of a CSV point list: the header line names the columns {@code x_mm}/{@code x}, {@code y_mm}/{@code y}
 * and {@code value} (optionally with its unit), each further line gives one point; {@link PointGridding} puts the
 * points on a raster.
 */
final class CsvPointList {
    private static final Pattern VALUE_UNIT = Pattern.compile("value\\s*(?:_\\s*(.+)|[(\\[]\\s*(.+?)\\s*[)\\]])");

    private CsvPointList() {
    }

    /**
     * Reads the header and the points from {@code parser} (whose lines follow {@code offset} earlier ones) and grids
     * them.
     */
    static MapBuilder.Raw read(CSVParser parser, int offset, String name, String source, CsvHeader header,
                               Sidecar meta, ReadOptions options, char delimiter)
            throws MapFormatException {
        int ix = -1;
        int iy = -1;
        int iv = -1;
        String columnUnit = null;
        double factor = 1;
        PointGridding.Points pts = new PointGridding.Points();
        int headerLine = offset + 1;
        boolean first = true;
        try {
            for (CSVRecord r : parser) {
                int line = offset + (int) parser.getCurrentLineNumber();
                if (first) {
                    first = false;
                    headerLine = line;
                    for (int i = 0; i < r.size(); i++) {
                        String h = unquote(r.get(i).trim()).toLowerCase(Locale.ROOT);
                        if (h.equals("x_mm") || h.equals("x")) {
                            ix = column(ix, i, h, name, line);
                        } else if (h.equals("y_mm") || h.equals("y")) {
                            iy = column(iy, i, h, name, line);
                        } else if (h.equals("value")) {
                            iv = column(iv, i, h, name, line);
                        } else {
                            Matcher m = VALUE_UNIT.matcher(h);
                            if (m.matches()) {
                                iv = column(iv, i, h, name, line);
                                columnUnit = m.group(1) != null ? m.group(1).trim() : m.group(2).trim();
                            }
                        }
                    }
                    if (ix < 0 || iy < 0 || iv < 0) {
                        String missing = ix < 0 ? "x_mm (or x)" : iy < 0 ? "y_mm (or y)" : "value";
                        throw new MapFormatException(name, "line " + line, "the header '" + abbreviate(
                                String.join(String.valueOf(delimiter), r.toList())) + "' has no column " + missing
                                + "; a point list needs x_mm, y_mm and value");
                    }
                    factor = lifetimeFactor(meta, columnUnit);
                    continue;
                }
                int needed = Math.max(ix, Math.max(iy, iv)) + 1;
                if (r.size() < needed) {
                    throw new MapFormatException(name, "line " + line, "has " + r.size() + " field"
                            + (r.size() == 1 ? "" : "s") + "; the header needs " + needed);
                }
                if (pts.n >= options.maxPixels()) {
                    throw new MapFormatException(name, "line " + line, "more than " + options.maxPixels()
                            + " points, the pixel limit (ReadOptions.maxPixels)");
                }
                double x = coordinate(r.get(ix), name, line, "x_mm", delimiter);
                double y = coordinate(r.get(iy), name, line, "y_mm", delimiter);
                float v = value(r.get(iv), name, line, unitForMessages(meta, columnUnit), delimiter, factor);
                pts.add(x, y, v, line);
            }
        } catch (UncheckedIOException | IllegalStateException e) {
            throw CsvLines.malformed(e, parser, offset, name);
        }
        if (pts.n == 0) {
            throw new MapFormatException(name, "line " + headerLine, "the header is followed by no points");
        }
        if (columnUnit != null) {
            String commentUnit = header.meta().unit();
            if (commentUnit != null && !Sidecar.normaliseUnit(commentUnit).equals(Sidecar.normaliseUnit(columnUnit))) {
                Integer l = header.lineOf().get("unit");
                throw new MapFormatException(name, "line " + headerLine, "the value column says unit '" + columnUnit
                        + "' but line " + l + " says unit '" + commentUnit + "'");
            }
        }
        Sidecar embedded = header.meta();
        if (columnUnit != null && embedded.unit() == null) {
            embedded = new Sidecar(embedded.waferId(), embedded.quantity(), columnUnit, embedded.pixelPitchMm(),
                    embedded.centreXPx(), embedded.centreYPx(), embedded.scale(), embedded.offset(),
                    embedded.noData(), embedded.conditions(), null, null, embedded.warnings());
        }
        List<ProcessingStep> steps = new ArrayList<>();
        steps.add(ProcessingStep.of("read", "file", source, "format", "csv point list", "points",
                Integer.toString(pts.n)));
        return PointGridding.raster(pts, name, meta, header, embedded, steps, options, factor != 1);
    }

    private static int column(int current, int index, String header, String name, int line)
            throws MapFormatException {
        if (current >= 0) {
            throw new MapFormatException(name, "line " + line, "the header has two columns for '" + header + "'");
        }
        return index;
    }
}
