package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.Rules;

/**
 * The seed files of the readers' fuzz targets are valid inputs: each reads without an error; except the TIFF seeds
 * named {@code *-strips-*}, damaged on purpose (strips cut short or scrambled), which must be refused naming a strip.
 */
class FuzzSeedsTest {
    @TempDir
    Path dir;

    private static List<Path> seeds(String inputs) throws IOException, URISyntaxException {
        Path d = Path.of(FuzzSeedsTest.class.getResource("/trapmap/maps/" + inputs).toURI());
        try (Stream<Path> s = Files.list(d)) {
            List<Path> seeds = s.filter(p -> !p.getFileName().toString().startsWith("crash-")).sorted().toList();
            assertThat(seeds).as(inputs).hasSizeGreaterThanOrEqualTo(2)
                    .allSatisfy(p -> assertThat(Files.size(p)).isLessThanOrEqualTo(4096));
            return seeds;
        }
    }

    @Test
    void tiffSeedsAreMaps() throws Exception {
        for (Path seed : seeds("io/TiffReaderJazzerTestInputs/readTiff")) {
            Path f = Files.copy(seed, dir.resolve(seed.getFileName() + ".tif"));
            if (seed.getFileName().toString().contains("-strips-")) {
                org.assertj.core.api.Assertions.assertThatThrownBy(() -> MapFiles.read(f)).as(seed.toString())
                        .isInstanceOf(MapFormatException.class).hasMessageContaining("strip");
            } else {
                assertThat(MapFiles.read(f)).as(seed.toString()).isNotEmpty();
            }
        }
    }

    @Test
    void csvSeedsAreMaps() throws Exception {
        for (Path seed : seeds("io/CsvReaderJazzerTestInputs/readCsv")) {
            Path f = Files.copy(seed, dir.resolve(seed.getFileName() + ".csv"));
            assertThat(MapFiles.read(f)).as(seed.toString()).hasSize(1);
        }
    }

    @Test
    void sidecarSeedsApplyToTheFuzzTargetsMap() throws Exception {
        for (Path seed : seeds("io/SidecarReaderJazzerTestInputs/readSidecar")) {
            Path map = dir.resolve("s.tif");
            Files.write(map, SidecarTest.plainTiff());
            Files.copy(seed, dir.resolve("s.json"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
            assertThat(MapFiles.read(map)).as(seed.toString()).isNotEmpty();
        }
    }

    @Test
    void rulesSeedsAreRules() throws Exception {
        for (Path seed : seeds("batch/RulesReaderJazzerTestInputs/readRules")) {
            assertThat(Rules.read(seed).figures()).as(seed.toString()).isNotEmpty();
            IronPairRules.read(seed);
        }
    }

    @Test
    void physicsAndDefectSeedsAreRead() throws Exception {
        for (Path seed : seeds("io/PhysicsSettingsJazzerTestInputs/readPhysicsSettings")) {
            assertThat(PhysicsSettingsFile.read(seed)).as(seed.toString()).isNotNull();
        }
        for (Path seed : seeds("io/DefectFileJazzerTestInputs/readDefectFile")) {
            assertThat(DefectFiles.read(seed)).as(seed.toString()).isNotEmpty();
        }
    }
}
