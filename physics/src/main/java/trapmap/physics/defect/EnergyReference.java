package trapmap.physics.defect;

/** The band edge or level a trap energy is quoted from. */
public enum EnergyReference {
    /** Depth below the conduction band edge: E_t = E_c − energy. */
    CONDUCTION_BAND("E_c -"),
    /** Height above the valence band edge: E_t = E_v + energy. */
    VALENCE_BAND("E_v +"),
    /** Signed offset from the intrinsic level: E_t = E_i + energy. */
    INTRINSIC("E_i +");

    private final String prefix;

    EnergyReference(String prefix) {
        this.prefix = prefix;
    }

    /** Human-readable level, e.g. {@code "E_v + 0.38 eV"}. */
    public String format(double energyEv) {
        if (this == INTRINSIC && energyEv < 0) {
            return "E_i - " + trim(-energyEv) + " eV";
        }
        return prefix + " " + trim(energyEv) + " eV";
    }

    private static String trim(double v) {
        String s = String.format(java.util.Locale.ROOT, "%.4f", v);
        return s.replaceAll("0+$", "").replaceAll("\\.$", ".0");
    }
}
