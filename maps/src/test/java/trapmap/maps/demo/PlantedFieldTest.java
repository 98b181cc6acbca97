package trapmap.maps.demo;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.material.Doping;

class PlantedFieldTest {
    private static final PlantedField.Edge LEFT = new PlantedField.Edge("left", 50, 2e12, 4.0);

    @Test
    void edgeZoneDecaysExponentiallyFromItsSide() {
        assertThat(LEFT.density(-50, 0)).isEqualTo(2e12);
        assertThat(LEFT.density(-46, 10)).isCloseTo(2e12 / Math.E, within(1e3));
        assertThat(LEFT.probe(2.0)).containsExactly(-48.0, 0.0);
    }

    @Test
    void spotsBlendToTheirOwnLevelAndEscapeTheGetteringDivisor() {
        PlantedField.Spot spot = new PlantedField.Spot("cluster", 10, 10, 3.0, 4e11);
        PlantedField f = new PlantedField((x, y) -> 1e11, List.of(LEFT), List.of(spot), null, 20);

        assertThat(f.total(10, 10)).isEqualTo(4e11);
        assertThat(f.total(0, 0)).isCloseTo(f.base(0, 0) / 20, within(1.0));
        assertThat(f.base(0, 0)).isCloseTo(1e11 + LEFT.density(0, 0), within(1.0));
    }

    @Test
    void ringIsGaussianInRadiusAroundItsCentreLine() {
        PlantedField.Ring ring = new PlantedField.Ring(60, 4, 2e12);

        assertThat(ring.density(60, 0)).isEqualTo(2e12);
        assertThat(ring.density(0, -64)).isCloseTo(2e12 * Math.exp(-0.5), within(1e3));
    }

    @Test
    void grainsAreTheSameForTheSameSeedAndWithinTheirLevelsTimesTheBoundaryFactor() {
        PlantedField.Grains a = new PlantedField.Grains(new Random(7), 50, 20, 2e10, 1e11);
        PlantedField.Grains b = new PlantedField.Grains(new Random(7), 50, 20, 2e10, 1e11);
        for (double x = -50; x <= 50; x += 7.3) {
            assertThat(a.applyAsDouble(x, -x / 2)).isEqualTo(b.applyAsDouble(x, -x / 2))
                    .isBetween(2e10, 2.5 * 1e11);
        }
    }

    @Test
    void steadyStateInjectionSolvesInjectionEqualsGenerationTimesLifetime() {
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, 300.0, null, 2e19, 10.0, null,
                null, null);
        TrapDensityConverter forward = LifetimeDrawing.forward(c, "fe-i");
        double g = 2e19;

        double dn = LifetimeDrawing.steadyStateInjection(forward, 1e12, g);

        assertThat(dn).isCloseTo(g * forward.lifetimeAtInjectionUs(1e12, dn) * 1e-6, within(1e-9 * dn));
    }
}
