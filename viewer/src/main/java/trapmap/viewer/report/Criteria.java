package trapmap.viewer.report;

import java.util.ArrayList;
import java.util.List;
import trapmap.maps.batch.Rules;
import trapmap.viewer.graphics.Labels;

/** The criteria of a rules profile in words, for the summary. */
final class Criteria {
    private Criteria() {
    }

    /** Which maps the profile judges. */
    static String judges(Rules.Profile p) {
        if (p.match() == null) {
            return "every map no other profile matches";
        }
        List<String> parts = new ArrayList<>();
        Rules.Match m = p.match();
        if (m.type() != null) {
            parts.add(m.type().name().toLowerCase(java.util.Locale.ROOT).charAt(0) + "-type maps");
        }
        if (!m.families().isEmpty()) {
            parts.add("wafer format " + String.join(" or ", m.families()));
        }
        if (m.file() != null) {
            parts.add("files named " + m.file());
        }
        if (p.stack() != null) {
            trapmap.maps.batch.StackRules s = p.stack();
            parts.add("with their injection stack (" + s.levels().size() + " levels: " + String.join(", ", s.levels())
                    + "; candidates " + (s.defects().isEmpty() ? "the library defects suited to the type"
                    : String.join(", ", s.defects())) + "; pixel noise " + Labels.number(s.noise() * 100) + " %"
                    + (s.blockPx() > 1 ? "; blocks of " + s.blockPx() + " px" : "")
                    + (s.register() ? "" : "; levels taken as aligned") + ")");
        }
        return String.join(", ", parts);
    }

    /** What is flagged, e.g. "trap density above 3e11 cm⁻³ (fe-i), regions of at least 4 mm²". */
    static String flag(Rules.Profile p) {
        Rules.Flag f = p.flag();
        boolean density = f.quantity() == Rules.FlagQuantity.TRAP_DENSITY;
        return (density ? "trap density above " : "lifetime below ") + Labels.number(f.threshold(),
                f.quantity().unit()) + (density && p.defectId() != null ? " (" + p.defectId() + ")" : "")
                + (f.confident() ? " with probability at least " + Labels.number(f.confidence()) + " ("
                + Labels.number(f.uncertainty().samples()) + " samples, seed " + f.uncertainty().seed() + ")" : "")
                + (f.minAreaMm2() > 0 ? ", regions of at least " + Labels.number(f.minAreaMm2()) + " " + Typeset.MM2
                : "");
    }

    /** One limit with its unit: "≤ 4e11 cm⁻³", "≥ 50 µs", "0.1 to 2". */
    static String limit(Rules.Limit l) {
        String u = l.figure().unit();
        if (!Double.isNaN(l.min()) && !Double.isNaN(l.max())) {
            return Labels.number(l.min()) + " to " + Labels.number(l.max(), u);
        }
        return Double.isNaN(l.min()) ? "≤ " + Labels.number(l.max(), u) : "≥ " + Labels.number(l.min(), u);
    }

    /** The grades in order: "A when …; otherwise B. Failed wafers: R." */
    static String grades(Rules.Profile p) {
        List<String> parts = new ArrayList<>();
        for (Rules.Grade g : p.grades()) {
            if (g.when().isEmpty()) {
                parts.add((parts.isEmpty() ? "" : "otherwise ") + g.grade());
            } else {
                List<String> w = new ArrayList<>();
                for (Rules.Limit l : g.when()) {
                    w.add(l.figure().what() + " " + limit(l));
                }
                parts.add(g.grade() + " when " + String.join(", ", w));
            }
        }
        String passing = parts.isEmpty() ? "no grades for passing wafers" : String.join("; ", parts);
        return passing + ". Failed wafers: " + (p.failGrade().isEmpty() ? "no grade" : p.failGrade()) + ".";
    }
}
