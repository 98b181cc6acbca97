package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static trapmap.physics.ReferenceSets.assertRelative;

import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.Collectors;
import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.KlaassenMobility;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.IntrinsicLifetime;
import trapmap.physics.recombination.SrhBounds;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.recombination.SurfaceLifetime;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.error.InvalidValueException;

/** Lifetime → trap density conversion: round trips, statuses, bounds and refusals. */
class TrapDensityConverterTest {
    private static final List<Defect> WITH_SIGMA = DefectLibrary.all().stream()
            .filter(Defect::hasAbsoluteCrossSections).collect(Collectors.toList());

    /** Independent forward model: K = τ_SRH·N_t from the textbook SRH expression. */
    private static double lifetimeDensityProduct(Defect d, Doping dop, Silicon si, double dn) {
        Carriers eq = dop.equilibrium(si.intrinsicPerCm3());
        double n1 = d.level().n1PerCm3(si);
        double p1 = d.level().p1PerCm3(si);
        double cn = d.electronCrossSectionCm2() * si.electronVthCmPerS();
        double cp = d.holeCrossSectionCm2() * si.holeVthCmPerS();
        double n0 = eq.electronsPerCm3();
        double p0 = eq.holesPerCm3();
        return ((n0 + n1 + dn) / cp + (p0 + p1 + dn) / cn) / (n0 + p0 + dn);
    }

    private static double surfaceRate(Surface s, Doping dop, Silicon si) {
        if (s.ideal()) {
            return 0;
        }
        double d = KlaassenMobility.minorityDiffusivityCm2PerS(dop, si);
        return 1 / SurfaceLifetime.lifetimeS(s.model(), s.thicknessUm() * 1e-4, s.srvCmPerS(), d);
    }

    // Round trip N_t → τ_eff (SRH + Richter intrinsic + surface) → converter → N_t to 1e-9, over a seeded random grid
    // of (N_t, Δn, doping type/level, defect, surface). Cases where SRH is < 0.1 % of the total rate are skipped
    // (subtracting the other rates there leaves too few digits for 1e-9); at least 2000 cases must remain.
    @Test
    void roundTripFixedInjection() {
        SplittableRandom rnd = new SplittableRandom(1234567L);
        Silicon si = Silicon.at(300);
        int checked = 0;
        for (int i = 0; i < 4000; i++) {
            Defect d = WITH_SIGMA.get(rnd.nextInt(WITH_SIGMA.size()));
            double level = Math.pow(10, rnd.nextDouble(13, 17.5));
            Doping dop = rnd.nextBoolean() ? Doping.pType(level) : Doping.nType(level);
            double dn = Math.pow(10, rnd.nextDouble(9, 17));
            double nt = Math.pow(10, rnd.nextDouble(9, 14));
            Surface surface = rnd.nextBoolean() ? Surface.IDEAL
                    : new Surface(rnd.nextDouble(100, 300), Math.pow(10, rnd.nextDouble(0, 3)),
                            rnd.nextBoolean() ? SurfaceModel.SPROUL : SurfaceModel.EXACT);
            double srhRate = nt / lifetimeDensityProduct(d, dop, si, dn);
            double intrRate = IntrinsicLifetime.richter2012(dop, si).rateConstantPerS(dn);
            double total = srhRate + intrRate + surfaceRate(surface, dop, si);
            // an SRH rate below 5 % of the intrinsic + surface rate is below the detection limit; stay clear of it
            if (srhRate < 0.06 * (total - srhRate)) {
                continue;
            }
            Conditions c = Conditions.of(dop, Injection.fixed(dn)).withSurface(surface);
            PixelResult r = new TrapDensityConverter(c, d).convert(1e6 / total);
            assertThat(r.status()).isEqualTo(PixelStatus.OK);
            assertRelative(d.id() + " " + dop + " dn " + dn + " " + surface, r.trapDensityPerCm3(), nt, 1e-9);
            assertRelative("tau_SRH", r.srhLifetimeUs(), 1e6 / srhRate, 1e-9);
            checked++;
        }
        assertThat(checked).isGreaterThan(2000);
    }

