package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.process.ConversionSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * Identification of a synthetic stack with planted fe-i, cr-i and overlapping regions ({@link SyntheticStack});
 * check-values R-IDM-1 and R-IDM-2.
 */
class DefectIdentificationTest {
    private static final double[] LEVELS = {1e13, 1e14, 1e15};
    private static StackLifetimes lifetimes;
    private static IdentificationResult result;

    @BeforeAll
    static void identify() {
        InjectionStack stack = InjectionStack.of(SyntheticStack.maps(LEVELS, 0.03, 20261205L),
                SyntheticStack.names(3), new InjectionStack.Options(false,
                        InjectionStack.Options.DEFAULTS.registration()));
        lifetimes = StackLifetimes.of(stack, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 2);
        result = DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withThreads(1));
    }

    private static RegionIdentification regionOf(int[] box) {
        int id = result.regionAt((box[0] + box[2]) / 2, (box[1] + box[3]) / 2);
        assertThat(id).as("region at the box centre").isPositive();
        return result.region(id);
    }

    @Test
    void aGivenRegionThresholdIsStatedWithItsUnit() {
        IdentificationResult given = DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withThreads(1).withRegionThreshold(250));
        assertThat(given.regionThresholdUs()).isEqualTo(250);
        assertThat(given.regionRule()).isEqualTo("τ_SRH below 250 µs and SRH at least 50 % of the recombination"
                + " at the first level");
    }

    @Test
    void eachPlantedAreaIsOneRegion() {
        assertThat(result.regions()).hasSize(3);
        assertThat(regionOf(SyntheticStack.FE_BOX).region().pixelCount()).isEqualTo(10 * 10);
        assertThat(regionOf(SyntheticStack.CR_BOX).region().pixelCount()).isEqualTo(10 * 10);
        assertThat(regionOf(SyntheticStack.BOTH_BOX).region().pixelCount()).isEqualTo(14 * 8);
        assertThat(result.regionAt(40, 40)).isZero();
    }

    @Test
    void singleDefectRegionsFindThePlantedDefectAndItsDensity() {
        Ranking fe = regionOf(SyntheticStack.FE_BOX).ranking();
        assertThat(fe.status()).isEqualTo(RankingStatus.OK);
        assertThat(fe.hint().best().id()).isEqualTo("fe-i");
        assertThat(fe.hint().chiSquaredRatio()).isGreaterThan(10);
        assertThat(fe.hint().best().ntPerCm3()).isCloseTo(SyntheticStack.FE_CM3, within(0.1 * SyntheticStack.FE_CM3));
        Ranking cr = regionOf(SyntheticStack.CR_BOX).ranking();
        assertThat(cr.status()).isEqualTo(RankingStatus.OK);
        assertThat(cr.hint().best().id()).isEqualTo("cr-i");
        assertThat(cr.hint().best().ntPerCm3()).isCloseTo(SyntheticStack.CR_CM3, within(0.1 * SyntheticStack.CR_CM3));
        assertThat(regionOf(SyntheticStack.FE_BOX).dpss()).isNotNull();
        assertThat(regionOf(SyntheticStack.FE_BOX).dpss().onCurve()).anyMatch(d -> d.defect().id().equals("fe-i")
                && d.onCurve());
    }

    @Test
    void overlapRegionHasNoSingleDefect() {
        assertThat(regionOf(SyntheticStack.BOTH_BOX).ranking().status()).isEqualTo(RankingStatus.NO_SINGLE_DEFECT);
    }

    @Test
    void regionCurveIsTheMeanOfItsPixelsWithTheLargerOfStandardErrorAndNoise() {
        RegionIdentification r = regionOf(SyntheticStack.FE_BOX);
        int[] labels = result.regionLabels();
        for (int level = 0; level < LEVELS.length; level++) {
            double sum = 0;
            double sq = 0;
            int n = 0;
            for (int p = 0; p < labels.length; p++) {
                if (labels[p] == r.id() && complete(p)) {
                    double t = lifetimes.tauSrhUs(level, p);
                    sum += t;
                    sq += t * t;
                    n++;
                }
            }
            double mean = sum / n;
            double sd = Math.sqrt((sq - n * mean * mean) / (n - 1));
            assertThat(r.curve().tauSrhS()[level]).isCloseTo(mean * 1e-6, within(1e-9 * mean * 1e-6));
            double expected = Math.max(sd / Math.sqrt(n) / mean, 0.03 / Math.sqrt(n));
            assertThat(r.curve().relativeUncertainty()[level]).isCloseTo(expected, within(1e-6 * expected));
            assertThat(r.curve().injectionPerCm3()[level]).isEqualTo(LEVELS[level]);
        }
        assertThat(r.pixelsUsed()).isEqualTo(100);
    }

    private static boolean complete(int p) {
        for (int i = 0; i < LEVELS.length; i++) {
            double t = lifetimes.tauSrhUs(i, p);
            if (!(t > 0 && t < Double.POSITIVE_INFINITY)) {
                return false;
            }
        }
        return true;
    }

    @Test
    void pixelMapsAgreeWithTheRankingOfEachPixel() {
        int w = result.width();
        float[] best = result.bestIndex();
        float[] status = result.status();
        float[] chi2 = result.chiSquared();
        LibraryRanking ranking = new LibraryRanking(result.rankedCandidates(), lifetimes.doping(),
                lifetimes.silicon(), LEVELS);
        for (int[] xy : new int[][] {{15, 15}, {33, 15}, {22, 31}, {40, 40}}) {
            int p = xy[1] * w + xy[0];
            double[] tau = new double[3];
            for (int i = 0; i < 3; i++) {
                tau[i] = lifetimes.tauSrhUs(i, p) * 1e-6;
            }
            Ranking r = ranking.rank(tau);
            assertThat(status[p]).isEqualTo((float) r.status().ordinal());
            assertThat(result.curveAt(xy[0], xy[1])).isEqualTo(LifetimeCurve.of(LEVELS, tau));
            if (r.hint() == null) {
                assertThat(best[p]).isNaN();
            } else {
                assertThat(result.legendOf((int) best[p]).defectId()).isEqualTo(r.hint().best().id());
                assertThat(chi2[p]).isEqualTo((float) r.hint().best().chiSquared());
            }
        }
        assertThat(best[0]).isNaN();
        assertThat(status[0]).isNaN();
        assertThat(result.curveAt(0, 0)).isNull();
    }

    @Test
    void mostPixelsOfTheIronAreaRankIronFirstAndTheLegendCountsThem() {
        float[] best = result.bestIndex();
        int fe = result.rankedCandidates().indexOf(DefectLibrary.byId("fe-i")) + 1;
        int inBox = 0;
        int total = 0;
        for (int y = 10; y < 20; y++) {
            for (int x = 10; x < 20; x++) {
                total++;
                if (best[y * result.width() + x] == fe) {
                    inBox++;
                }
            }
        }
        assertThat((double) inBox / total).isGreaterThan(0.7);
        IdentificationResult.LegendEntry e = result.legendOf(fe);
        assertThat(e.defectId()).isEqualTo("fe-i");
        assertThat(e.pixelCount()).isGreaterThanOrEqualTo(inBox - 5);
        int onWafer = 0;
        for (int y = 0; y < 48; y++) {
            for (int x = 0; x < 48; x++) {
                onWafer += SyntheticStack.onWafer(x, y) ? 1 : 0;
            }
        }
        assertThat(result.rankedPixels()).isEqualTo(onWafer);
        // the SRH-free background is below the limit at every level: too few levels to rank
        assertThat(result.status()[40 * 48 + 40]).isEqualTo((float) RankingStatus.TOO_FEW_LEVELS.ordinal());
    }

    @Test
    void resultsDoNotDependOnTheThreadsAndBlocksAverageTheirPixels() {
        IdentificationResult many = DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withThreads(3));
        assertThat(many.bestIndex()).containsExactly(result.bestIndex());
        assertThat(many.chiSquared()).containsExactly(result.chiSquared());
        assertThat(many.status()).containsExactly(result.status());
        assertThat(many.bestDensityCm3()).containsExactly(result.bestDensityCm3());

        IdentificationResult blocks = DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withBlock(4).withThreads(2));
        IdentificationResult blocksOne = DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withBlock(4).withThreads(1));
        assertThat(blocks.bestIndex()).containsExactly(blocksOne.bestIndex());
        // block (3, 3) lies inside the fe-i area: one curve for its 16 pixels, fe-i best
        LifetimeCurve c = blocks.curveAt(13, 14);
        assertThat(c).isEqualTo(blocks.curveAt(12, 12));
        double sum = 0;
        for (int y = 12; y < 16; y++) {
            for (int x = 12; x < 16; x++) {
                sum += lifetimes.tauSrhUs(0, y * 48 + x);
            }
        }
        assertThat(c.tauSrhS()[0]).isCloseTo(sum / 16 * 1e-6, within(1e-12));
        int fe = blocks.rankedCandidates().indexOf(DefectLibrary.byId("fe-i")) + 1;
        assertThat(blocks.bestIndex()[13 * 48 + 13]).isEqualTo((float) fe);
    }

    @Test
    void progressCountsEveryRowOfBlocksAndAnInterruptCancels() {
        java.util.concurrent.atomic.AtomicLong last = new java.util.concurrent.atomic.AtomicLong();
        java.util.concurrent.atomic.AtomicLong total = new java.util.concurrent.atomic.AtomicLong();
        java.util.concurrent.atomic.AtomicInteger calls = new java.util.concurrent.atomic.AtomicInteger();
        DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withBlock(4).withThreads(2), (done, all, message) -> {
                    calls.incrementAndGet();
                    last.accumulateAndGet(done, Math::max);
                    total.set(all);
                });
        assertThat(calls.get()).isEqualTo(12);
        assertThat(last.get()).isEqualTo(12);
        assertThat(total.get()).isEqualTo(12);
        Thread.currentThread().interrupt();
        try {
            org.assertj.core.api.Assertions.assertThatThrownBy(() -> DefectIdentification.identify(lifetimes,
                    DefectLibrary.all(), DefectIdentification.Options.DEFAULTS.withThreads(1),
                    trapmap.shared.progress.ProgressListener.NONE))
                    .isInstanceOf(java.util.concurrent.CancellationException.class);
        } finally {
            Thread.interrupted();
        }
    }

    @Test
    void dpssOfAnIronPixelHasIronOnItsCurve() {
        RegionIdentification fe = regionOf(SyntheticStack.FE_BOX);
        assertThat(result.dpssAt(15, 15)).isNotNull();
        assertThat(result.dpssAt(15, 15).usableLevels()).isEqualTo(3);
        assertThat(fe.dpss().onCurve()).extracting(d -> d.defect().id()).contains("fe-i").doesNotContain("cr-i");
        assertThat(result.dpssAt(0, 0)).isNull();
    }
}
