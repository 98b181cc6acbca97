package trapmap.physics.material;

import trapmap.physics.constants.PhysicalConstants;
import trapmap.shared.check.Checks;

/**
 * Silicon band parameters at one temperature. Immutable; every value can be overridden with a {@code with…}
 * method. Defaults (README, Models): n_i of Altermatt 2003 with the Sproul–Green
 * temperature form, N_c/N_v of Green 1990, thermal velocity 1.1e7 cm/s·sqrt(T/300).
 *
 * @param temperatureK          temperature, K
 * @param intrinsicPerCm3       intrinsic carrier density n_i, cm^-3
 * @param conductionDosPerCm3   effective density of states of the conduction band N_c, cm^-3
 * @param valenceDosPerCm3      effective density of states of the valence band N_v, cm^-3
 * @param electronVthCmPerS     electron thermal velocity, cm/s
 * @param holeVthCmPerS         hole thermal velocity, cm/s
 * @param velocityModel         the thermal-velocity convention the velocities follow (null when overridden)
 * @param intrinsicModel        the n_i model n_i comes from (null when overridden)
 */
public record Silicon(double temperatureK, double intrinsicPerCm3, double conductionDosPerCm3,
                      double valenceDosPerCm3, double electronVthCmPerS, double holeVthCmPerS,
                      ThermalVelocityModel velocityModel, IntrinsicDensityModel intrinsicModel) {

    /** Lowest temperature the models are offered for, K. */
    public static final double MIN_TEMPERATURE_K = 77;
    /** Highest temperature the models are offered for, K. */
    public static final double MAX_TEMPERATURE_K = 500;

    public Silicon {
        Checks.inRange(temperatureK, MIN_TEMPERATURE_K, MAX_TEMPERATURE_K, "temperature", "K");
        Checks.positive(intrinsicPerCm3, "intrinsicDensity", "cm^-3");
        Checks.positive(conductionDosPerCm3, "conductionBandDensityOfStates", "cm^-3");
        Checks.positive(valenceDosPerCm3, "valenceBandDensityOfStates", "cm^-3");
        Checks.positive(electronVthCmPerS, "electronThermalVelocity", "cm/s");
        Checks.positive(holeVthCmPerS, "holeThermalVelocity", "cm/s");
    }

    /** Silicon with an n_i of unknown origin (no n_i model: no fitted range to check). */
    public Silicon(double temperatureK, double intrinsicPerCm3, double conductionDosPerCm3, double valenceDosPerCm3,
                   double electronVthCmPerS, double holeVthCmPerS, ThermalVelocityModel velocityModel) {
        this(temperatureK, intrinsicPerCm3, conductionDosPerCm3, valenceDosPerCm3, electronVthCmPerS, holeVthCmPerS,
                velocityModel, null);
    }

    /** True when the temperature lies outside the fitted range of the n_i model (false when n_i was given). */
    public boolean outsideIntrinsicDensityFit() {
        return intrinsicModel != null && !intrinsicModel.covers(temperatureK);
    }

    /** Silicon at {@code temperatureK} with the default models. */
    public static Silicon at(double temperatureK) {
        return at(temperatureK, ThermalVelocityModel.FIXED);
    }

    /** Silicon at {@code temperatureK} with the default n_i and N_c/N_v models and the given velocity model. */
    public static Silicon at(double temperatureK, ThermalVelocityModel velocities) {
        return of(temperatureK, IntrinsicDensityModel.ALTERMATT_2003, DensityOfStatesModel.GREEN_1990, velocities);
    }

    /** Silicon at {@code temperatureK} with explicitly chosen models. */
    public static Silicon of(double temperatureK, IntrinsicDensityModel ni, DensityOfStatesModel dos,
                             ThermalVelocityModel velocities) {
        Checks.inRange(temperatureK, MIN_TEMPERATURE_K, MAX_TEMPERATURE_K, "temperature", "K");
        return new Silicon(temperatureK, ni.densityPerCm3(temperatureK), dos.conductionPerCm3(temperatureK),
                dos.valencePerCm3(temperatureK), velocities.electronCmPerS(temperatureK),
                velocities.holeCmPerS(temperatureK), velocities, ni);
    }

    /** Thermal energy kT, eV. */
    public double thermalEnergyEv() {
        return PhysicalConstants.thermalEnergyEv(temperatureK);
    }

    /** The same silicon with another intrinsic carrier density. */
    public Silicon withIntrinsicDensity(double perCm3) {
        return new Silicon(temperatureK, perCm3, conductionDosPerCm3, valenceDosPerCm3, electronVthCmPerS,
                holeVthCmPerS, velocityModel, null);
    }

    /** The same silicon with other thermal velocities (the velocity model is then unknown: null). */
    public Silicon withThermalVelocities(double electronCmPerS, double holeCmPerS) {
        return new Silicon(temperatureK, intrinsicPerCm3, conductionDosPerCm3, valenceDosPerCm3, electronCmPerS,
                holeCmPerS, null, intrinsicModel);
    }

    /** The same silicon with other effective densities of states. */
    public Silicon withDensitiesOfStates(double conductionPerCm3, double valencePerCm3) {
        return new Silicon(temperatureK, intrinsicPerCm3, conductionPerCm3, valencePerCm3, electronVthCmPerS,
                holeVthCmPerS, velocityModel, intrinsicModel);
    }
}
