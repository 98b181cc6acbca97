package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.catchThrowableOfType;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.EnergyReference;
import trapmap.physics.material.ThermalVelocityModel;

class DefectFilesTest {
    private static final String ALT_IRON = "{\"id\": \"fe-i-alt\", \"name\": \"iron, alternative set\","
            + " \"source\": \"test set\", \"level\": {\"reference\": \"Ev\", \"energy_ev\": 0.38},"
            + " \"sigma_n_cm2\": 5e-14, \"sigma_p_cm2\": 7e-17}";
    private static final String MIDGAP_GREEN = "{\"id\": \"mid-green\", \"source\": \"test set\","
            + " \"level\": {\"reference\": \"Ei\", \"energy_ev\": -0.05, \"degeneracy\": 2},"
            + " \"sigma_n_cm2\": 1e-15, \"sigma_p_cm2\": 2e-15, \"vth_convention\": \"green\","
            + " \"spread\": {\"energy_ev\": [-0.1, 0.0], \"sigma_n_cm2\": [5e-16, 2e-15], \"note\": \"made up\"}}";

    @TempDir
    Path dir;

    private Path write(String name, String text) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, text, StandardCharsets.UTF_8);
        return p;
    }

    @Test
    void readsASingleObject() throws Exception {
        List<Defect> defects = DefectFiles.read(write("one.json", ALT_IRON));
        assertThat(defects).hasSize(1);
        Defect d = defects.get(0);
        assertThat(d.id()).isEqualTo("fe-i-alt");
        assertThat(d.name()).isEqualTo("iron, alternative set");
        assertThat(d.level().reference()).isEqualTo(EnergyReference.VALENCE_BAND);
        assertThat(d.level().energyEv()).isEqualTo(0.38);
        assertThat(d.electronCrossSectionCm2()).isEqualTo(5e-14);
        assertThat(d.holeCrossSectionCm2()).isEqualTo(7e-17);
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.FIXED);
    }

    @Test
    void overlongIdsNamesAndNotesAreRefusedNamingTheFieldAndTheLimit() throws IOException {
        Path idFile = write("id.json", "[" + ALT_IRON + ", " + ALT_IRON.replace("fe-i-alt", "x".repeat(257)) + "]");
        assertThatThrownBy(() -> DefectFiles.read(idFile)).isInstanceOf(DefectFileException.class)
                .hasMessage(idFile + ": field '[1].id': is 257 characters long; at most 256 are allowed");
        Path sourceFile = write("source.json", ALT_IRON.replace("test set", "s".repeat(4097)));
        assertThatThrownBy(() -> DefectFiles.read(sourceFile))
                .hasMessage(sourceFile + ": field 'source': is 4097 characters long; at most 4096 are allowed");
        Path keyFile = write("key.json", "{\"" + "k".repeat(300) + "\": 1}");
        assertThatThrownBy(() -> DefectFiles.read(keyFile)).hasMessage(keyFile + ": field '" + "k".repeat(40)
                + "...': the key is 300 characters long; at most 256 are allowed");
    }

    @Test
    void readsAnArrayInFileOrder() throws Exception {
        List<Defect> defects = DefectFiles.read(write("two.json", "[" + ALT_IRON + ", " + MIDGAP_GREEN + "]"));
        assertThat(defects).extracting(Defect::id).containsExactly("fe-i-alt", "mid-green");
        Defect g = defects.get(1);
        assertThat(g.velocityConvention()).isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(g.level().degeneracy()).isEqualTo(2.0);
        assertThat(g.spread().energyEv().min()).isEqualTo(-0.1);
        assertThat(g.spread().electronCrossSectionCm2().max()).isEqualTo(2e-15);
        assertThat(g.spread().note()).isEqualTo("made up");
    }

    @Test
    void readsAWrappedList() throws Exception {
        List<Defect> defects = DefectFiles.read(write("wrapped.json", "{\"defects\": [" + MIDGAP_GREEN + "]}"));
        assertThat(defects).extracting(Defect::id).containsExactly("mid-green");
    }

    @Test
    void invalidFieldNamesFileFieldAndUnit() throws IOException {
        Path p = write("bad-sigma.json", ALT_IRON.replace("5e-14", "5.0"));
        DefectFileException e = catchThrowableOfType(DefectFileException.class, () -> DefectFiles.read(p));
        assertThat(e.file()).isEqualTo(p.toString());
        assertThat(e.field()).isEqualTo("sigma_n_cm2");
        assertThat(e.unit()).isEqualTo("cm^2");
        assertThat(e.getMessage()).contains(p.toString()).contains("'sigma_n_cm2'").contains("cm^2")
                .doesNotContain("\n");
    }

    @Test
    void energyOutOfRangeIsReportedUnderItsJsonKey() throws IOException {
        Path p = write("bad-energy.json", ALT_IRON.replace("0.38", "1.5"));
        DefectFileException e = catchThrowableOfType(DefectFileException.class, () -> DefectFiles.read(p));
        assertThat(e.field()).isEqualTo("level.energy_ev");
        assertThat(e.unit()).isEqualTo("eV");
        assertThat(e.getMessage()).contains("bad-energy.json").contains("'level.energy_ev'").contains("eV");
    }

    @Test
    void wrongTypeNamesTheUnit() throws IOException {
        Path p = write("text.json", ALT_IRON.replace("7e-17", "\"seven\""));
        assertThatThrownBy(() -> DefectFiles.read(p)).isInstanceOf(DefectFileException.class)
                .hasMessageContaining("text.json").hasMessageContaining("sigma_p_cm2").hasMessageContaining("cm^2");
    }

    @Test
    void entryOfAnArrayIsNumbered() throws IOException {
        Path p = write("second.json", "[" + ALT_IRON + ", " + MIDGAP_GREEN.replace("\"source\": \"test set\",", "")
                + "]");
        assertThatThrownBy(() -> DefectFiles.read(p)).hasMessageContaining("second.json (defect 2)")
                .hasMessageContaining("'source'");
    }

    @Test
    void malformedJsonNamesFileAndLine() throws IOException {
        Path p = write("broken.json", "{\n  \"id\": \"x\",\n  \"source\": }\n");
        DefectFileException e = catchThrowableOfType(DefectFileException.class, () -> DefectFiles.read(p));
        assertThat(e.getMessage()).startsWith(p + ": not valid JSON at line 3").doesNotContain("\n");
    }

    @Test
    void trailingGarbageAndDuplicateKeysAreMalformed() throws IOException {
        assertThatThrownBy(() -> DefectFiles.read(write("trail.json", ALT_IRON + " ]")))
                .hasMessageContaining("not valid JSON");
        assertThatThrownBy(() -> DefectFiles.read(write("dup.json", ALT_IRON.replace("{\"id\": \"fe-i-alt\",",
                "{\"id\": \"a\", \"id\": \"b\",")))).hasMessageContaining("not valid JSON")
                .hasMessageContaining("id");
    }

    @Test
    void missingFileIsNamed() {
        Path p = dir.resolve("nowhere.json");
        assertThatThrownBy(() -> DefectFiles.read(p)).isInstanceOf(DefectFileException.class)
                .hasMessage(p + ": no such defect file");
    }

    @Test
    void emptyFileAndWrongShapesAreExplained() throws IOException {
        assertThatThrownBy(() -> DefectFiles.read(write("empty.json", "  \n"))).hasMessageContaining("is empty");
        assertThatThrownBy(() -> DefectFiles.read(write("num.json", "42"))).hasMessageContaining("holds a number");
        assertThatThrownBy(() -> DefectFiles.read(write("none.json", "[]"))).hasMessageContaining("no defects");
        assertThatThrownBy(() -> DefectFiles.read(write("strs.json", "[\"fe-i\"]")))
                .hasMessageContaining("(defect 1): must be a JSON object but is a text");
        assertThatThrownBy(() -> DefectFiles.read(write("wrap.json", "{\"defects\": {}}")))
                .hasMessageContaining("field 'defects' must be an array");
        assertThatThrownBy(() -> DefectFiles.read(write("extra.json", "{\"defects\": [], \"x\": 1}")))
                .hasMessageContaining("no other fields");
    }

    @Test
    void unknownFieldIsRejected() throws IOException {
        Path p = write("typo.json", ALT_IRON.replace("\"sigma_p_cm2\"", "\"sigma_h_cm2\""));
        assertThatThrownBy(() -> DefectFiles.read(p)).hasMessageContaining("typo.json")
                .hasMessageContaining("sigma_h_cm2").hasMessageContaining("not a known field");
    }

    @Test
    void idsMustBeUniqueAndNotBuiltIn() throws IOException {
        assertThatThrownBy(() -> DefectFiles.read(write("twice.json", "[" + ALT_IRON + "," + ALT_IRON + "]")))
                .hasMessageContaining("'fe-i-alt' appears twice (defects 1 and 2)");
        DefectFileException e = catchThrowableOfType(DefectFileException.class,
                () -> DefectFiles.read(write("builtin.json", ALT_IRON.replace("fe-i-alt", "fe-i"))));
        assertThat(e.field()).isEqualTo("id");
        assertThat(e.getMessage()).contains("builtin.json").contains("built-in");
    }

    @Test
    void directoryIsNotAFile() {
        assertThatThrownBy(() -> DefectFiles.read(dir)).hasMessageContaining("is a directory");
    }

    @Test
    void aLineBreakInASpreadKeyStaysOnOneLineNamingTheFileOnce() throws Exception {
        Path f = write("nl.json", MIDGAP_GREEN.replace("\"energy_ev\": [", "\"e\\nergy_ev\": ["));
        assertThatThrownBy(() -> DefectFiles.read(f)).isInstanceOf(DefectFileException.class)
                .hasMessage(f + ": field 'spread.e ergy_ev' is not a known field (known: energy_ev, note,"
                        + " sigma_n_cm2, sigma_p_cm2)");
    }
}
