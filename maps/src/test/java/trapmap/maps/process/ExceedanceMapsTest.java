package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Map;
import java.util.Random;
import org.assertj.core.data.Offset;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;
import trapmap.physics.uncertainty.UncertaintySampler;
import trapmap.shared.error.InvalidValueException;

/**
 * {@link ExceedanceMaps}: every pixel equals the physics model's value, maps on several threads equal one thread's,
 * the confidence lifetime is the probability's level set, and the map agrees with a brute-force per-pixel Monte
 * Carlo through the converter.
 */
class ExceedanceMapsTest {
    /** p 1e16 cm⁻³, 180 µm, 300 K, Δn 1e14 cm⁻³, S = 10 cm/s. */
    private static final MeasurementConditions CONDITIONS = new MeasurementConditions(Doping.pType(1e16), 180.0,
            300.0, 1e14, null, 10.0, null, null, Map.of());
    private static final Defect FE_I = DefectLibrary.byId("fe-i");
    private static final double THRESHOLD = 1e11;
    private static ExceedanceMaps maps;

    @BeforeAll
    static void prepare() {
        maps = ExceedanceMaps.prepare(CONDITIONS, FE_I, ConversionSettings.DEFAULTS, ConditionUncertainty.DEFAULTS,
                THRESHOLD, 10_000, 1);
    }

