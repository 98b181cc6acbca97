package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Map;
import java.util.Random;
import org.assertj.core.data.Percentage;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.ConversionOutput;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.pl.PlCalibration;
import trapmap.shared.error.InvalidValueException;

class MapConversionTest {
    private static final MeasurementConditions CONDITIONS = new MeasurementConditions(Doping.pType(1e16), 180.0,
            300.0, 1e14, null, 10.0, null, null, Map.of());

    private static WaferMap lifetimeMap(int w, int h, long seed, MeasurementConditions c) {
        Random r = new Random(seed);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) Math.pow(10, r.nextDouble() * 3);
        }
        s[0] = Float.NaN;
        s[1] = -3;
        return new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 0.5), Quantity.EFFECTIVE_LIFETIME,
                "w1", c, Provenance.of("test"));
    }

    @Test
    void everyPixelEqualsTheSinglePixelConversion() {
        WaferMap map = lifetimeMap(7, 3, 11, CONDITIONS);
        MapConversion.Result result = MapConversion.convert(map, DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS.withReferenceInjection(1e15), 2);
        TrapDensityConverter single = new TrapDensityConverter(
                MapConversion.physicsConditions(CONDITIONS, ConversionSettings.DEFAULTS.withReferenceInjection(1e15)),
                DefectLibrary.byId("fe-i"));
        float[] tau = map.raster().samples();
        for (int i = 2; i < tau.length; i++) {
            PixelResult p = single.convert(tau[i]);
            assertThat(result.get(Quantity.TRAP_DENSITY).raster().samples()[i])
                    .isEqualTo((float) p.trapDensityPerCm3());
            assertThat(result.get(Quantity.OCCUPANCY).raster().samples()[i]).isEqualTo((float) p.occupancy());
            assertThat(result.get(Quantity.LIFETIME_AT_REFERENCE).raster().samples()[i])
                    .isEqualTo((float) p.lifetimeAtReferenceUs());
            assertThat(result.get(Quantity.STATUS).raster().samples()[i]).isEqualTo(p.status().code());
        }
        assertThat(result.get(Quantity.STATUS).raster().samples()[0]).isEqualTo(PixelStatus.NO_DATA.code());
        assertThat(result.get(Quantity.STATUS).raster().samples()[1]).isEqualTo(PixelStatus.INVALID.code());
        assertThat(result.get(Quantity.TRAP_DENSITY).provenance().steps()).hasSize(1);
        assertThat(result.get(Quantity.TRAP_DENSITY).provenance().steps().get(0).parameters())
                .containsEntry("defect", "fe-i");
    }

    @Test
    void rowByRowOnSeveralThreadsGivesThePlanesAndCountsOfOneCallOverTheWholeRaster() {
        // lifetimes of every kind: no data, <= 0, below the floor, infinite, ordinary; 37 rows (not a whole number
        // of the rows a thread takes at a time)
        int w = 53;
        int h = 37;
        Random r = new Random(3);
        float[] tau = new float[w * h];
        for (int i = 0; i < tau.length; i++) {
            tau[i] = switch (r.nextInt(9)) {
                case 0 -> Float.NaN;
                case 1 -> -r.nextFloat();
                case 2 -> 4e-4f;
                case 3 -> Float.POSITIVE_INFINITY;
                default -> (float) Math.pow(10, r.nextDouble() * 4 - 1);
            };
        }
        ConversionSettings settings = ConversionSettings.DEFAULTS.withReferenceInjection(1e15);
        TrapDensityConverter k = new TrapDensityConverter(MapConversion.physicsConditions(CONDITIONS, settings),
                DefectLibrary.byId("fe-i"));
        int n = tau.length;
        ConversionOutput expected = new ConversionOutput(new float[n], new float[n], new float[n], new float[n],
                new float[n], new float[n], new float[n], new byte[n], new byte[n]);
        TrapDensityConverter.Tally whole = k.convert(tau, w, expected, 1);
        for (int threads : new int[] {1, 2, 5}) {
            ConversionOutput got = new ConversionOutput(new float[n], new float[n], new float[n], new float[n],
                    new float[n], new float[n], new float[n], new byte[n], new byte[n]);
            TrapDensityConverter.Tally t = MapConversion.byRows(k, tau, w, got, threads);
            assertThat(got.trapDensity).isEqualTo(expected.trapDensity);
            assertThat(got.trapDensityMin).isEqualTo(expected.trapDensityMin);
            assertThat(got.trapDensityMax).isEqualTo(expected.trapDensityMax);
            assertThat(got.occupancy).isEqualTo(expected.occupancy);
            assertThat(got.srhLifetimeUs).isEqualTo(expected.srhLifetimeUs);
            assertThat(got.injection).isEqualTo(expected.injection);
            assertThat(got.lifetimeAtReferenceUs).isEqualTo(expected.lifetimeAtReferenceUs);
            assertThat(got.status).isEqualTo(expected.status);
            assertThat(got.warnings).isEqualTo(expected.warnings);
            assertThat(t.statusCounts()).isEqualTo(whole.statusCounts());
            assertThat(t.warningPixels()).isEqualTo(whole.warningPixels());
            assertThat(t.warningBits()).isEqualTo(whole.warningBits());
            assertThat(t.belowFloor()).isEqualTo(whole.belowFloor());
            assertThat(t.belowFloorLikeSeconds()).isEqualTo(whole.belowFloorLikeSeconds());
        }
        assertThat(whole.statusCounts()[PixelStatus.NO_DATA.code()]).isPositive();
        assertThat(whole.statusCounts()[PixelStatus.INVALID.code()]).isPositive();
        assertThat(whole.statusCounts()[PixelStatus.OK.code()]).isPositive();
        assertThatThrownBy(() -> MapConversion.byRows(k, new float[10], 3, expected, 2))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("whole number of rows");
    }

    @Test
    void onlyTheRequestedQuantitiesAreMadeAndTheStatusCodesAreKept() {
        WaferMap map = lifetimeMap(9, 4, 5, CONDITIONS);
        MapConversion.Result all = MapConversion.convert(map, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS,
                2);
        MapConversion.Result one = MapConversion.convert(map, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS,
                java.util.EnumSet.of(Quantity.TRAP_DENSITY), 2);
        assertThat(one.maps()).containsOnlyKeys(Quantity.TRAP_DENSITY);
        assertThat(one.get(Quantity.TRAP_DENSITY).raster().samples())
                .containsExactly(all.get(Quantity.TRAP_DENSITY).raster().samples());
        assertThatThrownBy(() -> one.get(Quantity.STATUS)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("status");
        float[] status = all.get(Quantity.STATUS).raster().samples();
        int[] counts = new int[PixelStatus.values().length];
        for (int i = 0; i < status.length; i++) {
            assertThat(one.statusCodes()[i]).isEqualTo((byte) status[i]);
            counts[(int) status[i]]++;
        }
        assertThat(one.statusCounts()).containsExactly(counts);
        assertThat(one.statusMask(PixelStatus.INVALID).count()).isEqualTo(counts[PixelStatus.INVALID.code()]);
        assertThat(one.okTrapDensity().raster().samples()).containsExactly(all.okTrapDensity().raster().samples());
        assertThat(one.warnings()).isEqualTo(all.warnings());
        // Without a reference injection the lifetime at reference cannot be made: nothing left to convert to.
        assertThatThrownBy(() -> MapConversion.convert(map, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS,
                java.util.EnumSet.of(Quantity.LIFETIME_AT_REFERENCE), 1))
                .isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void surfaceLimitedWarningCountsItsPixelsAsTheSinglePixelConversionFlagsThem() {
        // SRV 1000 cm/s on 180 µm: τ_surf ≈ 9 µs, so the longer lifetimes of the 1–1000 µs map are surface-limited
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, 300.0, 1e14, null, 1000.0,
                null, null, Map.of());
        WaferMap map = lifetimeMap(40, 30, 7, c);
        MapConversion.Result result = MapConversion.convert(map, DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS, 2);
        TrapDensityConverter single = new TrapDensityConverter(
                MapConversion.physicsConditions(c, ConversionSettings.DEFAULTS), DefectLibrary.byId("fe-i"));
        int expected = 0;
        int converted = 0;
        float[] tau = map.raster().samples();
        for (int i = 2; i < tau.length; i++) {
            PixelResult p = single.convert(tau[i]);
            if (p.status() == PixelStatus.OK || p.status() == PixelStatus.BELOW_LIMIT) {
                converted++;
            }
            if (p.warnings().contains(ConversionWarning.SURFACE_LIMITED)) {
                expected++;
            }
        }
        assertThat(expected).as("some, not all, pixels surface-limited").isBetween(1, tau.length - 3);
        assertThat(result.warnings()).contains(ConversionWarning.SURFACE_LIMITED);
        assertThat(result.pixelsWith(ConversionWarning.SURFACE_LIMITED)).isEqualTo(expected);
        assertThat(result.convertedPixels()).isEqualTo(converted).isEqualTo(tau.length - 2);
        assertThat(result.shareWith(ConversionWarning.SURFACE_LIMITED)).isEqualTo((double) expected / converted);
        String note = String.format(java.util.Locale.ROOT, "%s (%d px, %s %% of the %d converted pixels)",
                ConversionWarning.SURFACE_LIMITED.message(), expected,
                MapConversion.Result.percent(100.0 * expected / converted), converted);
        assertThat(result.warningNotes()).contains(note);
        assertThat(MapConversion.Result.percent(100.0 * 22 / 68224)).isEqualTo("0.032");
        assertThat(MapConversion.Result.percent(57.25)).isEqualTo("57.3");
        assertThat(MapConversion.Result.percent(0)).isEqualTo("0.0");
    }

    @Test
    void plCountsAreCalibratedIntoLifetimeFirst() {
        // Steady state: τ_eff = Δn/G with Δn from I = A·Δn·(Δn + N_dop) (Trupke et al., APL 89, 044107 (2006);
        // docs/check-values.md R-PL-4).
        PlCalibration cal = PlCalibration.fromReference(8000, 50, 1e19, 1e16);
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), null, null, null, 1e19, null, null,
                cal.constant(), Map.of());
        float[] counts = {8000, 12000, 0, Float.NaN};
        WaferMap pl = new WaferMap(FloatRaster.wrap(2, 2, counts), PixelGrid.centred(2, 2, 1), Quantity.PL_COUNTS,
                "pl", c, Provenance.of("test"));
        WaferMap tau = MapConversion.lifetimeFromPl(pl);
        assertThat((double) tau.raster().get(0, 0)).isCloseTo(50, Percentage.withPercentage(1e-4));
        // by hand: the reference gives Δn = G·τ = 5e14 cm^-3 and A = 8000/(5e14·1.05e16) = 1.5238e-27; 12000 counts
        // give Δn(Δn + 1e16) = 7.875e30, Δn = (−1e16 + sqrt(1e32 + 3.15e31))/2 = 7.33672e14 cm^-3, τ = Δn/G
        // (computed, docs/check-values.md R-PL-5)
        assertThat((double) tau.raster().get(1, 0)).isCloseTo(73.3672, Percentage.withPercentage(1e-4));
        assertThat(tau.raster().get(1, 1)).isNaN();
        MapConversion.Result r = MapConversion.convert(pl, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 1);
        assertThat(r.get(Quantity.INJECTION).raster().get(0, 0)).isCloseTo(5e14f, Percentage.withPercentage(1e-4));
    }

    @Test
    void missingConditionsNameTheField() {
        MeasurementConditions noDoping = CONDITIONS.withDoping(null);
        assertThatThrownBy(() -> MapConversion.convert(lifetimeMap(2, 2, 1, noDoping), DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("doping");
        MeasurementConditions both = CONDITIONS.withGeneration(1e19);
        assertThatThrownBy(() -> MapConversion.physicsConditions(both, ConversionSettings.DEFAULTS))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("generation");
        MeasurementConditions srvOnly = CONDITIONS.withThickness(null);
        assertThatThrownBy(() -> MapConversion.physicsConditions(srvOnly, ConversionSettings.DEFAULTS))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("thickness");
        assertThatThrownBy(() -> MapConversion.convert(lifetimeMap(2, 2, 1, CONDITIONS), DefectLibrary.byId("bo-lid"),
                ConversionSettings.DEFAULTS)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("normalised density");
    }

    @Test
    void aWarmUpWithSeveralGuessesBesideTheConversionChangesNothingAndStops() throws Exception {
        WaferMap map = lifetimeMap(64, 48, 5, CONDITIONS);
        java.util.Set<Quantity> wanted = java.util.EnumSet.of(Quantity.TRAP_DENSITY);
        MapConversion.Result cold = MapConversion.convert(map, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS,
                wanted, 2);
        MeasurementConditions generation = CONDITIONS.withInjection(null).withGeneration(1e19);
        MapConversion.Result warm;
        // an unusable guess (no doping) is left out; the others are converted in turn
        try (trapmap.shared.progress.HeadStart h = MapConversion.warmUp(java.util.List.of(MeasurementConditions.UNKNOWN,
                generation, CONDITIONS, CONDITIONS.withSrv(null)), DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS, wanted)) {
            warm = MapConversion.convert(map, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, wanted, 2);
        }
        assertThat(warm.get(Quantity.TRAP_DENSITY).raster().samples())
                .isEqualTo(cold.get(Quantity.TRAP_DENSITY).raster().samples());
        assertThat(warm.statusCodes()).isEqualTo(cold.statusCodes());
        assertThat(warm.statusCounts()).isEqualTo(cold.statusCounts());
        assertThat(warm.warningPixels()).isEqualTo(cold.warningPixels());
        WarmUpThreads.assertAllEnd();
    }
}
