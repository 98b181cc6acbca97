package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;

/** The one-pass {@link EvaluatedArea} against the separate mask passes and {@link InvalidArea#of} it replaces. */
class EvaluatedAreaMaskTest {
    /** Values with every cause: NaN, ±∞, 0, −0, negative, under the 1 ns floor, usable. */
    private static float value(Random r) {
        return switch (r.nextInt(10)) {
            case 0 -> Float.NaN;
            case 1 -> r.nextBoolean() ? Float.POSITIVE_INFINITY : Float.NEGATIVE_INFINITY;
            case 2 -> r.nextBoolean() ? 0f : -0f;
            case 3 -> -r.nextFloat() * 5;
            case 4 -> r.nextFloat() * 2e-3f;
            default -> 1 + r.nextFloat() * 500;
        };
    }

    private static FloatRaster raster(Random r, int w, int h) {
        float[] v = new float[w * h];
        for (int i = 0; i < v.length; i++) {
            v[i] = value(r);
        }
        return FloatRaster.wrap(w, h, v);
    }

    private static Mask statusMask(byte[] status, int w, int h, PixelStatus s) {
        return Mask.of(w, h, i -> status[i] == s.code());
    }

    /** What {@code trapmap stats} computed pass by pass: the mask, the evaluated and below-limit counts, the area. */
    private static void assertSameAsSeparatePasses(FloatRaster values, FloatRaster measured, Mask area, byte[] status,
                                                   boolean lifetimeFloor) {
        int w = values.width();
        int h = values.height();
        PixelGrid grid = PixelGrid.centred(w, h, 0.05);
        Mask valid = Mask.valid(values);
        Mask evaluatedArea = area == null ? Mask.valid(measured) : area;
        Mask mask = area == null ? valid : valid.and(area);
        InvalidArea invalid = InvalidArea.of(measured, evaluatedArea, status, lifetimeFloor, grid);
        int evaluated = mask.count();
        int below = 0;
        if (status != null) {
            below = mask.and(statusMask(status, w, h, PixelStatus.BELOW_LIMIT)).count();
            mask = mask.and(statusMask(status, w, h, PixelStatus.OK));
        }

        EvaluatedArea fused = EvaluatedArea.of(values, measured, area, status, lifetimeFloor, grid);
        assertThat(fused.mask().words()).isEqualTo(mask.words());
        assertThat(fused.evaluatedCount()).isEqualTo(evaluated);
        assertThat(fused.belowLimitCount()).isEqualTo(below);
        assertThat(fused.invalid()).isEqualTo(invalid);
    }

    @Test
    void givesTheFiguresOfTheSeparatePassesOnRandomMaps() {
        Random r = new Random(20261205L);
        // one block and many (parallel), sizes that end inside a 64-bit word and inside a block
        int[][] sizes = {{1, 1}, {7, 9}, {64, 3}, {333, 211}, {517, 389}, {1024, 300}};
        for (int[] s : sizes) {
            int w = s[0];
            int h = s[1];
            FloatRaster measured = raster(r, w, h);
            FloatRaster density = raster(r, w, h);
            byte[] status = new byte[w * h];
            for (int i = 0; i < status.length; i++) {
                status[i] = (byte) r.nextInt(PixelStatus.values().length);
            }
            boolean[] inside = new boolean[w * h];
            for (int i = 0; i < inside.length; i++) {
                inside[i] = r.nextInt(5) != 0;
            }
            Mask area = Mask.of(w, h, i -> inside[i]);
            for (boolean floor : new boolean[] {true, false}) {
                assertSameAsSeparatePasses(density, measured, area, status, floor);
                assertSameAsSeparatePasses(density, measured, null, status, floor);
                assertSameAsSeparatePasses(measured, measured, area, null, floor);
                assertSameAsSeparatePasses(measured, measured, null, null, floor);
            }
        }
    }

