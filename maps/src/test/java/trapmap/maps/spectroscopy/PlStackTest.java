package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.pl.PlCalibration;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.spectroscopy.LibraryRanking;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * A stack of photoluminescence images of one wafer at three excitation intensities (generation rates G), all with one
 * calibration constant A, through the identification engine. The images are made forward with the physics: per
 * pixel the steady state Δn solves Δn = G·τ_eff(Δn) (τ_eff from intrinsic recombination and the planted defects,
 * Shockley &amp; Read 1952; Hall 1952), and the counts are I = A·Δn·(Δn + N_A) (Trupke et al., APL 89, 044107 (2006);
 * check-values R-PL-4), with 0.5 % noise. The engine must take each pixel's Δn back from its counts (through
 * τ_eff = Δn/G, the stack's per-pixel levels under a generation rate) and find the planted defects.
 */
class PlStackTest {
    static final double[] G_CM3_S = {1e16, 1e17, 1e18};
    /** One calibration for every image, counts per cm^-6 (the value a reference of 8000 counts at 50 µs gives). */
    static final double A = PlCalibration.fromReference(8000, 50, 1e19, 1e15).constant();
    static final double NOISE = 0.005;
    static final int FE = 0;
    static final int CR = 1;
    static final int BOTH = 2;
    static final int NONE = 3;

    /** Per level and pixel class (fe-i, cr-i, both, none): the steady-state Δn, cm^-3. */
    static double[][] planted;
    static List<WaferMap> images;
    static StackLifetimes lifetimes;
    static IdentificationResult result;

    @BeforeAll
    static void identify() {
        int n = SyntheticStack.SIZE;
        planted = new double[G_CM3_S.length][4];
        images = new ArrayList<>();
        Random rnd = new Random(77);
        for (int l = 0; l < G_CM3_S.length; l++) {
            MeasurementConditions c = new MeasurementConditions(SyntheticStack.DOPING, 180.0, 300.0, null,
                    G_CM3_S[l], null, null, A, Map.of("excitation", "level " + (l + 1)));
            for (int k = 0; k < 4; k++) {
                planted[l][k] = steadyState(c, G_CM3_S[l], k);
            }
            float[] counts = new float[n * n];
            for (int y = 0; y < n; y++) {
                for (int x = 0; x < n; x++) {
                    double dn = planted[l][pixelClass(x, y)];
                    double i = A * dn * (dn + SyntheticStack.DOPING.densityPerCm3());
                    counts[y * n + x] = SyntheticStack.onWafer(x, y)
                            ? (float) (i * (1 + NOISE * rnd.nextGaussian())) : Float.NaN;
                }
            }
            images.add(new WaferMap(FloatRaster.wrap(n, n, counts), PixelGrid.centred(n, n, SyntheticStack.PITCH_MM),
                    Quantity.PL_COUNTS, "w1", c, Provenance.of("synthetic PL image")));
        }
        InjectionStack stack = InjectionStack.of(images, SyntheticStack.names(3), InjectionStack.Options.DEFAULTS);
        lifetimes = StackLifetimes.of(stack, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 2);
        result = DefectIdentification.identify(lifetimes, DefectLibrary.all(),
                DefectIdentification.Options.DEFAULTS.withNoise(0.01).withThreads(2));
    }

    static int pixelClass(int x, int y) {
        return SyntheticStack.in(SyntheticStack.BOTH_BOX, x, y) ? BOTH : SyntheticStack.in(SyntheticStack.FE_BOX, x, y)
                ? FE : SyntheticStack.in(SyntheticStack.CR_BOX, x, y) ? CR : NONE;
    }

    /** Δn with Δn = G·τ_eff(Δn), by bisection on log Δn (the recombination rate Δn/τ_eff rises with Δn). */
    static double steadyState(MeasurementConditions c, double g, int pixelClass) {
        Conditions pc = MapConversion.physicsConditions(c.withGeneration(null).withInjection(1e14),
                ConversionSettings.DEFAULTS);
        TrapDensityConverter fe = new TrapDensityConverter(pc, DefectLibrary.byId("fe-i"));
        SrhRecombination cr = SrhRecombination.of(DefectLibrary.byId("cr-i"), SyntheticStack.DOPING, pc.silicon());
        double lo = Math.log(1e8);
        double hi = Math.log(1e18);
        for (int it = 0; it < 200; it++) {
            double dn = Math.exp(0.5 * (lo + hi));
            double rateS = 1e6 / fe.lifetimeAtInjectionUs(pixelClass == FE || pixelClass == BOTH
                    ? SyntheticStack.FE_CM3 : 0, dn)
                    + (pixelClass == CR || pixelClass == BOTH ? SyntheticStack.CR_CM3 * cr.ratePerTrapCm3PerS(dn) : 0);
            if (dn * rateS < g) {
                lo = Math.log(dn);
            } else {
                hi = Math.log(dn);
            }
        }
        return Math.exp(0.5 * (lo + hi));
    }

