package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class MapComparisonTest {
    private static final float NAN = Float.NaN;

    private static WaferMap map(Quantity q, String id, int w, int h, float... samples) {
        return new WaferMap(FloatRaster.wrap(w, h, samples), PixelGrid.centred(w, h, 0.5), q, id,
                MeasurementConditions.UNKNOWN, Provenance.of(id + ".csv"));
    }

    // A 3×3 lifetime pair (µs), worked by hand below.
    //   before  10  20  40 |  50 NaN 100 |  0   8  16
    //   after   20  19  40 |  55  30 NaN |  5   4  16.4
    private static final WaferMap BEFORE = map(Quantity.EFFECTIVE_LIFETIME, "w1-before", 3, 3,
            10, 20, 40, 50, NAN, 100, 0, 8, 16);
    private static final WaferMap AFTER = map(Quantity.EFFECTIVE_LIFETIME, "w1-after", 3, 3,
            20, 19, 40, 55, 30, NAN, 5, 4, 16.4f);
    private static final double A8 = 16.4f; // the float sample as stored

    @Test
    void differenceIsAfterMinusBeforeWhereBothHaveData() {
        WaferMap d = MapComparison.difference(BEFORE, AFTER);
        assertThat(d.quantity()).isEqualTo(Quantity.DIFFERENCE);
        float[] s = d.raster().samples();
        assertThat(s).startsWith(10f, -1f, 0f, 5f);
        assertThat(s[4]).isNaN();
        assertThat(s[5]).isNaN();
        assertThat(s[6]).isEqualTo(5f);
        assertThat(s[7]).isEqualTo(-4f);
        assertThat((double) s[8]).isCloseTo(A8 - 16, within(1e-6));
        ProcessingStep step = d.provenance().steps().get(0);
        assertThat(step.operation()).isEqualTo("compare");
        assertThat(step.parameters()).containsEntry("unit", "µs").containsEntry("of", "effective-lifetime")
                .containsEntry("before", "w1-before");
        assertThat(d.waferId()).isEqualTo("w1-after");
    }

    @Test
    void ratioAndRelativeChangeNeedBothSamplesPositive() {
        float[] r = MapComparison.ratio(BEFORE, AFTER).raster().samples();
        assertThat(r[0]).isEqualTo(2f);
        assertThat(r[1]).isEqualTo(0.95f);
        assertThat(r[2]).isEqualTo(1f);
        assertThat(r[3]).isEqualTo(1.1f);
        assertThat(r[6]).as("before = 0").isNaN();
        assertThat(r[7]).isEqualTo(0.5f);
        float[] c = MapComparison.relativeChange(BEFORE, AFTER).raster().samples();
        assertThat(c[0]).isEqualTo(1f);
        assertThat(c[1]).isEqualTo(-0.05f);
        assertThat(c[3]).isCloseTo(0.1f, within(1e-7f));
        assertThat(c[6]).isNaN();
        assertThat(c[7]).isEqualTo(-0.5f);
        assertThat(MapComparison.ratio(BEFORE, AFTER).quantity()).isEqualTo(Quantity.RATIO);
        assertThat(MapComparison.relativeChange(BEFORE, AFTER).quantity()).isEqualTo(Quantity.RELATIVE_CHANGE);
    }

    @Test
    void pairedStatisticsOfTheHandWorkedExample() {
        PairedStatistics s = MapComparison.statistics(BEFORE, AFTER);
        // seven pixels have data in both: differences 10, −1, 0, 5, 5, −4, 0.4
        assertThat(s.count()).isEqualTo(7);
        assertThat(s.meanDifference()).isCloseTo((15 + (A8 - 16)) / 7, within(1e-12));
        assertThat(s.medianDifference()).isCloseTo(A8 - 16, within(1e-12));
        // six of them are positive in both: ratios 2, 0.95, 1, 1.1, 0.5, 1.025
        assertThat(s.positiveCount()).isEqualTo(6);
        double r8 = A8 / 16;
        assertThat(s.meanRatio()).isCloseTo((2 + 0.95 + 1 + 1.1 + 0.5 + r8) / 6, within(1e-12));
        assertThat(s.medianRatio()).isCloseTo((1 + r8) / 2, within(1e-12));
        assertThat(s.harmonicMeanBefore()).isCloseTo(6 / (0.1 + 0.05 + 0.025 + 0.02 + 0.125 + 0.0625),
                within(1e-12));
        assertThat(s.harmonicMeanAfter()).isCloseTo(6 / (1 / 20.0 + 1 / 19.0 + 1 / 40.0 + 1 / 55.0 + 1 / 4.0 + 1 / A8),
                within(1e-12));
        assertThat(s.harmonicMeanChange()).isCloseTo(s.harmonicMeanAfter() - s.harmonicMeanBefore(), within(0.0));
        // ±5 %: 10→20 and 50→55 improved; 20→19 (exactly −5 %), 40→40, 16→16.4 unchanged; 8→4 degraded
        assertThat(s.improvedFraction()).isCloseTo(2 / 6.0, within(1e-15));
        assertThat(s.unchangedFraction()).isCloseTo(3 / 6.0, within(1e-15));
        assertThat(s.degradedFraction()).isCloseTo(1 / 6.0, within(1e-15));
        assertThat(s.medianReduction()).as("lifetimes have no reduction").isNaN();
        assertThat(s.unit()).isEqualTo("µs");
        assertThat(s.improvement()).isEqualTo(Improvement.HIGHER_IS_BETTER);
        assertThat(s.relativeTolerance()).isEqualTo(0.05);
    }

    @Test
    void aTighterToleranceMovesSmallChangesOutOfUnchanged() {
        PairedStatistics s = MapComparison.statistics(BEFORE, AFTER, null, 0.01, Improvement.HIGHER_IS_BETTER);
        // 20→19 is now degraded and 16→16.4 (+2.5 %) improved
        assertThat(s.improvedFraction()).isCloseTo(3 / 6.0, within(1e-15));
        assertThat(s.unchangedFraction()).isCloseTo(1 / 6.0, within(1e-15));
        assertThat(s.degradedFraction()).isCloseTo(2 / 6.0, within(1e-15));
    }

    @Test
    void forDensitiesLowerIsBetterAndTheReductionIsGiven() {
        // iron before/after gettering, cm^-3
        WaferMap before = map(Quantity.IRON_DENSITY, "fe-before", 2, 2, 1e12f, 2e12f, 4e11f, 5e11f);
        WaferMap after = map(Quantity.IRON_DENSITY, "fe-after", 2, 2, 2e11f, 2e12f, 1e12f, 1e11f);
        WaferMap reduction = MapComparison.reduction(before, after);
        assertThat(reduction.quantity()).isEqualTo(Quantity.FRACTION);
        float[] ge = reduction.raster().samples();
        assertThat(ge[0]).isCloseTo(0.8f, within(1e-6f));
        assertThat(ge[1]).isEqualTo(0f);
        assertThat(ge[2]).isCloseTo(-1.5f, within(1e-6f));
        assertThat(ge[3]).isCloseTo(0.8f, within(1e-6f));
        PairedStatistics s = MapComparison.statistics(before, after);
        assertThat(s.improvement()).isEqualTo(Improvement.LOWER_IS_BETTER);
        assertThat(s.unit()).isEqualTo("cm^-3");
        assertThat(s.medianReduction()).isCloseTo(0.4, within(1e-6)); // median of −1.5, 0, 0.8, 0.8
        assertThat(s.improvedFraction()).isEqualTo(0.5);
        assertThat(s.unchangedFraction()).isEqualTo(0.25);
        assertThat(s.degradedFraction()).isEqualTo(0.25);
        Comparison c = MapComparison.compare(before, after);
        assertThat(c.hasReduction()).isTrue();
        assertThat(c.reduction().raster().sameSamples(reduction.raster())).isTrue();
        assertThat(c.statistics()).isEqualTo(s);
    }

    @Test
    void lifetimesGetNoReductionMap() {
        Comparison c = MapComparison.compare(BEFORE, AFTER);
        assertThat(c.hasReduction()).isFalse();
        assertThatThrownBy(() -> MapComparison.reduction(BEFORE, AFTER))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> assertThat(e.field()).isEqualTo("quantity"));
    }

    @Test
    void statisticsAgreeWithCommonsMathOnSeededMaps() {
        int w = 37;
        int h = 23;
        Random r = new Random(42);
        float[] b = new float[w * h];
        float[] a = new float[w * h];
        for (int i = 0; i < b.length; i++) {
            b[i] = (float) (1e11 * Math.exp(1.5 * r.nextGaussian()));
            a[i] = (float) (b[i] * Math.exp(-0.7 + 0.6 * r.nextGaussian()));
            if (r.nextDouble() < 0.1) {
                b[i] = NAN;
            }
            if (r.nextDouble() < 0.1) {
                a[i] = NAN;
            }
        }
        WaferMap before = map(Quantity.TRAP_DENSITY, "b", w, h, b);
        WaferMap after = map(Quantity.TRAP_DENSITY, "a", w, h, a);
        Mask region = Mask.of(w, h, i -> i % w > 3); // leave out four columns
        PairedStatistics s = MapComparison.statistics(before, after, region, 0.05, Improvement.LOWER_IS_BETTER);

        List<Double> diff = new ArrayList<>();
        List<Double> ratio = new ArrayList<>();
        List<Double> invB = new ArrayList<>();
        List<Double> invA = new ArrayList<>();
        List<Double> reduction = new ArrayList<>();
        int improved = 0;
        int unchanged = 0;
        for (int i = 0; i < b.length; i++) {
            if (i % w <= 3 || Float.isNaN(b[i]) || Float.isNaN(a[i])) {
                continue;
            }
            diff.add((double) a[i] - b[i]);
            ratio.add((double) a[i] / b[i]);
            invB.add(1.0 / b[i]);
            invA.add(1.0 / a[i]);
            reduction.add(1 - (double) a[i] / b[i]);
            double change = ((double) a[i] - b[i]) / b[i];
            if (Math.abs(change) <= 0.05) {
                unchanged++;
            } else if (change < 0) {
                improved++;
            }
        }
        int n = diff.size();
        assertThat(n).isGreaterThan(500);
        Percentile median = new Percentile(50);
        Mean mean = new Mean();
        assertThat(s.count()).isEqualTo(n);
        assertThat(s.positiveCount()).isEqualTo(n);
        assertThat(s.meanDifference()).isCloseTo(mean.evaluate(array(diff)), within(1e-3 * Math.abs(s.meanDifference())));
        assertThat(s.medianDifference()).isCloseTo(median.evaluate(array(diff)), within(1e-9 * 1e11));
        assertThat(s.meanRatio()).isCloseTo(mean.evaluate(array(ratio)), within(1e-12));
        assertThat(s.medianRatio()).isCloseTo(median.evaluate(array(ratio)), within(1e-12));
        assertThat(s.harmonicMeanBefore()).isCloseTo(1 / mean.evaluate(array(invB)),
                within(1e-9 * s.harmonicMeanBefore()));
        assertThat(s.harmonicMeanAfter()).isCloseTo(1 / mean.evaluate(array(invA)),
                within(1e-9 * s.harmonicMeanAfter()));
        assertThat(s.medianReduction()).isCloseTo(median.evaluate(array(reduction)), within(1e-12));
        assertThat(s.improvedFraction()).isCloseTo(improved / (double) n, within(1e-15));
        assertThat(s.unchangedFraction()).isCloseTo(unchanged / (double) n, within(1e-15));
        assertThat(s.improvedFraction() + s.unchangedFraction() + s.degradedFraction()).isCloseTo(1, within(1e-12));
    }

    @Test
    void anEmptyOverlapGivesNaNsNotErrors() {
        WaferMap before = map(Quantity.EFFECTIVE_LIFETIME, "b", 2, 1, NAN, 5);
        WaferMap after = map(Quantity.EFFECTIVE_LIFETIME, "a", 2, 1, 3, NAN);
        PairedStatistics s = MapComparison.statistics(before, after);
        assertThat(s.count()).isZero();
        assertThat(s.meanDifference()).isNaN();
        assertThat(s.medianRatio()).isNaN();
        assertThat(s.harmonicMeanBefore()).isNaN();
        assertThat(s.improvedFraction()).isNaN();
    }

    @Test
    void mapsOnDifferentGridsAreRefused() {
        WaferMap other = BEFORE.withGrid(PixelGrid.centred(3, 3, 0.4));
        assertThatThrownBy(() -> MapComparison.difference(BEFORE, other))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> assertThat(e.field()).isEqualTo("after"))
                .hasMessageContaining("register");
    }

    @Test
    void differentQuantitiesAreRefused() {
        WaferMap density = map(Quantity.TRAP_DENSITY, "n", 3, 3, new float[9]);
        assertThatThrownBy(() -> MapComparison.ratio(BEFORE, density))
                .isInstanceOfSatisfying(InvalidValueException.class,
                        e -> assertThat(e.field()).isEqualTo("quantity"));
    }

    @Test
    void aQuantityWithoutDirectionNeedsOneGiven() {
        WaferMap d1 = map(Quantity.DIFFERENCE, "d1", 1, 2, 1, 2);
        WaferMap d2 = map(Quantity.DIFFERENCE, "d2", 1, 2, 2, 2);
        assertThatThrownBy(() -> MapComparison.statistics(d1, d2))
                .isInstanceOfSatisfying(InvalidValueException.class,
                        e -> assertThat(e.field()).isEqualTo("improvement"));
        assertThat(MapComparison.statistics(d1, d2, null, 0.05, Improvement.HIGHER_IS_BETTER).improvedFraction())
                .isEqualTo(0.5);
    }

    @Test
    void badToleranceAndRegionAreRefusedNamingThem() {
        assertThatThrownBy(() -> MapComparison.statistics(BEFORE, AFTER, null, -0.1, Improvement.HIGHER_IS_BETTER))
                .isInstanceOfSatisfying(InvalidValueException.class,
                        e -> assertThat(e.field()).isEqualTo("relativeTolerance"));
        assertThatThrownBy(() -> MapComparison.statistics(BEFORE, AFTER, Mask.all(2, 2), 0.05,
                Improvement.HIGHER_IS_BETTER))
                .isInstanceOfSatisfying(InvalidValueException.class, e -> assertThat(e.field()).isEqualTo("region"));
    }

    @Test
    void registeredMapsCompareEndToEnd() {
        SyntheticWafer wafer = SyntheticWafer.random(3, 50);
        PixelGrid grid = PixelGrid.centred(216, 216, 0.5);
        WaferMap before = wafer.before(grid);
        Registration truth = Registration.explicit(false, true, 2, 1.5, -0.5);
        WaferMap after = wafer.after(grid, truth, 2.0, 0.02, 9);
        WaferMap aligned = MapRegistration.align(before, after);
        PairedStatistics s = MapComparison.statistics(before, aligned);
        // the made-up step doubles lifetimes, ±15 % across the wafer
        assertThat(s.medianRatio()).isCloseTo(2.0, within(0.1));
        assertThat(s.improvedFraction()).isGreaterThan(0.95);
        assertThat(s.count()).isGreaterThan(30000);
    }

    private static double[] array(List<Double> v) {
        return v.stream().mapToDouble(Double::doubleValue).toArray();
    }

    @Test
    void theMedianIsTheMiddleOfTheSortedValues() {
        Random r = new Random(3);
        for (int n : new int[] {1, 2, 3, 10, 11, 1000, 1001, 40_000, 40_001}) {
            double[] v = new double[n];
            for (int i = 0; i < n; i++) {
                // many ties, as in maps of quantised samples
                v[i] = Math.round(r.nextGaussian() * 20) / 4.0;
            }
            double[] sorted = v.clone();
            Arrays.sort(sorted);
            double expected = n % 2 == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
            assertThat(MapComparison.median(v.clone(), n)).as("n = %d", n).isEqualTo(expected);
            // only the first n - 1 values
            double[] head = Arrays.copyOf(v, n - 1);
            Arrays.sort(head);
            int m = n - 1;
            double expectedHead = m == 0 ? Double.NaN
                    : m % 2 == 1 ? head[m / 2] : 0.5 * (head[m / 2 - 1] + head[m / 2]);
            assertThat(Double.compare(MapComparison.median(v.clone(), m), expectedHead)).as("first %d", m).isZero();
        }
    }
}
