package trapmap.maps.geometry;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

class OutlineDetectionTest {

    /** A map with data (1.0) where the pixel centre lies inside {@code shape}, NaN elsewhere. */
    private static FloatRaster render(WaferShape shape, PixelGrid grid) {
        int w = grid.width();
        float[] s = new float[w * grid.height()];
        for (int i = 0; i < s.length; i++) {
            s[i] = shape.contains(grid.xMm(i % w), grid.yMm(i / w)) ? 1f : Float.NaN;
        }
        return FloatRaster.wrap(w, grid.height(), s);
    }

    @Test
    void recoversAKnownCircle() {
        PixelGrid grid = PixelGrid.centred(601, 551, 0.25);
        double cxPx = 303.3;
        double cyPx = 270.6;
        double rPx = 250.4;
        RoundWafer truth = RoundWafer.disk(2 * rPx * 0.25).movedTo(grid.xMm(cxPx), grid.yMm(cyPx));
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);

        assertThat(fit.model()).isEqualTo(OutlineFit.Model.ROUND);
        RoundWafer r = (RoundWafer) fit.shape();
        assertThat(fit.centreXPx()).isCloseTo(cxPx, within(0.5));
        assertThat(fit.centreYPx()).isCloseTo(cyPx, within(0.5));
        assertThat(r.radiusMm() / grid.pitchMm()).isCloseTo(rPx, within(0.5));
        assertThat(r.fiducial()).isEqualTo(Fiducial.NONE);
        assertThat(fit.quality().rmsResidualMm()).isLessThan(grid.pitchMm());
        assertThat(fit.quality().mismatchFraction()).isLessThan(0.005);
        // a plain 125 mm disk: the 125 mm format's flat (3.7 mm deep) would show at 0.25 mm, and it is not there
        assertThat(fit.closestFormat().format()).isNull();
        assertThat(fit.closestFormat().family()).isEqualTo("round-125");
        assertThat(fit.closestFormat().mark()).isEqualTo(FormatMatch.Mark.NOT_FOUND);
        assertThat(fit.centredShape().centreXMm()).isZero();
        assertThat(fit.recentredGrid().xMm(cxPx)).isCloseTo(0, within(0.5 * grid.pitchMm()));
    }

    @Test
    void findsTheFlatOfA150MmWaferAndItsDirection() {
        PixelGrid grid = PixelGrid.centred(801, 801, 0.2);
        WaferShape truth = WaferFormat.ROUND_150_FLAT.shape(30).movedTo(1.3, -0.7);
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);

        RoundWafer r = (RoundWafer) fit.shape();
        assertThat(r.fiducial()).isInstanceOf(Fiducial.Flat.class);
        assertThat(((Fiducial.Flat) r.fiducial()).lengthMm()).isCloseTo(57.5, within(2.5));
        assertThat(r.fiducialAngleDeg()).isCloseTo(30, within(1.0));
        assertThat(r.diameterMm()).isCloseTo(150, within(matcher(WaferFormat.ROUND_150_FLAT.sizeTolerance(), grid)));
        assertThat(r.centreXMm()).isCloseTo(1.3, within(grid.pitchMm()));
        assertThat(r.centreYMm()).isCloseTo(-0.7, within(grid.pitchMm()));
        assertThat(fit.closestFormat().format()).isEqualTo(WaferFormat.ROUND_150_FLAT);
        assertThat(fit.closestFormat().withinTolerance()).isTrue();
    }

    @Test
    void findsTheNotchOfA200MmWafer() {
        PixelGrid grid = PixelGrid.centred(1021, 1021, 0.2);
        WaferShape truth = WaferFormat.ROUND_200_NOTCH.shape(90);
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);

        RoundWafer r = (RoundWafer) fit.shape();
        assertThat(r.fiducial()).isInstanceOf(Fiducial.Notch.class);
        assertThat(((Fiducial.Notch) r.fiducial()).depthMm()).isCloseTo(1.0, within(3 * grid.pitchMm()));
        assertThat(r.fiducialAngleDeg()).isCloseTo(90, within(0.5));
        assertThat(fit.closestFormat().format()).isEqualTo(WaferFormat.ROUND_200_NOTCH);
    }

    @Test
    void aNotchBelowThePitchIsReportedUnresolvedNotGuessedAsAFlat() {
        PixelGrid grid = PixelGrid.centred(257, 257, 0.8);
        WaferShape truth = WaferFormat.ROUND_200_NOTCH.shape();
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);

        assertThat(fit.model()).isEqualTo(OutlineFit.Model.ROUND);
        FormatMatch m = fit.closestFormat();
        assertThat(m.format()).isNull();
        assertThat(m.family()).isEqualTo("round-200");
        assertThat(m.mark()).isEqualTo(FormatMatch.Mark.NOT_RESOLVED);
        assertThat(m.pitchMm()).isEqualTo(0.8);
        assertThat(m.withinTolerance()).isTrue();
    }

    @Test
    void recoversARotatedPseudoSquare() {
        PixelGrid grid = PixelGrid.centred(1041, 1041, 0.25);
        SquareWafer truth = new SquareWafer(182, 247, 12, 2.1, -1.6);
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);

        assertThat(fit.model()).isEqualTo(OutlineFit.Model.SQUARE);
        SquareWafer s = (SquareWafer) fit.shape();
        double px = grid.pitchMm();
        assertThat(s.centreXMm()).isCloseTo(2.1, within(0.5 * px));
        assertThat(s.centreYMm()).isCloseTo(-1.6, within(0.5 * px));
        assertThat(s.sideMm()).isCloseTo(182, within(px));
        assertThat(s.diagonalMm()).isCloseTo(247, within(matcher(WaferFormat.M10.diagonalTolerance(), grid)));
        assertThat(s.rotationDeg()).isCloseTo(12, within(0.1));
        assertThat(fit.closestFormat().format()).isEqualTo(WaferFormat.M10);
        assertThat(fit.alternative().model()).isEqualTo(OutlineFit.Model.ROUND);
        assertThat(fit.quality().mismatchFraction()).isLessThan(fit.alternative().mismatchFraction());
    }

    @Test
    void keepsTheSmallCornersOfAG12Wafer() {
        // G12 corners are 2 mm chords: about five pixels each at this pitch
        PixelGrid grid = PixelGrid.centred(800, 800, 0.378);
        OutlineFit fit = OutlineDetection.fit(render(WaferFormat.G12.shape(290), grid), grid);
        SquareWafer s = (SquareWafer) fit.shape();
        assertThat(s.isFullSquare()).isFalse();
        assertThat(s.diagonalMm()).isCloseTo(295, within(matcher(WaferFormat.G12.diagonalTolerance(), grid)));
        assertThat(fit.closestFormat().withinTolerance()).isTrue();
        assertThat(s.rotationDeg()).isCloseTo(20, within(0.1));
        assertThat(fit.closestFormat().format()).isEqualTo(WaferFormat.G12);
    }

    @Test
    void recoversAFullSquareTurnedTheOtherWay() {
        PixelGrid grid = PixelGrid.centred(901, 901, 0.25);
        SquareWafer truth = SquareWafer.full(156.75).withRotation(-7);
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);

        SquareWafer s = (SquareWafer) fit.shape();
        assertThat(s.isFullSquare()).isTrue();
        assertThat(s.sideMm()).isCloseTo(156.75, within(grid.pitchMm()));
        assertThat(s.rotationDeg()).isCloseTo(-7, within(0.1));
        assertThat(fit.closestFormat().format()).isEqualTo(WaferFormat.SQUARE_156_75);
    }

    @Test
    void holesInsideTheWaferDoNotDisturbTheFit() {
        PixelGrid grid = PixelGrid.centred(401, 401, 0.5);
        RoundWafer truth = RoundWafer.disk(150);
        FloatRaster map = render(truth, grid);
        float[] s = map.samples();
        for (int y = 150; y < 190; y++) {
            for (int x = 120; x < 260; x++) {
                s[y * 401 + x] = Float.NaN;
            }
        }
        OutlineFit fit = OutlineDetection.fit(map, grid);
        assertThat(((RoundWafer) fit.shape()).diameterMm()).isCloseTo(150, within(grid.pitchMm()));
        assertThat(fit.centreXPx()).isCloseTo(200, within(0.5));
    }

    @Test
    void aWaferCutByTheImageFrameIsFittedOnItsVisibleRim() {
        PixelGrid grid = new PixelGrid(500, 500, 0.2, 220, 260);
        RoundWafer truth = RoundWafer.disk(100); // reaches beyond the top and left of the image
        OutlineFit fit = OutlineDetection.fit(render(truth, grid), grid);
        assertThat(fit.centreXPx()).isCloseTo(220, within(0.5));
        assertThat(fit.centreYPx()).isCloseTo(260, within(0.5));
        assertThat(((RoundWafer) fit.shape()).diameterMm()).isCloseTo(100, within(2 * grid.pitchMm()));
        assertThat(fit.closestFormat().withinTolerance()).isTrue();
    }

    @Test
    void filledOutlineClosesEnclosedHolesOnly() {
        float n = Float.NaN;
        FloatRaster r = FloatRaster.wrap(5, 4, new float[] {
                n, 1, 1, 1, n,
                n, 1, n, 1, n,
                n, 1, 1, 1, n,
                n, n, n, n, n});
        Mask filled = DataOutline.filled(r);
        assertThat(filled.count()).isEqualTo(9);
        assertThat(filled.contains(2, 1)).isTrue();
        assertThat(filled.contains(0, 0)).isFalse();
    }

    @Test
    void distanceTransformIsEuclidean() {
        int w = 9;
        int h = 7;
        Mask inside = Mask.of(w, h, i -> i != 3 * w + 4); // everything but the centre pixel
        float[] d = DistanceTransform.distanceToOutsidePx(inside);
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double toHole = Math.hypot(x - 4, y - 3);
                double toFrame = Math.min(Math.min(x + 1, w - x), Math.min(y + 1, h - y));
                assertThat((double) d[y * w + x]).as("(%d, %d)", x, y)
                        .isCloseTo(Math.min(toHole, toFrame), within(1e-6));
            }
        }
    }

    @Test
    void tooLittleDataIsRefused() {
        PixelGrid grid = PixelGrid.centred(5, 5, 1);
        FloatRaster r = FloatRaster.filled(5, 5, Float.NaN);
        r.samples()[12] = 1;
        assertThatThrownBy(() -> OutlineDetection.fit(r, grid)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("edge points").hasMessageContaining("not visible");
    }

    /**
     * The size tolerance the format matcher applies to a fit at this pitch ({@link WaferFormat#closestTo}): the
     * format's tolerance widened by {@link WaferFormat#PITCH_TOLERANCE_FACTOR} pixels. An outline test is never
     * looser than that, so a fit that passes it is also matched to its format.
     */
    private static double matcher(Tolerance formatTolerance, PixelGrid grid) {
        return Math.max(formatTolerance.minus(), formatTolerance.plus())
                + WaferFormat.PITCH_TOLERANCE_FACTOR * grid.pitchMm();
    }
}
