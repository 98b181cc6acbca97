package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/** {@code inspect} reports invalid_area_fraction in results.csv and results.json and applies its default limit. */
class InspectInvalidAreaTest {
    private static final int N = 101;
    private static final PixelGrid GRID = PixelGrid.centred(N, N, 1.0);

    @TempDir
    Path dir;

    /** 100 µs on a 100 mm wafer with the first {@code share} of the evaluated pixels at 0 µs. */
    private void wafer(Path in, String name, double share) throws Exception {
        Mask area = WaferFormat.byId("round-100-flat").shape().mask(GRID, 5);
        float[] s = new float[N * N];
        for (int i = 0; i < s.length; i++) {
            s[i] = Math.hypot(GRID.xMm(i % N), GRID.yMm(i / N)) > 50 ? Float.NaN : 100f;
        }
        int zeros = (int) Math.floor(share * area.count());
        for (int i = area.nextIndex(0), k = 0; k < zeros; i = area.nextIndex(i + 1), k++) {
            s[i] = 0f;
        }
        MapFiles.write(new WaferMap(FloatRaster.wrap(N, N, s), GRID, Quantity.EFFECTIVE_LIFETIME, name,
                MeasurementConditions.UNKNOWN, Provenance.of("test")), in.resolve(name + ".tif"));
    }

    @Test
    void aWaferWithAThirdOfItsAreaAtZeroFailsTheDefaultLimit() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        wafer(in, "clean", 0);
        wafer(in, "zeros", 0.34);
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, "{\"wafer\": \"round-100-flat\", \"edge_exclusion_mm\": 5,"
                + " \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1e-6}}");
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out", out.toString(),
                "--no-thumbnails");
        assertThat(r.out()).contains("2 wafers: 1 pass, 1 fail, 0 error");
        List<CSVRecord> rows = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get()
                .parse(Files.newBufferedReader(out.resolve("results.csv"))).getRecords();
        assertThat(rows.get(0).get("invalid_area_fraction")).isEqualTo("0");
        assertThat(rows.get(0).get("status")).isEqualTo("pass");
        assertThat(rows.get(1).get("status")).isEqualTo("fail");
        assertThat(rows.get(1).get("failed_rules")).isEqualTo("invalid_area_fraction 0.34 > 0.05 (default limit)");
        assertThat(Double.parseDouble(rows.get(1).get("invalid_area_fraction"))).isBetween(0.339, 0.340);
        JsonNode json = Cli.parse(Files.readString(out.resolve("results.json")));
        assertThat(json.get("wafers").get(1).get("invalid_area_fraction").asDouble())
                .isEqualTo(Double.parseDouble(rows.get(1).get("invalid_area_fraction")));
        assertThat(out.resolve("summary.pdf")).exists();
    }
}
