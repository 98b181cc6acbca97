package trapmap.cli;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.apache.commons.csv.CSVFormat;
import trapmap.maps.io.CsvCells;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import org.apache.commons.csv.DuplicateHeaderMode;
import trapmap.shared.error.InvalidValueException;

/**
 * A table of {@code calc} cases. The input CSV has a header row; the columns named like the flags (without dashes,
 * {@code -} as {@code _}: {@code lifetime_us, doping, injection, generation, defect, temperature, thickness_um, srv,
 * surface_model, vth, reference_injection}) give each case, blank cells fall back to the command-line flags, and
 * other columns are carried through. The output has the input columns, then every result field (a field whose name
 * is already an input column is written as {@code result_<name>}), then {@code error}. A row that cannot be
 * converted gets {@code status=ERROR} and its message in {@code error}; the other rows go on. The output is written
 * through {@link trapmap.maps.io.AtomicFiles} (its folder created when missing), so that a reader never sees half a
 * file.
 */
final class CasesFile {
    /** Outcome of a run. */
    record Summary(int rows, int errors) {
    }

    private CasesFile() {
    }

    /**
     * Converts every case of {@code in} and writes {@code out}.
     *
     * @throws InputException when the input cannot be read or parsed as CSV, or the output cannot be written
     */
    static Summary run(Path in, Path out, CalcRequest defaults, DefectCatalog catalog) {
        return run(in, out, defaults, catalog, trapmap.physics.conversion.PhysicsSettings.DEFAULTS);
    }

