package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.progress.ProgressListener;

/**
 * The registration never returns a placement scoring below the maps as they lie, keeps every stage within the
 * turn limit, and warns about pairs that are not two maps of one wafer (demonstration set and synthetic wafers).
 */
class RegistrationHonestyTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    private static WaferMap demo(String name) throws Exception {
        return MapFiles.readSingle(DEMO.resolve(name));
    }

    private static RegistrationReport register(WaferMap before, WaferMap after, RegistrationOptions o) {
        return MapRegistration.registerChecked(before, after, o, ProgressListener.NONE);
    }

    @Test
    void getteringPairKeepsAPlacementScoringAtLeastTheUnregisteredOne() throws Exception {
        WaferMap before = demo("LOT-A02-W05-before-gettering.tif");
        WaferMap after = demo("LOT-A02-W05-after-gettering.tif");
        RegistrationReport r = register(before, after, RegistrationOptions.DEFAULTS);
        double unregistered = MapRegistration.unregistered(before, after).registration().score();
        assertThat(r.registration().score()).isGreaterThanOrEqualTo(unregistered);
        assertThat(r.identityScore()).isCloseTo(unregistered, within(1e-12));
        assertThat(r.registration().score()).isEqualTo(Math.max(r.searchScore(), r.identityScore()));
        assertThat(r.kept() == RegistrationReport.Kept.IDENTITY)
                .isEqualTo(!(r.searchScore() > r.identityScore()));
        assertThat(r.warnings()).isEmpty(); // one wafer, same size, score above the floor
    }

    @Test
    void unrelatedWafersOfDifferentSizesWarnThreeTimes() throws Exception {
        RegistrationReport r = register(demo("LOT-A01-W01.tif"), demo("LOT-N01-W03.tif"),
                RegistrationOptions.DEFAULTS);
        assertThat(r.warnings()).hasSize(3);
        assertThat(r.warnings().get(0)).contains("different wafer ids", "LOT-A01-W01", "LOT-N01-W03");
        assertThat(r.warnings().get(1)).contains("different wafer sizes", "mm");
        assertThat(r.warnings().get(2)).contains("below 0.40");
        assertThat(r.registration().score()).isLessThan(RegistrationWarnings.SCORE_FLOOR);
        assertThat(Math.abs(r.registration().fineRotationDeg())).isLessThanOrEqualTo(5 + 1e-9);
    }

    @Test
    void unrelatedPairHonoursATightTurnLimit() throws Exception {
        RegistrationReport r = register(demo("LOT-A01-W01.tif"), demo("LOT-N01-W03.tif"),
                RegistrationOptions.DEFAULTS.withMaxRotation(2));
        assertThat(Math.abs(r.registration().fineRotationDeg())).isLessThanOrEqualTo(2 + 1e-9);
    }

    @Test
    void aTurnBeyondTheLimitIsNotTaken() {
        SyntheticWafer wafer = SyntheticWafer.random(7, 50);
        PixelGrid grid = PixelGrid.centred(216, 216, 0.5);
        WaferMap before = wafer.before(grid, 0.03, 5);
        WaferMap after = wafer.after(grid, Registration.explicit(true, false, 98, 1, -1), 2.0, 0.03, 11);
        Registration free = register(before, after, RegistrationOptions.DEFAULTS.withMaxRotation(10))
                .registration();
        assertThat(free.fineRotationDeg()).isCloseTo(8, within(0.2)); // found when allowed
        for (double limit : new double[] {0, 3, 5}) {
            Registration r = register(before, after, RegistrationOptions.DEFAULTS.withMaxRotation(limit))
                    .registration();
            assertThat(Math.abs(r.fineRotationDeg())).as("turn with limit %s", limit)
                    .isLessThanOrEqualTo(limit + 1e-9);
            assertThat(MapRegistration.register(before, after, RegistrationOptions.DEFAULTS.withMaxRotation(limit),
                    ProgressListener.NONE).fineRotationDeg()).isBetween(-limit - 1e-9, limit + 1e-9);
        }
    }

    @Test
    void uprightSearchTakesNoMirrorOrQuarterTurn() throws Exception {
        RegistrationReport r = register(demo("LOT-A01-W01.tif"), demo("LOT-N01-W03.tif"),
                RegistrationOptions.DEFAULTS.withSearchOrientations(false));
        assertThat(r.registration().mirrored()).isFalse();
        assertThat(Math.abs(r.registration().rotationDeg())).isLessThanOrEqualTo(5 + 1e-9);
    }

    @Test
    void samePairTakenAsAlignedIsScoredAndChecked() throws Exception {
        WaferMap before = demo("LOT-A03-W02-feb-state.tif");
        RegistrationReport r = MapRegistration.unregistered(before, demo("LOT-A03-W02-fe-i-state.tif"));
        assertThat(r.kept()).isEqualTo(RegistrationReport.Kept.UNREGISTERED);
        assertThat(r.searchScore()).isNaN();
        assertThat(r.registration().score()).isGreaterThan(0.9);
        assertThat(r.warnings()).isEmpty();
        RegistrationReport self = MapRegistration.unregistered(before, demo("LOT-A01-W01.tif"));
        assertThat(self.warnings()).anyMatch(w -> w.startsWith("different wafer ids"));
    }
}
