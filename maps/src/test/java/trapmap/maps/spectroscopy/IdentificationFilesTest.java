package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.physics.defect.DefectLibrary;

/** The files of an identification read back. */
class IdentificationFilesTest {
    @TempDir
    Path dir;

    @Test
    void everyFileIsWrittenAndReadsBackToTheResult() throws Exception {
        InjectionStack stack = InjectionStack.of(SyntheticStack.maps(new double[] {1e13, 1e14, 1e15}, 0.03, 5),
                SyntheticStack.names(3), new InjectionStack.Options(false, RegistrationOptions.DEFAULTS));
        IdentificationResult r = DefectIdentification.identify(stack, ConversionSettings.DEFAULTS,
                List.of(DefectLibrary.byId("fe-i"), DefectLibrary.byId("cr-i"), DefectLibrary.byId("ti-i")),
                DefectIdentification.Options.DEFAULTS.withThreads(2));
        Path hint = dir.resolve("hint.tif");
        List<Path> files = IdentificationFiles.write(r, hint, true);
        assertThat(files).hasSize(10).allMatch(Files::isRegularFile)
                .isEqualTo(IdentificationFiles.files(hint, true));
        try (var listed = Files.list(dir)) {
            assertThat(listed.toList()).containsExactlyInAnyOrderElementsOf(files);
        }
        assertThat(IdentificationFiles.files(hint, false)).isEqualTo(files.subList(0, 9));
        WaferMap back = MapFiles.readSingle(hint);
        assertThat(back.quantity()).isEqualTo(Quantity.DEFECT_INDEX);
        assertThat(back.raster().samples()).containsExactly(r.bestIndex());
        assertThat(MapFiles.readSingle(dir.resolve("hint-status.tif")).raster().samples())
                .containsExactly(r.status());
        List<String> legend = Files.readAllLines(dir.resolve("hint-legend.csv"));
        assertThat(legend).hasSize(4);
        assertThat(legend.get(0)).isEqualTo("index,defect,name,pixels");
        assertThat(legend.get(1)).startsWith("1,fe-i,").endsWith("," + r.legendOf(1).pixelCount());
        List<String> regions = Files.readAllLines(dir.resolve("hint-regions.csv"));
        assertThat(regions).hasSize(1 + 3 * 3); // 3 regions x 3 candidates
        JsonNode j = new ObjectMapper().readTree(dir.resolve("hint-summary.json").toFile());
        assertThat(j.get("regions")).hasSize(3);
        assertThat(j.get("levels")).hasSize(3);
        assertThat(j.get("legend").get(0).get("defect").asText()).isEqualTo("fe-i");
        assertThat(j.get("status_pixels").get("ok").asInt()).isEqualTo(r.statusCounts()[0]);
    }
}
