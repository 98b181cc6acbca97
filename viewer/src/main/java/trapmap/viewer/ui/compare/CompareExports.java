package trapmap.viewer.ui.compare;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.TableFiles;
import trapmap.maps.model.WaferMap;

/**
 * Writes what the compare and iron views show, without a display, through the maps module's writers (each file
 * atomically): the before map, the registered after map and every derived map (difference, ratio, relative change,
 * reduction, iron, iron status) as TIFF with metadata and history and as CSV ({@code x_mm,y_mm,value}), and the
 * paired statistics table as CSV ({@code figure,value,unit}).
 */
public final class CompareExports {
    /** Map file formats written, by extension. */
    public static final List<String> MAP_EXTENSIONS = List.of("tif", "csv");

    private CompareExports() {
    }

    /**
     * Writes the maps and the statistics of {@code r} into {@code folder} as {@code BASE-before.tif},
     * {@code BASE-after-registered.tif}, {@code BASE-<view>.tif} (and {@code .csv} each) and
     * {@code BASE-statistics.csv}.
     *
     * @return the files written, in that order
     */
    public static List<Path> write(CompareModel.Result r, Path folder, String base) throws IOException {
        List<Path> written = new ArrayList<>();
        List<Object[]> maps = new ArrayList<>();
        maps.add(new Object[] {"before", r.before()});
        maps.add(new Object[] {"after-registered", r.after()});
        for (CompareModel.View v : CompareModel.View.values()) {
            WaferMap m = r.derived(v);
            if (m != null) {
                maps.add(new Object[] {v.name().toLowerCase(Locale.ROOT).replace('_', '-'), m});
            }
        }
        for (Object[] e : maps) {
            for (String ext : MAP_EXTENSIONS) {
                Path f = folder.resolve(base + "-" + e[0] + "." + ext);
                MapFiles.write((WaferMap) e[1], f);
                written.add(f);
            }
        }
        Path stats = folder.resolve(base + "-statistics.csv");
        writeStatistics(r, stats);
        written.add(stats);
        return written;
    }

    /** The paired statistics table (with registration, iron figures and warnings) as CSV. */
    public static void writeStatistics(CompareModel.Result r, Path file) throws IOException {
        List<List<String>> rows = new ArrayList<>();
        for (String[] row : r.statisticsRows()) {
            rows.add(Arrays.asList(row));
        }
        TableFiles.writeCsv(file, List.of("figure", "value", "unit"), rows);
    }

    /** A file-name base for a pair, e.g. {@code LOT-A02-W05-compare}. */
    public static String baseName(CompareModel.Result r) {
        String id = r.before().waferId().isEmpty() ? "wafer" : r.before().waferId();
        return id.replaceAll("[^A-Za-z0-9._-]", "_") + (r.iron() != null ? "-iron" : "-compare");
    }
}
