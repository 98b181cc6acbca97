package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.ConductivityType;

/** The {@code stack} of a rules profile: parsing, its checks and messages, and the level names it derives. */
class StackRulesTest {
    private static final String FLAG = "\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 20}";
    private static final String LEVELS = "\"levels\": [\"*-dn1e13.*\", \"*-dn1e14.*\", \"*-dn1e15.*\"]";

    private static Rules rules(String profileBody) throws RulesException {
        return Rules.parse("{" + FLAG + ", \"profiles\": [{\"name\": \"stack\", \"match\": {\"file\": \"*-dn1e13.*\"}"
                + (profileBody.isEmpty() ? "" : ", " + profileBody) + "}]}", "r.json");
    }

    private static String stack(String body) {
        return "\"defect\": \"fe-i\", \"stack\": {" + body + "}";
    }

    @Test
    void aProfileWithAStackReportsTheTwoShares() throws RulesException {
        Rules r = rules(stack(LEVELS + ", \"defects\": [\"fe-i\", \"cr-i\"], \"noise\": 0.05, \"block_px\": 3,"
                + " \"register\": false") + ", \"limits\": {\"best_defect_area_fraction\": {\"max\": 0.01}}");
        Rules.Profile p = r.profiles().get(0);
        StackRules s = p.stack();
        assertThat(s.levels()).containsExactly("*-dn1e13.*", "*-dn1e14.*", "*-dn1e15.*");
        assertThat(s.defects()).containsExactly("fe-i", "cr-i");
        assertThat(s.noise()).isEqualTo(0.05);
        assertThat(s.blockPx()).isEqualTo(3);
        assertThat(s.register()).isFalse();
        assertThat(p.figures()).extracting(Figure::name).contains(Figure.BEST_DEFECT_AREA_FRACTION,
                Figure.NO_SINGLE_DEFECT_AREA_FRACTION);
        assertThat(r.figures()).extracting(Figure::name).contains(Figure.NO_SINGLE_DEFECT_AREA_FRACTION);
        assertThat(r.defaultProfile().stack()).isNull();
        assertThat(r.defaultProfile().figures()).extracting(Figure::name)
                .doesNotContain(Figure.BEST_DEFECT_AREA_FRACTION);
        assertThat(Figure.parse(Figure.BEST_DEFECT_AREA_FRACTION).label()).isEqualTo("best-defect area fraction");
        assertThat(Figure.parse(Figure.NO_SINGLE_DEFECT_AREA_FRACTION).needsStack()).isTrue();
        assertThat(Figure.parse("flagged_area_fraction").needsStack()).isFalse();
    }

    @Test
    void defaultsAreThreePercentPixelByPixelRegisteredOnTheSuitedLibrary() throws RulesException {
        StackRules s = rules(stack(LEVELS)).profiles().get(0).stack();
        assertThat(s.noise()).isEqualTo(0.03);
        assertThat(s.blockPx()).isEqualTo(1);
        assertThat(s.register()).isTrue();
        assertThat(s.defects()).isEmpty();
        assertThat(s.candidates(ConductivityType.P)).extracting(Defect::id).contains("fe-i", "cr-i", "fe-b")
                .doesNotContain("au-a", "bo-lid");
        assertThat(s.candidates(ConductivityType.N)).extracting(Defect::id).contains("cr-i", "au-a")
                .doesNotContain("fe-i");
    }

    @Test
    void levelNamesFollowTheWildcardsOfTheFirstGlob() throws RulesException {
        StackRules s = rules(stack(LEVELS)).profiles().get(0).stack();
        assertThat(s.levelNames("LOT-S01-W01-dn1e13.tif")).contains(List.of("LOT-S01-W01-dn1e13.tif",
                "LOT-S01-W01-dn1e14.tif", "LOT-S01-W01-dn1e15.tif"));
        assertThat(s.judges("LOT-S01-W01-dn1e13.tif")).isTrue();
        assertThat(s.judges("LOT-S01-W01-dn1e14.tif")).isFalse();
        assertThat(s.levelNames("LOT-S01-W01-dn1e14.tif")).isEmpty();
        StackRules two = new StackRules(List.of("w?-low-*.tif", "w?-high-*.tif"), List.of(), 0.03, 1, true);
        assertThat(two.levelNames("w7-low-a.tif")).contains(List.of("w7-low-a.tif", "w7-high-a.tif"));
    }

