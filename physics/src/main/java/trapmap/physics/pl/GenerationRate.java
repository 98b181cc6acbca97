package trapmap.physics.pl;

import trapmap.physics.constants.PhysicalConstants;
import trapmap.shared.check.Checks;

/**
 * Uniform steady-state generation rate from illumination: G = Φ (1 − R) f_abs / W with single-pass absorption
 * f_abs = 1 − exp(−α W).
 */
public final class GenerationRate {
    private GenerationRate() {
    }

    /**
     * @param photonFluxPerCm2PerS     incident photon flux Φ, cm^-2 s^-1
     * @param reflectance              front reflectance R (0 … 1)
     * @param absorptionPerCm          absorption coefficient α at the excitation wavelength, cm^-1
     * @param thicknessCm              wafer thickness W, cm
     * @return G, cm^-3 s^-1
     */
    public static double perCm3PerS(double photonFluxPerCm2PerS, double reflectance, double absorptionPerCm,
                                    double thicknessCm) {
        Checks.nonNegative(photonFluxPerCm2PerS, "photonFlux", "cm^-2 s^-1");
        Checks.inRange(reflectance, 0, 1, "reflectance", "");
        Checks.positive(absorptionPerCm, "absorptionCoefficient", "cm^-1");
        Checks.positive(thicknessCm, "thickness", "cm");
        double absorbed = -Math.expm1(-absorptionPerCm * thicknessCm);
        return photonFluxPerCm2PerS * (1 - reflectance) * absorbed / thicknessCm;
    }

    /** Photon flux of monochromatic light of power density {@code wattsPerCm2} at wavelength {@code nm}. */
    public static double photonFluxPerCm2PerS(double wattsPerCm2, double wavelengthNm) {
        Checks.nonNegative(wattsPerCm2, "powerDensity", "W/cm^2");
        Checks.positive(wavelengthNm, "wavelength", "nm");
        double photonEnergyJ = PhysicalConstants.PLANCK_J_S * PhysicalConstants.SPEED_OF_LIGHT_M_PER_S
                / (wavelengthNm * 1e-9);
        return wattsPerCm2 / photonEnergyJ;
    }
}
