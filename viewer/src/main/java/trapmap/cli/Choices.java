package trapmap.cli;

import java.util.Locale;
import picocli.CommandLine.ITypeConverter;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;

/** The named choices of the commands, parsed case-insensitively with one-line errors. */
final class Choices {
    private Choices() {
    }

    /** {@code fixed} (1.1e7 cm/s·sqrt(T/300)) or {@code green} (Green 1990). */
    static ThermalVelocityModel vth(String text) {
        String t = text == null ? "" : text.trim().toLowerCase(Locale.ROOT);
        switch (t) {
            case "fixed":
                return ThermalVelocityModel.FIXED;
            case "green":
            case "green1990":
            case "green-1990":
            case "green_1990":
                return ThermalVelocityModel.GREEN_1990;
            default:
                throw new Quantity.BadValue("must be fixed (1.1e7 cm/s at 300 K) or green (Green 1990) (got '"
                        + text.trim() + "')");
        }
    }

    /** The command-line name of a thermal-velocity model. */
    static String vthName(ThermalVelocityModel m) {
        return m == ThermalVelocityModel.GREEN_1990 ? "green" : m == ThermalVelocityModel.FIXED ? "fixed" : "custom";
    }

    /** {@code sproul} or {@code exact}. */
    static SurfaceModel surfaceModel(String text) {
        String t = text == null ? "" : text.trim().toLowerCase(Locale.ROOT);
        switch (t) {
            case "sproul":
                return SurfaceModel.SPROUL;
            case "exact":
                return SurfaceModel.EXACT;
            default:
                throw new Quantity.BadValue("must be sproul (Sproul 1994 approximation) or exact (fundamental mode)"
                        + " (got '" + text.trim() + "')");
        }
    }

    static final class Vth implements ITypeConverter<ThermalVelocityModel> {
        @Override
        public ThermalVelocityModel convert(String value) {
            return vth(value);
        }
    }

    static final class Surface implements ITypeConverter<SurfaceModel> {
        @Override
        public SurfaceModel convert(String value) {
            return surfaceModel(value);
        }
    }
}
