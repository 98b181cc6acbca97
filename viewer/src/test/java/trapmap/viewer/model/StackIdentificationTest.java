package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.Set;
import java.util.List;
import java.util.concurrent.CancellationException;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.spectroscopy.RankingStatus;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;
import trapmap.viewer.graphics.Categories;

/** The viewer's identification runs the maps module's engine and finds the planted defects. */
class StackIdentificationTest {
    private static final double[] LEVELS = {1e13, 1e14, 1e15};
    private static IdentificationResult result;
    private static final List<String> phases = new ArrayList<>();
    private static final List<long[]> steps = new ArrayList<>();

    private static StackIdentification.Request request(List<WaferMap> maps, int block) {
        return request(maps, block, false);
    }

    private static StackIdentification.Request request(List<WaferMap> maps, int block, boolean register) {
        List<StackIdentification.Input> in = new ArrayList<>();
        for (int i = 0; i < maps.size(); i++) {
            in.add(StackIdentification.open("level" + i + ".tif", maps.get(i), ConditionOverrides.NONE));
        }
        List<Defect> cands = DefectLibrary.all();
        return new StackIdentification.Request(in, ConversionSettings.DEFAULTS, cands,
                DefectIdentification.Options.DEFAULTS.withBlock(block).withNoise(0.01).withThreads(2), register);
    }

    @BeforeAll
    static void run() {
        result = StackIdentification.run(request(SyntheticLevels.maps(LEVELS, 0.01, 7, "w1"), 1),
                (done, total, message) -> record(phases, steps, done, total, message));
    }

    private static synchronized void record(List<String> messages, List<long[]> counts, long done, long total,
                                            String message) {
        if (messages.isEmpty() || !messages.get(messages.size() - 1).equals(message)) {
            messages.add(message);
        }
        counts.add(new long[] {done, total});
    }

    @Test
    void phasesAreReportedAndEveryLevelIsListedWithItsPlacement() {
        assertThat(phases).containsExactly("checking 3 levels", "converting 3 levels", "ranking the defects");
        // the engine's rows of ranked pixels: every row once, the last one tells the whole
        List<long[]> rows = steps.stream().filter(c -> c[1] > 0).toList();
        assertThat(rows).hasSize(SyntheticLevels.SIZE);
        assertThat(rows.stream().mapToLong(c -> c[0]).max().orElse(0)).isEqualTo(SyntheticLevels.SIZE);
        List<String> reg = StackIdentification.registrationLines(result).stream()
                .filter(l -> !l.startsWith("  ")).toList();
        assertThat(reg).hasSize(3);
        assertThat(reg.get(0)).contains("reference");
        assertThat(reg.get(1)).contains("shifted 0.000, 0.000 mm", "unregistered kept");
        List<String> seen = new ArrayList<>();
        // a round wafer's levels measured in place: the registration finds nothing to move
        IdentificationResult registered = StackIdentification.run(request(SyntheticLevels.maps(LEVELS, 0.02, 11, "w1",
                true), 1, true), (done, total, message) -> record(seen, new ArrayList<>(), done, total, message));
        assertThat(seen.get(0)).isEqualTo("checking and registering 3 levels");
        assertThat(StackIdentification.registrationLines(registered)).filteredOn(l -> l.contains("level2.tif"))
                .singleElement().asString().contains("shifted 0.000, 0.000 mm", "turned 0.0°", "identity kept");
        assertThat(StackIdentification.pixel(registered, 10, 10).ranking().hint().best().id()).isEqualTo("fe-i");
    }

    @Test
    void aPixelInsideEachBoxNamesItsDefectAndTheChartsShowIt() {
        StackIdentification.Probe fe = StackIdentification.pixel(result, 8, 8);
        assertThat(fe.ranking().hint().best().id()).isEqualTo("fe-i");
        assertThat(fe.fits().candidates().get(0).fit().id()).isEqualTo("fe-i");
        assertThat(fe.fits().points()).hasSize(3);
        assertThat(fe.dpss().points()).isNotEmpty();
        assertThat(fe.title()).isEqualTo("pixel (8, 8)");
        assertThat(fe.summary()).contains("fe-i fits best");
        StackIdentification.Probe cr = StackIdentification.pixel(result, 30, 8);
        assertThat(cr.ranking().hint().best().id()).isEqualTo("cr-i");
        assertThat(cr.dpss().defects()).hasSize(DefectLibrary.all().size());
        // the N_t of the best fit is the planted one within the noise
        assertThat(fe.ranking().hint().best().ntPerCm3()).isBetween(0.8 * SyntheticLevels.NT_CM3,
                1.2 * SyntheticLevels.NT_CM3);
        // readout texts agree with the maps
        int i = 8 * result.width() + 8;
        assertThat(StackIdentification.defectText(result, result.bestIndex()[i])).startsWith("fe-i (");
        assertThat(StackIdentification.statusText(result.status()[i])).isEqualTo("OK");
        assertThat(StackIdentification.statusText(Double.NaN)).isEqualTo("no data");
        assertThat(StackIdentification.defectText(result, Double.NaN)).isEqualTo("none");
    }

