package trapmap.maps.demo;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.Sidecar;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.Mask;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.iron.IronImaging;
import trapmap.physics.iron.IronResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.material.Silicon;

class DemoScenarioTest {
    /** The one file in demo-data/ that the generator does not write. */
    private static final String HAND_WRITTEN_RULES = "rules-example.json";

    @TempDir
    static Path dir;
    static List<Path> written;
    static Map<String, List<PlantedDefect>> truth;

    @BeforeAll
    static void generate() throws IOException {
        written = DemoScenario.write(dir);
        truth = DemoScenario.readTruth(dir.resolve(DemoScenario.TRUTH));
    }

    @Test
    void twoRunsAreByteIdentical(@TempDir Path other) throws IOException {
        List<Path> second = DemoScenario.write(other);
        assertThat(second).hasSameSizeAs(written);
        for (Path p : written) {
            Path rel = dir.relativize(p);
            assertThat(Files.readAllBytes(other.resolve(rel))).as(rel.toString()).isEqualTo(Files.readAllBytes(p));
        }
    }

    @Test
    void setStaysWellUnderTenMegabytes() throws IOException {
        long total = 0;
        for (Path p : written) {
            total += Files.size(p);
        }
        assertThat(total).isLessThan(8L << 20);
        assertThat(written).allSatisfy(p -> assertThat(p.getFileName().toString()).doesNotEndWith(".tmp"));
        try (Stream<Path> s = Files.walk(dir)) {
            assertThat(s.filter(Files::isRegularFile).count()).isEqualTo(written.size());
        }
        assertThat(written).contains(dir.resolve(InjectionStackDemo.FOLDER).resolve(DemoScenario.TRUTH));
    }

