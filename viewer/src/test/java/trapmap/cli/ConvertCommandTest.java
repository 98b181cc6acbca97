package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.assertj.core.data.Percentage;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.material.Doping;

class ConvertCommandTest {
    @TempDir
    Path dir;

    private Path lifetimeMap(MeasurementConditions c) throws Exception {
        float[] tau = new float[6 * 4];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = 5 + 10 * i;
        }
        tau[3] = Float.NaN;
        WaferMap map = new WaferMap(FloatRaster.wrap(6, 4, tau), PixelGrid.centred(6, 4, 1.0),
                Quantity.EFFECTIVE_LIFETIME, "t1", c, Provenance.of("test"));
        Path file = dir.resolve("t1.tif");
        MapFiles.write(map, file);
        return file;
    }

    @Test
    void anOutputOntoTheInputIsRefusedAndTheInputKept() throws Exception {
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, null, 1e14, null, 10.0, null,
                null, Map.of());
        Path in = lifetimeMap(c);
        byte[] before = java.nio.file.Files.readAllBytes(in);
        for (String[] args : new String[][] {{"--defect", "fe-i"}, {}, {"--defect", "fe-i", "--quantity",
                "exceedance-probability", "--threshold", "1e11"}}) {
            java.util.List<String> line = new java.util.ArrayList<>(java.util.List.of("convert", in.toString(), "-o",
                    in.toString()));
            line.addAll(java.util.List.of(args));
            Cli.Run r = Cli.run(line.toArray(String[]::new));
            assertThat(r.code()).as(String.join(" ", args)).isEqualTo(2);
            assertThat(r.errLines()).hasSize(1);
            assertThat(r.err()).startsWith("trapmap convert: --output " + in + " would overwrite " + in)
                    .contains("input files are never modified");
            assertThat(java.nio.file.Files.readAllBytes(in)).isEqualTo(before);
        }
    }

    @Test
    void everyPixelOfTheWrittenMapEqualsThePointCalculator() throws Exception {
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, null, 1e14, null, 10.0, null,
                null, Map.of());
        Path in = lifetimeMap(c);
        Path out = dir.resolve("nt.tif");
        Cli.Run r = Cli.run("convert", in.toString(), "--defect", "fe-i", "-o", out.toString());
        assertThat(r.err()).isEmpty();
        assertThat(r.code()).isZero();
        assertThat(r.out()).containsPattern("(?m)^pixels: \\d+ ok, \\d+ below the detection limit, \\d+ invalid, 1 no data$")
                .doesNotContain("OK=").doesNotContain("{");
        WaferMap nt = MapFiles.readSingle(out);
        assertThat(nt.quantity()).isEqualTo(Quantity.TRAP_DENSITY);
        assertThat(nt.raster().get(3, 0)).isNaN();
        for (int i : new int[] {0, 5, 23}) {
            double tau = 5 + 10 * i;
            JsonNode calc = Cli.json("calc", "--lifetime-us", Double.toString(tau), "--doping", "p:1e16",
                    "--injection", "1e14", "--defect", "fe-i", "--thickness-um", "180", "--srv", "10", "--json");
            assertThat((double) nt.raster().samples()[i])
                    .isCloseTo(calc.get("trap_density_cm3").asDouble(), Percentage.withPercentage(1e-5));
        }
        assertThat(nt.provenance().steps()).anySatisfy(s -> assertThat(s.operation()).isEqualTo("convert"));
    }

    @Test
    void flagsOverrideTheSidecarAndCsvOutputHasCoordinates() throws Exception {
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e15), null, null, 1e13, null, null, null,
                null, Map.of());
        Path in = lifetimeMap(c);
        Path out = dir.resolve("occ.csv");
        JsonNode summary = Cli.json("convert", in.toString(), "--defect", "fe-i", "--doping", "p:1e16",
                "--injection", "1e14", "--quantity", "occupancy", "-o", out.toString(), "--json");
        assertThat(summary.get("quantity").asText()).isEqualTo("occupancy");
        assertThat(summary.get("pixels_by_status").get("NO_DATA").asInt()).isEqualTo(1);
        JsonNode calc = Cli.json("calc", "--lifetime-us", "5", "--doping", "p:1e16", "--injection", "1e14",
                "--defect", "fe-i", "--json");
        String firstRow = Files.readAllLines(out).stream().filter(l -> !l.startsWith("#")).skip(1).findFirst()
                .orElseThrow();
        for (String line : Files.readAllLines(out).stream().filter(l -> !l.startsWith("#")).skip(1).toList()) {
            String[] cell = line.split(",");
            assertThat(cell[0]).matches("-?\\d+(\\.[1-9])?"); // pitch 1 mm around a half-pixel centre: no 0.49999…
            assertThat(cell[1]).matches("-?\\d+(\\.[1-9])?");
            assertThat(cell[2]).isEqualTo(trapmap.maps.io.NumberText.of(Float.parseFloat(cell[2])));
        }
        String[] cells = firstRow.split(",");
        assertThat(Double.parseDouble(cells[0])).isEqualTo(-2.5);
        assertThat(Double.parseDouble(cells[1])).isEqualTo(1.5);
        assertThat(Double.parseDouble(cells[2])).isCloseTo(calc.get("occupancy").asDouble(),
                Percentage.withPercentage(1e-5));
    }

    @Test
    void badInputGivesOneLineAndExitTwo() throws Exception {
        Cli.Run missing = Cli.run("convert", dir.resolve("none.tif").toString(), "--defect", "fe-i", "-o",
                dir.resolve("o.tif").toString());
        assertThat(missing.code()).isEqualTo(2);
        assertThat(missing.errLines()).hasSize(1).first().asString().contains("none.tif").contains("no such file");

        Path garbage = dir.resolve("garbage.tif");
        Files.write(garbage, new byte[] {'I', 'I', 42, 0, 8, 0, 0, 0, 1});
        Cli.Run bad = Cli.run("convert", garbage.toString(), "--defect", "fe-i", "-o", dir.resolve("o.tif").toString());
        assertThat(bad.code()).isEqualTo(2);
        assertThat(bad.errLines()).hasSize(1).first().asString().contains("garbage.tif");

        MeasurementConditions noDoping = new MeasurementConditions(null, null, null, 1e14, null, null, null, null,
                Map.of());
        Path in = lifetimeMap(noDoping);
        Cli.Run noDop = Cli.run("convert", in.toString(), "--defect", "fe-i", "-o", dir.resolve("o.tif").toString());
        assertThat(noDop.code()).isEqualTo(2);
        assertThat(noDop.errLines()).hasSize(1).first().asString().contains("doping");

        Cli.Run badQuantity = Cli.run("convert", in.toString(), "--defect", "fe-i", "--doping", "p:1e16",
                "--quantity", "colour", "-o", dir.resolve("o.tif").toString());
        assertThat(badQuantity.code()).isEqualTo(2);
        assertThat(badQuantity.errLines()).hasSize(1).first().asString().contains("--quantity");
        assertThat(Files.exists(dir.resolve("o.tif"))).isFalse();
    }
}
