package trapmap.viewer.model;

import java.util.Collections;
import java.util.EnumMap;
import java.util.Map;

/**
 * The condition fields of the viewer as typed, checked one by one: each field is valid or has its own message (naming
 * the field and its unit), so that fixing or clearing one field clears its mark even while another is still wrong.
 * An empty field is always valid: it keeps the map's sidecar value. The rules are those of {@link ConditionOverrides}
 * (and through it {@code Checks} and {@code Doping.parse}); nothing is checked twice.
 *
 * @param dopingType    {@code p} or {@code n}
 * @param doping        the doping value as typed
 * @param dopingOhmCm   true when the doping value is a resistivity (Ω·cm), false for a net density (cm⁻³)
 * @param thickness     thickness as typed, µm
 * @param temperature   temperature as typed, K
 * @param generation    true when the excitation value is a generation rate (cm⁻³ s⁻¹), false for Δn (cm⁻³)
 * @param excitation    the excitation value as typed
 * @param srv           surface recombination velocity as typed, cm/s
 */
public record ConditionFields(String dopingType, String doping, boolean dopingOhmCm, String thickness,
                              String temperature, boolean generation, String excitation, String srv) {

    /** The fields of the conditions form. */
    public enum Field {
        DOPING("doping", "Ω·cm or cm⁻³"), THICKNESS("thickness", "µm"), TEMPERATURE("temperature", "K"),
        EXCITATION("excitation", "cm⁻³ or cm⁻³ s⁻¹"), SRV("surface recombination velocity", "cm/s");

        private final String label;
        private final String unit;

        Field(String label, String unit) {
            this.label = label;
            this.unit = unit;
        }

        public String label() {
            return label;
        }

        public String unit() {
            return unit;
        }
    }

    /**
     * The overrides when every field is valid (else null) and the message of each invalid field.
     *
     * @param overrides the conditions to apply, or null while a field is invalid
     * @param errors    message per invalid field; empty when all are valid
     */
    public record Outcome(ConditionOverrides overrides, Map<Field, String> errors) {
        public Outcome {
            EnumMap<Field, String> copy = new EnumMap<>(Field.class);
            copy.putAll(errors);
            errors = Collections.unmodifiableMap(copy);
        }

        /** The message of a field, or null when it is valid. */
        public String error(Field f) {
            return errors.get(f);
        }
    }

    /** Checks every field on its own, then (when all are valid) the combination. */
    public Outcome check() {
        Map<Field, String> errors = new EnumMap<>(Field.class);
        String d = null;
        if (!blank(doping)) {
            try {
                d = dopingType + ":" + parse(doping, Field.DOPING, dopingOhmCm ? "Ω·cm" : "cm⁻³")
                        + (dopingOhmCm ? "ohmcm" : "");
                ConditionOverrides.NONE.withDoping(d);
            } catch (IllegalArgumentException e) {
                errors.put(Field.DOPING, e.getMessage());
            }
        }
        Double t = field(thickness, Field.THICKNESS, "µm", errors, v -> ConditionOverrides.NONE.withThickness(v));
        Double k = field(temperature, Field.TEMPERATURE, "K", errors,
                v -> ConditionOverrides.NONE.withTemperature(v));
        Double ex = field(excitation, Field.EXCITATION, generation ? "cm⁻³ s⁻¹" : "cm⁻³", errors,
                v -> {
                    if (generation) {
                        ConditionOverrides.NONE.withGeneration(v);
                    } else {
                        ConditionOverrides.NONE.withInjection(v);
                    }
                });
        Double s = field(srv, Field.SRV, "cm/s", errors, v -> ConditionOverrides.NONE.withSrv(v));
        if (!errors.isEmpty()) {
            return new Outcome(null, errors);
        }
        return new Outcome(new ConditionOverrides(d, t, k, generation ? null : ex, generation ? ex : null, s),
                errors);
    }

    private static Double field(String text, Field f, String unit, Map<Field, String> errors,
                                java.util.function.DoubleConsumer rule) {
        if (blank(text)) {
            return null;
        }
        try {
            double v = parse(text, f, unit);
            rule.accept(v);
            return v;
        } catch (IllegalArgumentException e) {
            errors.put(f, e.getMessage());
            return null;
        }
    }

    private static double parse(String text, Field f, String unit) {
        String s = text.trim();
        try {
            double v = Double.parseDouble(s);
            if (!Double.isFinite(v)) {
                throw new NumberFormatException();
            }
            return v;
        } catch (NumberFormatException e) {
            throw new IllegalArgumentException(f.label() + ": '" + s + "' is not a number (" + unit + ")");
        }
    }

    private static boolean blank(String s) {
        return s == null || s.isBlank();
    }
}
