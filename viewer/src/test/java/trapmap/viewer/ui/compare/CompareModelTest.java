package trapmap.viewer.ui.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.compare.Registration;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.IronMapping;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.iron.IronImaging;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;

/** The compare view's derived maps, statistics, linked probing and iron map, without Swing. */
class CompareModelTest {
    private static final int N = 120;
    private static final double PITCH = 0.5;
    private static final Doping DOPING = Doping.pType(1e16);

    /** A smooth, asymmetric lifetime pattern on a round wafer of radius 28 mm, moved by (dx, dy) px. */
    static WaferMap lifetime(String id, double factor, int dxPx, int dyPx, double injection) {
        PixelGrid g = PixelGrid.centred(N, N, PITCH);
        float[] s = new float[N * N];
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x - dxPx);
                double ym = g.yMm(y - dyPx);
                double r = Math.hypot(xm, ym); // the wafer moves with its pattern
                double v = 120 + 50 * Math.sin(xm / 6.0) * Math.cos(ym / 9.0) + 30 * Math.exp(
                        -(Math.pow(xm - 10, 2) + Math.pow(ym + 5, 2)) / 40) + 0.8 * xm;
                s[y * N + x] = r > 28 ? Float.NaN : (float) (factor * v);
            }
        }
        MeasurementConditions c = new MeasurementConditions(DOPING, 180.0, 300.0, injection, null, null, null, null,
                null);
        return new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, id, c, Provenance.of("test"));
    }

    @Test
    void registrationFindsTheShiftAndTheDerivedMapsUseTheAlignedPixels() {
        WaferMap before = lifetime("B", 1, 0, 0, 1e14);
        WaferMap after = lifetime("A", 0.8, 4, -2, 1e14); // content moved 2 mm right and 1 mm up
        CompareModel.Result r = CompareModel.compute(before, after, CompareModel.Options.defaults(),
                ProgressListener.NONE);
        // a point p_B of the after map lies at p_A = p_B + shift on the before map: shift = (−2, −1) mm
        assertThat(r.registration().samePlacement(Registration.explicit(false, false, 0, -2, -1), 0.5, 0.25))
                .as(r.registration().toString()).isTrue();
        assertThat(r.comparison().statistics().medianRatio()).isCloseTo(0.8, within(0.01));
        float[] d = r.comparison().difference().raster().samples();
        float[] b = r.before().raster().samples();
        float[] a = r.after().raster().samples();
        int centre = (N / 2) * N + N / 2;
        assertThat((double) d[centre]).isCloseTo(a[centre] - b[centre], within(1e-3));
        assertThat(r.derived(CompareModel.View.REDUCTION)).isNull(); // lifetimes have no reduction
        assertThat(r.statisticsRows()).anySatisfy(row -> assertThat(row).containsExactly("registration shift x",
                row[1], "mm"));
    }

    @Test
    void linkedProbeReadsTheSameWaferPositionOnBothMaps() {
        WaferMap before = lifetime("B", 1, 0, 0, 1e14);
        WaferMap after = lifetime("A", 0.8, 4, -2, 1e14);
        CompareModel.Result r = CompareModel.compute(before, after, CompareModel.Options.defaults(),
                ProgressListener.NONE);
        double x = 5;
        double y = -3;
        CompareModel.Probe p = r.probe(x, y, CompareModel.View.RATIO);
        // the same wafer feature: the after map's own pixel at the registered position of (x, y)
        double[] onAfter = r.registration().toAfterMm(x, y);
        double afterOwn = CompareModel.sample(after, onAfter[0], onAfter[1]);
        assertThat(p.before()).isEqualTo(CompareModel.sample(before, x, y));
        assertThat(p.after()).isCloseTo(afterOwn, within(0.02 * afterOwn));
        assertThat(p.derived()).isCloseTo(p.after() / p.before(), within(1e-5));
        assertThat(r.probe(40, 40, CompareModel.View.RATIO).before()).isNaN(); // off the wafer
    }

    @Test
    void ironMapRecoversTheIronOfAForwardModelledPair() {
        // forward model after Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004): the same N_Fe as FeB before and as
        // Fe_i after, on top of an unchanged other recombination; the inversion must return N_Fe
        double dn = 1e13;
        Silicon si = Silicon.at(300);
        SrhRecombination feb = SrhRecombination.of(DefectLibrary.byId("fe-b"), DOPING, si);
        SrhRecombination fei = SrhRecombination.of(DefectLibrary.byId("fe-i"), DOPING, si);
        WaferMap base = lifetime("B", 1, 0, 0, dn);
        float[] s = base.raster().samples();
        float[] tb = new float[s.length];
        float[] ta = new float[s.length];
        double[] iron = new double[s.length];
        for (int i = 0; i < s.length; i++) {
            iron[i] = 1e11 * (1 + (i % N) / (double) N);
            double other = 1 / (s[i] * 1e-6 * 4); // a clean lifetime four times the pattern
            tb[i] = s[i] != s[i] ? Float.NaN : (float) (1e6 / (other + iron[i] * feb.ratePerTrapCm3PerS(dn)));
            ta[i] = s[i] != s[i] ? Float.NaN : (float) (1e6 / (other + iron[i] * fei.ratePerTrapCm3PerS(dn)));
        }
        WaferMap before = new WaferMap(FloatRaster.wrap(N, N, tb), base.grid(), base.quantity(), "W", base.conditions(),
                base.provenance());
        WaferMap after = new WaferMap(FloatRaster.wrap(N, N, ta), base.grid(), base.quantity(), "W", base.conditions(),
                base.provenance());
        CompareModel.Result r = CompareModel.compute(before, after, CompareModel.Options.defaults()
                .withRegistration(false).withIron(true), ProgressListener.NONE);
        IronMapping.Result fe = r.iron();
        assertThat(fe.iron().quantity()).isEqualTo(Quantity.IRON_DENSITY);
        float[] m = fe.iron().raster().samples();
        int checked = 0;
        for (int i = 0; i < m.length; i++) {
            if (s[i] == s[i]) {
                assertThat((double) m[i]).isCloseTo(iron[i], within(1e-4 * iron[i]));
                checked++;
            }
        }
        assertThat(checked).isGreaterThan(2000);
        // the library's fe-i/fe-b at N_A 1e16, v_th 1.1e7 cm/s: crossover 1.1848e14 cm^-3 (Macdonald, Geerligs &
        // Azzizi, JAP 95, 1021 (2004), computed; docs/check-values.md R-FE-5), 0.5 %
        assertThat(fe.crossoverPerCm3()).isCloseTo(1.1848e14, within(0.005 * 1.1848e14));
        assertThat(fe.nearCrossover()).isFalse();
        assertThat(r.derived(CompareModel.View.IRON)).isSameAs(fe.iron());
        assertThat(r.statisticsRows()).anySatisfy(row -> assertThat(row[0]).isEqualTo("[Fe_i] median"));
    }

    @Test
    void ironNearTheCrossoverIsFlaggedAndAtItHasNoSignal() {
        double crossover = new IronImaging(DOPING, Silicon.at(300)).crossoverPerCm3();
        WaferMap b = lifetime("B", 1, 0, 0, crossover * 1.5);
        WaferMap a = lifetime("A", 0.9, 0, 0, crossover * 1.5);
        IronMapping.Result near = CompareModel.compute(b, a, CompareModel.Options.defaults().withRegistration(false)
                .withIron(true), ProgressListener.NONE).iron();
        assertThat(near.nearCrossover()).isTrue();
        WaferMap b0 = lifetime("B", 1, 0, 0, crossover);
        WaferMap a0 = lifetime("A", 0.9, 0, 0, crossover);
        IronMapping.Result at = CompareModel.compute(b0, a0, CompareModel.Options.defaults().withRegistration(false)
                .withIron(true), ProgressListener.NONE).iron();
        assertThat(at.count(IronMapping.IronStatus.CROSSOVER)).isEqualTo(at.iron().raster().samples().length - countNaN(b0));
        assertThat(at.statistics().count()).isZero();
    }

    @Test
    void ironNeedsOneFixedInjectionInBothMaps() {
        WaferMap b = lifetime("B", 1, 0, 0, 1e13);
        WaferMap a = lifetime("A", 0.9, 0, 0, 2e13);
        assertThatThrownBy(() -> CompareModel.compute(b, a, CompareModel.Options.defaults().withRegistration(false)
                .withIron(true), ProgressListener.NONE)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("same injection");
    }

    @Test
    void exportsEveryShownMapAndTheStatisticsThroughTheMapsWriters(@TempDir Path dir) throws Exception {
        WaferMap before = lifetime("B", 1, 0, 0, 1e13);
        WaferMap after = lifetime("B", 0.6, 0, 0, 1e13);
        CompareModel.Result r = CompareModel.compute(before, after, CompareModel.Options.defaults()
                .withRegistration(false).withIron(true), ProgressListener.NONE);
        List<Path> files = CompareExports.write(r, dir, CompareExports.baseName(r));
        // before, after, difference, ratio, relative change, iron, iron status: TIFF and CSV each, then statistics
        assertThat(files).hasSize(2 * 7 + 1);
        WaferMap iron = MapFiles.readSingle(dir.resolve("B-iron-iron.tif"));
        assertThat(iron.quantity()).isEqualTo(Quantity.IRON_DENSITY);
        assertThat(iron.raster().samples()).containsExactly(r.iron().iron().raster().samples());
        assertThat(iron.provenance().steps()).anyMatch(st -> st.operation().equals("iron"));
        assertThat(MapFiles.readSingle(dir.resolve("B-iron-iron-status.csv")).raster().samples()[N * N / 2 + N / 2])
                .isEqualTo((float) IronMapping.IronStatus.OK.code());
        List<String> stats = Files.readAllLines(dir.resolve("B-iron-statistics.csv"));
        assertThat(stats.get(0)).isEqualTo("figure,value,unit");
        assertThat(stats).hasSize(r.statisticsRows().size() + 1)
                .anyMatch(l -> l.startsWith("[Fe_i] median,")).anyMatch(l -> l.startsWith("placement kept,"));
    }

    @Test
    void registrationWarningsReachTheResultAndItsTable() {
        WaferMap before = lifetime("B", 1, 0, 0, 1e14);
        WaferMap other = lifetime("OTHER", 1, 0, 0, 1e14);
        CompareModel.Result r = CompareModel.compute(before, other, CompareModel.Options.defaults()
                .withRegistration(false), ProgressListener.NONE);
        assertThat(r.warnings()).anyMatch(w -> w.contains("different wafer ids"));
        assertThat(r.statisticsRows()).anySatisfy(row -> assertThat(row[0]).isEqualTo("warning"));
    }

    /** The status line says how the after map was placed, as compare's "kept" does. */
    @Test
    void placementLineNamesThePlacementKept() {
        WaferMap before = lifetime("B", 1, 0, 0, 1e14);
        WaferMap moved = lifetime("A", 0.8, 4, -2, 1e14);
        assertThat(CompareModel.compute(before, moved, CompareModel.Options.defaults(), ProgressListener.NONE)
                .placementLine()).startsWith("Registered: shift (");
        CompareModel.Result aligned = CompareModel.compute(before, lifetime("A", 0.8, 0, 0, 1e14),
                CompareModel.Options.defaults().withRegistration(false), ProgressListener.NONE);
        assertThat(aligned.report().kept()).isEqualTo(trapmap.maps.compare.RegistrationReport.Kept.UNREGISTERED);
        assertThat(aligned.placementLine()).startsWith("Not registered (taken as aligned): shift (0, 0) mm, turn 0°");
    }

    private static int countNaN(WaferMap m) {
        int n = 0;
        for (float v : m.raster().samples()) {
            if (v != v) {
                n++;
            }
        }
        return n;
    }
}
