package trapmap.maps.geometry;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

class WaferFormatTest {

    /*
     * SEMI M1 round wafers. Diameters with tolerances and the 100/125/150 mm flat lengths: SEMI M1 as tabulated in
     * two independent public summaries (one citing SEMI M1-0302). The 200 mm flat and
     * the notch (depth 1.00 +0.25/−0.00 mm, angle 90° +5°/−1°): from memory.
     */
    @ParameterizedTest
    @CsvSource({
            // id,              diameter, ±,   flat,  ±
            "round-100-flat,    100,      0.5, 32.5,  2.5",
            "round-125-flat,    125,      0.5, 42.5,  2.5",
            "round-150-flat,    150,      0.2, 57.5,  2.5",
            "round-200-flat,    200,      0.2, 57.5,  2.5", // flat length from memory
    })
    void roundFlatFormatsMatchSemiM1(String id, double diameterMm, double diameterTolMm, double flatMm,
                                     double flatTolMm) {
        WaferFormat f = WaferFormat.byId(id);
        assertThat(f.kind()).isEqualTo(WaferFormat.Kind.ROUND);
        assertThat(f.sizeMm()).isEqualTo(diameterMm);
        assertThat(f.sizeTolerance()).isEqualTo(Tolerance.symmetric(diameterTolMm));
        assertThat(f.fiducial()).isEqualTo(Fiducial.flat(flatMm));
        assertThat(f.fiducialTolerance()).isEqualTo(Tolerance.symmetric(flatTolMm));
    }

    @ParameterizedTest
    @CsvSource({
            // id,               diameter, ±,   notch depth, -,  +,    angle, -, +   (notch from memory)
            "round-200-notch,    200,      0.2, 1.00,        0,  0.25, 90,    1, 5",
            "round-300-notch,    300,      0.2, 1.00,        0,  0.25, 90,    1, 5",
    })
    void notchedFormatsMatchSemiM1(String id, double diameterMm, double diameterTolMm, double depthMm,
                                   double depthMinusMm, double depthPlusMm, double angleDeg, double angleMinusDeg,
                                   double anglePlusDeg) {
        WaferFormat f = WaferFormat.byId(id);
        assertThat(f.sizeMm()).isEqualTo(diameterMm);
        assertThat(f.sizeTolerance()).isEqualTo(Tolerance.symmetric(diameterTolMm));
        assertThat(f.fiducial()).isEqualTo(Fiducial.notch(depthMm, angleDeg));
        assertThat(f.fiducialTolerance()).isEqualTo(new Tolerance(depthMinusMm, depthPlusMm));
        assertThat(f.notchAngleToleranceDeg()).isEqualTo(new Tolerance(angleMinusDeg, anglePlusDeg));
    }

    /*
     * Solar formats: side and pseudo-square diameter from public wafer-format tables (an educational overview for
     * M0/M2; a trade format table for M2, G1, M6, G12; trade press for the 182 mm M10 side). M10's 247 mm
     * diameter: from memory (common practice). SEMI PV22 itself was not consulted.
     */
    @ParameterizedTest
    @CsvSource({
            "m0,   156.00, 200",
            "m2,   156.75, 210",
            "g1,   158.75, 223",
            "m6,   166.00, 223",
            "m10,  182.00, 247",
            "g12,  210.00, 295",
    })
    void pseudoSquareFormatsMatchTradeTables(String id, double sideMm, double diameterMm) {
        WaferFormat f = WaferFormat.byId(id);
        assertThat(f.kind()).isEqualTo(WaferFormat.Kind.PSEUDO_SQUARE);
        assertThat(f.sizeMm()).isEqualTo(sideMm);
        assertThat(f.diagonalMm()).isEqualTo(diameterMm);
        assertThat(f.shape()).isInstanceOf(SquareWafer.class);
    }

    /*
     * Wafer areas: G1 25 199, M6 27 415 and G12 44 096 mm² from a public trade format table; M10 330.15 cm² from
     * memory. These are areas of the square-and-circle intersection, so they check the geometry as well.
     */
    @ParameterizedTest
    @CsvSource({
            "g1,  25199",
            "m6,  27415",
            "g12, 44096",
            "m10, 33015",
    })
    void pseudoSquareAreasMatchPublishedAreas(String id, double areaMm2) {
        assertThat(WaferFormat.byId(id).shape().areaMm2()).isCloseTo(areaMm2, within(1.0));
    }

