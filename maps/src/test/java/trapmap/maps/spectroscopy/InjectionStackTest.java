package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.ReadOptions;
import trapmap.maps.io.WriteOptions;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.physics.material.Doping;
import trapmap.shared.error.InvalidValueException;

/** Checks, reading and registration of injection stacks. */
class InjectionStackTest {
    private static final double[] LEVELS = {1e13, 1e14, 1e15};
    private static final InjectionStack.Options ALIGNED = new InjectionStack.Options(false,
            RegistrationOptions.DEFAULTS);

    @TempDir
    Path dir;

    @Test
    void oneLevelIsRefused() {
        List<WaferMap> maps = SyntheticStack.maps(new double[] {1e14}, 0.03, 1);
        assertThatThrownBy(() -> InjectionStack.of(maps, List.of("a.tif"), ALIGNED))
                .isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("at least 2").hasMessageContaining("a.tif");
    }

    @Test
    void equalLevelsAreRefusedNamingTheFilesAndTheUnit() {
        List<WaferMap> maps = SyntheticStack.maps(new double[] {1e14, 1e15, 1e14}, 0.03, 1);
        assertThatThrownBy(() -> InjectionStack.of(maps, SyntheticStack.names(3), ALIGNED))
                .isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("level2.tif").hasMessageContaining("level0.tif")
                .hasMessageContaining("injection_cm3").hasMessageContaining("cm^-3");
    }

    @Test
    void differentDopingThicknessOrWaferAreRefused() {
        List<WaferMap> maps = new ArrayList<>(SyntheticStack.maps(LEVELS, 0.03, 1));
        WaferMap m = maps.get(1);
        maps.set(1, m.withConditions(m.conditions().withDoping(Doping.pType(2e15))));
        assertThatThrownBy(() -> InjectionStack.of(maps, SyntheticStack.names(3), ALIGNED))
                .isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("level1.tif").hasMessageContaining("'doping'").hasMessageContaining("cm^-3");
        maps.set(1, m.withConditions(m.conditions().withThickness(200.0)));
        assertThatThrownBy(() -> InjectionStack.of(maps, SyntheticStack.names(3), ALIGNED))
                .hasMessageContaining("level1.tif").hasMessageContaining("thickness_um").hasMessageContaining("um");
        maps.set(1, new WaferMap(m.raster(), m.grid(), m.quantity(), "w2", m.conditions(), m.provenance()));
        assertThatThrownBy(() -> InjectionStack.of(maps, SyntheticStack.names(3), ALIGNED))
                .hasMessageContaining("level1.tif").hasMessageContaining("'w2'").hasMessageContaining("wafer_id");
        assertThat(InjectionStack.of(maps, SyntheticStack.names(3), new InjectionStack.Options(false,
                RegistrationOptions.DEFAULTS, false)).waferId()).isEqualTo("w1");
        maps.set(1, m.withConditions(m.conditions().withInjection(null)));
        assertThatThrownBy(() -> InjectionStack.of(maps, SyntheticStack.names(3), ALIGNED))
                .hasMessageContaining("level1.tif").hasMessageContaining("injection_cm3")
                .hasMessageContaining("generation_cm3_s");
    }

    @Test
    void multiPageFileWithPageObjectsIsAStack() throws Exception {
        List<WaferMap> maps = new ArrayList<>();
        for (WaferMap m : SyntheticStack.maps(LEVELS, 0.03, 2)) {
            maps.add(m.withConditions(m.conditions().withInjection(null)));
        }
        Path tif = dir.resolve("w1.tif");
        MapFiles.writeAll(maps, tif, WriteOptions.DEFAULTS);
        Files.writeString(dir.resolve("w1.json"), """
                {"conditions": {"doping": "p:1e15"},
                 "pages": [{"label": "low", "injection_cm3": 1e13}, {"label": "mid", "injection_cm3": 1e14},
                           {"label": "high", "injection_cm3": 1e15}]}
                """);
        InjectionStack.Loaded loaded = InjectionStack.read(List.of(tif), ReadOptions.DEFAULTS,
                MeasurementConditions.UNKNOWN);
        InjectionStack stack = InjectionStack.of(loaded, ALIGNED);
        assertThat(stack.size()).isEqualTo(3);
        assertThat(stack.level(1).label()).isEqualTo("mid");
        assertThat(stack.level(2).map().conditions().injectionPerCm3()).isEqualTo(1e15);
        assertThat(stack.level(2).source()).endsWith("w1.tif page 3");
        assertThat(stack.fixedInjection()).isTrue();
    }

