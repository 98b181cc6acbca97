package trapmap.physics;

import static org.assertj.core.api.Assertions.assertThat;

import trapmap.physics.defect.Defect;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;

/**
 * Parameter sets and conventions used by the computed check values of docs/check-values.md:
 * 300 K, n_i = 9.65e9 cm^-3, E_i at mid-gap with E_g = 1.124 eV, so a level quoted from a band edge is given here as
 * its offset from E_i, and the thermal velocities are set explicitly.
 */
public final class ReferenceSets {
    /** Half the band gap used by the reference's computed values, eV (E_g = 1.124 eV). */
    public static final double HALF_GAP_EV = 1.124 / 2;

    private ReferenceSets() {
    }

    /** 300 K, default n_i, v_th = 1.1e7 cm/s for both carriers. */
    public static Silicon fixedVelocities() {
        return Silicon.at(300, ThermalVelocityModel.FIXED);
    }

    /** 300 K, default n_i, Green 1990 thermal velocities (2.0457e7 / 1.6879e7 cm/s). */
    public static Silicon greenVelocities() {
        return Silicon.at(300, ThermalVelocityModel.GREEN_1990);
    }

    /** A level E_v + {@code heightEv} expressed from the mid-gap E_i. */
    public static TrapLevel aboveValence(double heightEv) {
        return TrapLevel.fromIntrinsic(heightEv - HALF_GAP_EV);
    }

    /** A level E_c − {@code depthEv} expressed from the mid-gap E_i. */
    public static TrapLevel belowConduction(double depthEv) {
        return TrapLevel.fromIntrinsic(HALF_GAP_EV - depthEv);
    }

    /** Set A Fe_i (Macdonald, Geerligs &amp; Azzizi 2004): E_v + 0.38 eV, σ_n 5e-14, σ_p 7e-17 cm². */
    public static Defect interstitialIronSetA() {
        return Defect.of("fe-i-set-a", "Fe_i, set A", aboveValence(0.38), 5e-14, 7e-17, ThermalVelocityModel.FIXED,
                "Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004)", null);
    }

    /** Set A FeB: E_c − 0.23 eV, σ_n 3e-14, σ_p 2e-15 cm² (Macdonald et al. 2001, used in 2004). */
    public static Defect ironBoronSetA() {
        return Defect.of("fe-b-set-a", "FeB, set A", belowConduction(0.23), 3e-14, 2e-15, ThermalVelocityModel.FIXED,
                "Macdonald et al. 2001 (doi 10.1063/1.1372156)", null);
    }

    /** Set B Fe_i: E_v + 0.38 eV, σ_n 1.3e-14, σ_p 7e-17 cm² (Macdonald, Tan &amp; Trupke 2008). */
    public static Defect interstitialIronSetB() {
        return Defect.of("fe-i-set-b", "Fe_i, set B", aboveValence(0.38), 1.3e-14, 7e-17, ThermalVelocityModel.FIXED,
                "Istratov et al. 1999; Macdonald, Tan & Trupke, JAP 103, 073710 (2008)", null);
    }

    /** Set B FeB: E_c − 0.26 eV, σ_n 5e-15, σ_p 3e-15 cm² (Macdonald et al., APL 89, 142107 (2006)). */
    public static Defect ironBoronSetB() {
        return Defect.of("fe-b-set-b", "FeB, set B", belowConduction(0.26), 5e-15, 3e-15, ThermalVelocityModel.FIXED,
                "Macdonald, Roth, Deenapanray, Trupke & Bardos, APL 89, 142107 (2006)", null);
    }

    /** Asserts |actual/expected − 1| ≤ relTol, with a message naming the quantity. */
    public static void assertRelative(String what, double actual, double expected, double relTol) {
        assertThat(actual).as("%s: expected %s, got %s (relative tolerance %s)", what, expected, actual, relTol)
                .isFinite();
        assertThat(Math.abs(actual / expected - 1)).as("%s: expected %s, got %s (relative tolerance %s)", what,
                expected, actual, relTol).isLessThanOrEqualTo(relTol);
    }
}
