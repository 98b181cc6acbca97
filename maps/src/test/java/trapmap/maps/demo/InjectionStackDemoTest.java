package trapmap.maps.demo;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * The demonstration injection stack, checked with the physics alone on the files as written: per region the
 * level-wise mean τ_SRH of its core pixels (each pixel's effective lifetime less intrinsic and surface
 * recombination, from its sidecar's conditions), with the standard error of the mean as relative uncertainty,
 * ranked against the whole library with {@link LibraryRanking}.
 */
class InjectionStackDemoTest {
    /** The planted defect's runner-up must fit at least this many times worse (χ² ratio). */
    static final double CHI2_RATIO_MARGIN = 10;

    @TempDir
    static Path dir;
    static Path stack;
    static InjectionStackDemo.Truth truth;
    static List<WaferMap> levels = new ArrayList<>();

    @BeforeAll
    static void generate() throws IOException {
        stack = dir.resolve(InjectionStackDemo.FOLDER);
        InjectionStackDemo.write(stack);
        truth = InjectionStackDemo.readTruth(stack.resolve(DemoScenario.TRUTH));
        for (String f : truth.files()) {
            levels.add(MapFiles.readSingle(stack.resolve(f)));
        }
    }

    @Test
    void levelsCarryTheirInjectionAndShareWaferAndConditions() {
        assertThat(truth.files()).containsExactly("LOT-S01-W01-dn1e13.tif", "LOT-S01-W01-dn1e14.tif",
                "LOT-S01-W01-dn1e15.tif");
        assertThat(truth.injectionPerCm3()).containsExactly(1e13, 1e14, 1e15);
        for (int l = 0; l < levels.size(); l++) {
            WaferMap m = levels.get(l);
            assertThat(m.waferId()).isEqualTo("LOT-S01-W01");
            assertThat(m.conditions().injectionPerCm3()).isEqualTo(truth.injectionPerCm3()[l]);
            assertThat(m.conditions().doping()).isEqualTo(levels.get(0).conditions().doping());
            assertThat(m.conditions().thicknessUm()).isEqualTo(180.0);
            assertThat(m.grid()).isEqualTo(levels.get(0).grid());
            assertThat(Files.exists(MapFiles.sidecarOf(stack.resolve(truth.files().get(l))))).isTrue();
        }
        assertThat(truth.regions()).extracting(InjectionStackDemo.Region::expected)
                .containsExactly("fe-i", "cr-i", InjectionStackDemo.NO_SINGLE_DEFECT);
    }

    @Test
    void stackIsSmallAndRegeneratesByteIdentical(@TempDir Path other) throws IOException {
        List<Path> again = InjectionStackDemo.write(other);
        long total = 0;
        for (Path p : again) {
            assertThat(Files.readAllBytes(p)).as(p.getFileName().toString())
                    .isEqualTo(Files.readAllBytes(stack.resolve(p.getFileName())));
            total += Files.size(p);
        }
        assertThat(again).hasSize(8);
        assertThat(total).isLessThan(1L << 20);
    }

    @Test
    void backgroundIsLimitedBySurfaceAndIntrinsicRecombinationOnly() {
        // the noiseless background lifetime equals 1/(1/τ_intr + 1/τ_surf) at every level, and its pixels are
        // mostly below the SRH detection limit
        for (int l = 0; l < levels.size(); l++) {
            TrapDensityConverter conv = converter(levels.get(l));
            assertThat(truth.backgroundLifetimeUs()[l]).isCloseTo(
                    conv.lifetimeAtInjectionUs(0, truth.injectionPerCm3()[l]), within(1e-5 * truth
                            .backgroundLifetimeUs()[l]));
            // Sproul, JAP 76, 2851 (1994), τ_s = W/(2S) + (W/π)²/D (check values R-LIM-13): W 180 µm and S 2 cm/s
            // give 0.018 cm/(4 cm/s) = 4500 µs, plus (0.018 cm/π)²/D = 1.1 ± 0.2 µs for any minority diffusivity
            // D of 25–40 cm²/s (Klaassen at p 1e15: about 33); computed
            assertThat(conv.surfaceLifetimeUs()).isCloseTo(4501.1, within(0.5));
            int below = 0;
            int n = 0;
            WaferMap m = levels.get(l);
            for (int y = 0; y < m.grid().height(); y++) {
                for (int x = 0; x < m.grid().width(); x++) {
                    double v = m.raster().get(x, y);
                    if (Double.isNaN(v) || nearARegion(truth, m, x, y)) {
                        continue;
                    }
                    n++;
                    if (conv.convert(v).status() == PixelStatus.BELOW_LIMIT) {
                        below++;
                    }
                }
            }
            assertThat(below).as("level %d", l).isGreaterThan(n * 9 / 10);
        }
    }

    @Test
    void plantedDefectsAreRankedFirstWithMarginAndTheirDensityWithinTenPercent() {
        for (InjectionStackDemo.Region r : truth.regions()) {
            if (r.expected().equals(InjectionStackDemo.NO_SINGLE_DEFECT)) {
                continue;
            }
            Ranking ranking = rankRegion(r);
            assertThat(ranking.status()).as(r.name() + ": " + ranking.reason()).isEqualTo(RankingStatus.OK);
            CandidateFit best = ranking.hint().best();
            assertThat(best.id()).as(ranking.reason()).isEqualTo(r.expected());
            assertThat(ranking.hint().chiSquaredRatio()).as(ranking.reason()).isGreaterThan(CHI2_RATIO_MARGIN);
            double planted = r.defects().get(0).densityPerCm3();
            assertThat(best.ntPerCm3()).as(r.name()).isCloseTo(planted, within(0.10 * planted));
            assertThat(best.lowerPerCm3()).isLessThanOrEqualTo(best.ntPerCm3());
        }
    }

    @Test
    void overlapRegionHasNoSingleDefect() {
        InjectionStackDemo.Region overlap = truth.regions().stream()
                .filter(r -> r.expected().equals(InjectionStackDemo.NO_SINGLE_DEFECT)).findFirst().orElseThrow();
        assertThat(overlap.defects()).hasSize(2);
        Ranking ranking = rankRegion(overlap);
        assertThat(ranking.status()).as(ranking.reason()).isEqualTo(RankingStatus.NO_SINGLE_DEFECT);
        assertThat(ranking.hint().best().pValue()).isLessThan(LibraryRanking.NO_SINGLE_DEFECT_P);
    }

    @Test
    void noiseIsThreePercentAsStated() {
        // relative spread of τ_eff over a region's core, where the planted density is flat
        InjectionStackDemo.Region r = truth.regions().get(0);
        WaferMap m = levels.get(0);
        double[] s = coreStats(m, r, m.raster()::get);
        assertThat(s[1] / s[0]).isCloseTo(InjectionStackDemo.NOISE, within(0.004));
        assertThat(s[0]).isCloseTo(r.lifetimeUs()[0], within(0.005 * r.lifetimeUs()[0]));
    }

    // ------------------------------------------------------------------ helpers

    static TrapDensityConverter converter(WaferMap m) {
        Conditions pc = MapConversion.physicsConditions(m.conditions(), ConversionSettings.DEFAULTS);
        return new TrapDensityConverter(pc.withInjection(Injection.fixed(m.conditions().injectionPerCm3())),
                DefectLibrary.byId("midgap"));
    }

    interface PixelValue {
        double at(int x, int y);
    }

    /** Mean, standard deviation and count of {@code value} over the core pixels of {@code r} with a finite value. */
    static double[] coreStats(WaferMap m, InjectionStackDemo.Region r, PixelValue value) {
        double sum = 0;
        double sum2 = 0;
        int n = 0;
        for (int y = 0; y < m.grid().height(); y++) {
            for (int x = 0; x < m.grid().width(); x++) {
                if (!r.core(m.grid().xMm(x), m.grid().yMm(y))) {
                    continue;
                }
                double v = value.at(x, y);
                if (!Double.isFinite(v)) {
                    continue;
                }
                sum += v;
                sum2 += v * v;
                n++;
            }
        }
        double mean = sum / n;
        return new double[] {mean, Math.sqrt((sum2 - n * mean * mean) / (n - 1)), n};
    }

    static boolean nearARegion(InjectionStackDemo.Truth t, WaferMap m, int x, int y) {
        for (InjectionStackDemo.Region r : t.regions()) {
            if (Math.hypot(m.grid().xMm(x) - r.centreXMm(), m.grid().yMm(y) - r.centreYMm()) < r.radiusMm() + 2) {
                return true;
            }
        }
        return false;
    }

    static Ranking rankRegion(InjectionStackDemo.Region r) {
        int k = levels.size();
        double[] tau = new double[k];
        double[] u = new double[k];
        for (int l = 0; l < k; l++) {
            WaferMap m = levels.get(l);
            TrapDensityConverter conv = converter(m);
            double[] s = coreStats(m, r, (x, y) -> {
                PixelResult px = conv.convert(m.raster().get(x, y));
                return px.status() == PixelStatus.OK ? px.srhLifetimeUs() : Double.NaN;
            });
            assertThat(s[2]).as("core pixels of %s", r.name()).isGreaterThan(300);
            tau[l] = s[0] * 1e-6;
            u[l] = s[1] / Math.sqrt(s[2]) / s[0];
        }
        WaferMap first = levels.get(0);
        Conditions pc = MapConversion.physicsConditions(first.conditions(), ConversionSettings.DEFAULTS);
        Ranking ranking = new LibraryRanking(DefectLibrary.all(), pc.doping(), pc.silicon(), truth.injectionPerCm3())
                .rank(tau, u);
        return ranking;
    }
}
