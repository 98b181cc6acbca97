package trapmap.physics.material;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.shared.error.InvalidValueException;

/**
 * Limits, exact invariants and branch conditions of the material models that the published-value tests (all at
 * 300 K and at ordinary doping) leave open: temperatures away from 300 K, near-intrinsic and the highest accepted
 * doping, the closed ends of the accepted ranges. The mutation-testing run (scripts/mutation) showed these gaps.
 */
class MaterialMutationGuardTest {

    // Klaassen, SSE 35, 953 (1992), eq. (4): lattice scattering alone gives μ_L = μ_max (300/T)^θ, with
    // μ_max = 1414 (electrons), 470.5 (holes) cm²/Vs and θ = 2.285, 2.247 (Table 1 of the paper). In lightly
    // doped silicon (1e12 cm^-3) impurity and carrier scattering are negligible, so the mobility must approach it.
    // Computed from the published formula; 1 % (the impurity term at 1e12 is below 0.1 %).
    @ParameterizedTest(name = "T = {0} K")
    @ValueSource(doubles = {250, 300, 350, 400, 450})
    void lightlyDopedMobilityIsTheLatticeMobility(double t) {
        double ni = Silicon.at(t).intrinsicPerCm3();
        double latticeE = 1414 * Math.pow(300 / t, 2.285);
        double latticeH = 470.5 * Math.pow(300 / t, 2.247);
        assertThat(KlaassenMobility.electronCm2PerVs(1e12, 0, 0, t, ni)).isCloseTo(latticeE, within(0.01 * latticeE));
        assertThat(KlaassenMobility.holeCm2PerVs(0, 1e12, 0, t, ni)).isCloseTo(latticeH, within(0.01 * latticeH));
        // Never above the lattice limit: every other mechanism adds scattering (Matthiessen's rule, eq. (1)).
        assertThat(KlaassenMobility.electronCm2PerVs(1e12, 0, 0, t, ni)).isLessThanOrEqualTo(latticeE);
        assertThat(KlaassenMobility.holeCm2PerVs(0, 1e12, 0, t, ni)).isLessThanOrEqualTo(latticeH);
    }

    // Klaassen 1992, eq. (4)-(5): lattice scattering falls steeply with temperature ((300/T)^θ, θ ≈ 2.3), while
    // the impurity term μ_N ∝ (T/300)^(3α − 1.5) rises with it. So lightly doped silicon loses more than 40 % of
    // its mobility from 300 to 400 K, and heavily doped silicon, where impurity scattering dominates, loses less.
    // Computed from the published formulas (qualitative check).
    @Test
    void mobilityFallsWithTemperatureLessWhenImpurityScatteringDominates() {
        for (boolean electron : new boolean[] {true, false}) {
            double light300 = mobility(electron, 1e13, 300);
            double light400 = mobility(electron, 1e13, 400);
            double heavy300 = mobility(electron, 1e19, 300);
            double heavy400 = mobility(electron, 1e19, 400);
            assertThat(light400).as("lightly doped, " + (electron ? "electrons" : "holes")).isLessThan(0.6 * light300);
            assertThat(heavy400 / heavy300).as("heavily doped, " + (electron ? "electrons" : "holes"))
                    .isGreaterThan(light400 / light300).isLessThan(1.0);
        }
    }

    /** Minority mobility in the matching type at doping N, temperature t (n-type for holes, p-type for electrons). */
    private static double mobility(boolean electron, double n, double t) {
        double ni = Silicon.at(t).intrinsicPerCm3();
        return electron ? KlaassenMobility.electronCm2PerVs(n, 0, 0, t, ni)
                : KlaassenMobility.holeCm2PerVs(0, n, 0, t, ni);
    }

    // Klaassen 1992: μ_min ≤ μ ≤ μ_L at every doping. At the highest doping the program accepts (1e19 cm^-3) the
    // majority density n_i²/N underflows against N²/4 in double precision; the mobility must stay finite and
    // between μ_min (68.5 electrons, 44.9 holes, Table 1) and the lattice mobility.
    @Test
    void mobilityAtTheHighestAcceptedDopingStaysBetweenItsLimits() {
        double ni = Silicon.at(300).intrinsicPerCm3();
        double e = KlaassenMobility.electronCm2PerVs(Doping.MAX_DENSITY_PER_CM3, 0, 0, 300, ni);
        double h = KlaassenMobility.holeCm2PerVs(Doping.MAX_DENSITY_PER_CM3, 0, 0, 300, ni);
        assertThat(e).isFinite().isBetween(68.5, 1414.0);
        assertThat(h).isFinite().isBetween(44.9, 470.5);
        double en = KlaassenMobility.electronCm2PerVs(0, Doping.MAX_DENSITY_PER_CM3, 0, 300, ni);
        assertThat(en).isFinite().isBetween(68.5, 1414.0);
    }