    // The same round trip in steady state: Δn = G·τ_eff
    @Test
    void roundTripFixedGeneration() {
        SplittableRandom rnd = new SplittableRandom(98765L);
        Silicon si = Silicon.at(300);
        int checked = 0;
        for (int i = 0; i < 1500; i++) {
            Defect d = WITH_SIGMA.get(rnd.nextInt(WITH_SIGMA.size()));
            Doping dop = rnd.nextBoolean() ? Doping.pType(Math.pow(10, rnd.nextDouble(14, 17)))
                    : Doping.nType(Math.pow(10, rnd.nextDouble(14, 17)));
            double dn = Math.pow(10, rnd.nextDouble(10, 16));
            double nt = Math.pow(10, rnd.nextDouble(9, 13));
            double srhRate = nt / lifetimeDensityProduct(d, dop, si, dn);
            double total = srhRate + IntrinsicLifetime.richter2012(dop, si).rateConstantPerS(dn);
            double g = dn * total;
            if (srhRate < 0.06 * (total - srhRate) || g < 1e10 || g > 1e24) {
                continue;
            }
            PixelResult r = new TrapDensityConverter(Conditions.of(dop, Injection.generation(g)), d)
                    .convert(1e6 / total);
            assertThat(r.status()).isEqualTo(PixelStatus.OK);
            assertRelative("dn = G tau", r.injectionPerCm3(), dn, 1e-12);
            assertRelative(d.id() + " N_t", r.trapDensityPerCm3(), nt, 1e-9);
            checked++;
        }
        assertThat(checked).isGreaterThan(500);
    }

