package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;

/**
 * A worker's {@link InspectionBuffers} carry nothing from one wafer to the next: maps of other sizes, other outlines
 * and other profiles inspected in sequence with one set of buffers give exactly the results of fresh buffers, also a
 * small map after a large one and the same map again; and the batch's evaluation (nothing map-sized kept) gives the
 * result of the viewer's, which keeps its maps.
 */
class InspectionBuffersTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    Path dir;

    /** The demo rules, and rules flagging the lifetime with below-limit densities at their bound. */
    private static List<Rules> rulesSets() throws Exception {
        return List.of(Rules.read(DEMO.resolve("rules-example.json")), Rules.parse("""
                {"conditions": {"doping": "p:1.5ohmcm", "injection_cm3": 1e14, "temperature_k": 300,
                                "thickness_um": 180, "override": false},
                 "defect": "fe-i", "edge_exclusion_mm": 3, "edge_band_mm": 10,
                 "flag": {"quantity": "lifetime", "threshold": 150, "min_area_mm2": 1, "below_limit": "at_bound"},
                 "limits": {"trap_density_p95_cm3": {"max": 4e11}, "edge_to_centre_ratio": {"min": 0.5},
                            "p10_lifetime_us": {"min": 20}}}
                """, "rules.json"));
    }

    /** Maps of 268², 249², 201² and a PL map, a spot wafer and a clean one, then the first again. */
    private List<Path> files() throws Exception {
        List<Path> f = new ArrayList<>();
        f.add(DEMO.resolve("LOT-A01-W01.tif"));
        f.add(DEMO.resolve("LOT-N01-W02.tif"));
        f.add(SyntheticWafers.spot(dir, "small-spot", 80, 10, -5, 8, 3));
        f.add(DEMO.resolve("LOT-A04-W01-pl.tif"));
        f.add(SyntheticWafers.clean(dir, "small-clean", 200));
        f.add(DEMO.resolve("LOT-A02-W05-before-gettering.tif"));
        f.add(DEMO.resolve("LOT-A01-W01.tif"));
        return f;
    }

    @Test
    void oneWorkersBuffersGiveTheResultsOfFreshBuffersWaferAfterWafer() throws Exception {
        List<Path> files = files();
        for (Rules rules : rulesSets()) {
            WaferInspection inspection = new WaferInspection(rules);
            InspectionBuffers reused = new InspectionBuffers();
            int flagged = 0;
            for (Path f : files) {
                Path thumbReused = dir.resolve("reused-" + f.getFileName() + ".png");
                Path thumbFresh = dir.resolve("fresh-" + f.getFileName() + ".png");
                WaferResult r = inspection.inspect(f, thumbReused, reused);
                WaferResult fresh = inspection.inspect(f, thumbFresh, new InspectionBuffers());
                assertThat(r.error()).as(f.toString()).isEmpty();
                assertThat(r).as(f.toString()).isEqualTo(fresh);
                assertThat(pixels(thumbReused)).isEqualTo(pixels(thumbFresh));
                flagged += r.regions().isEmpty() ? 0 : 1;
            }
            assertThat(flagged).as("wafers with flagged regions").isGreaterThanOrEqualTo(2);
        }
    }

    private static int[] pixels(Path png) throws Exception {
        java.awt.image.BufferedImage img = javax.imageio.ImageIO.read(png.toFile());
        return img.getRGB(0, 0, img.getWidth(), img.getHeight(), null, 0, img.getWidth());
    }

    @Test
    void aSmallMapAfterALargeOneSeesNothingOfIt() throws Exception {
        Rules rules = Rules.read(DEMO.resolve("rules-example.json"));
        WaferInspection inspection = new WaferInspection(rules);
        // the large map is flagged all over (a wafer of 3 µs), the small one is clean and the same size as a part of it
        Path large = SyntheticWafers.write(dir, "large-bad", SyntheticWafers.map("large-bad", 3, 0, 0, 0, 3));
        Path small = DEMO.resolve("LOT-N01-W02.tif");
        InspectionBuffers buffers = new InspectionBuffers();
        WaferResult bad = inspection.inspect(large, null, buffers);
        assertThat(bad.regions()).isNotEmpty();
        WaferResult after = inspection.inspect(small, null, buffers);
        assertThat(after).isEqualTo(inspection.inspect(small, null, new InspectionBuffers()));
        // and the other way round: a larger map after a smaller one
        WaferResult again = inspection.inspect(large, null, buffers);
        assertThat(again).isEqualTo(bad);
    }

    @Test
    void theBatchsEvaluationJudgesAsTheViewersWhichKeepsItsMaps() throws Exception {
        for (Rules rules : rulesSets()) {
            WaferInspection inspection = new WaferInspection(rules);
            for (Path f : files()) {
                WaferMap map = MapFiles.readSingle(f);
                WaferInspection.Evaluation kept = inspection.judge(f.toString(), map, null);
                WaferResult batch = inspection.evaluation(f.toString(), map, null, null, new InspectionBuffers(),
                        false).result();
                assertThat(batch).as(f.toString()).isEqualTo(kept.result());
                // the kept maps: the trap density at exactly the evaluated pixels
                if (kept.density() != null) {
                    float[] nt = kept.density().raster().samples();
                    boolean[] evaluated = kept.evaluated();
                    assertThat(evaluated).hasSize(nt.length);
                    for (int i = 0; i < nt.length; i++) {
                        if (!evaluated[i]) {
                            assertThat(nt[i]).isNaN();
                        }
                    }
                }
            }
        }
    }
}