    // Compensation (Klaassen 1992, eq. (6)-(8)): both dopants scatter, so a compensated wafer with the same net
    // doping has a lower mobility than an uncompensated one, and swapping which dopant is in excess changes
    // which carriers are the majority.
    @Test
    void compensationLowersTheMobility() {
        double ni = Silicon.at(300).intrinsicPerCm3();
        double plain = KlaassenMobility.electronCm2PerVs(1e16, 0, 0, 300, ni);
        double compensated = KlaassenMobility.electronCm2PerVs(2e16, 1e16, 0, 300, ni);
        assertThat(compensated).isLessThan(plain);
        double nPlain = KlaassenMobility.holeCm2PerVs(0, 1e16, 0, 300, ni);
        double nCompensated = KlaassenMobility.holeCm2PerVs(1e16, 2e16, 0, 300, ni);
        assertThat(nCompensated).isLessThan(nPlain);
    }

    // Mass action and charge neutrality (any semiconductor text, e.g. Sze & Ng, Physics of Semiconductor
    // Devices, 3rd ed., §1.5): n0·p0 = n_i², p0 − n0 = N_A. At N = n_i the majority density is n_i (1 + √5)/2.
    @ParameterizedTest(name = "N = {0} n_i")
    @ValueSource(doubles = {0.01, 0.5, 1, 2, 1e3, 1e6})
    void equilibriumObeysMassActionAndNeutrality(double ratio) {
        double ni = 1e12;
        double n = ratio * ni;
        Carriers p = Doping.pType(n).equilibrium(ni);
        assertThat(p.electronsPerCm3() * p.holesPerCm3()).isCloseTo(ni * ni, within(1e-12 * ni * ni));
        assertThat(p.holesPerCm3() - p.electronsPerCm3()).isCloseTo(n, within(1e-9 * Math.max(n, ni)));
        Carriers nt = Doping.nType(n).equilibrium(ni);
        assertThat(nt.electronsPerCm3()).isEqualTo(p.holesPerCm3());
        assertThat(nt.holesPerCm3()).isEqualTo(p.electronsPerCm3());
    }

    @Test
    void atDopingEqualToTheIntrinsicDensityTheMajorityIsTheGoldenRatioTimesNi() {
        Carriers c = Doping.pType(1e10).equilibrium(1e10);
        assertThat(c.holesPerCm3()).isCloseTo(1e10 * (1 + Math.sqrt(5)) / 2, within(1.0));
    }

    // The text form of a doping is the notation Doping.parse reads (DopingText): it must read back to the same.
    @Test
    void dopingTextReadsBackToTheSameDoping() {
        for (Doping d : new Doping[] {Doping.pType(1.5e16), Doping.nType(3e14), Doping.pType(1e19)}) {
            assertThat(Doping.parse(d.toString())).isEqualTo(d);
        }
        assertThat(Doping.nType(2e15).toString()).startsWith("n:");
        assertThat(Doping.pType(2e15).toString()).startsWith("p:");
    }

    // The accepted doping range [1e10, 1e19] cm^-3 is closed: both ends are accepted, just outside is refused
    // with a message naming the range and the unit.
    @Test
    void acceptedDopingRangeIsClosed() {
        assertThat(Doping.parse("p:1e10").densityPerCm3()).isEqualTo(1e10);
        assertThat(Doping.parse("n:1e19").densityPerCm3()).isEqualTo(1e19);
        assertThatThrownBy(() -> Doping.parse("p:9.99e9")).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("[1e10, 1e19] cm^-3");
        assertThatThrownBy(() -> Doping.parse("p:1.01e19")).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("[1e10, 1e19] cm^-3");
    }

    // ASTM F723 resistivities are accepted over the closed range [1e-4, 1e4] Ω·cm; a resistivity inside it whose
    // density leaves the accepted doping range is refused with that density in four digits.
    @Test
    void resistivityRangeIsClosedAndAnOutOfRangeDensityIsNamed() {
        assertThat(Doping.parse("p:1e4ohmcm").densityPerCm3()).isBetween(1e12, 2e12);
        InvalidValueException e = org.junit.jupiter.api.Assertions.assertThrows(InvalidValueException.class,
                () -> Doping.parse("p:1e-4ohmcm"));
        assertThat(e.field()).isEqualTo("doping");
        assertThat(e.unit()).isEqualTo("Ω·cm");
        assertThat(e.getMessage()).matches("(?s).*gives \\d\\.\\d{0,3}e\\d\\d cm\\^-3 by ASTM F723.*");
        assertThatThrownBy(() -> Doping.parse("p:1.1e4ohmcm")).hasMessageContaining("[1e-4, 10000] Ω·cm");
    }

    @Test
    void unitOfNoTextIsADensity() {
        assertThat(DopingText.unitOf(null)).isEqualTo("cm^-3");
        assertThat(DopingText.unitOf("n:2ohmcm")).isEqualTo("Ω·cm");
        assertThat(DopingText.unitOf("n:2e15")).isEqualTo("cm^-3");
    }

