package trapmap.viewer.model;

import java.util.Map;
import trapmap.maps.model.MeasurementConditions;
import trapmap.physics.material.Doping;
import trapmap.physics.material.DopingText;
import trapmap.shared.check.Checks;

/**
 * Measurement conditions the user sets in the viewer; they replace the sidecar's values of every open map. A null
 * field keeps the sidecar's value. Setting an injection level or a generation rate replaces the sidecar's
 * excitation altogether (the same rule as an overriding rules file of the batch).
 *
 * @param doping               {@code p:1e16} (net density, cm⁻³) or {@code p:1.5ohmcm} (resistivity, Ω·cm), or null
 * @param thicknessUm          wafer thickness, µm
 * @param temperatureK         temperature, K
 * @param injectionPerCm3      fixed injection level Δn, cm⁻³
 * @param generationPerCm3PerS generation rate, cm⁻³ s⁻¹
 * @param srvCmPerS            surface recombination velocity, cm/s
 */
public record ConditionOverrides(String doping, Double thicknessUm, Double temperatureK, Double injectionPerCm3,
                                 Double generationPerCm3PerS, Double srvCmPerS) {
    /** Nothing overridden: every map keeps its sidecar's conditions. */
    public static final ConditionOverrides NONE = new ConditionOverrides(null, null, null, null, null, null);

    public ConditionOverrides {
        if (doping != null) {
            doping = doping.trim();
            if (doping.isEmpty()) {
                doping = null;
            } else {
                Doping.parse(doping);
            }
        }
        if (thicknessUm != null) {
            Checks.inRange(thicknessUm, 1, 5000, "thickness", "um");
        }
        if (temperatureK != null) {
            Checks.inRange(temperatureK, 77, 600, "temperature", "K");
        }
        if (injectionPerCm3 != null) {
            Checks.inRange(injectionPerCm3, 1e8, 1e19, "injection", "cm^-3");
        }
        if (generationPerCm3PerS != null) {
            Checks.inRange(generationPerCm3PerS, 1e10, 1e25, "generation", "cm^-3 s^-1");
        }
        if (injectionPerCm3 != null && generationPerCm3PerS != null) {
            throw new IllegalArgumentException("give either an injection level or a generation rate, not both");
        }
        if (srvCmPerS != null) {
            Checks.inRange(srvCmPerS, 0, 1e7, "surface recombination velocity", "cm/s");
        }
    }

    /** The doping override parsed (type, density and the resistivity it came from), or null when not set. */
    public DopingText parsedDoping() {
        return doping == null ? null : DopingText.parse(doping);
    }

    /** The conditions a map is converted with: the sidecar's, with every set field of these taking precedence. */
    public MeasurementConditions applyTo(MeasurementConditions fromFile) {
        Doping d = doping == null ? null : Doping.parse(doping);
        MeasurementConditions mine = new MeasurementConditions(d, thicknessUm, temperatureK, injectionPerCm3,
                generationPerCm3PerS, srvCmPerS, null, null, Map.of());
        boolean excitation = injectionPerCm3 != null || generationPerCm3PerS != null;
        MeasurementConditions base = excitation ? fromFile.withInjection(null).withGeneration(null) : fromFile;
        return base.overriddenBy(mine);
    }

    public ConditionOverrides withDoping(String d) {
        return new ConditionOverrides(d, thicknessUm, temperatureK, injectionPerCm3, generationPerCm3PerS, srvCmPerS);
    }

    public ConditionOverrides withThickness(Double um) {
        return new ConditionOverrides(doping, um, temperatureK, injectionPerCm3, generationPerCm3PerS, srvCmPerS);
    }

    public ConditionOverrides withTemperature(Double k) {
        return new ConditionOverrides(doping, thicknessUm, k, injectionPerCm3, generationPerCm3PerS, srvCmPerS);
    }

    /** A fixed injection level (clears the generation rate). */
    public ConditionOverrides withInjection(Double perCm3) {
        return new ConditionOverrides(doping, thicknessUm, temperatureK, perCm3, perCm3 == null
                ? generationPerCm3PerS : null, srvCmPerS);
    }

    /** A generation rate (clears the injection level). */
    public ConditionOverrides withGeneration(Double perCm3PerS) {
        return new ConditionOverrides(doping, thicknessUm, temperatureK, perCm3PerS == null ? injectionPerCm3 : null,
                perCm3PerS, srvCmPerS);
    }

    public ConditionOverrides withSrv(Double cmPerS) {
        return new ConditionOverrides(doping, thicknessUm, temperatureK, injectionPerCm3, generationPerCm3PerS,
                cmPerS);
    }
}
