package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.ColourMap;
import trapmap.maps.region.RegionCriteria;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.ThermalVelocityModel;

class SessionFilesTest {
    @TempDir
    Path dir;

    private Session sample() {
        Defect user = Defect.of("my-level", "a mid-gap test level", TrapLevel.fromIntrinsic(0.05), 1e-14, 2e-15,
                ThermalVelocityModel.FIXED, "own measurement", null);
        Analysis a = new Analysis(new ConditionOverrides("p:1.5ohmcm", 180.0, 300.0, null, 1e19, 10.0), "my-level",
                DisplayedQuantity.TRAP_DENSITY, new DisplaySettings(ColourMap.GREY, true, false, 2, 98, 1e10, 1e12),
                new ThresholdRule(2e11, RegionCriteria.Side.ABOVE, 3.5, 0.01), new ProfileLine(-40, 10, 45, -5, 2.5),
                1.5);
        Path w1 = dir.resolve("maps/w1.tif");
        Path w2 = Path.of("/elsewhere/w2.tif");
        return new Session(List.of(w1, w2), 1, a, List.of(user), Map.of(w1, new ViewState(2.5, 100, 120.5)));
    }

    @Test
    void roundTripKeepsEverything() throws Exception {
        Session s = sample();
        Path f = dir.resolve("s.trapmap.json");
        SessionFiles.write(s, f);
        Session back = SessionFiles.read(f);
        assertThat(back.files()).isEqualTo(s.files());
        assertThat(back.selected()).isEqualTo(1);
        assertThat(back.analysis()).isEqualTo(s.analysis());
        assertThat(back.views()).isEqualTo(s.views());
        assertThat(back.userDefects()).singleElement().satisfies(d -> {
            assertThat(d.id()).isEqualTo("my-level");
            assertThat(d.electronCrossSectionCm2()).isEqualTo(1e-14);
            assertThat(d.level()).isEqualTo(TrapLevel.fromIntrinsic(0.05));
        });
        String text = Files.readString(f);
        assertThat(text).contains("\"version\" : 1").contains("\"maps/w1.tif\"").contains("\"min_area_mm2\"");
        assertThat(dir).isDirectoryNotContaining("glob:**.tmp");
    }

    @Test
    void rulesFileAndDefectOverridesAreRememberedAndRestored() throws Exception {
        Path demo = ViewerModelTest.DEMO;
        ViewerModel m = new ViewerModel();
        m.open(List.of(demo.resolve("LOT-A01-W01.tif"), demo.resolve("LOT-N01-W01.tif")));
        m.loadRules(demo.resolve("rules-example.json"));
        m.setDefectOverride(1, "cr-i");
        m.setDefectOverrideAll("midgap");
        Path f = dir.resolve("judged.trapmap.json");
        SessionFiles.write(Session.of(m), f);
        assertThat(Files.readString(f)).contains("\"rules\" : \"" + demo.resolve("rules-example.json") + "\"")
                .contains("\"defect_for_all\" : \"midgap\"");

        ViewerModel back = new ViewerModel();
        ViewerModel.OpenOutcome o = SessionFiles.read(f).applyTo(back);
        assertThat(o.errors()).isEmpty();
        assertThat(back.rules().file()).isEqualTo(demo.resolve("rules-example.json"));
        assertThat(back.defectOverrideAll()).isEqualTo("midgap");
        assertThat(back.wafer(back.indexOf(demo.resolve("LOT-N01-W01.tif"))).defectOverride()).isEqualTo("cr-i");
        assertThat(back.wafer(back.indexOf(demo.resolve("LOT-A01-W01.tif"))).defectOverride()).isNull();
        assertThat(back.compute(0, () -> false).verdict().rulesVerdict()).isTrue();

        Files.writeString(f, Files.readString(f).replace("\"midgap\"", "\"no-such\""));
        assertThatThrownBy(() -> SessionFiles.read(f)).hasMessageContaining("defect_for_all")
                .hasMessageContaining("no-such");
    }

    @Test
    void aSessionWhoseRulesFileIsGoneOpensWithTheQuickCheck() throws Exception {
        Path w01 = ViewerModelTest.DEMO.resolve("LOT-A01-W01.tif");
        Session s = new Session(List.of(w01), 0, Analysis.DEFAULT, List.of(), Map.of(), dir.resolve("gone.json"),
                null, Map.of());
        ViewerModel m = new ViewerModel();
        ViewerModel.OpenOutcome o = s.applyTo(m);
        assertThat(o.added()).isEqualTo(1);
        assertThat(o.errors()).singleElement().asString().contains("gone.json");
        assertThat(m.rules()).isNull();
    }

