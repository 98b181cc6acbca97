package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.Ranking;

/**
 * Levels given as generation rates: every pixel has its own Δn = G·τ_eff per level, and its curve is ranked at those
 * levels (a ranking prepared per curve).
 */
class GenerationStackTest {
    private static final double[] G = {1e17, 1e18, 1e19};

    @Test
    void eachPixelIsRankedAtItsOwnInjectionLevels() {
        List<WaferMap> maps = new ArrayList<>();
        List<WaferMap> fixed = SyntheticStack.maps(new double[] {1e13, 1e14, 1e15}, 0.03, 9);
        for (int i = 0; i < G.length; i++) {
            WaferMap m = fixed.get(i);
            maps.add(m.withConditions(m.conditions().withInjection(null).withGeneration(G[i])));
        }
        InjectionStack stack = InjectionStack.of(maps, SyntheticStack.names(3),
                new InjectionStack.Options(false, RegistrationOptions.DEFAULTS));
        assertThat(stack.fixedInjection()).isFalse();
        StackLifetimes lt = StackLifetimes.of(stack, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 1);
        assertThat(lt.fixedLevelsCm3()).isNull();
        IdentificationResult one = DefectIdentification.identify(lt, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withThreads(1));
        IdentificationResult two = DefectIdentification.identify(lt, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withThreads(2));
        assertThat(two.chiSquared()).containsExactly(one.chiSquared());
        assertThat(two.bestIndex()).containsExactly(one.bestIndex());
        int w = SyntheticStack.SIZE;
        for (int[] xy : new int[][] {{15, 15}, {33, 15}, {22, 31}}) {
            int p = xy[1] * w + xy[0];
            double[] dn = new double[3];
            double[] tau = new double[3];
            for (int i = 0; i < 3; i++) {
                double eff = maps.get(i).raster().get(xy[0], xy[1]);
                assertThat(lt.injectionCm3(i, p)).isCloseTo(G[i] * eff * 1e-6, within(1e-5 * G[i] * eff * 1e-6));
                dn[i] = lt.injectionCm3(i, p);
                tau[i] = lt.tauSrhUs(i, p) * 1e-6;
            }
            assertThat(one.curveAt(xy[0], xy[1]).injectionPerCm3()).containsExactly(dn);
            Ranking r = new LibraryRanking(one.rankedCandidates(), lt.doping(), lt.silicon(), dn).rank(tau);
            assertThat(one.status()[p]).isEqualTo((float) r.status().ordinal());
            assertThat(one.chiSquared()[p]).isEqualTo((float) r.hint().best().chiSquared());
            assertThat(one.rankingAt(xy[0], xy[1]).hint().best().id()).isEqualTo(r.hint().best().id());
        }
        IdentificationResult blocks = DefectIdentification.identify(lt, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withBlock(2).withThreads(1));
        double mean = 0;
        for (int y = 14; y < 16; y++) {
            for (int x = 14; x < 16; x++) {
                mean += lt.injectionCm3(1, y * w + x) / 4;
            }
        }
        assertThat(blocks.curveAt(15, 15).injectionPerCm3()[1]).isCloseTo(mean, within(1e-9 * mean));
    }
}
