package trapmap.cli;

import java.util.Map;
import picocli.CommandLine.Option;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.process.ConversionSettings;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;

/**
 * Measurement conditions and model choices for commands that convert whole maps. Each flag overrides the map's
 * sidecar value; what neither gives stays unknown and the conversion says which field is missing.
 */
final class MapConditionOptions {
    @Option(names = "--doping", paramLabel = "<type:value>", converter = DopingValue.Converter.class,
            description = Help.DOPING_FORMS + " Overrides the sidecar. Default: the sidecar's; needed when the map"
                    + " has none.")
    DopingValue doping;

    @Option(names = "--injection", paramLabel = "<cm^-3>", converter = Quantity.Density.class,
            description = "Excess carrier density Δn of the map in cm^-3, 1e6-1e19 (overrides the sidecar).")
    Double injection;

    @Option(names = "--generation", paramLabel = "<cm^-3 s^-1>", converter = Quantity.Generation.class,
            description = "Steady-state generation rate G in cm^-3 s^-1 instead of --injection; each pixel gets"
                    + " Δn = G·τ_eff (overrides the sidecar).")
    Double generation;

    @Option(names = "--temperature", paramLabel = "<K>", converter = Quantity.Temperature.class,
            description = "Wafer temperature in K, 77-500 (overrides the sidecar). Default: the sidecar's, else"
                    + " 300 K.")
    Double temperature;

    @Option(names = "--thickness-um", paramLabel = "<µm>", converter = Quantity.Thickness.class,
            description = "Wafer thickness W in µm, 1-5000 (overrides the sidecar). Default: the sidecar's, else"
                    + " none (no surface term).")
    Double thicknessUm;

    @Option(names = "--srv", paramLabel = "<cm/s>", converter = Quantity.Srv.class,
            description = "Surface recombination velocity S in cm/s on both surfaces; needs a thickness. Default:"
                    + " the sidecar's, else ideal surfaces.")
    Double srv;

    @Option(names = "--surface-model", paramLabel = "sproul|exact", converter = Choices.Surface.class,
            description = "Surface lifetime model. Default: sproul.")
    SurfaceModel surfaceModel;

    @Option(names = "--vth", paramLabel = "fixed|green", converter = Choices.Vth.class, description = Help.VTH)
    ThermalVelocityModel vth;

    @Option(names = "--physics", paramLabel = "<physics.json>", description = PhysicsOption.DESCRIPTION
            + " --vth and --surface-model override its fields.")
    java.nio.file.Path physics;

    /**
     * Takes the options {@code names} of this mixin out of {@code command}'s help while still parsing them, so that
     * the command can refuse them with a line saying why instead of offering them.
     */
    static void hide(picocli.CommandLine.Model.CommandSpec command, String... names) {
        for (String name : names) {
            picocli.CommandLine.Model.OptionSpec shown = command.findOption(name);
            command.remove(shown);
            command.addOption(shown.toBuilder().hidden(true).build());
        }
    }

    /** The flags as conditions that override the sidecar's. */
    MeasurementConditions overrides() {
        if (injection != null && generation != null) {
            throw new InputException("--injection and --generation exclude each other: give Δn (cm^-3) or G"
                    + " (cm^-3 s^-1), not both");
        }
        return new MeasurementConditions(doping == null ? null : doping.doping(), thicknessUm, temperature, injection,
                generation, srv, null, null, Map.of());
    }

    /**
     * The map's conditions with the flags applied. A flag for injection replaces a sidecar generation rate and vice
     * versa, since a map has one or the other.
     */
    MeasurementConditions applyTo(MeasurementConditions fromFile) {
        MeasurementConditions base = fromFile;
        if (injection != null) {
            base = base.withGeneration(null);
        }
        if (generation != null) {
            base = base.withInjection(null);
        }
        return base.overriddenBy(overrides());
    }

    ConversionSettings settings() {
        ConversionSettings s = ConversionSettings.of(PhysicsOption.load(physics));
        if (vth != null) {
            s = s.withVelocities(vth);
        }
        if (surfaceModel != null) {
            s = s.withSurfaceModel(surfaceModel);
        }
        return s;
    }
}