    /** Lifetimes 20 µs … 2 ms (log-uniform), with a NaN, a negative and a sub-nanosecond pixel. */
    private static WaferMap lifetimeMap(int w, int h, long seed) {
        Random r = new Random(seed);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) (20 * Math.pow(10, r.nextDouble() * 2));
        }
        s[0] = Float.NaN;
        s[1] = -3;
        s[2] = 1e-4f;
        return new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 0.5), Quantity.EFFECTIVE_LIFETIME,
                "w1", CONDITIONS, Provenance.of("test"));
    }

    private static Map<String, String> last(WaferMap m) {
        var steps = m.provenance().steps();
        return steps.get(steps.size() - 1).parameters();
    }

    @Test
    void probabilityMapEqualsThePhysicsModelPixelByPixel() {
        WaferMap map = lifetimeMap(33, 17, 3);
        ExceedanceModel physics = ExceedanceModel.prepare(
                MapConversion.physicsConditions(CONDITIONS, ConversionSettings.DEFAULTS), FE_I,
                ConversionSettings.DEFAULTS.physics(), ConditionUncertainty.DEFAULTS, THRESHOLD, 10_000, 1);
        WaferMap p = maps.probabilityMap(map, 1);
        assertThat(p.quantity()).isEqualTo(Quantity.EXCEEDANCE_PROBABILITY);
        float[] tau = map.raster().samples();
        float[] out = p.raster().samples();
        int between = 0;
        for (int i = 0; i < tau.length; i++) {
            double expected = physics.probability(tau[i]);
            if (Double.isNaN(expected)) {
                assertThat(out[i]).as("pixel %d", i).isNaN();
            } else {
                assertThat(out[i]).as("pixel %d", i).isEqualTo((float) expected);
                assertThat((double) out[i]).isEqualTo((float) maps.probabilityAt(tau[i]));
                between += expected > 0.05 && expected < 0.95 ? 1 : 0;
            }
        }
        assertThat(out[0]).isNaN();
        assertThat(out[1]).isNaN();
        assertThat(out[2]).isNaN();
        assertThat(between).as("pixels inside the uncertain band").isGreaterThan(20);
        assertThat(last(p)).containsEntry("samples", "10000")
                .containsEntry("seed", "1").containsEntry("threshold_cm3", "1.0E11");
    }

    @Test
    void mapsOnSeveralThreadsEqualOneThreads() {
        WaferMap map = lifetimeMap(64, 61, 5);
        assertThat(maps.probabilityMap(map, 4).raster().samples())
                .containsExactly(maps.probabilityMap(map, 1).raster().samples());
        assertThat(maps.quantileMap(map, 0.95, 3).raster().samples())
                .containsExactly(maps.quantileMap(map, 0.95, 1).raster().samples());
    }

    @Test
    void quantileMapEqualsTheOnePassQuantile() {
        WaferMap map = lifetimeMap(12, 9, 7);
        for (double q : new double[] {0.05, 0.5, 0.95}) {
            WaferMap m = maps.quantileMap(map, q, 2);
            assertThat(m.quantity()).isEqualTo(Quantity.DENSITY_QUANTILE);
            assertThat(last(m))
                    .containsEntry("quantile", Double.toString(q));
            float[] tau = map.raster().samples();
            float[] out = m.raster().samples();
            for (int i = 0; i < tau.length; i++) {
                double expected = maps.quantileAt(tau[i], q);
                if (Double.isNaN(expected)) {
                    assertThat(out[i]).isNaN();
                } else {
                    assertThat(out[i]).as("q %s pixel %d", q, i).isEqualTo((float) expected);
                }
            }
        }
        // quantiles are ordered and bracket the nominal conversion's density at a mid-band pixel
        TrapDensityConverter nominal = new TrapDensityConverter(
                MapConversion.physicsConditions(CONDITIONS, ConversionSettings.DEFAULTS), FE_I);
        PixelResult r = nominal.convert(150);
        assertThat(r.status()).isEqualTo(PixelStatus.OK);
        assertThat(maps.quantileAt(150, 0.05)).isLessThan(r.trapDensityPerCm3());
        assertThat(maps.quantileAt(150, 0.95)).isGreaterThan(r.trapDensityPerCm3());
    }

    /** P(τ) ≥ c exactly when τ &lt; τ_c, checked on both sides of τ_c (next float up and down). */
    @Test
    void confidentLifetimeIsTheLevelSetOfTheProbability() {
        for (double c : new double[] {0.5, 0.9, 0.95, 0.99, 1.0, 1e-4}) {
            double tauC = maps.confidentLifetimeUs(c);
            float below = Math.nextDown((float) tauC);
            while (below >= tauC) {
                below = Math.nextDown(below);
            }
            float atOrAbove = (float) tauC >= tauC ? (float) tauC : Math.nextUp((float) tauC);
            assertThat(maps.probabilityAt(below)).as("c %s below", c).isGreaterThanOrEqualTo(c);
            assertThat(maps.probabilityAt(atOrAbove)).as("c %s above", c).isLessThan(c);
        }
        assertThatThrownBy(() -> maps.confidentLifetimeUs(0)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("confidence");
    }

    /**
     * Independent brute force on a 3 x 3 map: each pixel with 10⁴ fresh samples of its own seed, each converted
     * through {@link TrapDensityConverter} (exceeds when the status is OK and N_t &gt; N*): the map agrees within 0.01
     * at every pixel.
     */
    @Test
    void agreesWithBruteForceMonteCarloWithinOneHundredth() {
        float[] tau = {60, 80, 100, 120, 150, 180, 220, 280, 400};
        WaferMap map = new WaferMap(FloatRaster.wrap(3, 3, tau), PixelGrid.centred(3, 3, 0.5),
                Quantity.EFFECTIVE_LIFETIME, "w1", CONDITIONS, Provenance.of("test"));
        float[] p = maps.probabilityMap(map, 2).raster().samples();
        Conditions c = MapConversion.physicsConditions(CONDITIONS, ConversionSettings.DEFAULTS);
        int n = 10_000;
        int between = 0;
        for (int i = 0; i < tau.length; i++) {
            UncertaintySampler sampler = new UncertaintySampler(c, FE_I, ConversionSettings.DEFAULTS.physics(),
                    ConditionUncertainty.DEFAULTS, 500 + i);
            int count = 0;
            for (int s = 0; s < n; s++) {
                UncertaintySampler.Sample draw = sampler.next();
                PixelResult r = new TrapDensityConverter(draw.conditions(), draw.defect())
                        .convert(tau[i] / draw.lifetimeFactor());
                count += r.status() == PixelStatus.OK && r.trapDensityPerCm3() > THRESHOLD ? 1 : 0;
            }
            double brute = (double) count / n;
            assertThat((double) p[i]).as("pixel %d at %s us", i, tau[i]).isCloseTo(brute, Offset.offset(0.01));
            between += brute > 0.05 && brute < 0.95 ? 1 : 0;
        }
        assertThat(between).as("pixels inside the uncertain band").isGreaterThanOrEqualTo(3);
    }

    @Test
    void refusesOtherQuantitiesAndBadLevels() {
        WaferMap map = lifetimeMap(4, 4, 1);
        WaferMap density = map.derive(map.raster(), Quantity.TRAP_DENSITY, trapmap.maps.model.ProcessingStep.of("test"));
        assertThatThrownBy(() -> maps.probabilityMap(density, 1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("trap-density");
        assertThatThrownBy(() -> maps.quantileMap(map, 1.0, 1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("quantile");
        assertThatThrownBy(() -> ExceedanceMaps.prepare(CONDITIONS.withDoping(null), FE_I, ConversionSettings.DEFAULTS,
                ConditionUncertainty.DEFAULTS, THRESHOLD, 1000, 1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("doping");
    }
}
