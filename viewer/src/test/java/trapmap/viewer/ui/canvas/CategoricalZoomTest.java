package trapmap.viewer.ui.canvas;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.raster.BlockMeanPyramid;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.physics.defect.DefectLibrary;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.model.ConditionOverrides;
import trapmap.viewer.model.StackIdentification;
import trapmap.viewer.model.SyntheticLevels;

/** A zoomed-out map of category codes shows each block's most common code, never a mean between codes. */
class CategoricalZoomTest {
    private static final DisplayStyle STYLE = new DisplayStyle(ColourMap.BLUE_YELLOW, false, 0, 1);

    @Test
    void everyIdentificationLayerPicksThePyramidItsQuantityAsksFor() {
        List<WaferMap> levels = SyntheticLevels.maps(new double[] {1e13, 1e14, 1e15}, 0.01, 7, "w1");
        List<StackIdentification.Input> in = levels.stream()
                .map(m -> StackIdentification.open("level.tif", m, ConditionOverrides.NONE)).toList();
        IdentificationResult r = StackIdentification.run(new StackIdentification.Request(in,
                ConversionSettings.DEFAULTS, DefectLibrary.all(), DefectIdentification.Options.DEFAULTS.withBlock(2)
                        .withNoise(0.01).withThreads(2), false), (done, total, message) -> { });
        MapCanvas c = new MapCanvas();
        c.setSize(200, 200);
        int categorical = 0;
        for (StackIdentification.Layer l : StackIdentification.Layer.values()) {
            c.setMap(StackIdentification.displayMap(l, r));
            c.setStyle(STYLE, StackIdentification.categories(l, r));
            c.awaitPyramid();
            assertThat(c.pyramid().rule()).as(l.name()).isEqualTo(l.categorical()
                    ? BlockMeanPyramid.Rule.MOST_COMMON : BlockMeanPyramid.Rule.EXACT_MEAN);
            categorical += l.categorical() ? 1 : 0;
        }
        assertThat(categorical).isEqualTo(4); // best, runner-up, status, regions
    }

    /** A 256×192 map of blobs of codes 1, 2, 3 and −1 with scattered pixels of other codes and no data. */
    private static float[] codes() {
        int w = 256;
        int h = 192;
        float[] s = new float[w * h];
        SplittableRandom rnd = new SplittableRandom(3);
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                float v = x < 100 ? 1 : y < 90 ? 2 : x < 200 ? 3 : -1;
                double u = rnd.nextDouble();
                s[y * w + x] = u < 0.1 ? Float.NaN : u < 0.35 ? new float[] {1, 2, 3, -1}[rnd.nextInt(4)] : v;
            }
        }
        return s;
    }

    private static Set<Integer> zoomedOutColours(Quantity q, Categories cats) {
        WaferMap m = new WaferMap(FloatRaster.wrap(256, 192, codes()), PixelGrid.centred(256, 192, 0.5), q, "w",
                MeasurementConditions.UNKNOWN, Provenance.of("synthetic"));
        MapCanvas c = new MapCanvas();
        c.setSize(400, 300);
        c.setMap(m);
        c.setStyle(STYLE, cats);
        c.awaitPyramid();
        c.fit();
        c.viewport().set(0.2, 128, 96); // 5 map pixels per screen pixel: level 2 of the pyramid
        assertThat(MapCanvas.levelFor(0.2, c.pyramid().levelCount())).isEqualTo(2);
        BufferedImage img = new BufferedImage(400, 300, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        c.paint(g);
        g.dispose();
        // the screen pixels wholly on the map (the scale bar and other overlays lie outside it)
        int x0 = (int) Math.ceil(c.screenX(0)) + 1;
        int x1 = (int) Math.floor(c.screenX(256)) - 1;
        int y0 = (int) Math.ceil(c.screenY(0)) + 1;
        int y1 = (int) Math.floor(c.screenY(192)) - 1;
        assertThat(x1 - x0).isGreaterThan(40);
        Set<Integer> seen = new HashSet<>();
        for (int rgb : img.getRGB(x0, y0, x1 - x0, y1 - y0, null, 0, x1 - x0)) {
            seen.add(rgb & 0xFFFFFF);
        }
        return seen;
    }

    @Test
    void aZoomedOutDefectIndexMapIsPaintedOnlyInItsCategoriesColours() {
        Categories cats = new Categories(List.of(new Categories.Category(1, "1 a", Categories.qualitative(0)),
                new Categories.Category(2, "2 b", Categories.qualitative(1)),
                new Categories.Category(3, "3 c", Categories.qualitative(2)),
                new Categories.Category(-1, "no single defect", Categories.UNDECIDED_RGB)));
        Set<Integer> allowed = new HashSet<>();
        cats.entries().forEach(e -> allowed.add(e.rgb()));
        Set<Integer> seen = zoomedOutColours(Quantity.DEFECT_INDEX, cats);
        assertThat(allowed).containsAll(seen);
        assertThat(seen).hasSize(4);
        // the same samples as a continuous quantity are averaged: the blocks show the colour of no category
        assertThat(zoomedOutColours(Quantity.EFFECTIVE_LIFETIME, cats)).contains(Categories.MIXED_RGB);
    }
}
