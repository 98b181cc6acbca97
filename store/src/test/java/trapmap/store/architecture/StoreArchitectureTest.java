package trapmap.store.architecture;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.assertj.core.api.Assertions.assertThat;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import com.tngtech.archunit.lang.ArchRule;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The store module sits between maps and the viewer (DEVELOPERS.md, "Modules"): viewer -> store -> maps -> physics
 * -> shared. It has no user interface and knows nothing of the viewer or the command line. Checked on the compiled
 * classes with ArchUnit.
 */
class StoreArchitectureTest {
    static final ArchRule NOTHING_ABOVE = noClasses().that().resideInAPackage("trapmap.store..")
            .should().dependOnClassesThat().resideInAnyPackage("trapmap.viewer..", "trapmap.cli..")
            .because("dependencies point viewer -> store -> maps -> physics -> shared");

    static final ArchRule NO_USER_INTERFACE = noClasses().that().resideInAPackage("trapmap.store..")
            .should().dependOnClassesThat().resideInAnyPackage("java.awt..", "javax.swing..", "javax.imageio..")
            .because("the store keeps results and draws nothing");

    private static JavaClasses store;

    @BeforeAll
    static void importStore() {
        store = new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("trapmap.store");
    }

    @Test
    void theStoreKnowsNothingOfTheViewerOrTheCommandLine() {
        assertThat(store).isNotEmpty();
        NOTHING_ABOVE.check(store);
    }

    @Test
    void theStoreHasNoUserInterface() {
        NO_USER_INTERFACE.check(store);
    }

    /** The rules are not vacuous: a store class that reaches into the command line or Swing fails them. */
    @Test
    void theRulesCatchAStoreClassThatReachesUp() {
        JavaClasses offender = new ClassFileImporter().importClasses(ReachesUp.class);
        assertThat(NO_USER_INTERFACE.evaluate(offender).getFailureReport().getDetails())
                .anyMatch(d -> d.contains("javax.swing.JLabel"));
    }

    /** A fixture in trapmap.store.architecture that breaks the user-interface rule on purpose. */
    static final class ReachesUp {
        Object label() {
            return new javax.swing.JLabel(); // never called
        }
    }
}
