package trapmap.viewer.model;

import java.util.Collections;
import java.util.EnumMap;
import java.util.Locale;
import java.util.Map;
import trapmap.physics.uncertainty.ConditionUncertainty;

/**
 * The viewer's fields for the probability of exceeding N* as typed: the threshold N* (cm⁻³), the number of samples,
 * the seed and the six standard uncertainties (relative ones in %, the temperature's in K), each checked on its own
 * so that every field gets its own message naming the field and its unit. The ranges are those of
 * {@link ExceedanceSettings} and {@link ConditionUncertainty}; nothing is checked twice.
 */
public final class ExceedanceForm {
    /** The fields, with their labels and units as shown. */
    public enum Field {
        THRESHOLD("threshold N*", "cm⁻³"), SAMPLES("samples", ""), SEED("seed", ""),
        DOPING("doping uncertainty", "%"), THICKNESS("thickness uncertainty", "%"),
        SRV("surface recombination velocity uncertainty", "%"), INJECTION("injection uncertainty", "%"),
        TEMPERATURE("temperature uncertainty", "K"), LIFETIME("lifetime noise", "%");

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
     * The settings when every field is valid (else null) and the message of each invalid field.
     *
     * @param settings the settings, or null while a field is invalid
     * @param errors   message per invalid field; empty when all are valid
     */
    public record Outcome(ExceedanceSettings settings, Map<Field, String> errors) {
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

    private final EnumMap<Field, String> texts = new EnumMap<>(Field.class);

    /** A form holding the texts of {@code s} (relative uncertainties as per cent). */
    public static ExceedanceForm of(ExceedanceSettings s) {
        ExceedanceForm f = new ExceedanceForm();
        ConditionUncertainty u = s.uncertainty();
        f.set(Field.THRESHOLD, Units.number(s.thresholdPerCm3()));
        f.set(Field.SAMPLES, Integer.toString(s.samples()));
        f.set(Field.SEED, Long.toString(s.seed()));
        f.set(Field.DOPING, percent(u.dopingRelative()));
        f.set(Field.THICKNESS, percent(u.thicknessRelative()));
        f.set(Field.SRV, percent(u.srvRelative()));
        f.set(Field.INJECTION, percent(u.injectionRelative()));
        f.set(Field.TEMPERATURE, plain(u.temperatureK()));
        f.set(Field.LIFETIME, percent(u.lifetimeRelative()));
        return f;
    }

    /** Sets a field's text. */
    public ExceedanceForm set(Field f, String text) {
        texts.put(f, text == null ? "" : text);
        return this;
    }

    /** A field's text. */
    public String text(Field f) {
        return texts.getOrDefault(f, "");
    }

    /** Checks each field on its own, then (when all are valid) builds the settings. */
    public Outcome check() {
        Map<Field, String> errors = new EnumMap<>(Field.class);
        double threshold = number(Field.THRESHOLD, errors);
        if (!errors.containsKey(Field.THRESHOLD) && !(threshold > 0)) {
            errors.put(Field.THRESHOLD, message(Field.THRESHOLD, text(Field.THRESHOLD), "must be above 0"));
        }
        double samples = number(Field.SAMPLES, errors);
        if (!errors.containsKey(Field.SAMPLES) && (samples != Math.rint(samples)
                || samples < trapmap.physics.uncertainty.ExceedanceModel.MIN_SAMPLES
                || samples > ExceedanceSettings.MAX_SAMPLES)) {
            errors.put(Field.SAMPLES, message(Field.SAMPLES, text(Field.SAMPLES), "must be a whole number from "
                    + trapmap.physics.uncertainty.ExceedanceModel.MIN_SAMPLES + " to " + ExceedanceSettings.MAX_SAMPLES));
        }
        long seed = 0;
        try {
            seed = Long.parseLong(text(Field.SEED).trim());
        } catch (NumberFormatException e) {
            errors.put(Field.SEED, message(Field.SEED, text(Field.SEED), "must be a whole number"));
        }
        double[] u = new double[6];
        Field[] uf = {Field.DOPING, Field.THICKNESS, Field.SRV, Field.INJECTION, Field.TEMPERATURE, Field.LIFETIME};
        for (int i = 0; i < uf.length; i++) {
            double v = number(uf[i], errors);
            boolean kelvin = uf[i] == Field.TEMPERATURE;
            double max = kelvin ? ConditionUncertainty.MAX_TEMPERATURE_K : ConditionUncertainty.MAX_RELATIVE * 100;
            if (!errors.containsKey(uf[i]) && !(v >= 0 && v <= max)) {
                errors.put(uf[i], message(uf[i], text(uf[i]), "must lie from 0 to " + plain(max) + " "
                        + uf[i].unit()));
            }
            u[i] = kelvin ? v : v / 100;
        }
        if (!errors.isEmpty()) {
            return new Outcome(null, errors);
        }
        ConditionUncertainty cu = new ConditionUncertainty(u[0], u[1], u[2], u[3], u[4], u[5]);
        return new Outcome(new ExceedanceSettings(cu, threshold, (int) samples, seed), errors);
    }

    private double number(Field f, Map<Field, String> errors) {
        String t = text(f).trim();
        try {
            double v = Double.parseDouble(t);
            if (Double.isFinite(v)) {
                return v;
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        errors.put(f, message(f, t, "is not a number"));
        return Double.NaN;
    }

    private static String message(Field f, String text, String problem) {
        return f.label() + (f.unit().isEmpty() ? "" : " (" + f.unit() + ")") + ": '" + text + "' " + problem;
    }

    private static String percent(double relative) {
        return plain(relative * 100);
    }

    private static String plain(double v) {
        double r = Math.round(v * 1e9) / 1e9;
        return r == Math.rint(r) && Math.abs(r) < 1e9 ? Long.toString((long) r) : String.format(Locale.ROOT, "%s", r);
    }
}