    // The shortest exact form of a number, as documented on DopingText.exact: a million is 1e6, not 1000000.
    @Test
    void exactFormIsTheShorterOneAtAMillion() {
        assertThat(DopingText.exact(1e6)).isEqualTo("1e6");
        assertThat(DopingText.exact(999999)).isEqualTo("999999");
        assertThat(DopingText.exact(1e19)).isEqualTo("1e19");
        assertThat(DopingText.exact(0.5)).isEqualTo("0.5");
    }

    // Green, JAP 67, 2944 (1990), Table 1 fit of E_g(T): three pieces that must join (within the fit's 0.2 meV)
    // at 190 K and 300 K, with the gap falling monotonically with temperature. Values computed from the published
    // pieces: 77 K → 1.1745 eV (low piece), 250 K → 1.1369 eV (middle piece), 400 K → 1.0968 eV (high piece).
    @Test
    void greenBandGapPiecesJoinAndFallWithTemperature() {
        assertThat(BandGap.green1990Ev(77)).isCloseTo(1.1700 + 1.059e-5 * 77 - 6.05e-7 * 77 * 77, within(1e-9));
        assertThat(BandGap.green1990Ev(250)).isCloseTo(1.1785 - 9.025e-5 * 250 - 3.05e-7 * 250 * 250, within(1e-9));
        assertThat(BandGap.green1990Ev(400)).isCloseTo(1.206 - 2.73e-4 * 400, within(1e-9));
        assertThat(BandGap.green1990Ev(189.999)).isCloseTo(BandGap.green1990Ev(190), within(2e-4));
        assertThat(BandGap.green1990Ev(299.999)).isCloseTo(BandGap.green1990Ev(300), within(2e-4));
        double previous = Double.POSITIVE_INFINITY;
        for (double t = 100; t <= 500; t += 10) {
            double e = BandGap.green1990Ev(t);
            assertThat(e).as("E_g at %s K", t).isLessThan(previous);
            previous = e;
        }
    }

    // Every model names its published source (DEVELOPERS.md: constants and models carry their source), with a year.
    @Test
    void everyMaterialModelNamesItsSource() {
        for (IntrinsicDensityModel m : IntrinsicDensityModel.values()) {
            assertThat(m.source()).as(m.name()).containsPattern("\\((19|20)\\d\\d\\)");
        }
        for (DensityOfStatesModel m : DensityOfStatesModel.values()) {
            assertThat(m.source()).as(m.name()).containsPattern("\\((19|20)\\d\\d\\)");
        }
        for (ThermalVelocityModel m : ThermalVelocityModel.values()) {
            assertThat(m.description()).as(m.name()).isNotBlank();
        }
    }

    // n_i rises steeply with temperature (about ×25 from 300 to 350 K). For Misiakos & Tsamakis, JAP 74, 3293
    // (1993), n_i = 5.29e19 (T/300)^2.54 exp(−6726/T): n_i(350)/n_i(300) = (350/300)^2.54 exp(6726/300 − 6726/350)
    // = 36.7 (computed from the published fit).
    @Test
    void intrinsicDensityRisesWithTemperatureAsPublished() {
        double ratio = IntrinsicDensityModel.MISIAKOS_1993.densityPerCm3(350)
                / IntrinsicDensityModel.MISIAKOS_1993.densityPerCm3(300);
        assertThat(ratio).isCloseTo(Math.pow(350 / 300.0, 2.54) * Math.exp(6726 / 300.0 - 6726 / 350.0),
                within(1e-9 * ratio));
        for (IntrinsicDensityModel m : IntrinsicDensityModel.values()) {
            assertThat(m.densityPerCm3(350) / m.densityPerCm3(300)).as(m.name()).isBetween(15.0, 60.0);
        }
    }

    // Overrides of n_i and N_c/N_v change only that parameter.
    @Test
    void materialOverridesChangeOnlyTheirParameter() {
        Silicon base = Silicon.at(320);
        Silicon ni = base.withIntrinsicDensity(2e10);
        assertThat(ni.intrinsicPerCm3()).isEqualTo(2e10);
        assertThat(ni.temperatureK()).isEqualTo(320);
        assertThat(ni.conductionDosPerCm3()).isEqualTo(base.conductionDosPerCm3());
        Silicon dos = base.withDensitiesOfStates(3e19, 2e19);
        assertThat(dos.conductionDosPerCm3()).isEqualTo(3e19);
        assertThat(dos.valenceDosPerCm3()).isEqualTo(2e19);
        assertThat(dos.intrinsicPerCm3()).isEqualTo(base.intrinsicPerCm3());
        assertThat(dos.velocityModel()).isEqualTo(base.velocityModel());
    }
}
