package trapmap.maps.io;

import static trapmap.maps.io.CsvNumbers.lifetimeFactor;
import static trapmap.maps.io.CsvNumbers.unitForMessages;
import static trapmap.maps.io.CsvNumbers.value;

import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.model.ProcessingStep;

/**
 * The records of a CSV grid: one image row per line (first line = top row), every row with the same number of
 * values (a trailing delimiter aside), an empty cell or NaN for no data.
 */
final class CsvGrid {
    private CsvGrid() {
    }

    /** Reads the rows from {@code parser}, whose lines follow {@code offset} earlier ones. */
    static MapBuilder.Raw read(CSVParser parser, int offset, String name, String source, CsvHeader header,
                               Sidecar meta, ReadOptions options, char delimiter)
            throws MapFormatException {
        float[] s = new float[1024];
        int n = 0;
        int width = -1;
        int rows = 0;
        boolean trailing = false;
        int firstLine = offset + 1;
        String unit = unitForMessages(meta, null);
        double factor = lifetimeFactor(meta, null);
        try {
            for (CSVRecord r : parser) {
                int line = offset + (int) parser.getCurrentLineNumber();
                int size = r.size();
                if (width < 0) {
                    firstLine = line;
                    trailing = size > 1 && r.get(size - 1).isEmpty() && delimiter != '\t';
                    width = trailing ? size - 1 : size;
                }
                if (trailing && size == width + 1 && r.get(size - 1).isEmpty()) {
                    size--;
                }
                if (size != width) {
                    throw new MapFormatException(name, "line " + line, "has " + size + " value" + (size == 1 ? ""
                            : "s") + " but line " + firstLine + " has " + width + "; every row of a grid needs the"
                            + " same number");
                }
                if ((long) (rows + 1) * width > options.maxPixels()) {
                    throw new MapFormatException(name, "line " + line, "the grid exceeds the limit of "
                            + options.maxPixels() + " pixels (ReadOptions.maxPixels)");
                }
                if (n + width > s.length) {
                    s = Arrays.copyOf(s, (int) Math.min(ReadOptions.MAX_PIXELS_LIMIT,
                            Math.max((long) s.length * 2, (long) n + width)));
                }
                for (int i = 0; i < width; i++) {
                    s[n++] = value(r.get(i), name, line, unit, delimiter, factor);
                }
                rows++;
            }
        } catch (UncheckedIOException | IllegalStateException e) {
            throw CsvLines.malformed(e, parser, offset, name);
        }
        if (rows == 0) {
            throw new MapFormatException(name, null, "holds no data");
        }
        List<ProcessingStep> steps = new ArrayList<>();
        steps.add(ProcessingStep.of("read", "file", source, "format", "csv grid", "size", width + "x" + rows));
        return new MapBuilder.Raw(Arrays.copyOf(s, n), width, rows, false, header.meta(), null, null, steps,
                factor != 1);
    }
}
