package trapmap.physics.architecture;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.assertj.core.api.Assertions.assertThat;

import com.tngtech.archunit.base.DescribedPredicate;
import com.tngtech.archunit.core.domain.JavaClass;
import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import com.tngtech.archunit.lang.ArchRule;
import java.io.FileInputStream;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The physics module is pure computation (DEVELOPERS.md, "Modules"): it reads and writes no files, draws nothing,
 * and knows nothing of the maps module, the viewer or the command line above it. Checked on the compiled classes
 * with ArchUnit, so names written out in full and calls through fields count as well as imports.
 */
class PhysicsArchitectureTest {
    private static JavaClasses physics;

    /** File access: the java.io file classes, java.nio.file and file channels. */
    static final DescribedPredicate<JavaClass> FILE_ACCESS = DescribedPredicate.describe(
            "file access (java.io.File*, java.io.RandomAccessFile, java.nio.file, java.nio.channels)",
            c -> c.getPackageName().startsWith("java.nio.file") || c.getPackageName().startsWith("java.nio.channels")
                    || c.getPackageName().equals("java.io") && (c.getSimpleName().startsWith("File")
                    || c.getSimpleName().equals("RandomAccessFile")));

    static final ArchRule NO_FILE_ACCESS = noClasses().that().resideInAPackage("trapmap.physics..")
            .should().dependOnClassesThat(FILE_ACCESS)
            .because("the physics module does no I/O; files are read and written by the maps module");

    static final ArchRule NO_AWT_OR_SWING = noClasses().that().resideInAPackage("trapmap.physics..")
            .should().dependOnClassesThat().resideInAnyPackage("java.awt..", "javax.swing..", "javax.imageio..")
            .because("the physics module draws nothing");

    static final ArchRule NOTHING_ABOVE = noClasses().that().resideInAPackage("trapmap.physics..")
            .should().dependOnClassesThat().resideInAnyPackage("trapmap.maps..", "trapmap.store..", "trapmap.viewer..",
                    "trapmap.cli..")
            .because("dependencies point viewer -> store -> maps -> physics -> shared");

    @BeforeAll
    static void importPhysics() {
        physics = new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("trapmap.physics");
    }

    @Test
    void physicsIsImportedFromTheMainClasses() {
        assertThat(physics.containPackage("trapmap.physics.recombination")).isTrue();
        assertThat(physics.contain(PhysicsArchitectureTest.class)).isFalse();
    }

    @Test
    void physicsDoesNoFileAccess() {
        NO_FILE_ACCESS.check(physics);
    }

    @Test
    void physicsUsesNeitherAwtNorSwing() {
        NO_AWT_OR_SWING.check(physics);
    }

    @Test
    void physicsKnowsNothingOfMapsViewerOrCommandLine() {
        NOTHING_ABOVE.check(physics);
    }

    /** The file rule is not vacuous: a physics class reading a file breaks it. */
    @Test
    void theFileRuleCatchesAFileRead() {
        JavaClasses offender = new ClassFileImporter().importClasses(ReadsAFile.class, WalksAFolder.class);
        assertThat(NO_FILE_ACCESS.evaluate(offender).getFailureReport().getDetails())
                .anyMatch(d -> d.contains("java.io.FileInputStream"))
                .anyMatch(d -> d.contains("java.nio.file.Files"));
    }

    /** Test fixtures inside trapmap.physics that break the file rule on purpose. */
    static final class ReadsAFile {
        int first(String name) throws IOException {
            try (FileInputStream in = new FileInputStream(name)) {
                return in.read();
            }
        }
    }

    static final class WalksAFolder {
        boolean exists(Path p) {
            return Files.exists(p);
        }
    }
}
