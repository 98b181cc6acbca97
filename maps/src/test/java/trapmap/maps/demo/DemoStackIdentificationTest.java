package trapmap.maps.demo;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.io.ReadOptions;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.maps.spectroscopy.InjectionStack;
import trapmap.maps.spectroscopy.RegionIdentification;
import trapmap.maps.spectroscopy.StackLifetimes;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * Acceptance of defect identification on the committed demonstration stack ({@code demo-data/injection-stack/}):
 * read and checked as {@code identify} does, τ_SRH per pixel and level from the conversion, ranked against the
 * whole library per pixel and per region (the engine's default region rule, nothing taken from the truth file), and
 * compared with {@code truth.json}.
 * <p>
 * The levels lie on one grid. The main run registers them as {@code identify} does by default (upright, near the
 * identity, {@link InjectionStack#IDENTITY_MARGIN}): every level must be kept as measured, so that no sub-pixel
 * resampling blurs the sharp disc edges (which shifts a region's mean τ_SRH by about 1 % at a level of high disc
 * contrast, several standard errors of that mean, enough to fail the region χ² test); a second run takes the levels
 * as aligned ({@code identify --no-registration}) and must give the same result.
 */
class DemoStackIdentificationTest {
    static final Path STACK = Path.of("..", "demo-data", InjectionStackDemo.FOLDER);

    static InjectionStackDemo.Truth truth;
    static InjectionStack.Loaded loaded;
    static InjectionStack stack;
    static IdentificationResult result;
    static IdentificationResult aligned;

    @BeforeAll
    static void identify() throws IOException {
        truth = InjectionStackDemo.readTruth(STACK.resolve(DemoScenario.TRUTH));
        List<Path> files = new ArrayList<>();
        truth.files().forEach(f -> files.add(STACK.resolve(f)));
        loaded = InjectionStack.read(files, ReadOptions.DEFAULTS, null);
        stack = InjectionStack.of(loaded, InjectionStack.Options.DEFAULTS);
        result = identify(stack);
        aligned = identify(InjectionStack.of(loaded, new InjectionStack.Options(false,
                InjectionStack.Options.DEFAULTS.registration())));
    }

    private static IdentificationResult identify(InjectionStack s) {
        StackLifetimes lifetimes = StackLifetimes.of(s, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 2);
        return DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withThreads(2));
    }

    @Test
    void registrationKeepsEveryLevelAsMeasured() {
        assertThat(stack.size()).isEqualTo(3);
        for (int l = 1; l < stack.size(); l++) {
            RegistrationReport r = stack.level(l).registration();
            assertThat(r.kept()).as("level %d: %s", l, r).isEqualTo(RegistrationReport.Kept.IDENTITY);
            // the search lands within a few hundredths of a mm and gains less than the margin
            assertThat(r.searchScore()).as("level %d", l).isLessThan(r.identityScore()
                    + InjectionStack.IDENTITY_MARGIN);
            assertThat(r.identityScore()).as("level %d", l).isGreaterThan(0.8);
            assertThat(stack.level(l).resampled()).isFalse();
            assertThat(stack.level(l).map()).isSameAs(loaded.maps().get(l));
        }
    }

    @Test
    void registeredAndAlignedRunsAgree() {
        assertThat(result.bestIndex()).containsExactly(aligned.bestIndex());
        assertThat(result.status()).containsExactly(aligned.status());
        assertThat(result.regions()).hasSameSizeAs(aligned.regions());
        for (int i = 1; i <= result.regions().size(); i++) {
            assertThat(result.region(i).ranking().status()).isEqualTo(aligned.region(i).ranking().status());
            assertThat(result.region(i).ranking().reason()).isEqualTo(aligned.region(i).ranking().reason());
        }
    }

    @Test
    void everyPlantedDiscIsOneRegionAndNothingElseIs() {
        assertThat(result.regions()).hasSize(truth.regions().size());
        for (InjectionStackDemo.Region r : truth.regions()) {
            RegionIdentification id = regionAt(r);
            assertThat(Math.hypot(id.region().centroidXMm() - r.centreXMm(), id.region().centroidYMm()
                    - r.centreYMm())).as(r.name()).isLessThan(2.0);
            double discMm2 = Math.PI * r.radiusMm() * r.radiusMm();
            assertThat(id.region().areaMm2()).as(r.name()).isBetween(0.8 * discMm2, 1.2 * discMm2);
        }
    }

    @Test
    void anSrhFreeBackgroundLeavesTheRegionsToSrhDominanceAlone() {
        // most pixels of the demo wafer show no resolvable SRH: half the median τ_SRH is not finite
        assertThat(result.regionThresholdUs()).isInfinite();
        assertThat(result.regionRule()).startsWith("SRH at least 50 % of the recombination at the first level")
                .contains("no τ_SRH threshold");
    }

    @Test
    void regionRankingsFindThePlantedDefectsAndTheOverlap() {
        for (InjectionStackDemo.Region r : truth.regions()) {
            Ranking ranking = regionAt(r).ranking();
            if (r.expected().equals(InjectionStackDemo.NO_SINGLE_DEFECT)) {
                assertThat(ranking.status()).as(ranking.reason()).isEqualTo(RankingStatus.NO_SINGLE_DEFECT);
                continue;
            }
            assertThat(ranking.status()).as(ranking.reason()).isEqualTo(RankingStatus.OK);
            assertThat(ranking.hint().best().id()).as(ranking.reason()).isEqualTo(r.expected());
            assertThat(ranking.hint().chiSquaredRatio()).as(ranking.reason())
                    .isGreaterThan(InjectionStackDemoTest.CHI2_RATIO_MARGIN);
            double planted = r.defects().get(0).densityPerCm3();
            assertThat(ranking.hint().best().ntPerCm3()).as(r.name()).isCloseTo(planted, within(0.10 * planted));
        }
    }

    @Test
    void pixelsOfEachDiscCoreMostlyCarryTheirDefect() {
        assertCoresCarryTheirDefect(result);
    }

    private static void assertCoresCarryTheirDefect(IdentificationResult result) {
        PixelGrid grid = stack.grid();
        float[] best = result.bestIndex();
        float[] status = result.status();
        for (InjectionStackDemo.Region r : truth.regions()) {
            int n = 0;
            int expected = 0;
            for (int y = 0; y < grid.height(); y++) {
                for (int x = 0; x < grid.width(); x++) {
                    if (!r.core(grid.xMm(x), grid.yMm(y))) {
                        continue;
                    }
                    int i = y * grid.width() + x;
                    n++;
                    if (r.expected().equals(InjectionStackDemo.NO_SINGLE_DEFECT)) {
                        expected += status[i] == RankingStatus.NO_SINGLE_DEFECT.ordinal() ? 1 : 0;
                    } else if (status[i] == RankingStatus.OK.ordinal()
                            && result.legendOf((int) best[i]).defectId().equals(r.expected())) {
                        expected++;
                    }
                }
            }
            assertThat(expected).as("%s: %d of %d core pixels", r.name(), expected, n).isGreaterThan(9 * n / 10);
        }
        // the background has no SRH defect: its pixels are below the limit at some level, or ranked without a
        // clear hint, and at most a few per cent of them look like one of the planted defects
        int background = 0;
        int lookalike = 0;
        for (int y = 0; y < grid.height(); y++) {
            for (int x = 0; x < grid.width(); x++) {
                int i = y * grid.width() + x;
                if (Float.isNaN(status[i]) || InjectionStackDemoTest.nearARegion(truth, stack.level(0).map(), x, y)) {
                    continue;
                }
                background++;
                if (status[i] == RankingStatus.OK.ordinal()) {
                    lookalike++;
                }
            }
        }
        assertThat(background).isGreaterThan(10_000);
        assertThat(lookalike).as("background pixels ranked OK").isLessThan(background / 20);
    }

    private static RegionIdentification regionAt(InjectionStackDemo.Region r) {
        return regionAt(result, r);
    }

    private static RegionIdentification regionAt(IdentificationResult result, InjectionStackDemo.Region r) {
        PixelGrid grid = stack.grid();
        int id = result.regionAt((int) Math.round(grid.xPx(r.centreXMm())), (int) Math.round(grid.yPx(
                r.centreYMm())));
        assertThat(id).as("region at the centre of " + r.name()).isPositive();
        return result.region(id);
    }
}
