package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.shared.error.InvalidValueException;

class RegistrationTest {

    @Test
    void rotationIsKeptInTheHalfOpenRange() {
        assertThat(Registration.explicit(false, false, 270, 0, 0).rotationDeg()).isEqualTo(-90);
        assertThat(Registration.explicit(false, false, -180, 0, 0).rotationDeg()).isEqualTo(180);
        assertThat(Registration.explicit(false, false, 725, 0, 0).rotationDeg()).isCloseTo(5, within(1e-12));
    }

    @Test
    void aQuarterTurnMovesXOntoY() {
        double[] p = Registration.explicit(false, false, 90, 1, 2).toBeforeMm(10, 0);
        assertThat(p[0]).isCloseTo(1, within(1e-12));
        assertThat(p[1]).isCloseTo(12, within(1e-12));
    }

    @Test
    void mirroringComesBeforeTurning() {
        double[] p = Registration.explicit(true, false, 90, 0, 0).toBeforeMm(10, 0);
        assertThat(p[0]).isCloseTo(0, within(1e-12));
        assertThat(p[1]).isCloseTo(-10, within(1e-12));
    }

    @Test
    void toAfterUndoesToBefore() {
        Registration r = Registration.explicit(true, true, 33.3, -4, 7.5);
        double[] b = r.toBeforeMm(12.5, -3.25);
        double[] a = r.toAfterMm(b[0], b[1]);
        assertThat(a[0]).isCloseTo(12.5, within(1e-12));
        assertThat(a[1]).isCloseTo(-3.25, within(1e-12));
    }

    @Test
    void bothMirrorsAreAHalfTurn() {
        Registration both = Registration.explicit(true, true, 10, 1, 2);
        Registration c = both.canonical();
        assertThat(c.flipX()).isFalse();
        assertThat(c.flipY()).isFalse();
        assertThat(c.rotationDeg()).isCloseTo(-170, within(1e-12));
        double[] p = both.toBeforeMm(3, 4);
        double[] q = c.toBeforeMm(3, 4);
        assertThat(q[0]).isCloseTo(p[0], within(1e-12));
        assertThat(q[1]).isCloseTo(p[1], within(1e-12));
    }

    @Test
    void aMirrorIsWrittenWithTheSmallerTurn() {
        Registration flipYHalfTurn = Registration.explicit(false, true, 180, 0, 0);
        assertThat(flipYHalfTurn.canonical()).isEqualTo(Registration.explicit(true, false, 0, 0, 0));
        assertThat(Registration.explicit(false, true, 100, 0, 0).canonical())
                .isEqualTo(Registration.explicit(true, false, -80, 0, 0));
        assertThat(Registration.explicit(false, true, 90, 0, 0).canonical())
                .isEqualTo(Registration.explicit(true, false, -90, 0, 0));
        assertThat(Registration.explicit(true, false, 92.5, 0, 0).quarterTurns()).isEqualTo(1);
        assertThat(Registration.explicit(true, false, 92.5, 0, 0).fineRotationDeg()).isCloseTo(2.5, within(1e-12));
    }

    @Test
    void samePlacementIgnoresHowTheMirrorIsWritten() {
        Registration a = Registration.explicit(true, false, 90, 1, 2);
        Registration b = Registration.explicit(false, true, -89.95, 1.05, 2);
        assertThat(a.samePlacement(b, 0.1, 0.1)).isTrue();
        assertThat(a.samePlacement(b, 0.01, 0.1)).isFalse();
        assertThat(a.samePlacement(Registration.explicit(false, false, 90, 1, 2), 1, 1)).isFalse();
    }

    @Test
    void identityAndExplicitAreNotEvaluated() {
        assertThat(Registration.identity().score()).isNaN();
        assertThat(Registration.identity().overlapPixels()).isZero();
        assertThat(Registration.identity().withQuality(0.9, 100).score()).isEqualTo(0.9);
    }

    @Test
    void badValuesAreRefusedNamingTheField() {
        assertThatThrownBy(() -> Registration.explicit(false, false, 0, Double.NaN, 0))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> {
                    assertThat(e.field()).isEqualTo("shiftX");
                    assertThat(e.unit()).isEqualTo("mm");
                });
        assertThatThrownBy(() -> Registration.identity().withQuality(1.5, 0))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> assertThat(e.field()).isEqualTo("score"));
        assertThatThrownBy(() -> Registration.identity().withQuality(0.5, -1))
                .isInstanceOfSatisfying(InvalidValueException.class,
                        e -> assertThat(e.field()).isEqualTo("overlapPixels"));
        assertThatThrownBy(() -> RegistrationOptions.DEFAULTS.withMaxRotation(60))
                .isInstanceOfSatisfying(InvalidValueException.class,
                        e -> assertThat(e.field()).isEqualTo("maxRotation"));
        assertThatThrownBy(() -> new RegistrationOptions(true, 5, 1, 100, 512))
                .isInstanceOfSatisfying(InvalidValueException.class,
                        e -> assertThat(e.field()).isEqualTo("coarseSize"));
    }
}
