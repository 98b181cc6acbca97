package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

/**
 * Registration of a synthetic wafer (Ø100 mm, 0.5 mm pitch) against copies drawn under known placements, with a
 * non-uniform gettering response (×2 ± 15 %) and 3 % noise on both maps. Targets: mirror exact, turn within 0.2°,
 * shift within 0.1 mm (a fifth of a pixel), score at least 0.9.
 */
class MapRegistrationTest {
    private static final SyntheticWafer WAFER = SyntheticWafer.random(7, 50);
    private static final PixelGrid GRID = PixelGrid.centred(216, 216, 0.5);
    private static final WaferMap BEFORE = WAFER.before(GRID, 0.03, 5);
    private static final double TURN_TOLERANCE_DEG = 0.2;
    private static final double SHIFT_TOLERANCE_MM = 0.1;

    private static WaferMap after(PixelGrid grid, Registration truth) {
        return WAFER.after(grid, truth, 2.0, 0.03, 11);
    }

    private static void assertRecovered(Registration found, Registration truth) {
        assertThat(found.mirrored()).as("mirror of %s", found).isEqualTo(truth.mirrored());
        assertThat(Registration.normaliseDeg(found.rotationWithoutFlipYDeg() - truth.rotationWithoutFlipYDeg()))
                .as("turn of %s", found).isCloseTo(0, within(TURN_TOLERANCE_DEG));
        assertThat(found.shiftXMm()).as("x shift of %s", found).isCloseTo(truth.shiftXMm(),
                within(SHIFT_TOLERANCE_MM));
        assertThat(found.shiftYMm()).as("y shift of %s", found).isCloseTo(truth.shiftYMm(),
                within(SHIFT_TOLERANCE_MM));
        assertThat(found.samePlacement(truth, TURN_TOLERANCE_DEG, SHIFT_TOLERANCE_MM)).isTrue();
        assertThat(found.score()).as("score of %s", found).isGreaterThanOrEqualTo(0.9);
    }

    /** The eight mirror/quarter-turn placements, each with a sub-pixel shift. */
    static Stream<Arguments> orientations() {
        List<Arguments> cases = new ArrayList<>();
        for (boolean flipX : new boolean[] {false, true}) {
            for (int quarter = 0; quarter < 4; quarter++) {
                // the mirrored ones alternate between flipX and flipY to exercise both spellings
                boolean flipY = flipX && quarter % 2 == 1;
                cases.add(Arguments.of(Registration.explicit(flipX && !flipY, flipY, 90.0 * quarter, 1.23, -0.77)));
            }
        }
        return cases.stream();
    }

    @ParameterizedTest
    @MethodSource("orientations")
    void recoversEveryMirrorAndQuarterTurn(Registration truth) {
        assertRecovered(MapRegistration.register(BEFORE, after(GRID, truth)), truth);
    }

    @Test
    void recoversAWholePixelShift() {
        Registration truth = Registration.explicit(false, false, 0, 2.0, -3.5);
        assertRecovered(MapRegistration.register(BEFORE, after(GRID, truth)), truth);
    }

    @Test
    void recoversASmallTurnOnTopOfAMirrorAndQuarterTurn() {
        Registration truth = Registration.explicit(true, false, 92.5, 1.7, 2.15);
        assertRecovered(MapRegistration.register(BEFORE, after(GRID, truth)), truth);
    }

    @Test
    void recoversASmallNegativeTurn() {
        Registration truth = Registration.explicit(false, false, -4.2, -2.6, 3.1);
        assertRecovered(MapRegistration.register(BEFORE, after(GRID, truth)), truth);
    }

    @Test
    void recoversAMapOfAnotherPitch() {
        PixelGrid fine = PixelGrid.centred(270, 270, 0.4);
        Registration truth = Registration.explicit(true, false, -88, 1.7, 0.9);
        assertRecovered(MapRegistration.register(BEFORE, after(fine, truth)), truth);
    }

