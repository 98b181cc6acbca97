package trapmap.cli;

import java.nio.file.Path;
import trapmap.maps.io.PhysicsSettingsFile;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.shared.error.InvalidValueException;

/** {@code --physics FILE}: the physics settings file every converting command accepts. */
final class PhysicsOption {
    static final String DESCRIPTION = "Physics settings file (JSON: thermal_velocity, surface_model,"
            + " intrinsic_density, density_of_states, radiative_coefficient_cm3_s, detection_resolution; see the"
            + " README, 'Models and defaults'). Default: the normative defaults.";

    private PhysicsOption() {
    }

    /**
     * The settings of {@code file}, or the defaults when null.
     *
     * @throws InputException naming the option, the file, the field and its unit
     */
    static PhysicsSettings load(Path file) {
        if (file == null) {
            return PhysicsSettings.DEFAULTS;
        }
        try {
            return PhysicsSettingsFile.read(file);
        } catch (InvalidValueException e) {
            throw new InputException("--physics " + e.getMessage(), e);
        }
    }
}
