package trapmap.maps.io;

import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import trapmap.shared.check.Checks;

/** Small tables (statistics, figures) written as CSV, atomically ({@link AtomicFiles}). */
public final class TableFiles {
    private TableFiles() {
    }

    /**
     * Writes a header row and the rows as UTF-8 CSV (RFC 4180 quoting, {@code \n} line ends); readers see either the
     * old file or the complete new one. Text cells that a spreadsheet could take for a formula are written as
     * {@link CsvCells#text} makes them.
     *
     * @throws IllegalArgumentException when a row's length differs from the header's
     */
    public static void writeCsv(Path file, List<String> header, List<? extends List<?>> rows) throws IOException {
        Checks.notNull(file, "file");
        Checks.notNull(header, "header");
        Checks.notNull(rows, "rows");
        for (List<?> r : rows) {
            if (r.size() != header.size()) {
                throw new IllegalArgumentException("a row has " + r.size() + " cells but the header " + header.size()
                        + ": " + r);
            }
        }
        CSVFormat format = CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get();
        AtomicFiles.write(file, tmp -> {
            try (Writer w = Files.newBufferedWriter(tmp, StandardCharsets.UTF_8);
                 CSVPrinter csv = new CSVPrinter(w, format)) {
                csv.printRecord(header);
                for (List<?> r : rows) {
                    csv.printRecord(r.stream().map(CsvCells::cell).toList());
                }
            }
        });
    }
}
