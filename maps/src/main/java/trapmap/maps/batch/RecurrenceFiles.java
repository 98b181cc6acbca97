package trapmap.maps.batch;

import java.io.IOException;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.io.CsvCells;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.maps.region.Region;

/**
 * The recurrence files of a folder, written alike by a batch and by the recurrence of a results-store query: per
 * recurrence map {@code recurrence-STEM.tif} (the fraction map) and {@code recurrence-STEM.png} (the picture with its
 * {@link HotSpots} outlined, {@link RecurrencePicture}), and the table {@value BatchInspection#RECURRENCE_NAME}
 * ({@code family, wafers, file}, led by a {@code group} column when the maps are grouped). Every file is written
 * atomically; a failure names the file ({@link BatchOutputException}).
 */
public final class RecurrenceFiles {
    /** Columns of {@value #HOT_SPOTS_NAME}. */
    public static final List<String> HOT_SPOT_COLUMNS = List.of("group", "family", "wafers", "spot", "cells",
            "peak_share", "centroid_x_mm", "centroid_y_mm");
    /** The hot spots of the recurrence maps, one row per hot spot. */
    public static final String HOT_SPOTS_NAME = "hotspots.csv";

    /**
     * One recurrence map to write.
     *
     * @param group      the group it belongs to (a value of a grouping fact), null when the maps are not grouped
     * @param recurrence the recurrence of one family
     * @param caption    what the picture's title names, e.g. {@code round-156, boat_slot 7}
     */
    public record Entry(String group, Recurrence recurrence, String caption) {
        public Entry {
            Objects.requireNonNull(recurrence, "recurrence");
            caption = caption == null ? recurrence.family() : caption;
        }

        /** An entry whose picture names the family only. */
        public Entry(String group, Recurrence recurrence) {
            this(group, recurrence, null);
        }
    }

    private RecurrenceFiles() {
    }

    /** The entries of a batch's recurrence: one per family, ungrouped, in family order. */
    public static List<Entry> of(RecurrenceMap recurrence) {
        List<Entry> out = new ArrayList<>();
        recurrence.families().values().forEach(r -> out.add(new Entry(null, r)));
        return out;
    }

    /**
     * Writes the recurrence maps, their pictures (when {@code pictures}; otherwise an earlier picture of the same name
     * is removed, as it would not match its map) and {@value BatchInspection#RECURRENCE_NAME} into {@code outDir}.
     *
     * @param grouped whether the table has a {@code group} column (entries of several groups)
     * @return the maps and pictures written, in order
     * @throws BatchOutputException naming the file that could not be written
     */
    public static List<Path> write(Path outDir, List<Entry> entries, boolean grouped, boolean pictures)
            throws BatchOutputException {
        List<Path> written = new ArrayList<>();
        StringBuilder table = new StringBuilder(grouped ? "group," : "")
                .append(String.join(",", BatchInspection.RECURRENCE_COLUMNS)).append('\n');
        Set<String> stems = new HashSet<>();
        for (Entry e : entries) {
            Recurrence r = e.recurrence();
            String stem = stem(e.group(), r.family(), stems);
            Path tif = outDir.resolve(stem + ".tif");
            OutputFolder.write(tif, () -> MapFiles.write(r.fraction(), tif));
            written.add(tif);
            Path png = outDir.resolve(stem + ".png");
            if (pictures) {
                Recurrence titled = e.caption().equals(r.family()) ? r
                        : new Recurrence(e.caption(), r.fraction(), r.wafersPerCell(), r.wafers());
                OutputFolder.write(png, () -> RecurrencePicture.write(titled,
                        HotSpots.find(r, HotSpots.Criteria.DEFAULT), png));
                written.add(png);
            } else {
                OutputFolder.write(png, () -> Files.deleteIfExists(png));
            }
            if (grouped) {
                table.append(CSVFormat.DEFAULT.format(CsvCells.text(String.valueOf(e.group())),
                        CsvCells.text(r.family()), r.wafers(), CsvCells.text(stem + ".tif")));
            } else {
                table.append(CSVFormat.DEFAULT.format(CsvCells.text(r.family()), r.wafers(),
                        CsvCells.text(stem + ".tif")));
            }
            table.append('\n');
        }
        Path csv = outDir.resolve(BatchInspection.RECURRENCE_NAME);
        OutputFolder.write(csv, () -> AtomicFiles.write(csv, table.toString().getBytes(StandardCharsets.UTF_8)));
        return written;
    }

    /**
     * The file stem of a map: {@code recurrence-FAMILY}, or {@code recurrence-GROUP-FAMILY} when grouped, characters
     * other than letters, digits, dot, underscore and hyphen as {@code _}; a stem already in {@code used} gets
     * {@code -2}, {@code -3}, ... so that no two maps share a file.
     */
    static String stem(String group, String family, Set<String> used) {
        String base = BatchInspection.RECURRENCE_PREFIX + (group == null ? "" : safe(group) + "-") + safe(family);
        String stem = base;
        for (int n = 2; !used.add(stem); n++) {
            stem = base + "-" + n;
        }
        return stem;
    }

    private static String safe(String name) {
        return name.replaceAll("[^A-Za-z0-9._-]", "_");
    }

    /**
     * The hot spots of the entries ({@link HotSpots}, criteria {@code criteria}) as rows of {@value #HOT_SPOTS_NAME},
     * by entry and then by area (largest first): group ("" when ungrouped), family, the family's wafers, the spot's
     * number, its cells, its highest share of wafers flagged (0 to 1) and its centroid, mm (wafer coordinates).
     */
    public static List<List<String>> hotSpotRows(List<Entry> entries, HotSpots.Criteria criteria) {
        List<List<String>> rows = new ArrayList<>();
        for (Entry e : entries) {
            Recurrence r = e.recurrence();
            for (Region g : HotSpots.find(r, criteria).regions().byArea()) {
                rows.add(List.of(e.group() == null ? "" : e.group(), r.family(), Integer.toString(r.wafers()),
                        Integer.toString(g.id()), Integer.toString(g.pixelCount()), NumberText.sample(g.peakValue()),
                        NumberText.mm(g.centroidXMm()), NumberText.mm(g.centroidYMm())));
            }
        }
        return rows;
    }

    /**
     * Writes {@value #HOT_SPOTS_NAME} ({@link #hotSpotRows}) into {@code outDir}, atomically.
     *
     * @throws BatchOutputException naming the file
     */
    public static Path writeHotSpots(Path outDir, List<Entry> entries, HotSpots.Criteria criteria)
            throws BatchOutputException {
        Path csv = outDir.resolve(HOT_SPOTS_NAME);
        OutputFolder.write(csv, () -> {
            StringWriter text = new StringWriter();
            try (CSVPrinter p = new CSVPrinter(text, CSVFormat.DEFAULT.builder()
                    .setHeader(HOT_SPOT_COLUMNS.toArray(String[]::new)).setRecordSeparator('\n').build())) {
                for (List<String> row : hotSpotRows(entries, criteria)) {
                    p.printRecord(row.stream().map(CsvCells::text).toList());
                }
            }
            AtomicFiles.write(csv, text.toString().getBytes(StandardCharsets.UTF_8));
        });
        return csv;
    }
}
