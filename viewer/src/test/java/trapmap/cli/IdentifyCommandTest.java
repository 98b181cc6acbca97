package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.WriteOptions;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * {@code trapmap identify} end to end on made-up maps: a round p 1e15 wafer whose lifetime is intrinsic but for a
 * square of Fe_i (2e11 cm^-3), at Δn 1e13, 1e14 and 1e15 cm^-3 with 3 % seeded noise (the physics' own SRH and
 * intrinsic models, so the planted defect must come out first).
 */
class IdentifyCommandTest {
    private static final int N = 40;
    private static final double[] LEVELS = {1e13, 1e14, 1e15};
    private static final double FE_CM3 = 2e11;

    @TempDir
    Path dir;

    private static MeasurementConditions conditions(Double dn) {
        return new MeasurementConditions(Doping.pType(1e15), 180.0, 300.0, dn, null, null, null, null, Map.of());
    }

    private static WaferMap level(double dn, long seed) {
        TrapDensityConverter fe = new TrapDensityConverter(MapConversion.physicsConditions(conditions(dn),
                ConversionSettings.DEFAULTS), DefectLibrary.byId("fe-i"));
        Random rnd = new Random(seed);
        float[] tau = new float[N * N];
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                boolean iron = x >= 10 && x < 20 && y >= 12 && y < 22;
                double t = fe.lifetimeAtInjectionUs(iron ? FE_CM3 : 0, dn) * (1 + 0.03 * rnd.nextGaussian());
                boolean on = Math.hypot(x - (N - 1) / 2.0, y - (N - 1) / 2.0) <= N / 2.0;
                tau[y * N + x] = on ? (float) t : Float.NaN;
            }
        }
        return new WaferMap(FloatRaster.wrap(N, N, tau), PixelGrid.centred(N, N, 0.5), Quantity.EFFECTIVE_LIFETIME,
                "W1", conditions(dn), Provenance.of("test"));
    }

    private List<String> files() throws Exception {
        List<String> files = new ArrayList<>();
        for (int i = 0; i < LEVELS.length; i++) {
            Path p = dir.resolve("W1-dn" + i + ".tif");
            MapFiles.write(level(LEVELS[i], 11 + i), p);
            files.add(p.toString());
        }
        return files;
    }

    @Test
    void plantedIronIsTheBestDefectOfItsRegionAndEveryFileIsWritten() throws Exception {
        List<String> args = new ArrayList<>(List.of("identify"));
        args.addAll(files());
        Path out = dir.resolve("out").resolve("hint.tif");
        Files.createDirectories(out.getParent());
        args.addAll(List.of("-o", out.toString(), "--json", "--defects", "fe-i,cr-i,ti-i,mo-i"));
        JsonNode j = Cli.json(args.toArray(String[]::new));
        assertThat(j.get("levels")).hasSize(3);
        JsonNode reg = j.get("levels").get(1).get("registration");
        // levels measured in place: kept as they lie, the search's score beside the identity's
        assertThat(reg.get("kept").asText()).isEqualTo("identity");
        assertThat(reg.get("shift_x_mm").asDouble()).isZero();
        assertThat(reg.get("score").asDouble()).isEqualTo(reg.get("identity_score").asDouble());
        assertThat(reg.get("search_score").asDouble()).isLessThan(reg.get("identity_score").asDouble()
                + trapmap.maps.spectroscopy.InjectionStack.IDENTITY_MARGIN);
        assertThat(j.get("regions")).hasSize(1);
        JsonNode region = j.get("regions").get(0);
        assertThat(region.get("pixels").asInt()).isEqualTo(100);
        assertThat(region.get("status").asText()).isEqualTo("ok");
        assertThat(region.get("best").asText()).isEqualTo("fe-i");
        assertThat(region.get("best_nt_cm3").asDouble()).isCloseTo(FE_CM3, within(0.1 * FE_CM3));
        assertThat(j.get("legend").get(0).get("defect").asText()).isEqualTo("fe-i");
        // it gives densities N_t: the caution goes with them
        assertThat(j.get("caution").asText()).isEqualTo(trapmap.maps.model.Caution.TEXT);
        for (String suffix : List.of(".tif", "-runner-up.tif", "-chi2.tif", "-chi2-ratio.tif", "-status.tif",
                "-nt.tif", "-regions.tif", "-legend.csv", "-regions.csv", "-summary.json")) {
            assertThat(dir.resolve("out").resolve("hint" + suffix)).as(suffix).isRegularFile();
        }
        assertThat(dir.resolve("out").resolve("hint.json")).as("nothing at the index map's sidecar name")
                .doesNotExist();
        WaferMap best = MapFiles.readSingle(out);
        assertThat(best.raster().get(15, 17)).isEqualTo(1f);
        assertThat(Cli.parse(Files.readString(dir.resolve("out").resolve("hint-summary.json"))).get("regions").get(0)
                .get("best").asText()).isEqualTo("fe-i");
    }

    @Test
    void theLinesEndWithTheCaution() throws Exception {
        List<String> args = new ArrayList<>(List.of("identify"));
        args.addAll(files());
        args.addAll(List.of("-o", dir.resolve("lines.tif").toString(), "--defects", "fe-i,cr-i"));
        Cli.Run r = Cli.run(args.toArray(String[]::new));
        assertThat(r.err()).isEmpty();
        assertThat(r.out().strip()).endsWith("caution: " + trapmap.maps.model.Caution.TEXT);
    }

    @Test
    void multiPageFileWithPageObjectsIsAStack() throws Exception {
        List<WaferMap> pages = new ArrayList<>();
        for (int i = 0; i < LEVELS.length; i++) {
            pages.add(level(LEVELS[i], 21 + i).withConditions(conditions(null)));
        }
        Path tif = dir.resolve("W1-stack.tif");
        MapFiles.writeAll(pages, tif, WriteOptions.DEFAULTS);
        Files.writeString(dir.resolve("W1-stack.json"), "{\"pages\": [{\"label\": \"1e13\", \"injection_cm3\":"
                + " 1e13}, {\"label\": \"1e14\", \"injection_cm3\": 1e14}, {\"label\": \"1e15\", \"injection_cm3\":"
                + " 1e15}]}");
        JsonNode j = Cli.json("identify", tif.toString(), "-o", dir.resolve("h.tif").toString(), "--json",
                "--no-registration", "--block", "2");
        assertThat(j.get("levels").get(2).get("label").asText()).isEqualTo("1e15");
        assertThat(j.get("levels").get(2).get("injection_cm3").asDouble()).isEqualTo(1e15);
        assertThat(j.get("block_px").asInt()).isEqualTo(2);
        assertThat(j.get("regions").get(0).get("best").asText()).isEqualTo("fe-i");
    }

    @Test
    void badStacksAreRefusedWithOneLineNamingTheFile() throws Exception {
        List<String> f = files();
        Cli.Run one = Cli.run("identify", f.get(0), "-o", dir.resolve("x.tif").toString());
        assertThat(one.code()).isEqualTo(2);
        assertThat(one.errLines()).hasSize(1);
        assertThat(one.err()).contains("at least 2").contains(f.get(0));
        Cli.Run same = Cli.run("identify", f.get(0), f.get(1), "--injection", "1e14", "-o",
                dir.resolve("x.tif").toString());
        assertThat(same.code()).isEqualTo(2);
        assertThat(same.err()).contains("--injection").contains("every level the same").contains("cm^-3");
        Files.copy(Path.of(f.get(1)), dir.resolve("copy.tif"));
        Cli.Run equal = Cli.run("identify", f.get(1), dir.resolve("copy.tif").toString(), "-o",
                dir.resolve("x.tif").toString());
        assertThat(equal.code()).isEqualTo(2);
        assertThat(equal.errLines()).hasSize(1);
        assertThat(equal.err()).contains("copy.tif").contains("injection_cm3").contains("must differ");
        Cli.Run doping = Cli.run("identify", f.get(0), f.get(1), "-o", dir.resolve("x.png").toString());
        assertThat(doping.code()).isEqualTo(2);
        assertThat(doping.err()).contains("--output must be a .tif");
        Cli.Run unknown = Cli.run("identify", f.get(0), f.get(1), "--defects", "fe-i,xx", "-o",
                dir.resolve("x.tif").toString());
        assertThat(unknown.code()).isEqualTo(2);
        assertThat(unknown.errLines()).hasSize(1);
        assertThat(unknown.err()).startsWith("trapmap identify: --defects 'xx' is not a known defect id (built-in: ");
        // a level whose sidecar gives another doping: the message names the files and the field, not --doping
        WaferMap other = level(LEVELS[2], 31).withConditions(new MeasurementConditions(Doping.pType(2e15), 180.0,
                300.0, LEVELS[2], null, null, null, null, Map.of()));
        Path otherFile = dir.resolve("W1-other.tif");
        MapFiles.write(other, otherFile);
        Cli.Run doped = Cli.run("identify", f.get(0), otherFile.toString(), "-o", dir.resolve("x.tif").toString());
        assertThat(doped.code()).isEqualTo(2);
        assertThat(doped.errLines()).hasSize(1);
        assertThat(doped.err()).startsWith("trapmap identify: " + otherFile + ": field 'doping' is p:2e15")
                .contains(f.get(0)).contains("(cm^-3)").doesNotContain("--doping");
        // an output that would replace an input map or its sidecar is refused before anything is written
        Path firstLevel = Path.of(f.get(0));
        byte[] before = Files.readAllBytes(firstLevel);
        Cli.Run onInput = Cli.run("identify", f.get(0), f.get(1), "-o", f.get(0));
        assertThat(onInput.code()).isEqualTo(2);
        assertThat(onInput.errLines()).hasSize(1);
        assertThat(onInput.err()).contains("--output " + f.get(0) + " would overwrite " + f.get(0));
        assertThat(Files.readAllBytes(firstLevel)).isEqualTo(before);
        // the summary Q-summary.json of -o Q.tif would replace the sidecar of an input map Q-summary.tif
        Path summaryNamed = dir.resolve("Q-summary.tif");
        Files.copy(firstLevel, summaryNamed);
        Path sidecar = dir.resolve("Q-summary.json");
        Files.writeString(sidecar, "{\"injection_cm3\": 1e13}");
        Cli.Run onSidecar = Cli.run("identify", summaryNamed.toString(), f.get(1), "-o",
                dir.resolve("Q.tif").toString(), "--json");
        assertThat(onSidecar.code()).isEqualTo(2);
        assertThat(onSidecar.err()).contains("would overwrite " + sidecar).contains("Q-summary.json");
        assertThat(Files.readString(sidecar)).isEqualTo("{\"injection_cm3\": 1e13}");
        Files.delete(sidecar);
        Files.delete(summaryNamed);
        Cli.Run besideInput = Cli.run("identify", f.get(0), f.get(1), "-o", dir.resolve("W1.tif").toString(),
                "--defects", "fe-i", "--block", "4");
        assertThat(besideInput.code()).as(besideInput.err()).isZero();
        // a noise the engine refuses is refused as the option, before any map is read
        Cli.Run tiny = Cli.run("identify", f.get(0), f.get(1), "--noise", "1e-9", "-o",
                dir.resolve("x.tif").toString());
        assertThat(tiny.code()).isEqualTo(2);
        assertThat(tiny.errLines()).hasSize(1);
        assertThat(tiny.err()).contains("--noise must be a relative uncertainty in [1E-6, 1]").contains("1.0E-9");
        assertThat(dir.resolve("x.tif")).doesNotExist();
    }
}
