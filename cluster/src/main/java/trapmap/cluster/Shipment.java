package trapmap.cluster;

import java.io.Serializable;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;
import java.util.regex.Pattern;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.WaferInspection;

/**
 * What the driver ships once to every executor (a Spark broadcast): the rules file's text and name. The rules carry
 * the physics settings ({@code physics} block) and name their defects from the built-in library, which every
 * executor holds as code; each executor JVM parses the text once and keeps the inspection ({@link #inspection}).
 *
 * @param rulesText the rules file's text
 * @param rulesName the rules file's path or URI, prefixing every message
 */
public record Shipment(String rulesText, String rulesName) implements Serializable {
    private static final long serialVersionUID = 1L;

    /** Parsed once per JVM: the rules' judgement and lot pattern, by shipment. */
    private static final Map<Shipment, Judge> JUDGES = new ConcurrentHashMap<>();

    /** The judgement of these rules (the rules parsed as {@code inspect} parses them) and the lot pattern. */
    public record Judge(Rules rules, WaferInspection inspection, Pattern lotPattern) {
    }

    /**
     * Parses and checks the rules as {@code inspect} does, and refuses what a wafer judged alone cannot have: a
     * profile's injection stack (the other levels' maps beside it).
     *
     * @throws RulesException with a one-line message naming the rules file and field
     */
    public Judge parse() throws RulesException {
        Rules rules = Rules.parse(rulesText, rulesName);
        for (Rules.Profile p : rules.allProfiles()) {
            if (p.stack() != null) {
                throw new RulesException(rulesName + ": profile '" + p.name() + "' has a 'stack' (maps of several"
                        + " injection levels judged together); the cluster job judges each map alone, so use inspect"
                        + " for injection stacks");
            }
        }
        Optional<Pattern> lots = LotPattern.parse(rulesText, rulesName);
        return new Judge(rules, new WaferInspection(rules), lots.orElse(null));
    }

    /**
     * What the cluster job leaves out of these rules, one line each: the {@code iron} section (its pairs need two maps
     * of a wafer together; each map is judged alone, and the FeB-state map's row has no iron columns).
     */
    public List<String> leftOut() throws RulesException {
        if (IronPairRules.parse(rulesText, rulesName).isPresent()) {
            return List.of(rulesName + ": the 'iron' section is left out: its FeB/Fe_i pairs need two maps of a wafer"
                    + " together, and the cluster job judges each map alone (inspect evaluates the pairs)");
        }
        return List.of();
    }

    /** The judgement of this shipment in this JVM, parsed on first use. */
    public Judge judge() {
        return JUDGES.computeIfAbsent(this, s -> {
            try {
                return s.parse();
            } catch (RulesException e) {
                throw new IllegalStateException(e.getMessage(), e); // checked on the driver before the job
            }
        });
    }
}
