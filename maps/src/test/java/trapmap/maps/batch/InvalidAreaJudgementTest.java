package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.stats.InvalidArea;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * invalid_area_fraction: the unusable share of the evaluated area (the wafer less the edge exclusion), by cause,
 * apart from the below-limit pixels; and the program's default limit on it when a profile sets none.
 */
class InvalidAreaJudgementTest {
    private static final int N = 101;
    private static final double PITCH_MM = 1.0;
    private static final double EXCLUSION_MM = 5;
    private static final WaferFormat FORMAT = WaferFormat.byId("round-100-flat");
    private static final PixelGrid GRID = PixelGrid.centred(N, N, PITCH_MM);
    private static final TrapDensityConverter FE = new TrapDensityConverter(
            Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)), DefectLibrary.byId("fe-i"));
    /** A lifetime at the detection limit: converted BELOW_LIMIT. */
    private static final float TAU_LIMIT_US = (float) FE.convert(100).intrinsicLifetimeUs();

    /** The evaluated area by the general path: the format's outline less the edge exclusion, every pixel. */
    private static final Mask AREA = FORMAT.shape().mask(GRID, EXCLUSION_MM);

    private static float[] base() {
        float[] s = new float[N * N];
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                s[y * N + x] = Math.hypot(GRID.xMm(x), GRID.yMm(y)) > 50 ? Float.NaN : 100f;
            }
        }
        return s;
    }

    /** The index of the pixel whose centre is (xMm, yMm). */
    private static int at(double xMm, double yMm) {
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                if (Math.abs(GRID.xMm(x) - xMm) < 1e-9 && Math.abs(GRID.yMm(y) - yMm) < 1e-9) {
                    return y * N + x;
                }
            }
        }
        throw new AssertionError("no pixel at " + xMm + ", " + yMm);
    }

    private static WaferMap map(float[] s) {
        MeasurementConditions c = MeasurementConditions.UNKNOWN.withDoping(Doping.pType(1e16)).withInjection(1e15);
        return new WaferMap(FloatRaster.wrap(N, N, s), GRID, Quantity.EFFECTIVE_LIFETIME, "w", c,
                Provenance.of("test"));
    }

    private static Rules rules(String limits) throws RulesException {
        return Rules.parse("{\"wafer\": \"round-100-flat\", \"edge_exclusion_mm\": " + EXCLUSION_MM + ","
                + " \"defect\": \"fe-i\", \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1e-6}"
                + (limits == null ? "" : ", \"limits\": {" + limits + "}") + "}", "rules.json");
    }

    /**
     * Inside (a 10 × 10 block at the centre): 12 NaN, 7 ±∞ (4 + 3), 20 zero, 9 negative, 5 below the 1 ns floor and
     * 30 at the detection limit; outside (in the 5 mm exclusion band at x = ±47 mm, and beyond the wafer in the
     * corners): NaN, zero and negative pixels that must not count.
     */
    private static float[] planted() {
        float[] s = base();
        float[] inside = new float[100];
        int k = 0;
        for (int i = 0; i < 12; i++) {
            inside[k++] = Float.NaN;
        }
        for (int i = 0; i < 4; i++) {
            inside[k++] = Float.POSITIVE_INFINITY;
        }
        for (int i = 0; i < 3; i++) {
            inside[k++] = Float.NEGATIVE_INFINITY;
        }
        for (int i = 0; i < 20; i++) {
            inside[k++] = 0f;
        }
        for (int i = 0; i < 9; i++) {
            inside[k++] = -5f;
        }
        for (int i = 0; i < 5; i++) {
            inside[k++] = 5e-4f;
        }
        for (int i = 0; i < 30; i++) {
            inside[k++] = TAU_LIMIT_US;
        }
        for (; k < 100; k++) {
            inside[k] = 100f;
        }
        for (int j = 0; j < 100; j++) {
            s[at(-5 + j % 10, -5 + j / 10)] = inside[j];
        }
        for (int dy = -3; dy <= 3; dy++) {
            s[at(47, dy)] = Float.NaN;
            s[at(-47, dy)] = dy < 0 ? 0f : -1f;
        }
        s[0] = 0f;
        s[N - 1] = -3f;
        s[N * N - 1] = Float.POSITIVE_INFINITY;
        return s;
    }

    @Test
    void plantedPixelsAreCountedByCauseInsideTheEvaluatedAreaOnly() throws Exception {
        assertThat(AREA.containsIndex(at(47, 0))).as("x = 47 mm lies in the exclusion band").isFalse();
        assertThat(AREA.containsIndex(at(-47, 0))).isFalse();
        assertThat(AREA.containsIndex(at(0, 0))).isTrue();
        WaferInspection.Evaluation e = new WaferInspection(rules("\"invalid_area_fraction\": {\"max\": 0.5},"
                + " \"below_limit_area_fraction\": {\"max\": 1}")).judge("w.tif", map(planted()), null);
        assertThat(e.density()).as("converted to trap density").isNotNull();
        InvalidArea inv = e.invalid();
        assertThat(inv.evaluatedCount()).isEqualTo(AREA.count());
        assertThat(inv.nonFiniteCount()).isEqualTo(12 + 4 + 3);
        assertThat(inv.nonPositiveCount()).isEqualTo(20 + 9);
        assertThat(inv.invalidConversionCount()).isEqualTo(5);
        assertThat(e.result().figures().get("invalid_area_fraction"))
                .isEqualTo((12 + 7 + 29 + 5) / (double) AREA.count());
        // the below-limit pixels keep their own figure, over the evaluated pixels that hold data
        assertThat(FE.convert(TAU_LIMIT_US).status()).isEqualTo(PixelStatus.BELOW_LIMIT);
        assertThat(e.result().figures().get("below_limit_area_fraction"))
                .isEqualTo(30 / (double) (AREA.count() - 12));
        assertThat(e.result().failed()).isEmpty();
    }

    @Test
    void withoutATrapDensityTheFloorOfTheConversionStillCounts() throws Exception {
        Rules noDefect = Rules.parse("{\"wafer\": \"round-100-flat\", \"edge_exclusion_mm\": " + EXCLUSION_MM
                + ", \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1e-6}}", "rules.json");
        WaferInspection.Evaluation e = new WaferInspection(noDefect).judge("w.tif", map(planted()), null);
        assertThat(e.density()).isNull();
        assertThat(e.invalid().invalidConversionCount()).isEqualTo(5);
        assertThat(e.invalid().invalidCount()).isEqualTo(12 + 7 + 29 + 5);
        assertThat(e.result().figures()).containsKey("invalid_area_fraction").doesNotContainKey(
                "below_limit_area_fraction");
    }

    /** Zero lifetimes at the first {@code share} of the evaluated area's pixels in scan order; returns how many. */
    private static int zeroShare(float[] s, double share) {
        int wanted = (int) Math.floor(share * AREA.count());
        int zeros = 0;
        for (int i = AREA.nextIndex(0); i >= 0 && zeros < wanted; i = AREA.nextIndex(i + 1)) {
            s[i] = 0f;
            zeros++;
        }
        return zeros;
    }

    @Test
    void theDefaultLimitFailsAWaferWithAThirdOfItsAreaAtZero() throws Exception {
        float[] s = base();
        int zeros = zeroShare(s, 0.34);
        double share = zeros / (double) AREA.count();
        assertThat(share).isBetween(0.339, 0.340);
        WaferResult r = new WaferInspection(rules(null)).judge("w.tif", map(s), null).result();
        assertThat(r.status()).isEqualTo(WaferResult.Status.FAIL);
        assertThat(r.figures().get("invalid_area_fraction")).isEqualTo(share);
        assertThat(r.failed()).containsExactly("invalid_area_fraction 0.34 > 0.05 (default limit)");
        // the zeros are left out of the harmonic mean, which stays at the lifetime of the rest
        assertThat(r.figures().get("harmonic_mean_lifetime_us")).isCloseTo(100.0, within(1e-9));
    }

    @Test
    void theDefaultLimitLetsAWaferJustWithinItPass() throws Exception {
        float[] s = base();
        int zeros = zeroShare(s, InvalidArea.DEFAULT_LIMIT);
        assertThat(zeros / (double) AREA.count()).isGreaterThan(0).isLessThanOrEqualTo(InvalidArea.DEFAULT_LIMIT);
        WaferResult r = new WaferInspection(rules(null)).judge("w.tif", map(s), null).result();
        assertThat(r.status()).isEqualTo(WaferResult.Status.PASS);
        assertThat(r.failed()).isEmpty();
    }

    @Test
    void aLimitOfTheRulesReplacesTheDefault() throws Exception {
        float[] s = base();
        zeroShare(s, 0.34);
        WaferResult loose = new WaferInspection(rules("\"invalid_area_fraction\": {\"max\": 0.4}"))
                .judge("w.tif", map(s), null).result();
        assertThat(loose.status()).isEqualTo(WaferResult.Status.PASS);
        WaferResult strict = new WaferInspection(rules("\"invalid_area_fraction\": {\"max\": 0.2}"))
                .judge("w.tif", map(s), null).result();
        assertThat(strict.status()).isEqualTo(WaferResult.Status.FAIL);
        assertThat(strict.failed()).containsExactly("invalid_area_fraction");
    }

    @Test
    void aProfileWithItsOwnLimitIsNotHeldToTheDefault() throws Exception {
        float[] s = base();
        zeroShare(s, 0.34);
        Rules r = Rules.parse("{\"wafer\": \"round-100-flat\", \"edge_exclusion_mm\": " + EXCLUSION_MM + ","
                + " \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1e-6},"
                + " \"profiles\": [{\"name\": \"lenient\", \"match\": {\"file\": \"lenient-*\"},"
                + " \"limits\": {\"invalid_area_fraction\": {\"max\": 0.5}}}]}", "rules.json");
        assertThat(new WaferInspection(r).judge("lenient-w.tif", map(s), null).result().status())
                .isEqualTo(WaferResult.Status.PASS);
        assertThat(new WaferInspection(r).judge("w.tif", map(s.clone()), null).result().failed())
                .singleElement().asString().endsWith("> 0.05 (default limit)");
    }

    @Test
    void aProfileStatesTheLimitItIsJudgedBy() throws Exception {
        Rules.Profile plain = rules(null).defaultProfile();
        assertThat(plain.limitsInvalidArea()).isFalse();
        assertThat(plain.invalidAreaLimit().max()).isEqualTo(InvalidArea.DEFAULT_LIMIT).isEqualTo(0.05);
        assertThat(plain.invalidAreaLimit().min()).isNaN();
        Rules.Profile own = rules("\"invalid_area_fraction\": {\"min\": 0, \"max\": 0.2}").defaultProfile();
        assertThat(own.limitsInvalidArea()).isTrue();
        assertThat(own.invalidAreaLimit().max()).isEqualTo(0.2);
        assertThat(own.invalidAreaLimit().min()).isZero();
    }

    @Test
    void theInvalidAreaIsAColumnOfEveryResultsTable() throws Exception {
        assertThat(BatchInspection.columns(rules(null))).contains("invalid_area_fraction");
        assertThat(Figure.parse("invalid_area_fraction").kind()).isEqualTo(Figure.Kind.INVALID_AREA_FRACTION);
        assertThat(Figure.parse("invalid_area_fraction").needsTrapDensity()).isFalse();
    }
}