    @Test
    void pageCountMismatchIsRefusedNamingTheSidecar() throws Exception {
        List<WaferMap> maps = SyntheticStack.maps(new double[] {1e13, 1e14}, 0.03, 2);
        Path tif = dir.resolve("w1.tif");
        MapFiles.writeAll(maps, tif, WriteOptions.DEFAULTS);
        Files.writeString(dir.resolve("w1.json"), """
                {"pages": [{"label": "a", "injection_cm3": 1e13}, {"label": "b", "injection_cm3": 1e14},
                           {"label": "c", "injection_cm3": 1e15}]}
                """);
        assertThatThrownBy(() -> InjectionStack.read(List.of(tif), ReadOptions.DEFAULTS, null))
                .isInstanceOf(MapFormatException.class)
                .hasMessageContaining("w1.json").hasMessageContaining("pages").hasMessageContaining("3 labels")
                .hasMessageContaining("2 pages");
    }

    @Test
    void displacementOfAPlacementIsMeasuredAtTheCorners() {
        trapmap.maps.raster.PixelGrid g = trapmap.maps.raster.PixelGrid.centred(101, 101, 0.5);
        assertThat(InjectionStack.largestDisplacementPx(trapmap.maps.compare.Registration.explicit(false, false, 0,
                0.1, 0), g)).isCloseTo(0.2, within(1e-9));
        // a turn of 0.1 degree moves the corners (35.36 mm from the centre) by the chord 2 r sin(θ/2)
        double r = Math.hypot(25, 25);
        assertThat(InjectionStack.largestDisplacementPx(trapmap.maps.compare.Registration.explicit(false, false, 0.1,
                0, 0), g)).isCloseTo(2 * r * Math.sin(Math.toRadians(0.1) / 2) / 0.5, within(1e-9));
    }

    @Test
    void shiftedLevelIsRegisteredAndItsShiftReported() {
        List<WaferMap> maps = new ArrayList<>(SyntheticStack.maps(LEVELS, 0.01, 3));
        WaferMap m = maps.get(2);
        int n = SyntheticStack.SIZE;
        float[] s = m.raster().samples();
        float[] shifted = new float[s.length];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                int sx = x - 3;
                shifted[y * n + x] = sx >= 0 ? s[y * n + sx] : s[y * n];
            }
        }
        maps.set(2, new WaferMap(FloatRaster.wrap(n, n, shifted), m.grid(), m.quantity(), m.waferId(),
                m.conditions(), m.provenance()));
        InjectionStack stack = InjectionStack.of(maps, SyntheticStack.names(3), InjectionStack.Options.DEFAULTS);
        assertThat(stack.level(0).registration()).isNull();
        assertThat(Math.abs(stack.level(2).shiftMm()[0])).isCloseTo(3 * SyntheticStack.PITCH_MM, within(0.3));
        assertThat(Math.abs(stack.level(2).shiftMm()[1])).isLessThan(0.3);
        assertThat(Math.abs(stack.level(1).shiftMm()[0])).isLessThan(0.3);
        // the unshifted level is kept as measured; the shifted one is resampled
        assertThat(stack.level(1).resampled()).isFalse();
        assertThat(stack.level(1).map()).isSameAs(maps.get(1));
        assertThat(stack.level(2).resampled()).isTrue();
        // placed back: the shifted level's pixel (24, 24) holds about its original value again
        float back = stack.level(2).map().raster().get(24, 24);
        assertThat((double) back).isCloseTo(s[24 * n + 24], within(0.05 * Math.abs(s[24 * n + 24])));
    }

    @Test
    void aConditionTheConversionNeedsIsNamedWithTheLevelsFile() {
        List<WaferMap> maps = new ArrayList<>();
        for (WaferMap m : SyntheticStack.maps(LEVELS, 0.03, 4)) {
            maps.add(m.withConditions(m.conditions().withThickness(null).withSrv(10.0)));
        }
        InjectionStack stack = InjectionStack.of(maps, SyntheticStack.names(3), ALIGNED);
        assertThatThrownBy(() -> StackLifetimes.of(stack, trapmap.physics.defect.DefectLibrary.byId("fe-i"),
                trapmap.maps.process.ConversionSettings.DEFAULTS, 1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("level0.tif").hasMessageContaining("thickness").hasMessageContaining("µm");
    }
}
