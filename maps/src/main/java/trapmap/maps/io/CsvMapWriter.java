package trapmap.maps.io;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;

/** Writes a map as a CSV point list that {@link CsvMaps} reads back onto the same grid. */
final class CsvMapWriter {
    private CsvMapWriter() {
    }

    /**
     * Writes a point list {@code x_mm,y_mm,value} (no-data pixels left out; positions as
     * {@link NumberText#gridPosition}, values as the shortest text of their float) under comment lines giving wafer
     * id,
     * quantity, unit, pitch, centre, raster size and conditions, so that the file reads back onto the same grid.
     */
    static void write(WaferMap map, Path target) throws IOException {
        Sidecar.checkWritable(map.grid());
        List<String> comments = new ArrayList<>();
        comments.add("trapmap map");
        comments.add("wafer_id=" + map.waferId().replaceAll("\\R", " "));
        comments.add("quantity=" + map.quantity().key());
        comments.add("unit=" + Sidecar.asciiUnit(map.quantity().unit()));
        PixelGrid g = map.grid();
        comments.add("pixel_pitch_mm=" + NumberText.of(g.pitchMm()));
        comments.add("centre_x_px=" + NumberText.of(g.centreXPx()));
        comments.add("centre_y_px=" + NumberText.of(g.centreYPx()));
        comments.add("width=" + map.width());
        comments.add("height=" + map.height());
        MeasurementConditions c = map.conditions();
        Sidecar.conditionsJson(c).properties().forEach(e -> {
            if (!e.getKey().equals("extra")) {
                comments.add(e.getKey() + "=" + (e.getValue().isNumber() ? NumberText.of(e.getValue().asDouble())
                        : e.getValue().asText()));
            }
        });
        CSVFormat format = CSVFormat.DEFAULT.builder().setCommentMarker('#').setRecordSeparator('\n')
                .setHeaderComments(comments.toArray(new Object[0])).setHeader("x_mm", "y_mm", "value").get();
        float[] s = map.raster().samples();
        int w = map.width();
        String[] xMm = new String[w];
        for (int x = 0; x < w; x++) {
            xMm[x] = NumberText.gridPosition(x, g.centreXPx(), g.pitchMm());
        }
        try (Writer out = new BufferedWriter(Files.newBufferedWriter(target, StandardCharsets.UTF_8), 1 << 16);
             CSVPrinter printer = new CSVPrinter(out, format)) {
            for (int y = 0; y < map.height(); y++) {
                String yMm = NumberText.gridPosition(-y, -g.centreYPx(), g.pitchMm());
                for (int x = 0; x < w; x++) {
                    float v = s[y * w + x];
                    if (v == v) {
                        printer.printRecord(xMm[x], yMm, NumberText.of(v));
                    }
                }
            }
        }
    }
}
