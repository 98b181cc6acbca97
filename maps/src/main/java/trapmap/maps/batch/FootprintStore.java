package trapmap.maps.batch;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Base64;
import java.util.BitSet;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.io.CsvCells;

/**
 * The footprints of inspected wafers in {@code footprints.csv} beside the results, so that a resumed batch can
 * include wafers it does not read again in the recurrence map. One row per wafer: {@code file, family, pitch_mm,
 * min_i, min_j, width, height, covered, flagged}, the two cell sets as Base64 of {@link BitSet#toByteArray()}.
 */
final class FootprintStore {
    static final String[] COLUMNS = {"file", "family", "pitch_mm", "min_i", "min_j", "width", "height", "covered",
        "flagged"};

    private FootprintStore() {
    }

    static List<String> record(String file, Footprint f) {
        Base64.Encoder b64 = Base64.getEncoder();
        return List.of(CsvCells.text(file), CsvCells.text(f.family()), Double.toString(f.pitchMm()), Integer.toString(f.minI()),
                Integer.toString(f.minJ()), Integer.toString(f.width()), Integer.toString(f.height()),
                b64.encodeToString(f.covered().toByteArray()), b64.encodeToString(f.flagged().toByteArray()));
    }

    /** Adds the footprints of {@code file} (when it exists) to {@code into}, keyed by the file column; bad rows skipped. */
    static void read(Path file, Map<String, Footprint> into, java.util.function.UnaryOperator<String> key)
            throws IOException {
        if (!Files.isRegularFile(file)) {
            return;
        }
        Base64.Decoder b64 = Base64.getDecoder();
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            for (CSVRecord rec : p) {
                try {
                    Footprint f = new Footprint(CsvCells.raw(rec.get("family")), Double.parseDouble(rec.get("pitch_mm")),
                            Integer.parseInt(rec.get("min_i")), Integer.parseInt(rec.get("min_j")),
                            Integer.parseInt(rec.get("width")), Integer.parseInt(rec.get("height")),
                            BitSet.valueOf(b64.decode(rec.get("covered"))),
                            BitSet.valueOf(b64.decode(rec.get("flagged"))));
                    into.put(key.apply(CsvCells.raw(rec.get("file"))), f);
                } catch (IllegalArgumentException | IllegalStateException e) {
                    // a row cut short by an interruption: that wafer is simply left out of the recurrence map
                }
            }
        }
    }
}
