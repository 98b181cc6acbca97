package trapmap.cli;

import static java.util.Map.entry;

import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import trapmap.shared.error.InvalidValueException;

/**
 * What each flag expects, and which flag a physics field belongs to, so that every error message names the flag the
 * user typed and the unit it is read in.
 */
final class Flags {
    /** What a flag expects, for "needs a value" and "is required" messages. */
    private static final Map<String, String> EXPECTED = Map.ofEntries(
            entry("--lifetime-us", "an effective lifetime in µs"),
            entry("--doping", DopingValue.EXPECTED),
            entry("--injection", "an excess carrier density Δn in cm^-3"),
            entry("--generation", "a generation rate G in cm^-3 s^-1"),
            entry("--defect", "a defect id (list them with 'trapmap defects')"),
            entry("--defect-file", "a JSON file of user-defined defects"),
            entry("--temperature", "a temperature in K"),
            entry("--thickness-um", "a wafer thickness in µm"),
            entry("--srv", "a surface recombination velocity in cm/s"),
            entry("--surface-model", "sproul or exact"),
            entry("--vth", "fixed or green"),
            entry("--reference-injection", "an excess carrier density in cm^-3"),
            entry("--cases", "a CSV file of cases"),
            entry("--out", "the CSV file to write"),
            entry("--before-us", "the lifetime before FeB dissociation in µs"),
            entry("--after-us", "the lifetime after FeB dissociation in µs"),
            entry("--degraded-us", "the degraded lifetime in µs"),
            entry("--annealed-us", "the annealed (or regenerated) lifetime in µs"),
            entry("--counts", "the PL signal in counts"),
            entry("--reference-counts", "the reference PL signal in counts"),
            entry("--reference-lifetime-us", "the reference effective lifetime in µs"),
            entry("--rules", "a rules file (.json)"),
            entry("--physics", "a physics settings file (.json)"),
            entry("--output", "the output file (.tif, .csv or .png)"),
            entry("--status-output", "the status map file (.tif, .csv or .png)"),
            entry("--quantity", "the name of a quantity (see --help)"),
            entry("--max-rotation-deg", "the largest rotation searched, in degrees"),
            entry("--block", "a block side in pixels, from 1"),
            entry("--noise", "a relative uncertainty as a fraction (0.03 = 3 %), no unit"),
            entry("--region-below-us", "a lifetime in µs"),
            entry("--min-region-px", "a number of pixels, from 1"),
            entry("--defects", "defect ids separated by commas (list them with 'trapmap defects')"),
            entry("--tolerance", "a relative change as a fraction (0.05 = ±5 %), no unit"),
            entry("--page", "a page number of the TIFF, from 1"),
            entry("--threads", "a number of maps inspected at once, from 1"),
            entry("--threshold", "a threshold in the unit of the map (µs for lifetimes, cm^-3 for densities)"),
            entry("--min-area-mm2", "an area in mm²"),
            entry("--edge-exclusion-mm", "a width in mm"),
            entry("--wafer", "a wafer format id (round-150-flat, m10, ...)"),
            entry("--flag", "above or below"),
            entry("--quantile", "a quantile level q between 0 and 1, no unit"),
            entry("--samples", "a number of Monte Carlo samples, 16-4194304"),
            entry("--seed", "a whole number, the seed of the draws"),
            entry("--store", "a results store: a SQLite file or postgresql://host[:port]/database"),
            entry("--figure", "a figure name, a column of results.csv (e.g. trap_density_p50_cm3)"),
            entry("--by", "lot, day, week, none or a sidecar fact's name"),
            entry("--since", "a UTC date (2026-11-02) or time (2026-11-02T08:00:00Z)"),
            entry("--profile", "a rules profile's name"),
            entry("--baseline", "a number of wafers (groups), from 2"),
            entry("--baseline-until", "a UTC date (2026-11-02) or time (2026-11-02T08:00:00Z)"),
            entry("--until", "a UTC date (2026-11-02, the whole day) or time (2026-11-02T08:00:00Z)"),
            entry("--lot", "a lot's name"),
            entry("--where", "NAME=VALUE: a sidecar fact and its value (furnace_tube=T2)"),
            entry("--cell", "a cell size in mm: 1 or an odd number (3, 5, ...)"),
            entry("--settle-s", "a time in s, from 0"),
            entry("--scan-s", "a time in s, above 0"),
            entry("--exit-idle-s", "a time in s, from 0 (0: never)"));

    /** What a flag expects where one command reads it differently, by command name (without "trapmap "). */
    private static final Map<String, String> EXPECTED_IN = Map.ofEntries(
            entry("inspect --out", "the folder for the results"),
            entry("watch --out", "the folder for the results"),
            entry("report --out", "the report to write (.pdf)"),
            entry("trend --out", "the output file (.pdf, .png or .csv)"),
            entry("recurrence --out", "the folder for the recurrence maps and tables"),
            entry("identify --output", "the best-defect index map (.tif)"),
            entry("demo --out", "the folder to write the demonstration set into"),
            entry("demo --history", "the folder to write the invented production history into"),
            entry("calc --out", "the CSV file to write"));

