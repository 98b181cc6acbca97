package trapmap.cluster.architecture;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import com.tngtech.archunit.lang.ArchRule;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The cluster module sits on top: it depends on store and maps (and what they depend on), never on the viewer, the command
 * line or a user interface, and nothing depends on it (no other module's pom names it, and no trapmap class outside
 * {@code trapmap.cluster} uses it). Checked on the compiled classes with ArchUnit; each rule also on an offending
 * fixture to show it can fail.
 */
class ClusterArchitectureTest {
    static final ArchRule ONLY_MAPS_AND_BELOW = noClasses().that().resideInAPackage("trapmap.cluster..")
            .should().dependOnClassesThat().resideInAnyPackage("trapmap.viewer..", "trapmap.cli..", "javax.swing..",
                    "java.awt..")
            .because("the cluster module depends on store, maps, physics and shared only, and has no user interface");

    static final ArchRule NOTHING_DEPENDS_ON_THE_CLUSTER = noClasses().that().resideInAPackage("trapmap..")
            .and().resideOutsideOfPackage("trapmap.cluster..")
            .should().dependOnClassesThat().resideInAPackage("trapmap.cluster..")
            .because("the cluster module is an application on top; nothing depends on it");

    private static JavaClasses main() {
        return new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("trapmap");
    }

    @Test
    void clusterUsesOnlyMapsAndBelow() {
        ONLY_MAPS_AND_BELOW.check(main());
    }

    @Test
    void noOtherClassUsesTheCluster() {
        JavaClasses all = main();
        assertThat(all.containPackage("trapmap.maps.batch")).isTrue();
        NOTHING_DEPENDS_ON_THE_CLUSTER.check(all);
    }

    @Test
    void theRuleFindsAClassOutsideThatUsesTheCluster() {
        JavaClasses fixture = new ClassFileImporter().importPackages("trapmap.clusterfixture");
        assertThatThrownBy(() -> NOTHING_DEPENDS_ON_THE_CLUSTER.check(fixture)).isInstanceOf(AssertionError.class)
                .hasMessageContaining("UsesTheCluster");
    }

    @Test
    void noOtherModuleNamesTheClusterModule() throws Exception {
        Path root = Path.of("..").toAbsolutePath().normalize();
        for (String module : List.of("shared", "physics", "maps", "store", "viewer")) { // every module but cluster
            String pom = Files.readString(root.resolve(module).resolve("pom.xml"));
            assertThat(pom).as(module).doesNotContain("trapmap-cluster");
        }
        assertThat(Files.readString(root.resolve("cluster").resolve("pom.xml"))).contains("trapmap-cluster");
    }
}