    @Test
    void recoversAWaferThatIsOffCentreInItsRaster() {
        // the tool put the wafer centre 12 mm left of and 8 mm below the raster centre and did not say so, so
        // the after map's wafer coordinates are off by (+12, +8) mm before the half turn
        PixelGrid wide = new PixelGrid(260, 240, 0.5, 129.5 - 24, 119.5 + 16);
        Registration truth = Registration.explicit(false, false, 180, -12.0, -8.0);
        PixelGrid assumed = PixelGrid.centred(260, 240, 0.5);
        WaferMap after = after(wide, Registration.explicit(false, false, 180, 0, 0)).withGrid(assumed);
        assertRecovered(MapRegistration.register(BEFORE, after), truth);
    }

    @Test
    void aMapOfAnotherWaferScoresLow() {
        WaferMap other = SyntheticWafer.random(1010, 50).after(GRID, Registration.identity(), 2, 0.03, 3);
        assertThat(MapRegistration.register(BEFORE, other).score()).isLessThan(0.3);
    }

    @Test
    void aMapRegisteredOnItselfIsTheIdentity() {
        Registration r = MapRegistration.register(BEFORE, BEFORE);
        assertThat(r.samePlacement(Registration.identity(), 0.01, 0.005)).as("%s", r).isTrue();
        assertThat(r.score()).isGreaterThan(0.999);
        assertThat(r.overlapPixels()).isEqualTo(BEFORE.raster().validCount());
    }

    @Test
    void aDensityMapRegistersAgainstALifetimeMap() {
        Registration truth = Registration.explicit(false, true, 0, -1.1, 0.6);
        WaferMap lifetime = after(GRID, truth);
        WaferMap density = lifetime.derive(lifetime.raster().map(t -> 1e12 / t), Quantity.TRAP_DENSITY,
                ProcessingStep.of("test"));
        assertRecovered(MapRegistration.register(BEFORE, density), truth);
    }

    @Test
    void theOrientationSearchCanBeSwitchedOff() {
        Registration truth = Registration.explicit(false, false, 1.5, 0.8, -0.4);
        RegistrationOptions upright = RegistrationOptions.DEFAULTS.withSearchOrientations(false);
        assertRecovered(MapRegistration.register(BEFORE, after(GRID, truth), upright,
                trapmap.shared.progress.ProgressListener.NONE), truth);
    }

    @Test
    void refinementFromAGuessFindsThePlacement() {
        Registration truth = Registration.explicit(true, false, 91.3, -1.4, 2.2);
        Registration guess = Registration.explicit(true, false, 90, 0, 0);
        Registration r = MapRegistration.refine(BEFORE, after(GRID, truth), guess, RegistrationOptions.DEFAULTS);
        assertRecovered(r, truth);
    }

    @Test
    void anExplicitPlacementIsScoredAsGiven() {
        Registration truth = Registration.explicit(true, false, 90, 1.0, 0.5);
        WaferMap after = after(GRID, truth);
        Registration right = MapRegistration.evaluate(BEFORE, after, truth);
        Registration wrong = MapRegistration.evaluate(BEFORE, after, Registration.explicit(false, false, 90, 1, 0.5));
        assertThat(right.samePlacement(truth, 0, 0)).isTrue();
        assertThat(right.score()).isGreaterThan(0.9);
        assertThat(right.overlapPixels()).isGreaterThan(30000);
        assertThat(wrong.score()).isLessThan(0.3);
    }

    @Test
    void applyingTheTruePlacementReproducesTheBeforeSamples() {
        // a quarter turn and whole-pixel shifts map pixel centres onto pixel centres, so no interpolation is needed
        Registration truth = Registration.explicit(true, false, 90, 2.0, -1.5);
        WaferMap before = WAFER.before(GRID);
        WaferMap after = WAFER.after(GRID, truth, 1, 0, 0);
        WaferMap aligned = MapRegistration.apply(before, after, truth);
        int compared = 0;
        for (int y = 0; y < GRID.height(); y++) {
            for (int x = 0; x < GRID.width(); x++) {
                float b = before.raster().get(x, y);
                float a = aligned.raster().get(x, y);
                if (!Float.isNaN(a) && !Float.isNaN(b)) {
                    assertThat(a).isCloseTo(b, within(1e-5f * b));
                    compared++;
                }
            }
        }
        assertThat(compared).isGreaterThan(30000);
    }