    @Test
    void everyMapReadsWithTheConditionsItsConversionNeeds() throws IOException {
        for (DemoFile f : DemoScenario.build()) {
            WaferMap m = MapFiles.readSingle(dir.resolve(f.file()));
            assertThat(Files.exists(dir.resolve(f.stem() + ".json"))).isTrue();
            MeasurementConditions c = m.conditions();
            assertThat(m.waferId()).matches("(LOT-[AN]\\d\\d|MON-200)-W\\d\\d");
            assertThat(c.doping()).as(f.file()).isNotNull();
            assertThat(c.injectionPerCm3() == null).as(f.file()).isNotEqualTo(c.generationPerCm3PerS() == null);
            assertThat(c.thicknessUm()).isNotNull();
            assertThat(c.srvCmPerS()).isNotNull();
            if (m.quantity() == Quantity.PL_COUNTS) {
                assertThat(c.plCalibration()).isNotNull();
            } else {
                assertThat(m.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
            }
            assertThat(m.raster().sameSamples(f.map().raster())).isTrue();
            assertThat(truth).containsKey(f.file());
        }
    }

    @Test
    void everySidecarAloneCarriesTheMapsConditions() throws IOException {
        for (DemoFile f : DemoScenario.build()) {
            Sidecar side = Sidecar.read(dir.resolve(f.stem() + ".json"));
            assertThat(side.warnings()).as(f.file()).isEmpty();
            assertThat(side.waferId()).isEqualTo(f.map().waferId());
            assertThat(side.quantity()).isEqualTo(f.map().quantity());
            assertThat(side.pixelPitchMm()).isEqualTo(f.map().grid().pitchMm());
            assertThat(side.conditions()).isEqualTo(f.map().conditions());
        }
    }

    @Test
    void truthFileListsEveryPlantedDefect() {
        for (DemoFile f : DemoScenario.build()) {
            List<PlantedDefect> t = truth.get(f.file());
            assertThat(t).as(f.file()).hasSameSizeAs(f.defects()).isNotEmpty();
            for (int i = 0; i < t.size(); i++) {
                assertThat(t.get(i).kind()).isEqualTo(f.defects().get(i).kind());
                assertThat(t.get(i).densityPerCm3()).isCloseTo(f.defects().get(i).densityPerCm3(),
                        within(1e-5 * f.defects().get(i).densityPerCm3()));
            }
        }
        List<String> kinds = truth.values().stream().flatMap(List::stream).map(PlantedDefect::kind).distinct()
                .sorted().toList();
        assertThat(kinds).containsExactly("boat-contact", "cluster", "edge-zone", "handling-mark", "ring", "spot");
    }

    @Test
    void convertingEachMapRecoversThePlantedDensityAtEveryProbe() throws IOException {
        for (Map.Entry<String, List<PlantedDefect>> e : truth.entrySet()) {
            WaferMap map = MapFiles.readSingle(dir.resolve(e.getKey()));
            String defect = e.getValue().get(0).defect();
            WaferMap density = MapConversion.convert(map, DefectLibrary.byId(defect), ConversionSettings.DEFAULTS, 1)
                    .get(Quantity.TRAP_DENSITY);
            for (PlantedDefect d : e.getValue()) {
                double found = at(density, d.probeXMm(), d.probeYMm());
                assertThat(found).as(e.getKey() + " " + d.kind())
                        .isBetween(d.densityPerCm3() / PlantedDefect.DENSITY_FACTOR,
                                d.densityPerCm3() * PlantedDefect.DENSITY_FACTOR);
            }
        }
    }

    @Test
    void thresholdRegionsFindEveryPlantedSpotWithinTwoMillimetres() throws IOException {
        int checked = 0;
        for (Map.Entry<String, List<PlantedDefect>> e : truth.entrySet()) {
            WaferMap map = MapFiles.readSingle(dir.resolve(e.getKey()));
            String defect = e.getValue().get(0).defect();
            WaferMap density = MapConversion.convert(map, DefectLibrary.byId(defect), ConversionSettings.DEFAULTS, 1)
                    .get(Quantity.TRAP_DENSITY);
            for (PlantedDefect d : e.getValue()) {
                if (!d.compact()) {
                    continue;
                }
                double threshold = (d.backgroundPerCm3() + d.densityPerCm3()) / 2;
                RegionTable regions = ThresholdRegions.find(density, Mask.valid(density.raster()),
                        RegionCriteria.above(threshold, 1.0), null);
                Region nearest = regions.regions().stream().min(Comparator.comparingDouble(
                        r -> Math.hypot(r.centroidXMm() - d.centreXMm(), r.centroidYMm() - d.centreYMm())))
                        .orElseThrow();
                assertThat(Math.hypot(nearest.centroidXMm() - d.centreXMm(), nearest.centroidYMm() - d.centreYMm()))
                        .as(e.getKey() + " " + d.kind()).isLessThan(PlantedDefect.POSITION_TOLERANCE_MM);
                assertThat(nearest.equivalentDiameterMm()).isCloseTo(2 * d.radiusMm(), within(1.5));
                checked++;
            }
        }
        assertThat(checked).isGreaterThanOrEqualTo(8);
    }

    @Test
    void feBPairRecoversThePlantedIron() throws IOException {
        WaferMap before = MapFiles.readSingle(dir.resolve("LOT-A03-W02-feb-state.tif"));
        WaferMap after = MapFiles.readSingle(dir.resolve("LOT-A03-W02-fe-i-state.tif"));
        IronImaging iron = new IronImaging(before.conditions().doping(), Silicon.at(300));
        double dn = before.conditions().injectionPerCm3();
        List<PlantedDefect> planted = truth.get("LOT-A03-W02-fe-i-state.tif");
        assertThat(planted).hasSize(2);
        for (PlantedDefect d : planted) {
            IronResult r = iron.evaluate(at(before, d.probeXMm(), d.probeYMm()), at(after, d.probeXMm(),
                    d.probeYMm()), dn);
            assertThat(r.status()).isEqualTo(PixelStatus.OK);
            assertThat(r.ironPerCm3()).as(d.kind()).isBetween(d.densityPerCm3() / PlantedDefect.DENSITY_FACTOR,
                    d.densityPerCm3() * PlantedDefect.DENSITY_FACTOR);
        }
    }

    @Test
    void plImageConvertsBackToThePlantedLifetime() throws IOException {
        WaferMap pl = MapFiles.readSingle(dir.resolve("LOT-A04-W01-pl.tif"));
        assertThat(pl.quantity()).isEqualTo(Quantity.PL_COUNTS);
        WaferMap tau = MapConversion.lifetimeFromPl(pl);
        List<PlantedDefect> planted = truth.get("LOT-A04-W01-pl.tif");
        assertThat(planted).isNotEmpty();
        for (PlantedDefect d : planted) {
            assertThat(at(tau, d.probeXMm(), d.probeYMm())).as(d.kind())
                    .isCloseTo(d.lifetimeUs(), within(0.06 * d.lifetimeUs()));
        }
    }

    @Test
    void committedDemoDataEqualsAFreshGeneration() throws IOException {
        Path committed = Path.of("..", "demo-data");
        List<String> names = new ArrayList<>();
        try (Stream<Path> s = Files.walk(committed)) {
            s.filter(Files::isRegularFile).forEach(p -> names.add(committed.relativize(p).toString()));
        }
        // The example rules file for batch inspection is written by hand and lives beside the generated set.
        names.remove(HAND_WRITTEN_RULES);
        assertThat(names).containsExactlyInAnyOrderElementsOf(written.stream().map(p -> dir.relativize(p).toString())
                .toList());
        for (Path p : written) {
            Path rel = dir.relativize(p);
            assertThat(Files.readAllBytes(committed.resolve(rel))).as(rel.toString())
                    .isEqualTo(Files.readAllBytes(p));
        }
    }

    private static double at(WaferMap m, double xMm, double yMm) {
        int x = (int) Math.round(m.grid().xPx(xMm));
        int y = (int) Math.round(m.grid().yPx(yMm));
        return m.raster().get(x, y);
    }
}
