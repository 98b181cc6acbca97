package trapmap.cluster;

import java.io.Serializable;
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

    /**
     * The judgement of these rules (the rules parsed as {@code inspect} parses them), the lot pattern (null: none) and
     * the iron section (null: none).
     */
    public record Judge(Rules rules, WaferInspection inspection, Pattern lotPattern, IronPairRules iron) {
        /** Whether a profile judges its maps with the other levels of an injection stack beside them. */
        public boolean hasStacks() {
            return rules.allProfiles().stream().anyMatch(p -> p.stack() != null);
        }
    }

    /**
     * Parses and checks the rules as {@code inspect} does (their iron section too).
     *
     * @throws RulesException with a one-line message naming the rules file and field
     */
    public Judge parse() throws RulesException {
        Rules rules = Rules.parse(rulesText, rulesName);
        Optional<Pattern> lots = LotPattern.parse(rulesText, rulesName);
        IronPairRules iron = IronPairRules.parse(rulesText, rulesName).orElse(null);
        return new Judge(rules, new WaferInspection(rules), lots.orElse(null), iron);
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