    /** Field names used by the physics checks, with the flag the value came from. */
    private static final Map<String, String> PHYSICS_FIELDS = Map.ofEntries(
            entry("injection", "--injection"),
            entry("generation", "--generation"),
            entry("doping", "--doping"),
            entry("doping type", "--doping"),
            entry("resistivity", "--doping"),
            entry("dopantDensity", "--doping"),
            entry("temperature", "--temperature"),
            entry("thickness", "--thickness-um"),
            entry("surfaceRecombinationVelocity", "--srv"),
            entry("referenceInjection", "--reference-injection"),
            entry("defect", "--defect"),
            entry("degradedLifetime", "--degraded-us"),
            entry("annealedLifetime", "--annealed-us"),
            entry("referenceCounts", "--reference-counts"),
            entry("referenceLifetime", "--reference-lifetime-us"));

    private static final Pattern DECIMAL = Pattern.compile("(?<![\\w.])-?\\d+\\.\\d+(E-?\\d+)?(?![\\w.])");

    private Flags() {
    }

    /**
     * The name messages use for {@code option}: its first declared long name, so that an option with several
     * spellings ({@code -o, --out, --output}) keeps the name its command documents; the longest name otherwise.
     */
    static String name(picocli.CommandLine.Model.OptionSpec option) {
        for (String n : option.names()) {
            if (n.startsWith("--")) {
                return n;
            }
        }
        return option.longestName();
    }

    /** What {@code flag} expects, e.g. {@code a wafer thickness in µm}. */
    static String expected(String flag) {
        return EXPECTED.getOrDefault(flag, "a value");
    }

    /** What {@code flag} of {@code command} (qualified, e.g. {@code trapmap report}) expects. */
    static String expected(String command, String flag) {
        String name = command.startsWith("trapmap ") ? command.substring("trapmap ".length()) : command;
        String special = EXPECTED_IN.get(name + " " + flag);
        return special != null ? special : expected(flag);
    }

    /** Whether {@link #expected(String, String)} knows what {@code flag} of {@code command} expects. */
    static boolean knows(String command, String flag) {
        return !expected(command, flag).equals(expected("--no-such-option"));
    }

    /** {@code "--x is required: <what it expects>"}. */
    static InputException required(String flag) {
        return new InputException(flag + " is required: " + expected(flag));
    }

    /**
     * A one-line message for a physics range error, in terms of the flag: {@code thickness must be in [1.0, 5000.0]
     * um but was 0.5} becomes {@code --thickness-um must be in [1, 5000] µm (got 0.5)}. A message that names a file's
     * field ({@code FILE: field 'doping' is …}) gets no flag: the value came from the file.
     */
    static String message(InvalidValueException e) {
        String field = e.field() == null ? "" : e.field();
        String flag = PHYSICS_FIELDS.get(field);
        String msg = oneLine(e.getMessage());
        msg = msg.replaceAll(" but was (\\S+)$", " (got $1)");
        Matcher m = DECIMAL.matcher(msg);
        StringBuilder sb = new StringBuilder();
        while (m.find()) {
            m.appendReplacement(sb, Matcher.quoteReplacement(Format.exact(Double.parseDouble(m.group()))));
        }
        m.appendTail(sb);
        msg = sb.toString().replaceAll("\\bum\\b", "µm").replaceAll("\\bus\\b", "µs").replace("ohm*cm", "Ω·cm");
        if (flag == null || msg.contains(": field '")) {
            // a message that names a file's field (a sidecar's doping, say) is about the file, not the flag
            return msg;
        }
        if (!field.isEmpty() && msg.startsWith(field + " ")) {
            return flag + msg.substring(field.length());
        }
        return flag + ": " + msg;
    }

    /**
     * A results store's refusal as the one line after {@code --store}: {@code NAME: problem}, without the leading
     * "store " of the store's own message (which would read "--store store NAME") and without the database driver's
     * appended block of dashes, SQL state and error code, which repeats the problem.
     */
    static String storeProblem(String message) {
        String m = oneLine(message);
        if (m.startsWith("store ")) {
            m = m.substring("store ".length());
        }
        int dashes = m.indexOf(" -----");
        return dashes > 0 ? m.substring(0, dashes) : m;
    }

    /**
     * Refuses, with {@code --no-registration}, the options among {@code registrationOptions} that were given: they
     * shape a registration that is then not made, and would be ignored.
     */
    static void refuseWithoutRegistration(picocli.CommandLine.Model.CommandSpec spec, boolean noRegistration,
                                          String... registrationOptions) {
        if (!noRegistration) {
            return;
        }
        for (String option : registrationOptions) {
            if (spec.commandLine().getParseResult().hasMatchedOption(option)) {
                throw new InputException(option + " shapes the registration, which --no-registration leaves out:"
                        + " give one or the other");
            }
        }
    }

    /** {@code s} on one line. */
    static String oneLine(String s) {
        return s == null ? "" : s.replaceAll("\\s*\\R\\s*", " ").trim();
    }
}