    @Test
    void regionsGetTheirOwnCurveRankingAndDpss() {
        List<StackIdentification.RegionRow> rows = StackIdentification.regionRows(result);
        assertThat(rows).hasSize(result.regions().size()).hasSizeGreaterThanOrEqualTo(3);
        List<String> best = new ArrayList<>();
        for (StackIdentification.RegionRow r : rows) {
            best.add(r.best() + "/" + r.status());
            assertThat(r.areaMm2()).isEqualTo(r.pixels() * 1.0);
            assertThat(r.dpss()).isNotBlank();
            StackIdentification.Probe p = StackIdentification.region(result, r.id());
            assertThat(p.title()).startsWith("region " + r.id() + " (");
            assertThat(p.dpss()).isSameAs(result.region(r.id()).dpss());
            assertThat(p.ranking()).isSameAs(result.region(r.id()).ranking());
            if (!r.best().equals("none")) {
                assertThat(r.ntPerCm3()).isBetween(r.lowerPerCm3(), r.upperPerCm3());
            }
        }
        assertThat(best).contains("fe-i/OK", "cr-i/OK");
        assertThat(best).anyMatch(s -> s.endsWith("/" + StackIdentification.statusText(
                RankingStatus.NO_SINGLE_DEFECT)));
    }

    @Test
    void everyLayerIsAMapOfTheStacksSize() {
        for (StackIdentification.Layer l : StackIdentification.Layer.values()) {
            WaferMap m = l.of(result);
            assertThat(m.width()).isEqualTo(SyntheticLevels.SIZE);
            assertThat(m.height()).isEqualTo(SyntheticLevels.SIZE);
        }
        assertThat(StackIdentification.layerKey(StackIdentification.Layer.BEST, result)).contains("1 fe-i",
                result.legend().size() + " " + result.legend().get(result.legend().size() - 1).defectId());
        assertThat(StackIdentification.layerKey(StackIdentification.Layer.STATUS, result)).contains("0 OK",
                RankingStatus.NO_SINGLE_DEFECT.ordinal() + " no single defect");
        assertThat(StackIdentification.layerKey(StackIdentification.Layer.REGIONS, result)).endsWith(
                result.regionRule());
        assertThat(StackIdentification.Layer.BEST.categorical()).isTrue();
        assertThat(StackIdentification.Layer.CHI_SQUARED.categorical()).isFalse();
        assertThat(StackIdentification.Layer.DENSITY.label()).contains("cm⁻³");
    }

    @Test
    void blocksAreNamedInTheProbe() {
        IdentificationResult b = StackIdentification.run(request(SyntheticLevels.maps(LEVELS, 0.01, 7, "w1"), 4),
                ProgressListener.NONE);
        StackIdentification.Probe p = StackIdentification.pixel(b, 9, 9);
        assertThat(p.title()).startsWith("block of 4×4 px");
        assertThat(p.ranking().hint().best().id()).isEqualTo("fe-i");
    }

    @Test
    void windowOverridesKeepEachMapsOwnInjectionLevel() {
        WaferMap m = SyntheticLevels.maps(new double[] {1e14}, 0.01, 1, "w1").get(0);
        ConditionOverrides window = ConditionOverrides.NONE.withInjection(3e15).withDoping("p:2e15")
                .withThickness(170.0);
        StackIdentification.Input in = StackIdentification.open("a.tif", m, window);
        assertThat(in.map().conditions().injectionPerCm3()).isEqualTo(1e14);
        assertThat(in.map().conditions().thicknessUm()).isEqualTo(170.0);
        assertThat(in.map().conditions().doping().acceptorsPerCm3()).isEqualTo(2e15);
    }

    @Test
    void oneLevelIsRefusedWithTheEnginesMessage() {
        List<WaferMap> one = SyntheticLevels.maps(new double[] {1e14}, 0.01, 1, "w1");
        assertThatThrownBy(() -> StackIdentification.run(request(one, 1), ProgressListener.NONE))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("level0.tif");
    }

    @Test
    void anInterruptedRunStopsWithACancellation() {
        Thread caller = Thread.currentThread();
        List<String> seen = new ArrayList<>();
        try {
            assertThatThrownBy(() -> StackIdentification.run(request(SyntheticLevels.maps(LEVELS, 0.01, 7, "w1"), 1),
                    (done, total, message) -> {
                        record(seen, new ArrayList<>(), done, total, message);
                        if (total > 0 && done == 2) {
                            caller.interrupt();
                        }
                    })).isInstanceOf(CancellationException.class).hasMessageContaining("cancelled");
        } finally {
            Thread.interrupted();
        }
        assertThat(seen).contains("ranking the defects");
    }