    @Test
    void badNumberNamesFileFieldAndUnit() {
        assertThatThrownBy(() -> SessionFiles.parse("""
                {"format": "trapmap-session", "version": 1, "files": [],
                 "threshold": {"value": 20, "min_area_mm2": "big"}}""", "s.json", dir))
                .isInstanceOf(SessionFiles.SessionException.class)
                .hasMessage("s.json: threshold.min_area_mm2 (mm^2) must be a number in mm^2 but was \"big\"");
    }

    @Test
    void unknownKeyIsNamed() {
        assertThatThrownBy(() -> SessionFiles.parse("""
                {"format": "trapmap-session", "version": 1, "files": [], "display": {"colour": "grey"}}""",
                "s.json", dir)).hasMessageStartingWith("s.json: display.colour is not a known key");
    }

    @Test
    void newerVersionIsRefused() {
        assertThatThrownBy(() -> SessionFiles.parse("{\"format\": \"trapmap-session\", \"version\": 7, \"files\": []}",
                "s.json", dir)).hasMessage("s.json: version 7 is not supported (this program reads version 1)");
    }

    @Test
    void anUnknownQuantityIsNamedOnce() {
        assertThatThrownBy(() -> SessionFiles.parse("{\"format\": \"trapmap-session\", \"version\": 1, \"files\": [],"
                + " \"quantity\": \"colour\"}", "s.json", dir))
                .hasMessageStartingWith("s.json: unknown quantity 'colour'; expected one of");
    }

    @Test
    void outOfRangeConditionNamesTheFieldAndUnit() {
        assertThatThrownBy(() -> SessionFiles.parse("""
                {"format": "trapmap-session", "version": 1, "files": [], "conditions": {"thickness_um": -5}}""",
                "s.json", dir)).hasMessageContaining("s.json").hasMessageContaining("thickness")
                .hasMessageContaining("µm");
    }

    @Test
    void overlongTextsNameTheFieldAndTheLimit() {
        String longPath = "w/" + "p".repeat(4095);
        assertThatThrownBy(() -> SessionFiles.parse("{\"format\": \"trapmap-session\", \"version\": 1,"
                + " \"files\": [\"a.tif\", \"" + longPath + "\"]}", "s.json", dir))
                .isInstanceOf(SessionFiles.SessionException.class)
                .hasMessage("s.json: files[1] is 4097 characters long; at most 4096 are allowed");
        assertThatThrownBy(() -> SessionFiles.parse("{\"format\": \"trapmap-session\", \"version\": 1,"
                + " \"files\": [], \"defect\": \"" + "d".repeat(257) + "\"}", "s.json", dir))
                .hasMessage("s.json: defect is 257 characters long; at most 256 are allowed");
        assertThatThrownBy(() -> SessionFiles.parse("{\"format\": \"trapmap-session\", \"version\": 1,"
                + " \"files\": [], \"user_defects\": [{\"id\": \"u\", \"name\": \"" + "n".repeat(300) + "\"}]}",
                "s.json", dir)).hasMessage("s.json: user_defects[0].name is 300 characters long; at most 256 are"
                + " allowed");
    }

    @Test
    void unknownDefectIsRefused() {
        assertThatThrownBy(() -> SessionFiles.parse("""
                {"format": "trapmap-session", "version": 1, "files": [], "defect": "unobtainium"}""", "s.json", dir))
                .hasMessage("s.json: defect 'unobtainium' is neither a library defect with absolute cross-sections"
                        + " nor one of user_defects");
    }

    @Test
    void brokenJsonNamesTheLine() {
        assertThatThrownBy(() -> SessionFiles.parse("{\n\"format\": ", "s.json", dir))
                .hasMessageStartingWith("s.json: line 2, column 11: not valid JSON: ");
    }

