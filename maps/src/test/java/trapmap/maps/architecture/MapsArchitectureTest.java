package trapmap.maps.architecture;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.assertj.core.api.Assertions.assertThat;

import com.tngtech.archunit.base.DescribedPredicate;
import com.tngtech.archunit.core.domain.JavaClass;
import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import com.tngtech.archunit.lang.ArchRule;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Pattern;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The maps module has no user interface (DEVELOPERS.md, "Modules"). It uses AWT only to hold and write pictures,
 * and only in the two packages that write them:
 * <ul>
 * <li>{@code trapmap.maps.io}: TIFF maps through image rasters ({@code TiffMaps}), PNG maps and PNG files
 * ({@code PngMaps}, {@code PngFiles});</li>
 * <li>{@code trapmap.maps.batch}: the recurrence picture ({@code RecurrencePicture}, drawn with Graphics2D) and the
 * batch thumbnails ({@code Thumbnails}).</li>
 * </ul>
 * Even there only the imaging part of AWT is used (images, colour models, 2D drawing, fonts, geometry), never its
 * widgets, windows, events or toolkit. Swing is used nowhere. Checked on the compiled classes with ArchUnit.
 */
class MapsArchitectureTest {
    /** The packages that write pictures. */
    static final String[] PICTURE_PACKAGES = {"trapmap.maps.io", "trapmap.maps.batch"};

    /** AWT for pictures: images, colour spaces, 2D geometry, fonts, and the Graphics2D drawing classes. */
    private static final Pattern AWT_IMAGING = Pattern.compile("java\\.awt\\.(image|color|geom|font)\\..+"
            + "|java\\.awt\\.(Color|Graphics|Graphics2D|Font|FontMetrics|BasicStroke|Stroke|RenderingHints(\\$.+)?"
            + "|Transparency|Image|Shape|Paint|Composite|AlphaComposite|Rectangle|Point|Dimension)");

    static final DescribedPredicate<JavaClass> AWT_OUTSIDE_IMAGING = DescribedPredicate.describe(
            "AWT classes other than imaging (widgets, windows, events, toolkit)",
            c -> c.getPackageName().startsWith("java.awt") && !AWT_IMAGING.matcher(c.getName()).matches());

    static final ArchRule NO_SWING = noClasses().that().resideInAPackage("trapmap.maps..")
            .should().dependOnClassesThat().resideInAPackage("javax.swing..")
            .because("the maps module has no user interface");

    static final ArchRule AWT_ONLY_WHERE_PICTURES_ARE_WRITTEN = noClasses().that().resideInAPackage("trapmap.maps..")
            .and().resideOutsideOfPackages(PICTURE_PACKAGES)
            .should().dependOnClassesThat().resideInAnyPackage("java.awt..", "javax.imageio..")
            .because("only trapmap.maps.io and trapmap.maps.batch write pictures");

    static final ArchRule ONLY_AWT_IMAGING = noClasses().that().resideInAPackage("trapmap.maps..")
            .should().dependOnClassesThat(AWT_OUTSIDE_IMAGING)
            .because("pictures need images and 2D drawing, never AWT widgets, windows or events");

    static final ArchRule NOTHING_OF_THE_VIEWER = noClasses().that().resideInAPackage("trapmap.maps..")
            .should().dependOnClassesThat().resideInAnyPackage("trapmap.viewer..", "trapmap.cli..", "trapmap.store..")
            .because("dependencies point viewer -> store -> maps -> physics -> shared");

    private static JavaClasses maps;

    @BeforeAll
    static void importMaps() {
        maps = new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("trapmap.maps");
    }

    @Test
    void mapsUseNoSwing() {
        NO_SWING.check(maps);
    }

    @Test
    void awtAndImageIoOnlyInThePackagesThatWritePictures() {
        AWT_ONLY_WHERE_PICTURES_ARE_WRITTEN.check(maps);
    }

    @Test
    void awtUseIsImagingOnly() {
        ONLY_AWT_IMAGING.check(maps);
    }

    @Test
    void mapsKnowNothingOfTheViewerTheCommandLineOrTheStore() {
        NOTHING_OF_THE_VIEWER.check(maps);
    }

    /** The named picture packages are exactly the ones that use AWT imaging: the list is neither stale nor too wide. */
    @Test
    void thePicturePackagesAreExactlyThoseThatUseAwt() {
        Set<String> users = new TreeSet<>();
        for (JavaClass c : maps) {
            boolean usesAwt = c.getDirectDependenciesFromSelf().stream()
                    .anyMatch(d -> d.getTargetClass().getPackageName().startsWith("java.awt"));
            if (usesAwt) {
                users.add(c.getPackageName());
            }
        }
        assertThat(users).containsExactlyInAnyOrder(PICTURE_PACKAGES);
    }

    /** The rules are not vacuous: a maps class outside the picture packages that draws, or opens a window, fails. */
    @Test
    void theRulesCatchDrawingOutsideThePicturePackagesAndWidgets() {
        JavaClasses offender = new ClassFileImporter().importClasses(DrawsOutsideThePictures.class);
        assertThat(AWT_ONLY_WHERE_PICTURES_ARE_WRITTEN.evaluate(offender).hasViolation()).isTrue();
        assertThat(ONLY_AWT_IMAGING.evaluate(offender).getFailureReport().getDetails())
                .anyMatch(d -> d.contains("java.awt.Frame"))
                .noneMatch(d -> d.contains("java.awt.image.BufferedImage"));
        assertThat(NO_SWING.evaluate(offender).getFailureReport().getDetails())
                .anyMatch(d -> d.contains("javax.swing.JLabel"));
    }

    /** A fixture in trapmap.maps.architecture (not a picture package) that breaks every rule on purpose. */
    static final class DrawsOutsideThePictures {
        Object draw() {
            java.awt.image.BufferedImage img = new java.awt.image.BufferedImage(1, 1,
                    java.awt.image.BufferedImage.TYPE_INT_RGB);
            return java.util.List.of(img, new java.awt.Frame(), new javax.swing.JLabel()); // never called
        }
    }
}