    @Test
    void fullSquaresHaveSharpCorners() {
        SquareWafer s = (SquareWafer) WaferFormat.byId("square-156.75").shape();
        assertThat(s.isFullSquare()).isTrue();
        assertThat(s.areaMm2()).isCloseTo(156.75 * 156.75, within(1e-9));
        assertThat(s.cornerChordMm()).isZero();
        assertThat(WaferFormat.SQUARE_210.diagonalMm()).isCloseTo(210 * Math.sqrt(2), within(1e-12));
    }

    @Test
    void pseudoSquareCornerGeometryFollowsFromSideAndDiameter() {
        SquareWafer m10 = (SquareWafer) WaferFormat.M10.shape();
        double straight = 2 * Math.sqrt(123.5 * 123.5 - 91 * 91);
        assertThat(m10.straightSideMm()).isCloseTo(straight, within(1e-9));
        assertThat(m10.cornerChordMm()).isCloseTo(Math.sqrt(2) * (91 - straight / 2), within(1e-9));
    }

    @Test
    void idsAreUniqueAndResolveCaseInsensitively() {
        assertThat(WaferFormat.ids()).doesNotHaveDuplicates().contains("round-150-flat", "round-300-notch", "m10",
                "g12", "square-156.75");
        assertThat(WaferFormat.byId(" M10 ")).isEqualTo(WaferFormat.M10);
        assertThat(WaferFormat.byId("m12")).isEqualTo(WaferFormat.G12);
    }

    @Test
    void unknownIdListsTheKnownOnes() {
        assertThatThrownBy(() -> WaferFormat.byId("round-450"))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("round-450")
                .hasMessageContaining("round-300-notch");
    }

    @Test
    void everyFormatNamesItsSource() {
        for (WaferFormat f : WaferFormat.values()) {
            assertThat(f.source()).as(f.id()).isNotBlank();
        }
        assertThat(WaferFormat.ROUND_300_NOTCH.source()).contains("memory");
        assertThat(WaferFormat.M10.source()).contains("memory");
    }

    @Test
    void orientationTurnsTheFiducial() {
        RoundWafer r = (RoundWafer) WaferFormat.ROUND_150_FLAT.shape(0);
        double d = r.flatDistanceMm();
        assertThat(r.contains(d + 0.1, 0)).isFalse();
        assertThat(r.contains(d - 0.1, 0)).isTrue();
        assertThat(r.contains(0, -(d + 0.1))).isTrue();
        assertThat(((RoundWafer) WaferFormat.ROUND_150_FLAT.shape()).fiducialAngleDeg()).isEqualTo(270);
    }

    @Test
    void closestFormatPrefersTheSameKindOfMark() {
        assertThat(WaferFormat.closestTo(RoundWafer.of(199.9, Fiducial.notch(1, 90))).format())
                .isEqualTo(WaferFormat.ROUND_200_NOTCH);
        assertThat(WaferFormat.closestTo(RoundWafer.of(200.1, Fiducial.flat(55))).format())
                .isEqualTo(WaferFormat.ROUND_200_FLAT);
        FormatMatch m = WaferFormat.closestTo(SquareWafer.pseudo(182.1, 246.9));
        assertThat(m.format()).isEqualTo(WaferFormat.M10);
        assertThat(m.deviationMm()).isCloseTo(0.1, within(1e-9));
        assertThat(m.withinTolerance()).isTrue();
        assertThat(WaferFormat.closestTo(SquareWafer.full(156.7)).format()).isEqualTo(WaferFormat.SQUARE_156_75);
        assertThat(WaferFormat.closestTo(SquareWafer.full(150)).withinTolerance()).isFalse();
    }

    @Test
    void sizeTolerancesWidenByOnePixelPitch() {
        // the demo's M2 wafers fit as 262 whole 0.6 mm pixels: 157.20 mm, 0.45 mm over the 156.75 mm side
        SquareWafer m2 = SquareWafer.pseudo(157.2, 210.14);
        assertThat(WaferFormat.closestTo(m2).withinTolerance()).isFalse(); // ±0.25 mm alone
        FormatMatch at06 = WaferFormat.closestTo(m2, 0.6);
        assertThat(at06.format()).isEqualTo(WaferFormat.M2);
        assertThat(at06.withinTolerance()).isTrue();
        assertThat(at06.toleranceMm()).isCloseTo(0.25 + 0.6, within(1e-12)); // nominal + 1 × pitch
        assertThat(at06.batchFamily()).isEqualTo("m2");
        assertThat(WaferFormat.closestTo(m2, 0.1).withinTolerance()).isFalse(); // 0.45 > 0.35
        assertThat(WaferFormat.closestTo(m2, 0.1).batchFamily()).isEqualTo(FormatMatch.FITTED);
        // SEMI M1 200 mm: ±0.2 mm; a 200.9 mm disk passes only on a coarse map
        assertThat(WaferFormat.closestTo(RoundWafer.of(200.9, Fiducial.notch(1, 90)), 0.2).withinTolerance())
                .isFalse();
        assertThat(WaferFormat.closestTo(RoundWafer.of(200.9, Fiducial.notch(1, 90)), 0.8).withinTolerance())
                .isTrue();
    }

