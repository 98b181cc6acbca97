package trapmap.viewer.model.architecture;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.assertj.core.api.Assertions.assertThat;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import com.tngtech.archunit.lang.ArchRule;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The viewer model {@code trapmap.viewer.model} is headless (DEVELOPERS.md, "The desktop viewer"): no Swing, no AWT
 * and nothing of the desktop UI {@code trapmap.viewer.ui}, so it is unit-tested without a display and the PDF
 * reports can use it. Checked on the compiled classes with ArchUnit; {@code trapmap.viewer.ArchitectureTest} checks
 * the same on the sources.
 */
class ViewerModelArchitectureTest {
    static final ArchRule HEADLESS = headless("trapmap.viewer.model");

    /** No class of {@code pkg} (the package only, not its sub-packages) uses Swing or AWT. */
    static ArchRule headless(String pkg) {
        return noClasses().that().resideInAPackage(pkg)
                .should().dependOnClassesThat().resideInAnyPackage("javax.swing..", "java.awt..")
                .because("the viewer model runs without a display");
    }

    static final ArchRule NOTHING_OF_THE_UI = noClasses().that().resideInAPackage("trapmap.viewer.model")
            .should().dependOnClassesThat().resideInAPackage("trapmap.viewer.ui..")
            .because("panels read and change the model, never the other way round");

    private static JavaClasses model;

    @BeforeAll
    static void importModel() {
        model = new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("trapmap.viewer.model");
    }

    @Test
    void theModelIsImported() {
        assertThat(model.containPackage("trapmap.viewer.model")).isTrue();
        assertThat(model.stream().filter(c -> c.getPackageName().equals("trapmap.viewer.model")).count())
                .isGreaterThan(10);
    }

    @Test
    void modelUsesNeitherSwingNorAwt() {
        HEADLESS.check(model);
    }

    @Test
    void modelUsesNothingOfTheDesktopUi() {
        NOTHING_OF_THE_UI.check(model);
    }

    /** The rule catches what it is for, shown on a fixture of this test package. */
    @Test
    void theHeadlessRuleCatchesSwingAndAwt() {
        JavaClasses offender = new ClassFileImporter().importClasses(UsesSwing.class);
        assertThat(headless("trapmap.viewer.model.architecture").evaluate(offender).getFailureReport().getDetails())
                .anyMatch(d -> d.contains("javax.swing.JPanel"))
                .anyMatch(d -> d.contains("java.awt.Color"));
    }

    static final class UsesSwing {
        Object panel() {
            javax.swing.JPanel p = new javax.swing.JPanel();
            p.setBackground(java.awt.Color.RED);
            return p;
        }
    }
}