    @Test
    void badStacksAreRefusedNamingTheField() throws RulesException {
        assertThatThrownBy(() -> rules(stack("\"levels\": [\"*-dn1e13.*\"]")))
                .hasMessage("r.json: field 'profiles[0].stack.levels': is required: an array of at least 2 file-name"
                        + " globs, one per injection level, the judged map's first (e.g. [\"*-dn1e13.*\","
                        + " \"*-dn1e14.*\"])");
        assertThatThrownBy(() -> rules(stack("\"levels\": [\"*-dn1e13.*\", \"*-dn1e13.*\"]")))
                .hasMessageContaining("field 'profiles[0].stack.levels[1]': '*-dn1e13.*' is given twice");
        assertThatThrownBy(() -> rules(stack("\"levels\": [\"*-dn1e13.*\", \"*-?-dn1e14.*\"]")))
                .hasMessageContaining("field 'profiles[0].stack.levels[1]': must have the same * and ? wildcards");
        assertThatThrownBy(() -> rules(stack("\"levels\": [\"*-dn1e13.*\", \"sub/*-dn1e14.*\"]")))
                .hasMessageContaining("only * and ? wildcards");
        assertThatThrownBy(() -> rules(stack("\"levels\": [\"a-dn1e13.tif\", \"a-dn1e14.tif\"]")))
                .hasMessageContaining("needs a * or ?");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"noise\": 0")))
                .hasMessage("r.json: field 'profiles[0].stack.noise': must be a relative uncertainty in [1E-6, 1]"
                        + " (0.03 is 3 %) but was 0 (relative)");
        // below the identification's smallest noise (check-values R-LIM-11): refused here, naming the field, not
        // later per wafer
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"noise\": 1e-9")))
                .hasMessageContaining("field 'profiles[0].stack.noise'").hasMessageContaining("(relative)");
        assertThat(rules(stack(LEVELS + ", \"noise\": 1e-6")).profiles().get(0).stack().noise()).isEqualTo(1e-6);
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"noise\": \"3%\"")))
                .hasMessageContaining("field 'profiles[0].stack.noise'");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"block_px\": 2.5")))
                .hasMessage("r.json: field 'profiles[0].stack.block_px': must be a whole number of pixels in [1, 64]"
                        + " but was 2.5 (px)");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"register\": \"no\"")))
                .hasMessageContaining("field 'profiles[0].stack.register': must be true or false");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"defects\": [\"fe-x\"]")))
                .hasMessageContaining("field 'profiles[0].stack.defects[0]': unknown defect 'fe-x'");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"defects\": [\"bo-lid\", \"fe-i\"]")))
                .hasMessageContaining("'bo-lid' has no absolute capture cross-sections");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"defects\": [\"cr-i\"]")))
                .hasMessage("r.json: field 'profiles[0].stack.defects': must include the profile's defect 'fe-i',"
                        + " whose share best_defect_area_fraction gives");
        assertThatThrownBy(() -> rules(stack(LEVELS + ", \"pages\": 3")))
                .hasMessageContaining("field 'profiles[0].stack.pages': unknown key; expected one of levels, defects,"
                        + " noise, block_px, register");
        assertThatThrownBy(() -> rules("\"stack\": [1]"))
                .hasMessageContaining("field 'profiles[0].defect': is required with a stack");
        assertThatThrownBy(() -> rules("\"defect\": \"fe-i\", \"stack\": [1]"))
                .hasMessageContaining("field 'profiles[0].stack': must be an object");
    }

    @Test
    void stackFiguresNeedAProfileWithAStack() {
        assertThatThrownBy(() -> rules("\"defect\": \"fe-i\", \"limits\": {\"no_single_defect_area_fraction\":"
                + " {\"max\": 0.1}}"))
                .hasMessage("r.json: field 'profiles[0].stack': is required for best_defect_area_fraction and"
                        + " no_single_defect_area_fraction: {\"levels\": [glob, glob, …]}");
        assertThatThrownBy(() -> Rules.parse("{" + FLAG + ", \"defect\": \"fe-i\", \"limits\":"
                + " {\"best_defect_area_fraction\": {\"max\": 0.1}}}", "r.json"))
                .hasMessageContaining("field 'limits': best_defect_area_fraction and no_single_defect_area_fraction"
                        + " need an injection stack");
        assertThatThrownBy(() -> Rules.parse("{" + FLAG + ", \"profiles\": [{\"name\": \"s\", \"match\": {\"type\":"
                + " \"p\"}, " + stack(LEVELS) + "}]}", "r.json"))
                .hasMessageContaining("field 'profiles[0].match.file': is required with a stack");
    }
}
