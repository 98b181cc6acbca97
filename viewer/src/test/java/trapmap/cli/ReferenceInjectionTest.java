package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;

/** --reference-injection makes the lifetime-at-reference map of convert and is refused wherever it has no effect. */
class ReferenceInjectionTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final String MAP = DEMO.resolve("LOT-A01-W01.tif").toString();

    @TempDir
    Path dir;

    @Test
    void convertMakesTheLifetimeAtReferenceWithIt() throws Exception {
        Path out = dir.resolve("ref.tif");
        Cli.Run r = Cli.run("convert", MAP, "--defect", "fe-i", "--quantity", "lifetime-at-reference",
                "--reference-injection", "1e15", "-o", out.toString());
        assertThat(r.code()).as(r.err()).isZero();
        WaferMap m = MapFiles.readSingle(out);
        assertThat(m.quantity()).isEqualTo(Quantity.LIFETIME_AT_REFERENCE);
        float[] v = m.raster().samples();
        long positive = 0;
        for (float x : v) {
            if (Float.isFinite(x) && x > 0) {
                positive++;
            }
        }
        assertThat(positive).isGreaterThan(v.length / 2);
    }

    @Test
    void convertRefusesItForAnyOtherQuantity() {
        Cli.Run density = Cli.run("convert", MAP, "--defect", "fe-i", "--reference-injection", "1e15", "-o",
                dir.resolve("nt.tif").toString());
        assertThat(density.code()).isEqualTo(2);
        assertThat(density.errLines()).containsExactly("trapmap convert: --reference-injection applies only to"
                + " --quantity lifetime-at-reference, not to --quantity trap-density");
        Cli.Run copy = Cli.run("convert", MAP, "--reference-injection", "1e15", "-o", dir.resolve("m.csv").toString());
        assertThat(copy.code()).isEqualTo(2);
        assertThat(copy.errLines()).containsExactly("trapmap convert: --reference-injection applies only to"
                + " --quantity lifetime-at-reference, not to a plain format conversion");
        assertThat(dir.resolve("nt.tif")).doesNotExist();
        assertThat(dir.resolve("m.csv")).doesNotExist();
    }

    @Test
    void theOtherMapCommandsNeitherOfferNorTakeIt() {
        String stack = DEMO.resolve("injection-stack").toString();
        List<List<String>> commands = List.of(
                List.of("stats", MAP),
                List.of("compare", MAP, MAP),
                List.of("iron", MAP, MAP, "-o", dir.resolve("fe.tif").toString()),
                List.of("identify", stack + "/LOT-S01-W01-dn1e13.tif", stack + "/LOT-S01-W01-dn1e14.tif", "-o",
                        dir.resolve("hint.tif").toString()));
        for (List<String> c : commands) {
            assertThat(Cli.run(c.get(0), "--help").out()).as(c.get(0)).doesNotContain("--reference-injection");
            List<String> args = new java.util.ArrayList<>(c);
            args.addAll(List.of("--reference-injection", "1e15"));
            Cli.Run r = Cli.run(args.toArray(String[]::new));
            assertThat(r.code()).as("%s", args).isEqualTo(2);
            assertThat(r.out()).isEmpty();
            assertThat(r.errLines()).containsExactly("trapmap " + c.get(0) + ": --reference-injection applies only"
                    + " to convert --quantity lifetime-at-reference (see 'trapmap " + c.get(0) + " --help')");
        }
        assertThat(dir.resolve("fe.tif")).doesNotExist();
        assertThat(dir.resolve("hint.tif")).doesNotExist();
    }
}