    @Test
    void thePixelProbeShowsTheEnginesDpss() {
        StackIdentification.Probe fe = StackIdentification.pixel(result, 8, 8);
        DpssResult engine = result.dpssAt(8, 8);
        assertThat(fe.dpss().points()).isEqualTo(engine.points());
        assertThat(fe.dpss().band()).containsExactlyElementsOf(engine.band());
        assertThat(fe.dpss().reason()).isEqualTo(engine.reason());
    }

    @Test
    void indexLayersShowUndecidedPixelsInTheirOwnGreysWithTheLegendsColours() {
        Categories best = StackIdentification.categories(StackIdentification.Layer.BEST, result);
        float[] shown = StackIdentification.displayMap(StackIdentification.Layer.BEST, result).raster().samples();
        float[] status = result.status();
        float[] index = result.bestIndex();
        int undecided = 0;
        int identified = 0;
        for (int i = 0; i < shown.length; i++) {
            if (Float.isNaN(status[i])) {
                assertThat(shown[i]).isNaN();
            } else if (status[i] == RankingStatus.NO_SINGLE_DEFECT.ordinal()) {
                assertThat(best.of(shown[i]).rgb()).isEqualTo(Categories.UNDECIDED_RGB);
                undecided++;
            } else if (status[i] == RankingStatus.TOO_FEW_LEVELS.ordinal()) {
                assertThat(best.of(shown[i]).rgb()).isEqualTo(Categories.TOO_FEW_RGB);
            } else {
                assertThat(shown[i]).isEqualTo(index[i]);
                identified++;
            }
        }
        assertThat(undecided).isPositive();
        assertThat(identified).isPositive();
        // every legend index its own colour (the library has fewer defects than the palette colours), none grey
        Set<Integer> colours = new HashSet<>();
        for (IdentificationResult.LegendEntry e : result.legend()) {
            Categories.Category c = best.of(e.index());
            assertThat(c.label()).isEqualTo(e.index() + " " + e.defectId());
            assertThat(colours.add(c.rgb())).isTrue();
        }
        assertThat(colours).doesNotContain(Categories.UNDECIDED_RGB, Categories.TOO_FEW_RGB);
        assertThat(best.entries()).hasSize(result.legend().size() + 2);
        assertThat(StackIdentification.categories(StackIdentification.Layer.RUNNER_UP, result)).isEqualTo(best);
    }

    @Test
    void statusAndRegionLayersHaveTheirOwnCategoriesAndContinuousLayersNone() {
        Categories status = StackIdentification.categories(StackIdentification.Layer.STATUS, result);
        assertThat(status.entries()).hasSize(RankingStatus.values().length);
        assertThat(status.entries().stream().map(Categories.Category::rgb).distinct().count())
                .isEqualTo(RankingStatus.values().length);
        assertThat(status.of(RankingStatus.NO_SINGLE_DEFECT.ordinal()).rgb()).isEqualTo(Categories.UNDECIDED_RGB);
        assertThat(status.of(RankingStatus.OK.ordinal()).label()).isEqualTo("0 OK");
        Categories regions = StackIdentification.categories(StackIdentification.Layer.REGIONS, result);
        assertThat(regions.entries()).hasSize(result.regions().size() + 1);
        assertThat(regions.of(0).label()).isEqualTo("0 in no region");
        assertThat(regions.of(1).rgb()).isNotEqualTo(regions.of(2).rgb());
        assertThat(StackIdentification.categories(StackIdentification.Layer.CHI_SQUARED, result)).isNull();
        assertThat(StackIdentification.displayMap(StackIdentification.Layer.STATUS, result).raster().samples())
                .containsExactly(result.status());
        for (StackIdentification.Layer l : StackIdentification.Layer.values()) {
            assertThat(StackIdentification.categories(l, result) != null).as(l.name()).isEqualTo(l.categorical());
            assertThat(l.of(result).quantity()).as(l.name()).isEqualTo(l.quantity());
        }
    }

    @Test
    void anUnboundedRegionThresholdIsExplainedInsteadOfPrintedAsTheLargestFloat() {
        // the synthetic wafer is clean outside its squares: the median τ_SRH is unbounded, so is the threshold
        assertThat(result.regionThresholdUs()).isInfinite();
        String key = StackIdentification.layerKey(StackIdentification.Layer.REGIONS, result);
        assertThat(key).contains("SRH at least 50 %", "no τ_SRH threshold").doesNotContain("e38", "E38",
                "Infinity");
        StackIdentification.Request base = request(SyntheticLevels.maps(LEVELS, 0.01, 7, "w1"), 1);
        StackIdentification.Request bounded = new StackIdentification.Request(base.inputs(), base.settings(),
                base.candidates(), base.options().withRegionThreshold(50), false);
        IdentificationResult r = StackIdentification.run(bounded, ProgressListener.NONE);
        assertThat(StackIdentification.layerKey(StackIdentification.Layer.REGIONS, r)).contains("below 50 µs");
    }
}
