package trapmap.maps.batch;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.maps.spectroscopy.InjectionStack;
import trapmap.maps.spectroscopy.StackLifetimes;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * The figures of a profile's injection stack ({@link StackRules}) for one wafer: its other levels are read from
 * beside the judged map, checked and registered onto it ({@link InjectionStack}), every pixel (or block) is ranked
 * against the candidate defects ({@link DefectIdentification}, the engine of {@code trapmap identify}), and over the
 * evaluated pixels (the wafer less the edge exclusion) it counts
 * <ul>
 *   <li>{@code best_defect_area_fraction}: the pixels whose best defect is the profile's defect and whose ranking
 *       status is OK or BELOW_LIMIT (a single defect explains their curve: the legend count of {@code identify}),</li>
 *   <li>{@code no_single_defect_area_fraction}: the pixels whose status is NO_SINGLE_DEFECT,</li>
 * </ul>
 * each over the evaluated pixel count. Pixels without a usable curve (below the detection limit at too many levels,
 * no data) count in neither. Everything that judges a wafer (batch, viewer verdict, wafer report) goes through here.
 */
final class StackFigures {
    /**
     * The two shares and the identification behind them.
     *
     * @param bestDefect     best_defect_area_fraction
     * @param noSingleDefect no_single_defect_area_fraction
     * @param files          the file of every level, the judged map's first
     */
    record Shares(double bestDefect, double noSingleDefect, List<Path> files, IdentificationResult result) {
    }

    private StackFigures() {
    }

    /**
     * Identifies the stack of the wafer whose first-level map is {@code first} (read from {@code file}) and counts
     * the shares over the evaluated pixels {@code indices[0..count)}.
     *
     * @param first  the judged map, with the rules' conditions applied
     * @param rules  the rules (their conditions are applied to the other levels, their physics used)
     * @param defect the profile's defect
     * @throws IllegalArgumentException naming the level file and what is wrong with it when the stack cannot be
     *                                  formed
     */
    static Shares of(String file, WaferMap first, StackRules spec, Rules rules, Defect defect,
                     WaferInspection.MapReader reader, int[] indices, int count) {
        Path path = Path.of(file);
        String fileName = path.getFileName().toString();
        List<String> names = spec.levelNames(fileName).orElseThrow(() -> new IllegalArgumentException(
                "the file name does not match the stack's first level '" + spec.levels().get(0) + "'"));
        List<WaferMap> maps = new ArrayList<>();
        List<String> labels = new ArrayList<>();
        List<Path> files = new ArrayList<>();
        maps.add(first);
        labels.add(file);
        files.add(path);
        for (int l = 1; l < names.size(); l++) {
            Path p = path.resolveSibling(names.get(l));
            WaferMap m;
            try {
                m = reader.read(p);
            } catch (MapFormatException e) {
                throw new IllegalArgumentException("stack level " + (l + 1) + " of " + names.size() + ": "
                        + e.getMessage() + " (the stack's levels[" + l + "] '" + spec.levels().get(l) + "' names "
                        + p + ")", e);
            } catch (IOException e) {
                throw new IllegalArgumentException("stack level " + (l + 1) + " of " + names.size() + ": " + p
                        + " cannot be read (" + e.getMessage() + "); the stack's levels[" + l + "] '"
                        + spec.levels().get(l) + "' names it", e);
            }
            maps.add(m.withConditions(rules.applyTo(m.conditions())));
            labels.add(p.toString());
            files.add(p);
        }
        InjectionStack stack = InjectionStack.of(maps, labels, spec.register() ? InjectionStack.Options.DEFAULTS
                : new InjectionStack.Options(false, InjectionStack.Options.DEFAULTS.registration()));
        ConversionSettings settings = ConversionSettings.of(rules.physics());
        StackLifetimes lifetimes = StackLifetimes.of(stack, defect, settings, 1);
        ConductivityType type = lifetimes.doping().type();
        List<Defect> candidates = spec.candidates(type);
        DefectIdentification.Options options = DefectIdentification.Options.DEFAULTS.withBlock(spec.blockPx())
                .withNoise(spec.noise()).withThreads(1);
        IdentificationResult result = DefectIdentification.identify(lifetimes, candidates, options);
        float[] best = result.bestIndex();
        float[] status = result.status();
        int index = -1;
        for (IdentificationResult.LegendEntry e : result.legend()) {
            if (e.defectId().equals(defect.id())) {
                index = e.index();
            }
        }
        int ok = RankingStatus.OK.ordinal();
        int below = RankingStatus.BELOW_LIMIT.ordinal();
        int none = RankingStatus.NO_SINGLE_DEFECT.ordinal();
        int identified = 0;
        int noSingle = 0;
        for (int k = 0; k < count; k++) {
            int i = indices[k];
            float s = status[i];
            if ((s == ok || s == below) && best[i] == index) {
                identified++;
            } else if (s == none) {
                noSingle++;
            }
        }
        double n = count;
        return new Shares(count == 0 ? Double.NaN : identified / n, count == 0 ? Double.NaN : noSingle / n,
                List.copyOf(files), result);
    }
}