    // Invariant: at fixed Δn the density falls as τ_eff rises, down to the BELOW_LIMIT threshold
    @ParameterizedTest
    @ValueSource(strings = {"fe-i", "fe-b", "cr-i", "midgap", "au-a"})
    void densityFallsAsLifetimeRises(String id) {
        for (Doping dop : new Doping[] {Doping.pType(1e16), Doping.nType(5e15)}) {
            TrapDensityConverter conv = new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14))
                    .withSurface(Surface.sproul(180, 10)), DefectLibrary.byId(id));
            double prev = Double.POSITIVE_INFINITY;
            int ok = 0;
            for (double lg = -2; lg <= 5; lg += 0.01) {
                PixelResult r = conv.convert(Math.pow(10, lg));
                if (r.status() != PixelStatus.OK) {
                    assertThat(r.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
                    break;
                }
                assertThat(r.trapDensityPerCm3()).isLessThan(prev);
                prev = r.trapDensityPerCm3();
                ok++;
            }
            assertThat(ok).isGreaterThan(100);
        }
    }

    // Statuses (project rule, README Models): OK; BELOW_LIMIT when τ_eff ≥ what intrinsic + surface recombination
    // allow — the density is then the detection limit (an upper bound: positive, finite); INVALID for NaN, ≤ 0 or infinite input
    @Test
    @DisplayName("statuses OK / BELOW_LIMIT / INVALID and the detection limit")
    void statuses() {
        Doping dop = Doping.pType(1e16);
        double dn = 1e14;
        Silicon si = Silicon.at(300);
        Surface surface = Surface.sproul(180, 20);
        Conditions c = Conditions.of(dop, Injection.fixed(dn)).withSurface(surface);
        Defect fe = DefectLibrary.byId("fe-i");
        TrapDensityConverter conv = new TrapDensityConverter(c, fe);
        double intrRate = IntrinsicLifetime.richter2012(dop, si).rateConstantPerS(dn);
        double surfRate = surfaceRate(surface, dop, si);
        double limitUs = 1e6 / (intrRate + surfRate);

        PixelResult ok = conv.convert(limitUs / 2);
        assertThat(ok.status()).isEqualTo(PixelStatus.OK);
        assertThat(ok.trapDensityPerCm3()).isPositive().isFinite();

        for (double tau : new double[] {limitUs * 1.0001, limitUs * 2, 1e9}) {
            PixelResult below = conv.convert(tau);
            assertThat(below.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
            double limit = lifetimeDensityProduct(fe, dop, si, dn) * Conditions.DEFAULT_RESOLUTION * (intrRate + surfRate);
            assertThat(below.trapDensityPerCm3()).isPositive().isFinite();
            assertRelative("detection limit", below.trapDensityPerCm3(), limit, 1e-9);
            assertThat(below.trapDensityMinPerCm3()).isPositive().isFinite()
                    .isLessThanOrEqualTo(below.trapDensityPerCm3());
            assertThat(below.trapDensityMaxPerCm3()).isFinite().isGreaterThanOrEqualTo(below.trapDensityPerCm3());
            assertThat(below.srhLifetimeUs()).isEqualTo(Double.POSITIVE_INFINITY);
        }
        // a density at the detection limit lowers the limit lifetime by the resolution δ: 1/(1 + δ)
        PixelResult below = conv.convert(limitUs * 2);
        assertRelative("limit lowers tau by delta", conv.lifetimeAtInjectionUs(below.trapDensityPerCm3(), dn),
                limitUs / (1 + Conditions.DEFAULT_RESOLUTION), 1e-9);

        for (double bad : new double[] {Double.NaN, 0, -1, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY}) {
            PixelResult r = conv.convert(bad);
            assertThat(r.status()).as("tau = %s", bad).isEqualTo(PixelStatus.INVALID);
            assertThat(r.trapDensityPerCm3()).as("tau = %s", bad).isNaN();
        }
    }

    // The raster path agrees with the single-pixel path (rounded to float); NaN pixels are NO_DATA there
    @Test
    void rasterMatchesSinglePixel() {
        TrapDensityConverter conv = new TrapDensityConverter(Conditions.of(Doping.pType(1e16),
                Injection.generation(1e19)).withSurface(Surface.sproul(180, 5)), DefectLibrary.byId("fe-i"));
        float[] tau = new float[64 * 4];
        SplittableRandom rnd = new SplittableRandom(3);
        for (int i = 0; i < tau.length; i++) {
            tau[i] = (float) Math.pow(10, rnd.nextDouble(-1, 4));
        }
        tau[5] = Float.NaN;
        tau[6] = 0;
        tau[7] = -3;
        tau[8] = Float.POSITIVE_INFINITY;
        for (int threads : new int[] {1, 4}) {
            ConversionOutput out = ConversionOutput.allocateAll(tau.length);
            conv.convert(tau, 64, out, threads);
            for (int i = 0; i < tau.length; i++) {
                if (i == 5) {
                    assertThat(PixelStatus.ofCode(out.status[i])).isEqualTo(PixelStatus.NO_DATA);
                    assertThat(out.trapDensity[i]).isNaN();
                    continue;
                }
                PixelResult r = conv.convert(tau[i]);
                assertThat(PixelStatus.ofCode(out.status[i])).isEqualTo(r.status());
                if (r.status() == PixelStatus.INVALID) {
                    assertThat(out.trapDensity[i]).isNaN();
                    continue;
                }
                assertThat(out.trapDensity[i]).isEqualTo((float) r.trapDensityPerCm3());
                assertThat(out.trapDensityMin[i]).isEqualTo((float) r.trapDensityMinPerCm3());
                assertThat(out.trapDensityMax[i]).isEqualTo((float) r.trapDensityMaxPerCm3());
                assertThat(out.injection[i]).isEqualTo((float) r.injectionPerCm3());
            }
        }
        assertThatThrownBy(() -> conv.convert(tau, 60, ConversionOutput.allocateAll(tau.length), 1))
                .isInstanceOf(IllegalArgumentException.class);
        assertThatThrownBy(() -> conv.convert(tau, 64, ConversionOutput.allocateAll(10), 1))
                .isInstanceOf(IllegalArgumentException.class);
    }

    // Density bounds: min ≤ nominal ≤ max, and they are the bound parameter sets' K times the same SRH rate
    @Test
    void densityBoundsBracketTheNominal() {
        Silicon si = Silicon.at(300);
        for (Defect d : WITH_SIGMA) {
            for (Doping dop : new Doping[] {Doping.pType(1e16), Doping.nType(1e15)}) {
                for (double dn : new double[] {1e11, 1e14, 1e16}) {
                    TrapDensityConverter conv = new TrapDensityConverter(Conditions.of(dop, Injection.fixed(dn)), d);
                    double tau = 0.5e6 / IntrinsicLifetime.richter2012(dop, si).rateConstantPerS(dn);
                    PixelResult r = conv.convert(tau);
                    assertThat(r.status()).isEqualTo(PixelStatus.OK);
                    assertThat(r.trapDensityMinPerCm3()).as(d.id()).isPositive()
                            .isLessThanOrEqualTo(r.trapDensityPerCm3() * (1 + 1e-12));
                    assertThat(r.trapDensityMaxPerCm3()).as(d.id())
                            .isGreaterThanOrEqualTo(r.trapDensityPerCm3() * (1 - 1e-12));
                    SrhBounds b = SrhBounds.of(d, dop, si);
                    double rate = 1e6 / r.srhLifetimeUs();
                    assertRelative("min", r.trapDensityMinPerCm3(), b.lower().lifetimeDensityProductSCm3(dn) * rate,
                            1e-9);
                    assertRelative("max", r.trapDensityMaxPerCm3(), b.upper().lifetimeDensityProductSCm3(dn) * rate,
                            1e-9);
                }
            }
        }
    }

    // Occupancy travels with the result: f_t of the nominal parameters at the pixel's Δn
    @Test
    void occupancyIsReported() {
        Doping dop = Doping.pType(1e16);
        Defect fe = DefectLibrary.byId("fe-i");
        PixelResult r = new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14)), fe).convert(10);
        assertRelative("f_t", r.occupancy(), SrhRecombination.of(fe, dop, Silicon.at(300)).occupancy(1e14), 1e-12);
        assertRelative("occupied density", r.occupiedDensityPerCm3(), r.occupancy() * r.trapDensityPerCm3(), 1e-12);
    }

    // Rein & Glunz, APL 82, 1054 (2003) / Bothe & Schmidt 2006: no absolute σ for the BO centre, so a single map
    // cannot give its density — refused with the normalised-density explanation (Bothe & Schmidt 2006, R-DEF-12)
    @Test
    @DisplayName("bo-lid refused, message points to the normalised density N_t*")
    void boronOxygenRefused() {
        assertThatThrownBy(() -> new TrapDensityConverter(Conditions.of(Doping.pType(1e16), Injection.fixed(1e14)),
                DefectLibrary.byId("bo-lid"))).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("normalised density").hasMessageContaining("bo-lid");
        assertThatThrownBy(() -> SrhRecombination.of(DefectLibrary.byId("bo-lid"), Doping.pType(1e16),
                Silicon.at(300))).isInstanceOf(InvalidValueException.class);
    }

    // Warnings that travel with results (README Models)
    @Test
    void warnings() {
        Doping dop = Doping.pType(1e16);
        Defect fe = DefectLibrary.byId("fe-i");
        // trap density not ≪ min(Δn, N_dop): Macdonald & Cuevas, PRB 67, 075203 (2003) (R-LIM-5)
        TrapDensityConverter lowDn = new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e11)), fe);
        assertThat(lowDn.convert(0.01).warnings()).contains(ConversionWarning.TRAP_DENSITY_NOT_SMALL);
        // 1/c_n ≈ 7e6 s cm^-3: at 3000 µs (τ_intr ≈ 9 ms) N_t ≈ 1.6e9 < 0.1·Δn; at 100 µs N_t ≈ 7e10 > 0.1·Δn
        assertThat(lowDn.convert(3000).status()).isEqualTo(PixelStatus.OK);
        assertThat(lowDn.convert(3000).warnings()).doesNotContain(ConversionWarning.TRAP_DENSITY_NOT_SMALL);
        assertThat(lowDn.convert(100).warnings()).contains(ConversionWarning.TRAP_DENSITY_NOT_SMALL);
        // surface-limited: τ_surf within 2× of τ_eff (common practice, R-LIM-6)
        TrapDensityConverter surf = new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14))
                .withSurface(Surface.sproul(180, 100)), fe);
        double tauS = surf.surfaceLifetimeUs();
        assertThat(surf.convert(tauS * 0.8).warnings()).contains(ConversionWarning.SURFACE_LIMITED);
        assertThat(surf.convert(tauS * 0.1).warnings()).doesNotContain(ConversionWarning.SURFACE_LIMITED);
        // T ≠ 300 K with Richter 2012
        Conditions warm = Conditions.of(dop, Injection.fixed(1e14)).withSilicon(Silicon.at(320));
        assertThat(new TrapDensityConverter(warm, fe).convert(10).warnings())
                .contains(ConversionWarning.TEMPERATURE_NOT_300K);
        assertThat(new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14)), fe).convert(10).warnings())
                .doesNotContain(ConversionWarning.TEMPERATURE_NOT_300K, ConversionWarning.VELOCITY_CONVENTION);
        // velocities other than the cross-sections' convention
        Conditions green = Conditions.of(dop, Injection.fixed(1e14))
                .withSilicon(Silicon.at(300, trapmap.physics.material.ThermalVelocityModel.GREEN_1990));
        assertThat(new TrapDensityConverter(green, fe).convert(10).warnings())
                .contains(ConversionWarning.VELOCITY_CONVENTION);
    }

    // Surface lifetime used by the converter: Sproul with the Klaassen minority diffusivity (R-LIM-4)
    @Test
    void surfaceLifetimeUsesKlaassenDiffusivity() {
        Doping dop = Doping.pType(1e16);
        TrapDensityConverter conv = new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14))
                .withSurface(Surface.sproul(180, 100)), DefectLibrary.byId("midgap"));
        // D = 0.025852 × 1106.8 = 28.61 cm²/s (Klaassen 1992, R-MOB-3): τ_s = 90 µs + (0.018/π)²/28.61
        assertRelative("tau_s", conv.surfaceLifetimeUs(), 90 + Math.pow(0.018 / Math.PI, 2) / 28.61 * 1e6, 0.001);
        assertThat(new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14)), DefectLibrary.byId("midgap"))
                .surfaceLifetimeUs()).isEqualTo(Double.POSITIVE_INFINITY);
    }

    // Injection harmonisation: a pixel converted at Δn and re-evaluated at the same Δn returns its τ_eff
    @Test
    void lifetimeAtReferenceInjection() {
        Doping dop = Doping.pType(1e16);
        Defect fe = DefectLibrary.byId("fe-i");
        Conditions c = Conditions.of(dop, Injection.fixed(1e14)).withReferenceInjection(1e14);
        PixelResult r = new TrapDensityConverter(c, fe).convert(25);
        assertRelative("same injection", r.lifetimeAtReferenceUs(), 25, 1e-9);
        PixelResult r2 = new TrapDensityConverter(c.withReferenceInjection(1e12), fe).convert(25);
        double expected = 1e6 / (r2.trapDensityPerCm3() / lifetimeDensityProduct(fe, dop, Silicon.at(300), 1e12)
                + IntrinsicLifetime.richter2012(dop, Silicon.at(300)).rateConstantPerS(1e12));
        assertRelative("other injection", r2.lifetimeAtReferenceUs(), expected, 1e-9);
        assertThat(new TrapDensityConverter(Conditions.of(dop, Injection.fixed(1e14)), fe).convert(25)
                .lifetimeAtReferenceUs()).isNaN();
    }

    // A trap level used only for the custom-defect path through the converter
    @Test
    void customDefectThroughConverter() {
        Defect d = Defect.of("custom", "custom", TrapLevel.fromIntrinsic(0.1), 2e-15, 5e-16,
                trapmap.physics.material.ThermalVelocityModel.FIXED, "test", null);
        PixelResult r = new TrapDensityConverter(Conditions.of(Doping.nType(1e15), Injection.fixed(1e13)), d)
                .convert(50);
        assertThat(r.status()).isEqualTo(PixelStatus.OK);
        assertThat(r.trapDensityMinPerCm3()).isEqualTo(r.trapDensityPerCm3());
        assertThat(r.trapDensityMaxPerCm3()).isEqualTo(r.trapDensityPerCm3());
    }
}
