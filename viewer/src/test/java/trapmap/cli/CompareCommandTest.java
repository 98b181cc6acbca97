package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Random;
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

class CompareCommandTest {
    private static final int N = 96;
    private static final double PITCH_MM = 0.5;
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    Path dir;

    /** A textured disk: smooth random blobs of lifetime 20-200 µs, NaN outside; not mirror-symmetric. */
    private static float[] texture(long seed) {
        Random r = new Random(seed);
        int blobs = 40;
        double[][] b = new double[blobs][4];
        for (double[] x : b) {
            x[0] = r.nextDouble() * N;
            x[1] = r.nextDouble() * N;
            x[2] = 2 + r.nextDouble() * 6;
            x[3] = r.nextDouble() * 2 - 1;
        }
        float[] s = new float[N * N];
        double c = (N - 1) / 2.0;
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                if (Math.hypot(x - c, y - c) > 44) {
                    s[y * N + x] = Float.NaN;
                    continue;
                }
                double v = 0;
                for (double[] k : b) {
                    double d2 = (x - k[0]) * (x - k[0]) + (y - k[1]) * (y - k[1]);
                    v += k[3] * Math.exp(-d2 / (2 * k[2] * k[2]));
                }
                s[y * N + x] = (float) (60 * Math.exp(0.8 * v));
            }
        }
        return s;
    }

    private Path write(String name, float[] samples) throws Exception {
        WaferMap m = new WaferMap(FloatRaster.wrap(N, N, samples), PixelGrid.centred(N, N, PITCH_MM),
                Quantity.EFFECTIVE_LIFETIME, "W01", new MeasurementConditions(Doping.pType(1e16), null, null, 1e14,
                        null, null, null, null, Map.of()), Provenance.of("test"));
        Path f = dir.resolve(name + ".tif");
        MapFiles.write(m, f);
        return f;
    }

    @Test
    void findsTheMirrorAndShiftAndTheGain() throws Exception {
        float[] before = texture(5);
        float[] after = new float[N * N];
        int shiftPx = 3; // mirrored left-right, then moved 3 px (1.5 mm) to the right; lifetimes ×1.5
        java.util.Arrays.fill(after, Float.NaN);
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                int xs = N - 1 - x + shiftPx;
                if (xs >= 0 && xs < N) {
                    after[y * N + xs] = 1.5f * before[y * N + x];
                }
            }
        }
        Path b = write("before", before);
        Path a = write("after", after);
        Path out = dir.resolve("ratio.tif");
        JsonNode j = Cli.json("compare", b.toString(), a.toString(), "-o", out.toString(), "--json");
        JsonNode reg = j.get("registration");
        assertThat(reg.get("flip_x").asBoolean() ^ reg.get("flip_y").asBoolean()).isTrue();
        assertThat(reg.get("score").asDouble()).isGreaterThan(0.9);
        assertThat(j.get("paired").get("median_ratio").asDouble()).isCloseTo(1.5, within(0.03));
        assertThat(j.get("paired").get("count").asInt()).isGreaterThan(5000);
        WaferMap ratio = MapFiles.readSingle(out);
        assertThat(ratio.quantity()).isEqualTo(Quantity.RATIO);
    }

    @Test
    void densityComparisonGivesTheGetteringReduction() throws Exception {
        float[] before = texture(9);
        float[] after = new float[before.length];
        for (int i = 0; i < before.length; i++) {
            after[i] = before[i] * 4; // longer lifetime after gettering: fewer traps
        }
        Path b = write("b", before);
        Path a = write("a", after);
        JsonNode j = Cli.json("compare", b.toString(), a.toString(), "--defect", "fe-i", "--no-registration",
                "--quantity", "reduction", "-o", dir.resolve("red.tif").toString(), "--json");
        double median = j.get("paired").get("median_reduction").asDouble();
        // N_t ∝ 1/τ_SRH; with τ_intr ≫ τ at these lifetimes, four times the lifetime is about 75 % fewer traps.
        assertThat(median).isCloseTo(0.75, within(0.02));
        assertThat(j.get("paired").get("quantity").asText()).isEqualTo("trap-density");
    }

    /** 1 − after/before is a share of defects removed only for densities: refused on lifetimes. */
    @Test
    void reductionOfLifetimeMapsIsRefused() {
        String b = DEMO.resolve("LOT-A02-W05-before-gettering.tif").toString();
        String a = DEMO.resolve("LOT-A02-W05-after-gettering.tif").toString();
        Cli.Run r = Cli.run("compare", b, a, "--quantity", "reduction", "-o", dir.resolve("red.tif").toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.out()).isEmpty();
        assertThat(r.errLines()).containsExactly("trapmap compare: --quantity reduction needs density maps (trap"
                + " or iron density); these hold effective-lifetime (use --defect)");
        assertThat(dir.resolve("red.tif")).doesNotExist();
    }

    /** Without -o only the statistics are printed, the same for every quantity: --quantity alone is refused. */
    @Test
    void quantityWithoutAnOutputIsRefused() {
        String b = DEMO.resolve("LOT-A02-W05-before-gettering.tif").toString();
        String a = DEMO.resolve("LOT-A02-W05-after-gettering.tif").toString();
        for (String quantity : List.of("ratio", "difference", "relative-change", "reduction")) {
            Cli.Run r = Cli.run("compare", b, a, "--quantity", quantity, "--json");
            assertThat(r.code()).as(quantity).isEqualTo(2);
            assertThat(r.out()).as(quantity).isEmpty();
            assertThat(r.errLines()).as(quantity).containsExactly("trapmap compare: --quantity belongs to -o (the map"
                    + " written): give -o FILE (.tif, .csv or .png) or leave --quantity out");
        }
        // the statistics themselves need no --quantity
        assertThat(Cli.run("compare", b, a, "--json").code()).isZero();
    }

    @Test
    void getteringPairNeverScoresBelowItsUnregisteredPlacement() {
        String b = DEMO.resolve("LOT-A02-W05-before-gettering.tif").toString();
        String a = DEMO.resolve("LOT-A02-W05-after-gettering.tif").toString();
        JsonNode registered = Cli.json("compare", b, a, "--json");
        JsonNode unregistered = Cli.json("compare", b, a, "--json", "--no-registration");
        double score = registered.get("registration").get("score").asDouble();
        assertThat(score).isGreaterThanOrEqualTo(unregistered.get("registration").get("score").asDouble());
        assertThat(registered.get("registration").get("kept").asText()).isIn("search", "identity");
        assertThat(unregistered.get("registration").get("kept").asText()).isEqualTo("unregistered");
        assertThat(registered.get("warnings")).isEmpty();
    }

    @Test
    void unrelatedWafersWarnOnStderrAndInJson() {
        Cli.Run r = Cli.run("compare", DEMO.resolve("LOT-A01-W01.tif").toString(),
                DEMO.resolve("LOT-N01-W03.tif").toString(), "--json");
        assertThat(r.code()).isZero();
        assertThat(r.errLines()).hasSize(3).allMatch(l -> l.startsWith("warning: "));
        JsonNode j = Cli.parse(r.out());
        assertThat(j.get("warnings")).hasSize(3);
        assertThat(j.get("warnings").get(0).asText()).contains("LOT-N01-W03");
        assertThat(Math.abs(j.get("registration").get("fine_rotation_deg").asDouble())).isLessThanOrEqualTo(5);
    }

    @Test
    void strictTurnsWarningsIntoExitStatusTwo() {
        String b = DEMO.resolve("LOT-A01-W01.tif").toString();
        Cli.Run unrelated = Cli.run("compare", b, DEMO.resolve("LOT-N01-W03.tif").toString(), "--strict",
                "--max-rotation-deg", "2");
        assertThat(unrelated.code()).isEqualTo(2);
        assertThat(unrelated.errLines()).isNotEmpty().allMatch(l -> l.startsWith("warning: "));
        assertThat(unrelated.out()).contains("registration");
        Cli.Run same = Cli.run("compare", DEMO.resolve("LOT-A03-W02-feb-state.tif").toString(),
                DEMO.resolve("LOT-A03-W02-fe-i-state.tif").toString(), "--strict", "--upright");
        assertThat(same.code()).isZero();
        assertThat(same.err()).isEmpty();
    }

    @Test
    void mapsOfDifferentQuantitiesAreRefused() throws Exception {
        Path b = write("x", texture(1));
        WaferMap other = new WaferMap(FloatRaster.wrap(N, N, texture(2)), PixelGrid.centred(N, N, PITCH_MM),
                Quantity.TRAP_DENSITY, "y", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path a = dir.resolve("y.tif");
        MapFiles.write(other, a);
        Cli.Run r = Cli.run("compare", b.toString(), a.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1).first().asString().contains("trap-density");
    }

    @Test
    void anUnreadableMapIsNamedWhicheverOfTheTwoItIs() throws Exception {
        Path good = write("x", texture(1));
        Path junk = dir.resolve("junk.tif");
        java.nio.file.Files.write(junk, new byte[] {1, 2, 3, 4});
        Path missing = dir.resolve("missing.tif");
        for (String[] pair : new String[][] {{good.toString(), junk.toString()}, {junk.toString(), good.toString()},
                {good.toString(), missing.toString()}, {missing.toString(), junk.toString()}}) {
            Cli.Run r = Cli.run("compare", pair[0], pair[1]);
            String bad = pair[0].equals(good.toString()) ? pair[1] : pair[0];
            assertThat(r.code()).as("%s %s", pair[0], pair[1]).isEqualTo(2);
            assertThat(r.errLines()).hasSize(1).first().asString().contains(bad).doesNotContain("internal error");
        }
    }

    @Test
    void anOutputOntoEitherInputOrItsSidecarIsRefusedAndTheInputsKept() throws Exception {
        Path before = write("before", texture(5));
        Path after = write("after", texture(6));
        java.nio.file.Files.writeString(dir.resolve("after.json"), "{\"wafer_id\": \"W01\"}");
        byte[] beforeBytes = java.nio.file.Files.readAllBytes(before);
        byte[] afterBytes = java.nio.file.Files.readAllBytes(after);
        for (Path target : new Path[] {before, after, dir.resolve("after.json")}) {
            Cli.Run r = Cli.run("compare", before.toString(), after.toString(), "-o", target.toString());
            assertThat(r.code()).as("%s", target).isEqualTo(2);
            assertThat(r.errLines()).hasSize(1);
            assertThat(r.err()).startsWith("trapmap compare: --output " + target + " would overwrite " + target)
                    .contains("input files are never modified");
        }
        assertThat(java.nio.file.Files.readAllBytes(before)).isEqualTo(beforeBytes);
        assertThat(java.nio.file.Files.readAllBytes(after)).isEqualTo(afterBytes);
    }

    @Test
    void registrationOptionsWithNoRegistrationAreRefusedNotIgnored() throws Exception {
        Path before = write("b", texture(5));
        Path after = write("a", texture(5));
        for (String[] extra : new String[][] {{"--upright"}, {"--max-rotation-deg", "3"}}) {
            java.util.List<String> line = new java.util.ArrayList<>(java.util.List.of("compare", before.toString(),
                    after.toString(), "--no-registration"));
            line.addAll(java.util.List.of(extra));
            Cli.Run r = Cli.run(line.toArray(String[]::new));
            assertThat(r.code()).as(extra[0]).isEqualTo(2);
            assertThat(r.errLines()).as(extra[0]).containsExactly("trapmap compare: " + extra[0] + " shapes the"
                    + " registration, which --no-registration leaves out: give one or the other");
        }
        assertThat(Cli.run("compare", before.toString(), after.toString(), "--no-registration").code()).isZero();
    }

    @Test
    void pixelCountsAreWrittenWholeAsTheViewerAndTheJsonGiveThem() {
        String b = DEMO.resolve("LOT-A02-W05-before-gettering.tif").toString();
        String a = DEMO.resolve("LOT-A02-W05-after-gettering.tif").toString();
        int count = Cli.json("compare", b, a, "--json").get("paired").get("count").asInt();
        assertThat(count).as("a count that four significant digits would round").isGreaterThan(9999)
                .matches(c -> c % 10 != 0);
        Cli.Run text = Cli.run("compare", b, a);
        assertThat(text.code()).isZero();
        assertThat(text.out()).containsPattern("pixels compared +" + count + "\\R");
        Cli.Run stats = Cli.run("stats", b);
        int pixels = Cli.json("stats", b, "--json").get("count").asInt();
        assertThat(stats.out()).containsPattern("pixels +" + pixels + "\\R");
    }
}
