package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.compare.MapRegistration;
import trapmap.maps.compare.Registration;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.model.WaferMap;
import trapmap.shared.progress.ProgressListener;

/**
 * Registration of the levels of a stack ({@link InjectionStack#REGISTRATION}, {@link InjectionStack#IDENTITY_MARGIN},
 * {@link MapRegistration#registerNearIdentity}) on square maps without a wafer edge (data in every pixel), whose
 * only structure is two defect discs of different contrast at the two levels, as interstitial iron and chromium
 * give at different injection levels: the disc dark at one level is faint at the other. Turning one level by 180°
 * lays its dark disc onto the other level's dark disc.
 */
class StackRegistrationTest {
    static final int N = 64;
    /** Disc centres (px), point-symmetric about the map centre 31.5 so that a half turn swaps them. */
    static final double[] DISC_A = {20, 22};
    static final double[] DISC_B = {43, 41};
    static final double RADIUS_PX = 7;
    static final double BACKGROUND_US = 1000;

    /** A level: τ_eff (µs) with the discs at {@code contrastA}, {@code contrastB} of the background, shifted. */
    static WaferMap level(double dn, double contrastA, double contrastB, double shiftXPx, double shiftYPx,
                          double noise, long seed) {
        Random rnd = new Random(seed);
        float[] tau = new float[N * N];
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double f = 1;
                if (Math.hypot(x - shiftXPx - DISC_A[0], y - shiftYPx - DISC_A[1]) <= RADIUS_PX) {
                    f = contrastA;
                } else if (Math.hypot(x - shiftXPx - DISC_B[0], y - shiftYPx - DISC_B[1]) <= RADIUS_PX) {
                    f = contrastB;
                }
                tau[y * N + x] = (float) (BACKGROUND_US * f * (1 + noise * rnd.nextGaussian()));
            }
        }
        return new WaferMap(trapmap.maps.raster.FloatRaster.wrap(N, N, tau),
                trapmap.maps.raster.PixelGrid.centred(N, N, SyntheticStack.PITCH_MM),
                trapmap.maps.model.Quantity.EFFECTIVE_LIFETIME, "w1", SyntheticStack.conditions(dn),
                trapmap.maps.model.Provenance.of("synthetic square level"));
    }

    @Test
    void squareLevelsOfSwappedContrastKeepTheirPlacement() {
        WaferMap first = level(1e13, 0.3, 0.9, 0, 0, 0.02, 1);
        WaferMap second = level(1e15, 0.9, 0.3, 0, 0, 0.02, 2);
        // the unrestricted search of compare lays the second level's dark disc onto the first's by a half turn:
        // this pair is the trap the stack's registration must not fall into
        Registration free = MapRegistration.registerChecked(first, second, RegistrationOptions.DEFAULTS,
                ProgressListener.NONE).registration();
        assertThat(free.samePlacement(Registration.identity(), 5, 2)).as("compare's placement %s", free).isFalse();

        InjectionStack stack = InjectionStack.of(List.of(first, second), SyntheticStack.names(2),
                InjectionStack.Options.DEFAULTS);
        RegistrationReport r = stack.level(1).registration();
        assertThat(r.kept()).isEqualTo(RegistrationReport.Kept.IDENTITY);
        assertThat(r.registration()).isEqualTo(Registration.identity().withQuality(r.identityScore(),
                r.registration().overlapPixels()));
        assertThat(stack.level(1).resampled()).isFalse();
        assertThat(stack.level(1).map()).isSameAs(second);
    }

    @Test
    void aRealShiftOfAFewPixelsIsFoundAndUndone() {
        WaferMap first = level(1e13, 0.3, 0.9, 0, 0, 0.02, 3);
        WaferMap moved = level(1e14, 0.5, 0.6, 3, -2, 0.02, 4);
        InjectionStack stack = InjectionStack.of(List.of(first, moved), SyntheticStack.names(2),
                InjectionStack.Options.DEFAULTS);
        RegistrationReport r = stack.level(1).registration();
        assertThat(r.kept()).isEqualTo(RegistrationReport.Kept.SEARCH);
        assertThat(r.registration().score()).isGreaterThan(r.identityScore() + InjectionStack.IDENTITY_MARGIN);
        assertThat(Math.abs(r.registration().fineRotationDeg())).isLessThan(0.5);
        assertThat(Math.hypot(r.registration().shiftXMm(), r.registration().shiftYMm()))
                .isCloseTo(Math.hypot(3, 2) * SyntheticStack.PITCH_MM, within(0.3));
        assertThat(stack.level(1).resampled()).isTrue();
        // placed back: the centre of disc A at the first level's position holds the disc's lifetime again
        WaferMap placed = stack.level(1).map();
        assertThat((double) placed.raster().get((int) DISC_A[0], (int) DISC_A[1]))
                .isCloseTo(0.5 * BACKGROUND_US, within(0.1 * BACKGROUND_US));
        assertThat((double) placed.raster().get((int) DISC_B[0], (int) DISC_B[1]))
                .isCloseTo(0.6 * BACKGROUND_US, within(0.1 * BACKGROUND_US));
    }

    @Test
    void aSpuriousFineTurnDoesNotBeatTheShiftByTheMargin() {
        // with two discs as the only texture the turn is poorly fixed: the refinement may find a turn near 1°
        // scoring a little above the correct shift; the stack keeps the shift alone
        WaferMap first = level(1e13, 0.3, 0.9, 0, 0, 0.02, 3);
        WaferMap moved = level(1e14, 0.5, 0.6, 3, -2, 0.02, 4);
        RegistrationOptions upright = InjectionStack.REGISTRATION;
        Registration turned = MapRegistration.registerChecked(first, moved, upright, ProgressListener.NONE)
                .registration();
        RegistrationReport kept = MapRegistration.registerNearIdentity(first, moved, upright,
                InjectionStack.IDENTITY_MARGIN, ProgressListener.NONE);
        assertThat(kept.registration().rotationDeg()).isZero();
        assertThat(turned.score()).isLessThan(kept.registration().score() + InjectionStack.IDENTITY_MARGIN);
        // with no margin the best-scoring placement wins, turned or not
        RegistrationReport noMargin = MapRegistration.registerNearIdentity(first, moved, upright, 0,
                ProgressListener.NONE);
        assertThat(noMargin.registration().score()).isGreaterThanOrEqualTo(kept.registration().score());
        assertThat(noMargin.registration().score()).isCloseTo(noMargin.searchScore(), within(1e-12));
    }

    @Test
    void neverMirrorsNorTurnsBeyondTheLimitWhateverTheOptionsSay() {
        WaferMap first = level(1e13, 0.3, 0.9, 0, 0, 0.02, 1);
        WaferMap second = level(1e15, 0.9, 0.3, 0, 0, 0.02, 2);
        RegistrationReport r = MapRegistration.registerNearIdentity(first, second, RegistrationOptions.DEFAULTS, 0,
                ProgressListener.NONE);
        assertThat(r.registration().mirrored()).isFalse();
        assertThat(Math.abs(r.registration().rotationDeg())).isLessThanOrEqualTo(
                RegistrationOptions.DEFAULTS.maxRotationDeg() + 1e-9);
    }
}
