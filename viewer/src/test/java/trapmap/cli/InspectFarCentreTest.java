package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/**
 * A readable map whose wafer centre lies a billion millimetres from its data (centre_x_px −1e7 at 100 mm pitch) no
 * longer breaks the batch's recurrence maps: it is left out of them, the summary says why, and every recurrence map
 * written reads back.
 */
class InspectFarCentreTest {
    @TempDir
    Path dir;

    private static WaferMap map(String id, PixelGrid g) {
        float[] s = new float[g.width() * g.height()];
        java.util.Arrays.fill(s, 80f);
        return new WaferMap(FloatRaster.wrap(g.width(), g.height(), s), g, Quantity.EFFECTIVE_LIFETIME, id,
                MeasurementConditions.UNKNOWN, Provenance.of("test"));
    }

    @Test
    void theFarWaferIsLeftOutOfTheRecurrenceMapsAndTheSummaryIsWritten() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        MapFiles.write(map("far", new PixelGrid(20, 20, 100, -1e7, 10)), in.resolve("far.tif"));
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, "{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 10},"
                + " \"limits\": {\"invalid_area_fraction\": {\"max\": 1}}}");
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out", out.toString(),
                "--no-thumbnails");
        assertThat(r.out()).contains("1 wafers: 1 pass").doesNotContain("recurrence-");
        try (var files = Files.list(out)) {
            for (Path tif : files.filter(p -> p.getFileName().toString().matches("recurrence-.*\\.tif")).toList()) {
                MapFiles.readSingle(tif);
            }
        }
        assertThat(out.resolve("summary.pdf")).exists();
        try (PDDocument pdf = Loader.loadPDF(out.resolve("summary.pdf").toFile())) {
            String text = new PDFTextStripper().getText(pdf).replaceAll("\\s+", " ");
            assertThat(text).contains("Not in the recurrence maps: family ");
            assertThat(text).contains("beyond the 1000.0 mm a recurrence map covers");
        }
    }
}