    @Test
    void theStackTakesEachPixelsInjectionFromItsCountsWithTheOneCalibration() {
        assertThat(lifetimes.stack().fixedInjection()).isFalse();
        // registered as identify does: images of one wafer on one grid stay as measured
        for (int l = 1; l < G_CM3_S.length; l++) {
            assertThat(lifetimes.stack().level(l).resampled()).isFalse();
            assertThat(lifetimes.stack().level(l).map()).isSameAs(images.get(l));
        }
        int n = SyntheticStack.SIZE;
        for (int[] xy : new int[][] {{15, 15}, {33, 15}, {22, 31}, {24, 5}}) {
            int p = xy[1] * n + xy[0];
            for (int l = 0; l < G_CM3_S.length; l++) {
                double dn = planted[l][pixelClass(xy[0], xy[1])];
                // the counts carry 0.5 % noise; Δn ∝ I at Δn ≪ N_A, ∝ sqrt(I) at Δn ≫ N_A: within 3 sigma
                assertThat(lifetimes.injectionCm3(l, p)).as("level %d at %s", l, xy[0] + "," + xy[1])
                        .isCloseTo(dn, within(0.015 * dn));
                assertThat(lifetimes.effectiveLifetimeUs(l, p)).isCloseTo(1e6 * dn / G_CM3_S[l],
                        within(0.015 * 1e6 * dn / G_CM3_S[l]));
            }
        }
        // the levels span low to high injection at the defect boxes
        assertThat(planted[0][FE]).isLessThan(0.05 * SyntheticStack.DOPING.densityPerCm3());
        assertThat(planted[2][FE]).isGreaterThan(0.2 * SyntheticStack.DOPING.densityPerCm3());
    }

    @Test
    void thePlantedDefectsAreFoundFromThePlImages() {
        int n = SyntheticStack.SIZE;
        int[] right = new int[3];
        int[] all = new int[3];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                int k = pixelClass(x, y);
                if (k == NONE) {
                    continue;
                }
                int p = y * n + x;
                all[k]++;
                boolean ok = k == BOTH ? result.status()[p] == RankingStatus.NO_SINGLE_DEFECT.ordinal()
                        : result.status()[p] == RankingStatus.OK.ordinal() && result.legendOf((int) result.bestIndex()[p])
                        .defectId().equals(k == FE ? "fe-i" : "cr-i");
                right[k] += ok ? 1 : 0;
            }
        }
        for (int k = 0; k < 3; k++) {
            assertThat(all[k]).isPositive();
            assertThat(right[k]).as("class %d: %d of %d", k, right[k], all[k]).isGreaterThan(9 * all[k] / 10);
        }
    }

    @Test
    void aPixelsRankingIsTheLibraryRankingOfItsCurve() {
        int n = SyntheticStack.SIZE;
        for (int[] xy : new int[][] {{15, 15}, {33, 15}, {22, 31}}) {
            int p = xy[1] * n + xy[0];
            double[] dn = new double[3];
            double[] tau = new double[3];
            double[] u = new double[3];
            for (int l = 0; l < 3; l++) {
                dn[l] = lifetimes.injectionCm3(l, p);
                tau[l] = lifetimes.tauSrhUs(l, p) * 1e-6;
                u[l] = 0.01;
            }
            Ranking r = new LibraryRanking(result.rankedCandidates(), lifetimes.doping(), lifetimes.silicon(), dn)
                    .rank(tau, u);
            assertThat(result.status()[p]).isEqualTo((float) r.status().ordinal());
            assertThat(result.chiSquared()[p]).isEqualTo((float) r.hint().best().chiSquared());
            assertThat(result.bestDensityCm3()[p]).isEqualTo((float) r.hint().best().ntPerCm3());
        }
    }
}
