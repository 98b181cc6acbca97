package trapmap.physics.conversion;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import trapmap.physics.material.DensityOfStatesModel;
import trapmap.physics.material.IntrinsicDensityModel;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.RadiativeCoefficient;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * The model choices of a conversion that are not measurement conditions, as one object: every face (single values,
 * maps, batch, viewer) converts with one of these, and every output records it ({@link #describe()}). The defaults
 * ({@link #DEFAULTS}) are the normative ones: thermal velocity 1.1e7 cm/s·sqrt(T/300), Sproul 1994 surface
 * lifetime, n_i of Altermatt 2003 with the Sproul–Green temperature form, N_c/N_v of Green 1990, B_low = 4.73e-15
 * cm³/s (Trupke et al., JAP 94, 4930 (2003)) and a 5 % detection resolution.
 *
 * @param velocities          thermal-velocity model
 * @param surfaceModel        surface-lifetime model
 * @param intrinsicDensity    n_i(T) model
 * @param densityOfStates     N_c(T), N_v(T) model
 * @param radiativeCm3PerS    low-injection radiative coefficient B_low, cm³/s, in [1e-16, 1e-13]
 * @param detectionResolution relative lifetime resolution of the detection limit, in [1e-6, 1]
 */
public record PhysicsSettings(ThermalVelocityModel velocities, SurfaceModel surfaceModel,
                              IntrinsicDensityModel intrinsicDensity, DensityOfStatesModel densityOfStates,
                              double radiativeCm3PerS, double detectionResolution) {
    /** Lowest accepted B_low, cm³/s. */
    public static final double MIN_RADIATIVE_CM3_PER_S = 1e-16;
    /** Highest accepted B_low, cm³/s. */
    public static final double MAX_RADIATIVE_CM3_PER_S = 1e-13;

    /** The normative defaults. */
    public static final PhysicsSettings DEFAULTS = new PhysicsSettings(ThermalVelocityModel.FIXED, SurfaceModel.SPROUL,
            IntrinsicDensityModel.ALTERMATT_2003, DensityOfStatesModel.GREEN_1990,
            RadiativeCoefficient.TRUPKE_2003_CM3_PER_S, Conditions.DEFAULT_RESOLUTION);

    public PhysicsSettings {
        Checks.notNull(velocities, "thermal_velocity");
        Checks.notNull(surfaceModel, "surface_model");
        Checks.notNull(intrinsicDensity, "intrinsic_density");
        Checks.notNull(densityOfStates, "density_of_states");
        Checks.inRange(radiativeCm3PerS, MIN_RADIATIVE_CM3_PER_S, MAX_RADIATIVE_CM3_PER_S,
                "radiative_coefficient_cm3_s", "cm^3/s");
        Checks.inRange(detectionResolution, 1e-6, 1, "detection_resolution", "");
    }

    /** Silicon at {@code temperatureK} with these models. */
    public Silicon silicon(double temperatureK) {
        return Silicon.of(temperatureK, intrinsicDensity, densityOfStates, velocities);
    }

    public PhysicsSettings withVelocities(ThermalVelocityModel v) {
        return new PhysicsSettings(v, surfaceModel, intrinsicDensity, densityOfStates, radiativeCm3PerS,
                detectionResolution);
    }

    public PhysicsSettings withSurfaceModel(SurfaceModel m) {
        return new PhysicsSettings(velocities, m, intrinsicDensity, densityOfStates, radiativeCm3PerS,
                detectionResolution);
    }

    /** True when every choice is the default. */
    public boolean isDefault() {
        return equals(DEFAULTS);
    }

    /**
     * The settings as key → text in the settings file's names (the keys of the JSON form), for provenance: TIFF
     * history, results.json, reports.
     */
    public Map<String, String> describe() {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("thermal_velocity", name(velocities));
        m.put("surface_model", name(surfaceModel));
        m.put("intrinsic_density", name(intrinsicDensity));
        m.put("density_of_states", name(densityOfStates));
        m.put("radiative_coefficient_cm3_s", Double.toString(radiativeCm3PerS));
        m.put("detection_resolution", Double.toString(detectionResolution));
        return m;
    }

    /** One line, e.g. {@code thermal_velocity=fixed, surface_model=sproul, …}. */
    public String oneLine() {
        StringBuilder sb = new StringBuilder();
        describe().forEach((k, v) -> sb.append(sb.length() == 0 ? "" : ", ").append(k).append('=').append(v));
        return sb.toString();
    }

    /**
     * The settings-file name of a model choice: the enum constant in lower case with '-' for '_', except the
     * thermal-velocity models, which keep the command line's names ({@code fixed}, {@code green}).
     */
    public static String name(Enum<?> choice) {
        if (choice == ThermalVelocityModel.GREEN_1990) {
            return "green";
        }
        return choice.name().toLowerCase(Locale.ROOT).replace('_', '-');
    }

    /**
     * The choice of {@code type} named {@code text} (as {@link #name}; {@code green-1990} is also accepted).
     *
     * @throws InvalidValueException naming the field and the accepted names
     */
    public static <E extends Enum<E>> E choice(Class<E> type, String text, String field) {
        String t = text == null ? "" : text.trim().toLowerCase(Locale.ROOT);
        StringBuilder known = new StringBuilder();
        for (E e : type.getEnumConstants()) {
            if (name(e).equals(t) || e.name().toLowerCase(Locale.ROOT).replace('_', '-').equals(t)) {
                return e;
            }
            known.append(known.length() == 0 ? "" : ", ").append(name(e));
        }
        throw new InvalidValueException(field, "", field + " '" + text + "' is not one of " + known);
    }
}
