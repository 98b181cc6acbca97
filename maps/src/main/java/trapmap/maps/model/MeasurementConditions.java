package trapmap.maps.model;

import java.util.Map;
import java.util.TreeMap;
import trapmap.physics.material.Doping;

/**
 * Conditions under which a map was measured. Every field may be unknown (null); the conversion refuses to guess the
 * ones it needs.
 *
 * @param doping              net doping and type
 * @param thicknessUm         wafer thickness, µm
 * @param temperatureK        sample temperature, K
 * @param injectionPerCm3     fixed excess carrier density of a lifetime map, cm^-3
 * @param generationPerCm3PerS steady-state generation rate, cm^-3 s^-1
 * @param srvCmPerS           surface recombination velocity (both surfaces), cm/s
 * @param photonFluxPerCm2PerS excitation photon flux of a PL image, cm^-2 s^-1
 * @param plCalibration       PL calibration constant A of I = A·Δn·(Δn + N_dop), counts·cm^6
 * @param extra               further labelled facts (passivation, wafer history, time since dissociation…)
 */
public record MeasurementConditions(Doping doping, Double thicknessUm, Double temperatureK, Double injectionPerCm3,
                                    Double generationPerCm3PerS, Double srvCmPerS, Double photonFluxPerCm2PerS,
                                    Double plCalibration, Map<String, String> extra) {

    /** Nothing known. */
    public static final MeasurementConditions UNKNOWN =
            new MeasurementConditions(null, null, null, null, null, null, null, null, Map.of());

    public MeasurementConditions {
        extra = Map.copyOf(extra == null ? Map.of() : extra);
    }

    /**
     * These conditions with every known field of {@code override} taking precedence (flags over sidecar values).
     */
    public MeasurementConditions overriddenBy(MeasurementConditions override) {
        Map<String, String> merged = new TreeMap<>(extra);
        merged.putAll(override.extra);
        return new MeasurementConditions(pick(override.doping, doping), pick(override.thicknessUm, thicknessUm),
                pick(override.temperatureK, temperatureK), pick(override.injectionPerCm3, injectionPerCm3),
                pick(override.generationPerCm3PerS, generationPerCm3PerS), pick(override.srvCmPerS, srvCmPerS),
                pick(override.photonFluxPerCm2PerS, photonFluxPerCm2PerS), pick(override.plCalibration, plCalibration),
                merged);
    }

    public MeasurementConditions withThickness(Double um) {
        return new MeasurementConditions(doping, um, temperatureK, injectionPerCm3, generationPerCm3PerS, srvCmPerS,
                photonFluxPerCm2PerS, plCalibration, extra);
    }

    public MeasurementConditions withSrv(Double cmPerS) {
        return new MeasurementConditions(doping, thicknessUm, temperatureK, injectionPerCm3, generationPerCm3PerS,
                cmPerS, photonFluxPerCm2PerS, plCalibration, extra);
    }

    public MeasurementConditions withTemperature(Double kelvin) {
        return new MeasurementConditions(doping, thicknessUm, kelvin, injectionPerCm3, generationPerCm3PerS,
                srvCmPerS, photonFluxPerCm2PerS, plCalibration, extra);
    }

    public MeasurementConditions withPlCalibration(Double countsCm6) {
        return new MeasurementConditions(doping, thicknessUm, temperatureK, injectionPerCm3, generationPerCm3PerS,
                srvCmPerS, photonFluxPerCm2PerS, countsCm6, extra);
    }

    private static <T> T pick(T preferred, T fallback) {
        return preferred != null ? preferred : fallback;
    }

    public MeasurementConditions withDoping(Doping d) {
        return new MeasurementConditions(d, thicknessUm, temperatureK, injectionPerCm3, generationPerCm3PerS,
                srvCmPerS, photonFluxPerCm2PerS, plCalibration, extra);
    }

    public MeasurementConditions withInjection(Double perCm3) {
        return new MeasurementConditions(doping, thicknessUm, temperatureK, perCm3, generationPerCm3PerS, srvCmPerS,
                photonFluxPerCm2PerS, plCalibration, extra);
    }

    public MeasurementConditions withGeneration(Double perCm3PerS) {
        return new MeasurementConditions(doping, thicknessUm, temperatureK, injectionPerCm3, perCm3PerS, srvCmPerS,
                photonFluxPerCm2PerS, plCalibration, extra);
    }
}
