package trapmap.maps.geometry;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.Random;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class WaferShapeTest {

    static Stream<WaferShape> shapes() {
        return Stream.of(
                RoundWafer.disk(100),
                WaferFormat.ROUND_150_FLAT.shape(),
                WaferFormat.ROUND_100_FLAT.shape(33),
                new RoundWafer(200, Fiducial.notch(1, 90), 200, 3, -2),
                new RoundWafer(60, Fiducial.notch(6, 60), 270, 0, 0),
                WaferFormat.M10.shape(),
                new SquareWafer(125, 150, 17, -4, 6),
                SquareWafer.full(156.75).withRotation(-8).movedTo(1, 2));
    }

    /** Outline by bisection of {@link WaferShape#contains} along rays from the centre (all shapes are star-shaped). */
    private static double[][] sampledOutline(WaferShape s, int n) {
        double[][] pts = new double[2][n];
        WaferShape.Prepared p = s.prepared();
        for (int k = 0; k < n; k++) {
            double t = 2 * Math.PI * k / n;
            double lo = 0;
            double hi = s.boundingRadiusMm() * 1.01;
            for (int it = 0; it < 60; it++) {
                double mid = (lo + hi) / 2;
                if (p.contains(s.centreXMm() + mid * Math.cos(t), s.centreYMm() + mid * Math.sin(t))) {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            pts[0][k] = s.centreXMm() + lo * Math.cos(t);
            pts[1][k] = s.centreYMm() + lo * Math.sin(t);
        }
        return pts;
    }

    /** The near distance (square roots for hypot) stays within its stated bound of the exact one, on both sides. */
    @ParameterizedTest
    @MethodSource("shapes")
    void nearDistanceStaysWithinItsBoundOfTheExactOne(WaferShape s) {
        WaferShape.Prepared p = s.prepared();
        Random r = new Random(9);
        double worst = 0;
        for (int k = 0; k < 200_000; k++) {
            double dx = (r.nextDouble() * 2.4 - 1.2) * s.boundingRadiusMm();
            double dy = (r.nextDouble() * 2.4 - 1.2) * s.boundingRadiusMm();
            double x = s.centreXMm() + dx;
            double y = s.centreYMm() + dy;
            double exact = p.distanceToEdgeMm(x, y);
            double near = p.nearDistanceToEdgeMm(x, y);
            double bound = p.nearDistanceErrorMm(Math.abs(dx) + Math.abs(dy));
            assertThat(Math.abs(near - exact)).as("(%s, %s)", x, y).isLessThanOrEqualTo(bound);
            assertThat(Math.signum(near)).isEqualTo(Math.signum(exact));
            worst = Math.max(worst, Math.abs(near - exact) / bound);
        }
        // the bound is generous: the differences are rounding, a thousandth of it or less
        assertThat(worst).isLessThan(1e-3);
    }

    @ParameterizedTest
    @MethodSource("shapes")
    void distanceMatchesADenselySampledOutline(WaferShape s) {
        int n = 100_000;
        double[][] outline = sampledOutline(s, n);
        double spacing = 2 * Math.PI * s.boundingRadiusMm() / n * 2;
        Random r = new Random(5);
        for (int k = 0; k < 200; k++) {
            double x = s.centreXMm() + (r.nextDouble() * 2.4 - 1.2) * s.boundingRadiusMm();
            double y = s.centreYMm() + (r.nextDouble() * 2.4 - 1.2) * s.boundingRadiusMm();
            double brute2 = Double.POSITIVE_INFINITY;
            for (int i = 0; i < n; i++) {
                double dx = x - outline[0][i];
                double dy = y - outline[1][i];
                brute2 = Math.min(brute2, dx * dx + dy * dy);
            }
            double brute = Math.sqrt(brute2);
            double d = s.distanceToEdgeMm(x, y);
            assertThat(Math.abs(d)).as("%s at (%.3f, %.3f)", s.describe(), x, y).isCloseTo(brute, within(spacing));
            assertThat(d >= 0).isEqualTo(s.contains(x, y));
        }
    }

    @Test
    void distancesOfAFlattedWaferAtKnownPoints() {
        RoundWafer w = (RoundWafer) WaferFormat.ROUND_150_FLAT.shape();
        double d = Math.sqrt(75 * 75 - 28.75 * 28.75);
        assertThat(w.flatDistanceMm()).isCloseTo(d, within(1e-12));
        assertThat(w.distanceToEdgeMm(0, 0)).isCloseTo(d, within(1e-12));
        assertThat(w.distanceToEdgeMm(0, 60)).isCloseTo(15, within(1e-12));
        assertThat(w.distanceToEdgeMm(0, -80)).isCloseTo(-(80 - d), within(1e-12));
        assertThat(w.distanceToEdgeMm(100, 0)).isCloseTo(-25, within(1e-12));
        // just beyond the end of the flat the nearest edge point is the corner where flat and arc meet
        assertThat(w.distanceToEdgeMm(28.75 + 1, -d - 4)).isCloseTo(-Math.sqrt(17), within(1e-12));
        // a little farther round, the arc is nearer than the corner
        assertThat(w.distanceToEdgeMm(28.75 + 3, -d - 4)).isCloseTo(75 - Math.hypot(31.75, d + 4), within(1e-12));
    }

    @Test
    void notchBottomIsItsDepthInsideTheCircle() {
        RoundWafer w = (RoundWafer) WaferFormat.ROUND_300_NOTCH.shape();
        assertThat(w.contains(0, -149.05)).isFalse();
        assertThat(w.contains(0, -148.95)).isTrue();
        assertThat(w.contains(0.6, -149.5)).isTrue();
        assertThat(w.distanceToEdgeMm(0, -140)).isCloseTo(9, within(1e-9));
        // the V removes depth² (90° opening) minus a sliver between chord and arc
        double removed = Math.PI * 150 * 150 - w.areaMm2();
        assertThat(removed).isCloseTo(1.0, within(0.01));
    }

    @Test
    void pseudoSquareDistanceNearTheCorner() {
        SquareWafer m10 = (SquareWafer) WaferFormat.M10.shape();
        assertThat(m10.distanceToEdgeMm(0, 0)).isCloseTo(91, within(1e-12));
        double q = 100 / Math.sqrt(2);
        // on the diagonal but still beside the straight part of the side (which ends at ±83.5 mm)
        assertThat(m10.distanceToEdgeMm(q, q)).isCloseTo(91 - q, within(1e-12));
        double q2 = 120 / Math.sqrt(2);
        assertThat(m10.distanceToEdgeMm(q2, q2)).isCloseTo(123.5 - 120, within(1e-12));
        assertThat(m10.contains(90, 90)).isFalse();
        assertThat(m10.distanceToEdgeMm(90, 90)).isCloseTo(-(Math.hypot(90, 90) - 123.5), within(1e-12));
    }

    /**
     * Pixel counting misjudges the area along the rim: a few hundredths of a pixel per rim pixel on average, up to
     * half a pixel along an edge that runs parallel to the pixel rows. Allowed here: 0.05 pixel areas per rim pixel.
     */
    private static double rimTolerance(WaferShape s, PixelGrid grid) {
        double rimPixels = 2 * Math.PI * s.boundingRadiusMm() / grid.pitchMm();
        return 0.05 * rimPixels * grid.pixelAreaMm2();
    }

    @Test
    void roundMaskAreaIsTheDiskMinusTheFlatSegment() {
        RoundWafer w = (RoundWafer) WaferFormat.ROUND_150_FLAT.shape();
        PixelGrid grid = PixelGrid.centred(801, 801, 0.2);
        Mask m = w.mask(grid, 0);
        double r = 75;
        double c = 28.75;
        double d = Math.sqrt(r * r - c * c);
        double segment = r * r * Math.acos(d / r) - d * c;
        double expected = Math.PI * r * r - segment;
        assertThat(w.areaMm2()).isCloseTo(expected, within(1e-9));
        assertThat(m.count() * grid.pixelAreaMm2()).isCloseTo(expected, within(rimTolerance(w, grid)));
    }

    @Test
    void edgeExclusionShrinksARoundWaferByTheExclusion() {
        RoundWafer w = (RoundWafer) WaferFormat.ROUND_150_FLAT.shape(30);
        PixelGrid grid = PixelGrid.centred(801, 801, 0.2);
        double e = 3;
        // points at least e inside a disk-with-flat: the disk of radius R − e cut by the chord moved in by e
        double r = 75 - e;
        double d = w.flatDistanceMm() - e;
        RoundWafer inner = new RoundWafer(2 * r, Fiducial.flat(2 * Math.sqrt(r * r - d * d)), 30, 0, 0);
        Mask m = w.mask(grid, e);
        assertThat(m.count() * grid.pixelAreaMm2()).isCloseTo(inner.areaMm2(), within(rimTolerance(w, grid)));
        assertThat(w.areaMm2() - inner.areaMm2()).isGreaterThan(100 * rimTolerance(w, grid));
        assertThat(m.and(w.mask(grid, 0).not()).count()).isZero();
    }

    @Test
    void edgeExclusionShrinksAPseudoSquareOnBothItsSidesAndCorners() {
        SquareWafer s = (SquareWafer) WaferFormat.M10.shape(280);
        PixelGrid grid = PixelGrid.centred(1001, 1001, 0.25);
        double e = 2;
        SquareWafer inner = new SquareWafer(182 - 2 * e, 247 - 2 * e, 10, 0, 0);
        assertThat(s.mask(grid, 0).count() * grid.pixelAreaMm2()).isCloseTo(s.areaMm2(),
                within(rimTolerance(s, grid)));
        assertThat(s.mask(grid, e).count() * grid.pixelAreaMm2()).isCloseTo(inner.areaMm2(),
                within(rimTolerance(s, grid)));
    }

    @Test
    void maskFollowsAShapeOffTheGridCentre() {
        PixelGrid grid = PixelGrid.centred(101, 101, 1);
        Mask m = RoundWafer.disk(20).movedTo(30, -20).mask(grid, 0);
        assertThat(m.contains(50 + 30, 50 + 20)).isTrue();
        assertThat(m.contains(50, 50)).isFalse();
        assertThat(m.count()).isBetween(300, 330);
    }

    @Test
    void invalidDimensionsNameFieldAndUnit() {
        assertThatThrownBy(() -> RoundWafer.disk(-1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("diameter").hasMessageContaining("mm");
        assertThatThrownBy(() -> RoundWafer.of(100, Fiducial.flat(120))).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("flatLength");
        assertThatThrownBy(() -> SquareWafer.pseudo(182, 180)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("diagonal");
        assertThatThrownBy(() -> Fiducial.notch(1, 190)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("notchAngle").hasMessageContaining("deg");
        assertThatThrownBy(() -> RoundWafer.disk(100).mask(PixelGrid.centred(3, 3, 1), -1))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("edgeExclusion")
                .hasMessageContaining("mm");
    }
}
