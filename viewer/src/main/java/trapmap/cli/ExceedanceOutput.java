package trapmap.cli;

import java.io.PrintWriter;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.PhysicsSettingsFile;
import trapmap.maps.io.UncertaintySettings;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.physics.defect.Defect;
import trapmap.shared.error.InvalidValueException;

/**
 * {@code convert --quantity exceedance-probability | density-quantile}: the map through {@link ExceedanceMaps}, with
 * the uncertainties of the {@code --physics} file's {@code uncertainty} block (else the defaults) and
 * {@code --samples} / {@code --seed} over it.
 */
final class ExceedanceOutput {
    /** Quantile level when none is given. */
    static final double DEFAULT_QUANTILE = 0.95;

    private final ConvertCommand c;

    ExceedanceOutput(ConvertCommand c) {
        this.c = c;
    }

    /** The uncertainty settings of the command line. */
    UncertaintySettings uncertainty() {
        UncertaintySettings u = UncertaintySettings.DEFAULTS;
        if (c.conditions.physics != null) {
            try {
                u = PhysicsSettingsFile.readUncertainty(c.conditions.physics);
            } catch (InvalidValueException e) {
                throw new InputException("--physics " + e.getMessage(), e);
            }
        }
        if (c.samples != null) {
            if (c.samples < trapmap.physics.uncertainty.ExceedanceModel.MIN_SAMPLES
                    || c.samples > trapmap.physics.uncertainty.ExceedanceModel.MAX_SAMPLES) {
                throw new InputException("--samples must be in [" + trapmap.physics.uncertainty.ExceedanceModel
                        .MIN_SAMPLES + ", " + trapmap.physics.uncertainty.ExceedanceModel.MAX_SAMPLES + "] (got "
                        + c.samples + ")");
            }
            u = u.withSamples(c.samples);
        }
        if (c.seed != null) {
            u = u.withSeed(c.seed);
        }
        return u;
    }

    int write(Defect d, Quantity wanted) throws MapFormatException {
        boolean probability = wanted == Quantity.EXCEEDANCE_PROBABILITY;
        if (probability && c.threshold == null) {
            throw new InputException("--quantity exceedance-probability needs --threshold (N* in cm^-3)");
        }
        if (!probability && c.threshold != null) {
            throw new InputException("--threshold belongs to --quantity exceedance-probability; density-quantile"
                    + " takes --quantile");
        }
        if (probability && c.quantileLevel != null) {
            throw new InputException("--quantile belongs to --quantity density-quantile");
        }
        double q = c.quantileLevel == null ? DEFAULT_QUANTILE : c.quantileLevel;
        if (!(q > 0 && q < 1)) {
            throw new InputException("--quantile must lie strictly between 0 and 1 (got " + c.quantileLevel + ")");
        }
        UncertaintySettings u = uncertainty();
        WaferMap map = MapInput.page(c.input, c.page);
        map = map.withConditions(c.conditions.applyTo(map.conditions()));
        ConversionSettings settings = c.settings();
        // N* of a quantile map only sets each sample's threshold lifetime, which the quantile does not read
        double nStar = probability ? c.threshold : 1;
        int threads = Runtime.getRuntime().availableProcessors();
        WaferMap out;
        try {
            ExceedanceMaps maps = ExceedanceMaps.prepare(map, d, settings, u.uncertainty(), nStar, u.samples(),
                    u.seed());
            out = probability ? maps.probabilityMap(map, threads) : maps.quantileMap(map, q, threads);
        } catch (InvalidValueException e) {
            throw new InputException(c.input + ": " + e.getMessage(), e);
        }
        MapInput.write(out, c.output);
        report(out, d, u, probability ? Double.NaN : q);
        return Exit.OK;
    }

    private void report(WaferMap out, Defect d, UncertaintySettings u, double q) {
        float[] v = out.raster().samples();
        long valid = 0;
        double sum = 0;
        long atLeastHalf = 0;
        for (float x : v) {
            if (!Float.isNaN(x)) {
                valid++;
                sum += x;
                atLeastHalf += x >= 0.5 ? 1 : 0;
            }
        }
        boolean probability = Double.isNaN(q);
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("input", c.input.toString());
        m.put("output", c.output.toString());
        m.put("quantity", out.quantity().key());
        m.put("unit", out.quantity().unit());
        m.put("width", out.width());
        m.put("height", out.height());
        m.put("defect", d.id());
        m.put("threshold_cm3", probability ? c.threshold : null);
        m.put("quantile", probability ? null : q);
        m.put("uncertainty", u.toJson());
        m.put("pixels_valid", valid);
        m.put("pixels_no_value", v.length - valid);
        if (probability) {
            m.put("mean_probability", valid == 0 ? null : sum / valid);
            m.put("share_probability_at_least_0.5", valid == 0 ? null : (double) atLeastHalf / valid);
        }
        m.put("caution", Calculation.CAUTION);
        PrintWriter stdout = c.spec.commandLine().getOut();
        if (c.json) {
            stdout.println(Output.json(m));
        } else {
            stdout.printf(Locale.ROOT, "wrote %s: %s (%s) of %s, %d x %d pixels, %d samples, seed %d%n", c.output,
                    out.quantity().key(), out.quantity().unit().isEmpty() ? "probability 0-1"
                            : out.quantity().unit(), d.id(), out.width(), out.height(), u.samples(), u.seed());
            stdout.println(probability ? String.format(Locale.ROOT, "P(N_t > %s cm^-3): mean %.4f over %d pixels,"
                    + " %d pixels without a value", c.threshold, valid == 0 ? Double.NaN : sum / valid, valid,
                    v.length - valid) : String.format(Locale.ROOT, "quantile q = %s of N_t over %d pixels, %d"
                    + " pixels without a value", q, valid, v.length - valid));
            stdout.println("caution: " + Calculation.CAUTION);
        }
        stdout.flush();
    }
}
