package trapmap.viewer.report;

import trapmap.viewer.graphics.Labels;

/**
 * Units and symbols as the PDF reports print them, in one place: the reports write these (set in the embedded face,
 * which has Greek letters, super- and subscripts and the middle dot) and never spelt-out forms such as "cm-3",
 * "Ohm", "sigma_n", "tau" or "mm^2".
 */
final class Typeset {
    /** Per cubic centimetre: densities and injection levels. */
    static final String PER_CM3 = "cm⁻³";
    /** Per cubic centimetre and second: generation rates. */
    static final String PER_CM3_S = "cm⁻³ s⁻¹";
    /** Resistivity. */
    static final String OHM_CM = "Ω·cm";
    /** Square millimetres: areas on the wafer. */
    static final String MM2 = "mm²";
    /** Square centimetres: capture cross-sections. */
    static final String CM2 = "cm²";
    /** Microseconds: lifetimes. */
    static final String US = "µs";
    /** Excess carrier density (injection level). */
    static final String DELTA_N = "Δn";
    /** Electron capture cross-section. */
    static final String SIGMA_N = "σₙ";
    /** Hole capture cross-section. */
    static final String SIGMA_P = "σₚ";
    /** Lifetime. */
    static final String TAU = "τ";

    private Typeset() {
    }

    /**
     * A stored or typed unit text as printed: "cm^-3", "cm-3", "cm3" → "cm⁻³"; "us" → "µs"; "mm2", "mm^2" → "mm²";
     * "Ohm cm", "ohmcm" → "Ω·cm"; anything else as {@link Labels#unit(String)} prints it.
     */
    static String unit(String stored) {
        if (stored == null) {
            return "";
        }
        return switch (stored.trim()) {
            case "cm^-3", "cm-3", "cm3", "1/cm3", "cm⁻³" -> PER_CM3;
            case "cm^-3 s^-1", "cm-3 s-1", "cm-3/s" -> PER_CM3_S;
            case "us", "µs", "μs" -> US;
            case "mm2", "mm^2", "mm²" -> MM2;
            case "cm2", "cm^2", "cm²" -> CM2;
            case "Ohm cm", "Ohm·cm", "ohm cm", "ohmcm", "Ohm.cm", "ohm.cm", "Ω cm", "Ω·cm" -> OHM_CM;
            default -> Labels.unit(stored);
        };
    }

    /** "name (unit)", or the name alone when the unit is empty. */
    static String headed(String name, String unit) {
        String u = unit(unit);
        return u.isEmpty() ? name : name + " (" + u + ")";
    }
}