    @Test
    void givesTheFiguresOfTheSeparatePassesOnMostlyUsableMaps() {
        // whole words of usable pixels (the quick path) beside words with one pixel of some cause
        Random r = new Random(77);
        int w = 611;
        int h = 203;
        float[] measured = new float[w * h];
        float[] density = new float[w * h];
        byte[] status = new byte[w * h];
        for (int i = 0; i < measured.length; i++) {
            boolean odd = r.nextInt(300) == 0;
            measured[i] = odd ? value(r) : 1 + r.nextFloat() * 500;
            density[i] = odd ? value(r) : 1e10f + r.nextFloat() * 1e12f;
            status[i] = odd ? (byte) r.nextInt(PixelStatus.values().length) : PixelStatus.OK.code();
        }
        FloatRaster m = FloatRaster.wrap(w, h, measured);
        FloatRaster d = FloatRaster.wrap(w, h, density);
        Mask area = Mask.of(w, h, i -> (i / w - h / 2) * (i / w - h / 2) + (i % w - w / 2) * (i % w - w / 2) < 90000);
        for (boolean floor : new boolean[] {true, false}) {
            assertSameAsSeparatePasses(d, m, area, status, floor);
            assertSameAsSeparatePasses(d, m, null, status, floor);
            assertSameAsSeparatePasses(m, m, area, null, floor);
            assertSameAsSeparatePasses(m, m, null, null, floor);
        }
    }

    @Test
    void wordsOfOkStatusesStillHaveEachValueChecked() {
        // every status of most 64-pixel words OK (the words read eight statuses at a time), whatever the values hold
        Random r = new Random(5);
        int w = 700;
        int h = 190;
        float[] measured = new float[w * h];
        float[] density = new float[w * h];
        byte[] status = new byte[w * h];
        for (int i = 0; i < measured.length; i++) {
            boolean odd = r.nextInt(20) == 0;
            measured[i] = odd ? value(r) : 1 + r.nextFloat() * 500;
            density[i] = r.nextInt(20) == 0 ? value(r) : 1e10f + r.nextFloat() * 1e12f;
            boolean mixedWord = (i >>> 6) % 7 == 3;
            status[i] = mixedWord && odd ? (byte) r.nextInt(PixelStatus.values().length) : PixelStatus.OK.code();
        }
        status[status.length - 1] = PixelStatus.BELOW_LIMIT.code(); // in the short last word
        status[64 * 9 + 63] = PixelStatus.NO_DATA.code(); // the last status of an otherwise OK word
        status[64 * 12] = PixelStatus.INCONSISTENT.code(); // the first
        FloatRaster m = FloatRaster.wrap(w, h, measured);
        FloatRaster d = FloatRaster.wrap(w, h, density);
        Mask area = Mask.of(w, h, i -> i % w > 40);
        for (boolean floor : new boolean[] {true, false}) {
            assertSameAsSeparatePasses(d, m, area, status, floor);
            assertSameAsSeparatePasses(d, m, null, status, floor);
        }
    }

    @Test
    void countsEachCauseOnceAndKeepsOnlyOkPixels() {
        float[] tau = {Float.NaN, Float.POSITIVE_INFINITY, 0f, -2f, 5e-4f, 50f, 60f, 70f};
        FloatRaster measured = FloatRaster.wrap(tau.length, 1, tau);
        float[] nt = {Float.NaN, Float.NaN, Float.NaN, Float.NaN, Float.NaN, 1e11f, 1e9f, 2e11f};
        byte[] status = {PixelStatus.NO_DATA.code(), PixelStatus.INVALID.code(), PixelStatus.INVALID.code(),
            PixelStatus.INVALID.code(), PixelStatus.INVALID.code(), PixelStatus.OK.code(),
            PixelStatus.BELOW_LIMIT.code(), PixelStatus.OK.code()};
        Mask area = Mask.of(tau.length, 1, i -> i != 7);
        EvaluatedArea e = EvaluatedArea.of(FloatRaster.wrap(tau.length, 1, nt), measured, area, status, true,
                PixelGrid.centred(tau.length, 1, 0.5));
        assertThat(e.evaluatedCount()).isEqualTo(2);
        assertThat(e.belowLimitCount()).isEqualTo(1);
        assertThat(e.mask().count()).isEqualTo(1);
        assertThat(e.mask().containsIndex(5)).isTrue();
        assertThat(e.invalid()).isEqualTo(new InvalidArea(7, 2, 2, 1, 0.25));
    }

    @Test
    void refusesMapsOfOtherSizes() {
        FloatRaster a = FloatRaster.wrap(4, 2, new float[8]);
        FloatRaster b = FloatRaster.wrap(2, 4, new float[8]);
        assertThatThrownBy(() -> EvaluatedArea.of(a, b, null, null, false, PixelGrid.centred(4, 2, 1)))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("does not match");
        assertThatThrownBy(() -> EvaluatedArea.of(a, a, null, new byte[7], false, PixelGrid.centred(4, 2, 1)))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("status codes");
    }
}