    /** As {@link #run(Path, Path, CalcRequest, DefectCatalog)} with the given physics settings. */
    static Summary run(Path in, Path out, CalcRequest defaults, DefectCatalog catalog,
                       trapmap.physics.conversion.PhysicsSettings physics) {
        if (in.toAbsolutePath().normalize().equals(out.toAbsolutePath().normalize())) {
            throw new InputException("--out must differ from --cases (got " + out + " for both)");
        }
        CSVFormat inFormat = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true)
                .setIgnoreSurroundingSpaces(true).setIgnoreEmptyLines(true).setCommentMarker('#')
                .setDuplicateHeaderMode(DuplicateHeaderMode.DISALLOW).setAllowMissingColumnNames(false).get();
        List<String> header;
        List<List<String>> outRows = new ArrayList<>();
        int errors = 0;
        try (Reader reader = new java.io.BufferedReader(new java.io.InputStreamReader(
                trapmap.maps.io.InputFiles.open(in, trapmap.maps.io.InputFiles.TABLE_MAX_BYTES),
                StandardCharsets.UTF_8.newDecoder()));
             CSVParser parser = CSVParser.parse(reader, inFormat)) {
            header = List.copyOf(parser.getHeaderNames());
            if (header.isEmpty()) {
                throw new InputException("--cases " + in + ": has no header row (expected columns like lifetime_us,"
                        + " doping, injection, defect)");
            }
            Map<Integer, CalcRequest.Param> params = columns(header);
            List<String> resultColumns = resultColumns(header);
            outRows.add(concat(header, resultColumns));
            for (CSVRecord rec : parser) {
                List<String> input = new ArrayList<>();
                rec.forEach(input::add);
                String error = null;
                Map<String, Object> result = null;
                if (input.size() > header.size()) {
                    error = "row has " + input.size() + " values but the header has " + header.size() + " columns";
                } else {
                    try {
                        Map<CalcRequest.Param, String> cells = new EnumMap<>(CalcRequest.Param.class);
                        params.forEach((i, p) -> cells.put(p, i < input.size() ? input.get(i) : ""));
                        result = Calculation.run(CalcRequest.fromCells(cells).orElse(defaults), catalog,
                                physics);
                    } catch (InputException e) {
                        error = InputException.forColumns(e.getMessage());
                    } catch (InvalidValueException e) {
                        error = InputException.forColumns(Flags.message(e));
                    } catch (IllegalArgumentException | ArithmeticException e) {
                        error = "cannot convert this case: " + Flags.oneLine(e.getMessage());
                    }
                }
                while (input.size() < header.size()) {
                    input.add("");
                }
                List<String> row = new ArrayList<>(input.subList(0, header.size()));
                for (String field : Calculation.FIELDS) {
                    row.add(result != null ? Output.cell(result.get(field)) : field.equals("status") ? "ERROR" : "");
                }
                row.add(error == null ? "" : error);
                if (error != null) {
                    errors++;
                }
                outRows.add(row);
            }
        } catch (NoSuchFileException e) {
            throw new InputException("--cases " + in + ": no such file", e);
        } catch (trapmap.maps.io.InputFiles.Refused e) {
            throw new InputException("--cases " + in + ": " + e.reason(), e);
        } catch (UncheckedIOException e) {
            if (e.getCause() instanceof trapmap.maps.io.InputFiles.Refused r) {
                throw new InputException("--cases " + in + ": " + r.reason(), e);
            }
            throw notCsv(in, e);
        } catch (IOException | IllegalArgumentException | IllegalStateException e) {
            throw notCsv(in, e);
        }
        write(out, outRows);
        return new Summary(outRows.size() - 1, errors);
    }

    private static Map<Integer, CalcRequest.Param> columns(List<String> header) {
        Map<String, CalcRequest.Param> byColumn = new LinkedHashMap<>();
        for (CalcRequest.Param p : CalcRequest.Param.values()) {
            byColumn.put(p.column(), p);
        }
        Map<Integer, CalcRequest.Param> params = new LinkedHashMap<>();
        Set<CalcRequest.Param> seen = new HashSet<>();
        for (int i = 0; i < header.size(); i++) {
            CalcRequest.Param p = byColumn.get(normalise(header.get(i)));
            if (p != null) {
                if (!seen.add(p)) {
                    throw new InputException("--cases: column " + p.column() + " appears twice in the header");
                }
                params.put(i, p);
            }
        }
        return params;
    }

    private static List<String> resultColumns(List<String> header) {
        Set<String> taken = new HashSet<>();
        header.forEach(h -> taken.add(normalise(h)));
        List<String> cols = new ArrayList<>();
        for (String f : Calculation.FIELDS) {
            cols.add(taken.contains(f) ? "result_" + f : f);
        }
        cols.add(taken.contains("error") ? "result_error" : "error");
        return cols;
    }

    /** The refusal of a cases file that could not be read as CSV; a binary file (a map, say) is said to be one. */
    private static InputException notCsv(Path in, Exception e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof java.nio.charset.CharacterCodingException) {
                return new InputException("--cases " + in + ": is not UTF-8 text (a binary file?); a CSV table of"
                        + " cases with a header row was expected", e);
            }
        }
        return new InputException("--cases " + in + ": cannot read it as CSV with a header row ("
                + Flags.oneLine(e.getMessage()) + ")", e);
    }

    private static String normalise(String column) {
        return column.trim().toLowerCase(Locale.ROOT).replace('-', '_');
    }

    private static List<String> concat(List<String> a, List<String> b) {
        List<String> all = new ArrayList<>(a);
        all.addAll(b);
        return all;
    }

    private static void write(Path out, List<List<String>> rows) {
        try {
            // the folder is created when missing; readers see the old file or the complete new one
            trapmap.maps.io.AtomicFiles.write(out, tmp -> {
                try (BufferedWriter w = Files.newBufferedWriter(tmp, StandardCharsets.UTF_8);
                     CSVPrinter printer = new CSVPrinter(w,
                             CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                    for (List<String> row : rows) {
                        printer.printRecord(row.stream().map(CsvCells::text).toList());
                    }
                }
            });
        } catch (IOException e) {
            throw new InputException("--out " + out + ": cannot write it (" + MapInput.writeFailure(e) + ")", e);
        }
    }
}