    @Test
    void sessionRestoresModel() throws Exception {
        Path demo = Path.of("..", "demo-data").toAbsolutePath().normalize();
        ViewerModel m = new ViewerModel();
        m.open(List.of(demo.resolve("LOT-A01-W01.tif"), demo.resolve("LOT-A01-W02.tif")));
        m.select(1);
        m.setAnalysis(m.analysis().withThreshold(m.analysis().threshold().withValue(33)), "threshold");
        m.wafer(1).setView(new ViewState(3, 50, 60));
        Path f = dir.resolve("s.json");
        SessionFiles.write(Session.of(m), f);

        ViewerModel restored = new ViewerModel();
        SessionFiles.read(f).applyTo(restored);
        assertThat(restored.size()).isEqualTo(2);
        assertThat(restored.selectedIndex()).isEqualTo(1);
        assertThat(restored.analysis().threshold().value()).isEqualTo(33);
        assertThat(restored.wafer(1).view()).isEqualTo(new ViewState(3, 50, 60));
        assertThat(restored.canUndo()).isFalse();
    }

    @Test
    void theSessionFuzzSeedsAreSessions() throws Exception {
        Path seeds = Path.of(getClass().getResource("SessionReaderJazzerTestInputs/readSession").toURI());
        try (var files = Files.list(seeds)) {
            List<Path> valid = files.filter(p -> !p.getFileName().toString().startsWith("crash-")).toList();
            assertThat(valid).hasSizeGreaterThanOrEqualTo(2);
            for (Path seed : valid) {
                assertThat(SessionFiles.read(seed)).as(seed.toString()).isNotNull();
            }
        }
    }

    @Test
    void unreadableSessionFilesAreOneLineNamingTheFile() throws Exception {
        Path none = dir.resolve("none.trapmap.json");
        assertThatThrownBy(() -> SessionFiles.read(none)).isInstanceOf(SessionFiles.SessionException.class)
                .hasMessage(none + ": no such session file");
        Path latin1 = dir.resolve("latin1.trapmap.json");
        Files.write(latin1, new byte[] {'{', '"', (byte) 0xE9, '"', ':', '1', '}'});
        assertThatThrownBy(() -> SessionFiles.read(latin1)).hasMessage(latin1 + ": is not UTF-8 text");
        Path deep = dir.resolve("deep.trapmap.json");
        Files.writeString(deep, "[".repeat(5000));
        assertThatThrownBy(() -> SessionFiles.read(deep)).isInstanceOf(SessionFiles.SessionException.class)
                .hasMessageStartingWith(deep + ": ").hasMessageContaining("not valid JSON")
                .satisfies(e -> assertThat(e.getMessage()).doesNotContain("\n"));
    }

    @Test
    void aPathThatCannotBeAFileNamesTheFieldNotAJavaException() {
        String nul = "{\"format\": \"trapmap-session\", \"version\": 1, \"files\": [\"a\\u0000b.tif\"]}";
        assertThatThrownBy(() -> SessionFiles.parse(nul, "s.json", dir))
                .isInstanceOf(SessionFiles.SessionException.class)
                .hasMessageStartingWith("s.json: files[0] is not a valid file path (");
        String view = "{\"format\": \"trapmap-session\", \"version\": 1, \"files\": [],"
                + " \"views\": {\"x\\u0000\": {\"zoom\": 1, \"centre_x_px\": 0, \"centre_y_px\": 0}}}";
        assertThatThrownBy(() -> SessionFiles.parse(view, "s.json", dir))
                .hasMessageStartingWith("s.json: views.x\u0000 is not a valid file path (");
    }

    @Test
    void aLineBreakInAKeyStaysOnTheMessagesOneLine() {
        String json = "{\"format\": \"trapmap-session\", \"version\": 1, \"files\": [], \"a\\nb\": 1}";
        assertThatThrownBy(() -> SessionFiles.parse(json, "s.json", dir))
                .hasMessageStartingWith("s.json: a\\nb is not a known key")
                .satisfies(e -> assertThat(e.getMessage()).doesNotContain("\n"));
    }

    @Test
    void openingASessionRestoresItOrNamesTheFile() throws Exception {
        Path f = dir.resolve("s.trapmap.json");
        SessionFiles.write(sample(), f);
        ViewerModel m = new ViewerModel();
        ViewerModel.OpenOutcome o = SessionFiles.open(f, m);
        assertThat(o.added()).isZero(); // the sample's maps do not exist
        assertThat(o.errors()).hasSize(2);
        assertThat(m.analysis()).isEqualTo(sample().analysis());
        Files.writeString(f, "{");
        assertThatThrownBy(() -> SessionFiles.open(f, m)).isInstanceOf(SessionFiles.SessionException.class)
                .hasMessageStartingWith(f + ": ");
    }
}