    @Test
    void markDepthsAndTheirResolution() {
        // sagitta of a chord: R − √(R² − (L/2)²), computed from the SEMI M1 flat lengths listed above
        assertThat(WaferFormat.ROUND_200_FLAT.markDepthMm())
                .isCloseTo(100 - Math.sqrt(100 * 100 - 28.75 * 28.75), within(1e-12));
        assertThat(WaferFormat.ROUND_200_FLAT.markDepthMm()).isCloseTo(4.22, within(0.01));
        assertThat(WaferFormat.ROUND_200_NOTCH.markDepthMm()).isEqualTo(1.0);
        assertThat(WaferFormat.M10.markDepthMm()).isZero();
        assertThat(WaferFormat.ROUND_200_NOTCH.markResolvable(0.5)).isTrue();
        assertThat(WaferFormat.ROUND_200_NOTCH.markResolvable(0.8)).isFalse();
        assertThat(WaferFormat.ROUND_200_FLAT.markResolvable(0.8)).isTrue();
        assertThat(WaferFormat.ROUND_200_FLAT.markResolvable(2.2)).isFalse();
        assertThat(WaferFormat.G12.markResolvable(5)).isTrue();
    }

    @Test
    void aDiskWhoseMarkThePitchCannotShowIsFiledUnderItsSize() {
        FormatMatch coarse = WaferFormat.closestTo(RoundWafer.disk(199.98), 0.8);
        assertThat(coarse.format()).isNull();
        assertThat(coarse.family()).isEqualTo("round-200");
        assertThat(coarse.mark()).isEqualTo(FormatMatch.Mark.NOT_RESOLVED);
        assertThat(coarse.markResolved()).isFalse();
        assertThat(coarse.withinTolerance()).isTrue();
        assertThat(coarse.batchFamily()).isEqualTo("round-200");
        assertThat(coarse.candidates()).containsExactly(WaferFormat.ROUND_200_FLAT, WaferFormat.ROUND_200_NOTCH);
        assertThat(coarse.describe()).contains("mark not resolved at 0.8 mm pitch");
        // fine enough for both marks, and neither is there: not found, still never a flat
        FormatMatch fine = WaferFormat.closestTo(RoundWafer.disk(199.98), 0.2);
        assertThat(fine.format()).isNull();
        assertThat(fine.mark()).isEqualTo(FormatMatch.Mark.NOT_FOUND);
        // a seen mark decides at any pitch
        FormatMatch flat = WaferFormat.closestTo(RoundWafer.of(200, Fiducial.flat(57.5)), 0.8);
        assertThat(flat.format()).isEqualTo(WaferFormat.ROUND_200_FLAT);
        assertThat(flat.mark()).isEqualTo(FormatMatch.Mark.RESOLVED);
        assertThat(WaferFormat.closestTo(SquareWafer.pseudo(182, 247), 0.5).mark()).isEqualTo(FormatMatch.Mark.NONE);
    }

    @Test
    void sizeFamiliesTakeBothMarksButAFormatIdNeedsItsMark() {
        assertThat(WaferFormat.familyIds()).contains("round-200", "round-300", "round-150", "m10", "round-200-notch");
        assertThat(WaferFormat.ROUND_200_NOTCH.sizeFamily()).isEqualTo("round-200");
        assertThat(WaferFormat.M10.sizeFamily()).isEqualTo("m10");
        assertThat(WaferFormat.familyMatches("round-200", "round-200")).isTrue();
        assertThat(WaferFormat.familyMatches("round-200", "round-200-flat")).isTrue();
        assertThat(WaferFormat.familyMatches("round-200", "round-200-notch")).isTrue();
        assertThat(WaferFormat.familyMatches("round-200", "round-300-notch")).isFalse();
        assertThat(WaferFormat.familyMatches("round-200-notch", "round-200")).isFalse();
        assertThat(WaferFormat.familyMatches("round-200-notch", "round-200-flat")).isFalse();
        assertThat(WaferFormat.familyMatches("m10", "m10")).isTrue();
        assertThat(WaferFormat.familyMatches("m10", "fitted")).isFalse();
    }
}