    @Test
    void applyingASubPixelPlacementInterpolates() {
        Registration truth = Registration.explicit(false, false, 3, 0.37, -0.21);
        WaferMap before = WAFER.before(GRID);
        WaferMap aligned = MapRegistration.apply(before, WAFER.after(GRID, truth, 1, 0, 0), truth);
        // compare away from grain boundaries, where the field is smooth enough for bilinear interpolation
        double[] stats = new double[2];
        for (int i = 0; i < before.raster().size(); i++) {
            float b = before.raster().samples()[i];
            float a = aligned.raster().samples()[i];
            if (!Float.isNaN(a) && !Float.isNaN(b)) {
                stats[0]++;
                if (Math.abs(a - b) < 0.05 * b) {
                    stats[1]++;
                }
            }
        }
        assertThat(stats[1] / stats[0]).isGreaterThan(0.9);
    }

    @Test
    void theAlignedMapLivesOnTheBeforeGridAndRecordsTheStep() {
        PixelGrid fine = PixelGrid.centred(270, 270, 0.4);
        Registration truth = Registration.explicit(true, false, -88, 1.7, 0.9);
        WaferMap after = after(fine, truth);
        Registration r = MapRegistration.register(BEFORE, after);
        WaferMap aligned = MapRegistration.apply(BEFORE, after, r);
        assertThat(aligned.grid()).isEqualTo(BEFORE.grid());
        assertThat(aligned.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(aligned.waferId()).isEqualTo("after");
        ProcessingStep step = aligned.provenance().steps().get(aligned.provenance().steps().size() - 1);
        assertThat(step.operation()).isEqualTo("register");
        assertThat(step.parameters()).containsEntry("onto", "before").containsEntry("flip_x", "true")
                .containsKeys("rotation_deg", "shift_x_mm", "shift_y_mm", "score", "overlap_px", "pitch_mm");
        assertThat(aligned.raster().validCount()).isCloseTo(r.overlapPixels(), within(2000));
    }

    @Test
    void identityOnTheSameGridCopiesTheSamples() {
        WaferMap aligned = MapRegistration.apply(BEFORE, BEFORE, Registration.identity());
        assertThat(aligned.raster().sameSamples(BEFORE.raster())).isTrue();
        assertThat(aligned.provenance().steps().get(0).parameters()).containsEntry("score", "not evaluated");
    }

    @Test
    void aFlatMapIsRefusedNamingIt() {
        WaferMap flat = new WaferMap(FloatRaster.filled(216, 216, 10f), GRID, Quantity.EFFECTIVE_LIFETIME, "flat",
                MeasurementConditions.UNKNOWN, Provenance.of("test"));
        assertThatThrownBy(() -> MapRegistration.register(BEFORE, flat))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> assertThat(e.field()).isEqualTo("after"))
                .hasMessageContaining("flat");
    }

    @Test
    void aTinyMapIsRefusedNamingIt() {
        WaferMap tiny = new WaferMap(FloatRaster.filled(5, 40, 10f), PixelGrid.centred(5, 40, 0.5),
                Quantity.EFFECTIVE_LIFETIME, "tiny", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        assertThatThrownBy(() -> MapRegistration.register(tiny, BEFORE))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> {
                    assertThat(e.field()).isEqualTo("before");
                    assertThat(e.unit()).isEqualTo("px");
                });
    }

    @Test
    void progressIsReportedToTheEnd() {
        List<String> messages = new ArrayList<>();
        long[] last = new long[2];
        MapRegistration.register(BEFORE, BEFORE, RegistrationOptions.DEFAULTS, (done, total, message) -> {
            messages.add(message);
            last[0] = done;
            last[1] = total;
        });
        assertThat(messages).isNotEmpty();
        assertThat(last[0]).isEqualTo(last[1]);
    }

    @Test
    void anInterruptedThreadCancels() {
        Thread.currentThread().interrupt();
        try {
            assertThatThrownBy(() -> MapRegistration.register(BEFORE, BEFORE))
                    .isInstanceOf(java.util.concurrent.CancellationException.class);
        } finally {
            Thread.interrupted();
        }
    }
}
