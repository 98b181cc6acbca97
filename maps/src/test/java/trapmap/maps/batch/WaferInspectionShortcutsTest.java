package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.util.BitSet;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.SquareWafer;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.ThresholdRegions;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

/**
 * The batch's faster paths give what the general classes give: the same masks as {@link WaferShape#mask}, the same
 * regions as {@link ThresholdRegions}, the same figures as {@link MapStatistics}; the outline fitted on a
 * block-reduced mask stays within a stated tolerance of the full-resolution fit.
 */
class WaferInspectionShortcutsTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    private static WaferMap demo(String file) throws Exception {
        return MapFiles.readSingle(DEMO.resolve(file));
    }

    @ParameterizedTest
    @ValueSource(strings = {"LOT-A01-W02.tif", "LOT-N01-W03.tif", "MON-200-W01.tif"})
    void masksEqualTheShapeMaskOfTheValidPixels(String file) throws Exception {
        WaferMap m = demo(file);
        WaferShape shape = OutlineDetection.fit(m).shape();
        for (double e : new double[] {0, 2, 3.7}) {
            Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, e, e + 10);
            Mask expected = Mask.valid(m.raster()).and(shape.mask(m.grid(), e));
            Mask centre = Mask.valid(m.raster()).and(shape.mask(m.grid(), e + 10));
            assertThat(masks.count()).isEqualTo(expected.count());
            for (int i = 0; i < masks.evaluated().length; i++) {
                assertThat(masks.evaluated()[i]).as("pixel %d, exclusion %s", i, e).isEqualTo(expected.containsIndex(i));
                assertThat(masks.centre()[i]).as("centre pixel %d", i).isEqualTo(centre.containsIndex(i));
            }
            for (int k = 1; k < masks.count(); k++) {
                assertThat(masks.indices()[k]).isGreaterThan(masks.indices()[k - 1]);
            }
        }
    }

    /**
     * The masks with the evaluated lifetimes packed on the way (as the batch makes them): the indices, in order, and
     * the values of the pixels of the plain mask (not NaN, inside the exclusion), NaN pixels inside counted as
     * missing, with NaN pixels alone, in runs, and at the starts and ends of rows.
     */
    @ParameterizedTest
    @ValueSource(ints = {0, 1, 7, 40})
    void packedMasksHoldThePlainMasksPixelsAndValues(int nanPerThousand) {
        PixelGrid grid = PixelGrid.centred(97, 83, 1);
        WaferShape disk = RoundWafer.disk(44);
        java.util.Random rnd = new java.util.Random(nanPerThousand);
        float[] tau = new float[97 * 83];
        for (int i = 0; i < tau.length; i++) {
            int x = i % 97;
            tau[i] = rnd.nextInt(1000) < nanPerThousand || nanPerThousand > 0 && (x == 0 || x == 96 || i / 97 == 40
                    && x > 30 && x < 45) ? Float.NaN : (float) (50 + 200 * rnd.nextDouble());
        }
        InspectionBuffers buffers = new InspectionBuffers();
        float[] packed = buffers.life(tau.length);
        java.util.Arrays.fill(packed, -1f);
        Masks masks = Masks.of(tau, grid, disk, 3, Double.NaN, buffers, packed);
        Mask inside = disk.mask(grid, 3);
        Mask expected = Mask.valid(FloatRaster.wrap(97, 83, tau)).and(inside);
        assertThat(masks.count()).isEqualTo(expected.count());
        assertThat(masks.missing()).isEqualTo(inside.count() - expected.count());
        int k = 0;
        for (int i = 0; i < tau.length; i++) {
            if (expected.containsIndex(i)) {
                assertThat(masks.indices()[k]).as("position %d", k).isEqualTo(i);
                assertThat(Float.floatToRawIntBits(packed[k])).as("value at %d", i)
                        .isEqualTo(Float.floatToRawIntBits(tau[i]));
                k++;
            }
        }
    }

    /** Pixels exactly at the exclusion distance (integer coordinates on a disk) are decided by the exact distance. */
    @ParameterizedTest
    @ValueSource(doubles = {0, 4, 5, 7})
    void masksAtExactlyTheExclusionDistanceEqualTheShapeMask(double exclusionMm) {
        PixelGrid grid = PixelGrid.centred(31, 31, 1);
        WaferShape disk = RoundWafer.disk(20);
        float[] tau = new float[31 * 31];
        java.util.Arrays.fill(tau, 100f);
        Masks masks = Masks.of(tau, grid, disk, exclusionMm, exclusionMm + 1);
        Mask expected = disk.mask(grid, exclusionMm);
        Mask centre = disk.mask(grid, exclusionMm + 1);
        assertThat(masks.count()).isEqualTo(expected.count());
        for (int i = 0; i < tau.length; i++) {
            assertThat(masks.evaluated()[i]).as("pixel %d", i).isEqualTo(expected.containsIndex(i));
            assertThat(masks.centre()[i]).as("centre pixel %d", i).isEqualTo(centre.containsIndex(i));
        }
    }

    @Test
    void regionsEqualThoseOfThresholdRegions() throws Exception {
        WaferMap m = demo("LOT-A01-W02.tif");
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        for (RegionCriteria c : List.of(RegionCriteria.below(60, 1), RegionCriteria.below(150, 0),
                RegionCriteria.above(400, 2))) {
            FlaggedRegions mine = FlaggedRegions.find(m.raster(), m.grid(), masks.indices(), masks.count(), c, shape,
                    null);
            List<Region> expected = ThresholdRegions.find(m, Masks.mask(masks.evaluated(), m.grid()), c,
                    shape).regions();
            assertThat(expected).isNotEmpty();
            assertThat(mine.regions()).extracting(FlaggedRegions.FlaggedRegion::region)
                    .containsExactlyElementsOf(expected);
            assertThat(mine.pixels().cardinality()).isEqualTo(expected.stream().mapToInt(Region::pixelCount).sum());
            // edge distances over the border pixels only: the same regions
            assertThat(m.grid().pitchMm()).isLessThan(2);
            FlaggedRegions borders = FlaggedRegions.find(m.raster(), m.grid(), masks.indices(), masks.count(), c,
                    shape, null, 2);
            assertThat(borders.regions()).isEqualTo(mine.regions());
            assertThat(borders.pixels()).isEqualTo(mine.pixels());
        }
    }

    @Test
    void regionsOfPackedValuesEqualThoseOfTheFullMaps() throws Exception {
        WaferMap m = demo("LOT-A01-W02.tif");
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        float[] tau = Sample.gather(m.raster().samples(), masks);
        WaferInspection.Density d = WaferInspection.trapDensity(m, DefectLibrary.byId("fe-i"), tau, masks);
        InspectionBuffers buffers = new InspectionBuffers();
        for (RegionCriteria c : List.of(RegionCriteria.below(60, 1), RegionCriteria.above(400, 2))) {
            FlaggedRegions full = FlaggedRegions.find(m.raster(), m.grid(), masks.indices(), masks.count(), c, shape,
                    d.map().raster().samples(), 2);
            FlaggedRegions packed = FlaggedRegions.findPacked(tau, d.packed(), m.grid(), masks.indices(),
                    masks.count(), c, shape, 2, buffers);
            assertThat(full.regions()).isNotEmpty();
            assertThat(packed.regions()).isEqualTo(full.regions());
            assertThat(packed.pixels()).isEqualTo(full.pixels());
        }
        // flagged by trap density
        RegionCriteria high = RegionCriteria.above(percentile(d.packed(), 90), 1);
        FlaggedRegions full = FlaggedRegions.find(d.map().raster(), m.grid(), masks.indices(), masks.count(), high,
                shape, d.map().raster().samples(), 2);
        FlaggedRegions packed = FlaggedRegions.findPacked(d.packed(), d.packed(), m.grid(), masks.indices(),
                masks.count(), high, shape, 2, buffers);
        assertThat(full.regions()).isNotEmpty();
        assertThat(packed.regions()).isEqualTo(full.regions());
    }

    private static float percentile(float[] v, double percent) {
        float[] s = new float[v.length];
        int n = 0;
        for (float f : v) {
            if (f == f) {
                s[n++] = f;
            }
        }
        java.util.Arrays.sort(s, 0, n);
        return s[(int) (percent / 100 * (n - 1))];
    }

    @ParameterizedTest
    @ValueSource(ints = {6, 40})
    void regionDensityMedianEqualsMapStatisticsOverItsPixels(int radius) {
        int n = 96;
        PixelGrid grid = PixelGrid.centred(n, n, 0.5);
        float[] tau = new float[n * n];
        float[] density = new float[n * n];
        Random rnd = new Random(radius);
        int[] all = new int[n * n];
        for (int i = 0; i < tau.length; i++) {
            int dx = i % n - n / 2;
            int dy = i / n - n / 2;
            tau[i] = dx * dx + dy * dy <= radius * radius ? 10 : 100;
            density[i] = rnd.nextInt(10) == 0 ? Float.NaN : rnd.nextInt(50) * 1e10f; // ties and gaps
            all[i] = i;
        }
        FlaggedRegions r = FlaggedRegions.find(FloatRaster.wrap(n, n, tau), grid, all, all.length,
                RegionCriteria.below(50, 0), null, density);
        assertThat(r.regions()).hasSize(1);
        BitSet px = r.pixels();
        Mask region = Mask.of(n, n, px::get);
        MapStatistics st = MapStatistics.of(FloatRaster.wrap(n, n, density), region, grid,
                StatisticsRequest.of(new double[0]));
        assertThat(r.regions().get(0).medianDensityCm3()).isEqualTo(st.median());
        assertThat(r.regions().get(0).peakDensityCm3()).isEqualTo(st.max());
    }

    @ParameterizedTest
    @ValueSource(strings = {"LOT-A01-W02.tif", "LOT-N01-W01.tif", "LOT-A04-W01-pl.tif"})
    void trapDensityEqualsThatOfTheFullConversion(String file) throws Exception {
        WaferMap read = demo(file);
        WaferMap lifetime = read.quantity() == Quantity.PL_COUNTS ? MapConversion.lifetimeFromPl(read) : read;
        Defect defect = DefectLibrary.byId(file.startsWith("LOT-N") ? "midgap" : "fe-i");
        float[] expected = MapConversion.convert(lifetime, defect, ConversionSettings.DEFAULTS, 1)
                .get(Quantity.TRAP_DENSITY).raster().samples();
        WaferMap mine = WaferInspection.trapDensity(lifetime, defect);
        assertThat(mine.quantity()).isEqualTo(Quantity.TRAP_DENSITY);
        assertThat(mine.raster().samples()).containsExactly(expected);
        // converted at the evaluated pixels only: the same values there, NaN elsewhere
        WaferShape shape = OutlineDetection.fit(lifetime).shape();
        Masks masks = Masks.of(lifetime.raster().samples(), lifetime.grid(), shape, 2,
                Double.NaN);
        WaferMap packed = WaferInspection.trapDensity(lifetime, defect, masks.indices(), masks.count());
        assertThat(packed.provenance()).isEqualTo(mine.provenance());
        assertThat(masks.count()).isPositive();
        float[] p = packed.raster().samples();
        for (int i = 0; i < p.length; i++) {
            float want = masks.evaluated()[i] ? expected[i] : Float.NaN;
            assertThat(Float.floatToRawIntBits(p[i])).as("pixel %d", i).isEqualTo(Float.floatToRawIntBits(want));
        }
    }

    @Test
    void packedTrapDensityFiguresEqualMapStatisticsOfTheFullConversion() throws Exception {
        WaferMap m = demo("LOT-A02-W05-before-gettering.tif");
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        Defect fe = DefectLibrary.byId("fe-i");
        float[] packedTau = Sample.gather(m.raster().samples(), masks);
        WaferInspection.Density d = WaferInspection.trapDensity(m, fe, packedTau, masks);
        double[] percents = {5, 95};
        Sample s = Sample.ofPacked(d.packed(), masks.count(), m.grid(), percents,
                false);
        MapStatistics st = MapStatistics.of(WaferInspection.trapDensity(m, fe),
                Masks.mask(masks.evaluated(), m.grid()), StatisticsRequest.of(percents));
        assertThat(s.count()).isEqualTo(st.count());
        assertThat(s.median()).isEqualTo(st.median());
        for (double p : percents) {
            assertThat(s.percentile(p)).isEqualTo(st.percentile(p));
        }
        // and the lifetimes, packed the same way, give the lifetime figures
        Sample life = Sample.ofPacked(packedTau, masks.count(), m.grid(), percents,
                true);
        MapStatistics lt = MapStatistics.of(m, Masks.mask(masks.evaluated(), m.grid()),
                StatisticsRequest.of(percents));
        assertThat(life.harmonicMean()).isEqualTo(lt.harmonicMean());
        assertThat(life.percentile(95)).isEqualTo(lt.percentile(95));
    }

    @Test
    void sampleFiguresEqualMapStatistics() throws Exception {
        WaferMap m = demo("LOT-A02-W05-before-gettering.tif");
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        double[] percents = {1, 5, 95, 99};
        Sample s = Sample.of(m.raster().samples(), masks, m.grid(), percents);
        MapStatistics st = MapStatistics.of(m, Masks.mask(masks.evaluated(), m.grid()),
                StatisticsRequest.of(percents));
        assertThat(s.count()).isEqualTo(st.count());
        assertThat(s.areaMm2()).isEqualTo(st.areaMm2());
        assertThat(s.harmonicMean()).isEqualTo(st.harmonicMean());
        assertThat(s.median()).isEqualTo(st.median());
        for (double p : percents) {
            assertThat(s.percentile(p)).isEqualTo(st.percentile(p));
        }
    }

    /**
     * A 1024² M2 map (0.16 mm pixels) off centre by (0.37, −0.61) mm and turned 0.8°: the outline fitted on the
     * 6×6-block mask (0.98 mm blocks) has its centre within 0.05 mm of the full-resolution fit and its side within
     * 0.25 mm (a quarter of a block: an edge nearly parallel to the block rows snaps to the same block boundary along
     * much of its length), matches the same format, and the evaluated areas (2 mm edge exclusion) differ by less
     * than 0.3 %.
     */
    @Test
    void outlineOfTheReducedMaskStaysWithinAFractionOfAPixel() {
        int n = 1024;
        PixelGrid grid = PixelGrid.centred(n, n, (WaferFormat.M2.sizeMm() + 6) / n);
        SquareWafer truth = new SquareWafer(WaferFormat.M2.sizeMm(), WaferFormat.M2.diagonalMm(), 0.8, 0.37, -0.61);
        WaferShape.Prepared p = truth.prepared();
        float[] tau = new float[n * n];
        Random rnd = new Random(5);
        for (int i = 0; i < tau.length; i++) {
            tau[i] = p.contains(grid.xMm(i % n), grid.yMm(i / n)) ? 100 + rnd.nextFloat() : Float.NaN;
        }
        OutlineFit full = OutlineDetection.fit(Mask.valid(FloatRaster.wrap(n, n, tau)), grid);
        OutlineFit reduced = OutlineFits.fit(tau, grid);
        assertThat(reduced.shape()).isInstanceOf(SquareWafer.class);
        SquareWafer a = (SquareWafer) full.shape();
        SquareWafer b = (SquareWafer) reduced.shape();
        assertThat(b.centreXMm()).isCloseTo(a.centreXMm(), within(0.05));
        assertThat(b.centreYMm()).isCloseTo(a.centreYMm(), within(0.05));
        assertThat(b.sideMm()).isCloseTo(a.sideMm(), within(0.25));
        assertThat(b.rotationDeg()).isCloseTo(a.rotationDeg(), within(0.1));
        assertThat(reduced.closestFormat().format()).isEqualTo(full.closestFormat().format());
        int fullCount = Masks.of(tau, grid, a, 2, Double.NaN).count();
        int reducedCount = Masks.of(tau, grid, b, 2, Double.NaN).count();
        assertThat(Math.abs(reducedCount - fullCount) / (double) fullCount).isLessThan(3e-3);
        // a second map with the same valid pixels reuses the fit
        assertThat(OutlineFits.fit(tau.clone(), grid)).isSameAs(reduced);
    }

    @Test
    void dilationMarksEveryPixelWithinTheRadius() {
        Random rnd = new Random(3);
        int w = 37;
        int h = 23;
        boolean[] b = new boolean[w * h];
        for (int i = 0; i < b.length; i++) {
            b[i] = rnd.nextInt(40) == 0;
        }
        for (int r = 0; r <= 3; r++) {
            boolean[] d = Thumbnails.dilate(b, w, h, r);
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    boolean expected = false;
                    for (int yy = Math.max(0, y - r); yy <= Math.min(h - 1, y + r); yy++) {
                        for (int xx = Math.max(0, x - r); xx <= Math.min(w - 1, x + r); xx++) {
                            expected |= b[yy * w + xx];
                        }
                    }
                    assertThat(d[y * w + x]).as("(%d, %d) r=%d", x, y, r).isEqualTo(expected);
                }
            }
        }
    }

    @Test
    void footprintCellsHoldTheFlaggedPixels() throws Exception {
        WaferMap m = demo("LOT-A01-W02.tif");
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        BitSet flagged = FlaggedRegions.find(m.raster(), m.grid(), masks.indices(), masks.count(),
                RegionCriteria.below(60, 1), shape, null).pixels();
        Footprint f = Footprint.of("m2", m.grid(), masks.indices(), masks.count(), flagged);
        PixelGrid g = m.grid();
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            int cx = Footprint.cell(g.xMm(i % g.width()), 1) - f.minI();
            int cy = Footprint.cell(g.yMm(i / g.width()), 1) - f.minJ();
            assertThat(f.flagged().get(cy * f.width() + cx)).isTrue();
        }
        BitSet covered = new BitSet();
        for (int i = 0; i < masks.evaluated().length; i++) {
            if (masks.evaluated()[i]) {
                int cx = Footprint.cell(g.xMm(i % g.width()), 1) - f.minI();
                int cy = Footprint.cell(g.yMm(i / g.width()), 1) - f.minJ();
                covered.set(cy * f.width() + cx);
            }
        }
        assertThat(f.covered()).isEqualTo(covered);
    }

    /** Covered cells from the indices (runs skipped) equal those of every evaluated pixel, holes and all. */
    @ParameterizedTest
    @ValueSource(doubles = {0.16, 0.3, 1, 2.5})
    void footprintCoversTheCellsOfEveryEvaluatedPixel(double pitchMm) {
        Random rnd = new Random(Double.hashCode(pitchMm));
        int w = 173;
        int h = 91;
        PixelGrid g = PixelGrid.centred(w, h, pitchMm);
        int[] indices = new int[w * h];
        int count = 0;
        for (int i = 0; i < w * h; i++) {
            // long evaluated stretches with holes of one pixel and longer gaps, as around defects and the edge
            int x = i % w;
            boolean gap = x < 7 || x > w - 12 || (i / w) % 17 == 3 && x > 40 && x < 90;
            boolean hole = (i / w) % 3 == 0 && rnd.nextInt(40) == 0; // every third row has holes
            if (!gap && !hole) {
                indices[count++] = i;
            }
        }
        Footprint f = Footprint.of("m2", g, indices, count, new BitSet());
        BitSet covered = new BitSet();
        for (int k = 0; k < count; k++) {
            int i = indices[k];
            if (pitchMm <= 1) { // the cell under the pixel's centre
                covered.set((Footprint.cell(g.yMm(i / w), 1) - f.minJ()) * f.width()
                        + Footprint.cell(g.xMm(i % w), 1) - f.minI());
            } else { // pixels larger than the cells: the cells whose centres lie in the pixel's square
                double x = g.xMm(i % w);
                double y = g.yMm(i / w);
                for (int cy = (int) Math.floor(y - pitchMm / 2) + 1; cy <= Math.floor(y + pitchMm / 2); cy++) {
                    for (int cx = (int) Math.floor(x - pitchMm / 2) + 1; cx <= Math.floor(x + pitchMm / 2); cx++) {
                        covered.set((cy - f.minJ()) * f.width() + cx - f.minI());
                    }
                }
            }
        }
        assertThat(f.covered()).isEqualTo(covered);
        assertThat(Footprint.of("m2", g, indices, 0, new BitSet()).covered().isEmpty()).isTrue();
    }

    @Test
    void reducedValidityCountsTheValidPixelsOfEachBlock() {
        Random rnd = new Random(11);
        int w = 61;
        int h = 47;
        float[] tau = new float[w * h];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = rnd.nextInt(3) == 0 ? Float.NaN : rnd.nextFloat();
        }
        for (int k = 2; k <= 7; k++) {
            boolean[] valid = OutlineFits.reducedValidity(tau, w, h, k);
            int cw = w / k;
            assertThat(valid).hasSize(cw * (h / k));
            for (int b = 0; b < valid.length; b++) {
                int n = 0;
                for (int y = (b / cw) * k; y < (b / cw + 1) * k; y++) {
                    for (int x = (b % cw) * k; x < (b % cw + 1) * k; x++) {
                        n += Float.isNaN(tau[y * w + x]) ? 0 : 1;
                    }
                }
                assertThat(valid[b]).as("block %d, k=%d", b, k).isEqualTo(2 * n >= k * k);
            }
        }
    }

    /**
     * The packed conversion, a strip of pixels per call of the kernel, gives every pixel the value and status of one
     * call over all of them, and the same count below the detection limit.
     */
    @ParameterizedTest
    @ValueSource(ints = {1, WaferInspection.STRIP - 1, WaferInspection.STRIP, 3 * WaferInspection.STRIP + 5})
    void packedConversionInStripsEqualsOneCallOverAllPixels(int n) throws Exception {
        WaferMap lifetime = demo("LOT-A01-W02.tif");
        trapmap.physics.conversion.Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(),
                ConversionSettings.DEFAULTS);
        Defect defect = DefectLibrary.byId("fe-i");
        Random rnd = new Random(n);
        float[] tau = new float[n + 2];
        for (int k = 0; k < n; k++) {
            int kind = rnd.nextInt(40);
            tau[k] = kind == 0 ? -1f : kind == 1 ? 0f : kind == 2 ? 2e-4f : kind == 3 ? Float.POSITIVE_INFINITY
                    : kind == 4 ? 1e7f : (float) (20 * Math.exp(2 * rnd.nextGaussian()));
        }
        float[] out = new float[n + 2];
        byte[] status = new byte[n + 2];
        int below = WaferInspection.convertPacked(conditions, defect, tau, n, out, status);

        float[] wantOut = new float[n];
        byte[] wantStatus = new byte[n];
        trapmap.physics.conversion.TrapDensityConverter.Tally tally =
                new trapmap.physics.conversion.TrapDensityConverter.Tally();
        new trapmap.physics.conversion.TrapDensityConverter(conditions, defect).convertRows(
                java.util.Arrays.copyOf(tau, n), n, 0, 1, new trapmap.physics.conversion.ConversionOutput(wantOut,
                        null, null, null, null, null, null, wantStatus, null), tally);
        for (int k = 0; k < n; k++) {
            assertThat(Float.floatToRawIntBits(out[k])).as("pixel %d", k)
                    .isEqualTo(Float.floatToRawIntBits(wantOut[k]));
            assertThat(status[k]).as("status of pixel %d", k).isEqualTo(wantStatus[k]);
        }
        assertThat(below).isEqualTo(tally.count(trapmap.physics.conversion.PixelStatus.BELOW_LIMIT));
        assertThat(out[n]).as("past the pixels: untouched").isZero();
        assertThat(status[n]).isZero();
    }

    /**
     * Without an outline the evaluated pixels are the valid ones, with their values packed in index order; with one,
     * the packed values are those at the indices, and the NaN pixels inside the exclusion are counted as missing.
     */
    @Test
    void maskIndicesPackedValuesAndMissingPixelsEqualTheirDefinitions() {
        PixelGrid grid = PixelGrid.centred(157, 143, 0.8);
        Random rnd = new Random(5);
        float[] tau = new float[157 * 143];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = rnd.nextInt(30) == 0 ? Float.NaN : 10 + 90 * rnd.nextFloat();
        }
        Mask valid = Mask.valid(FloatRaster.wrap(157, 143, tau));

        float[] packed = new float[tau.length];
        Masks none = Masks.of(tau, grid, null, 2, Double.NaN, new InspectionBuffers(), packed);
        assertThat(none.count()).isEqualTo(valid.count());
        assertThat(none.missing()).isZero();
        for (int k = 0, i = -1; k < none.count(); k++) {
            i = valid.nextIndex(i + 1);
            assertThat(none.indices()[k]).isEqualTo(i);
            assertThat(packed[k]).isEqualTo(tau[i]);
        }

        WaferShape disk = RoundWafer.disk(50);
        float[] packedIn = new float[tau.length];
        Masks in = Masks.of(tau, grid, disk, 3, 20, new InspectionBuffers(), packedIn);
        Mask inside = disk.mask(grid, 3);
        Mask expected = valid.and(inside);
        Mask centre = valid.and(disk.mask(grid, 20));
        assertThat(in.count()).isEqualTo(expected.count());
        assertThat(in.missing()).isEqualTo(inside.count() - expected.count());
        for (int k = 0, i = -1; k < in.count(); k++) {
            i = expected.nextIndex(i + 1);
            assertThat(in.indices()[k]).isEqualTo(i);
            assertThat(packedIn[k]).isEqualTo(tau[i]);
        }
        for (int i = 0; i < tau.length; i++) {
            assertThat(in.centre()[i]).as("centre pixel %d", i).isEqualTo(centre.containsIndex(i));
        }
    }
}
