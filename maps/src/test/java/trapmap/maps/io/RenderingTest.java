package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Optional;
import org.junit.jupiter.api.Test;

class RenderingTest {
    /** Java 17 on Debian when the HarfBuzz library of libfontmanager is not installed. */
    private static final String HARFBUZZ = "/usr/lib/jvm/java-17-openjdk-amd64/lib/libfontmanager.so: libharfbuzz.so.0:"
            + " cannot open shared object file: No such file or directory";

    private static Runnable throwing(Throwable t) {
        return () -> {
            if (t instanceof RuntimeException r) {
                throw r;
            }
            throw (Error) t;
        };
    }

    @Test
    void aRuntimeThatDrawsLacksNothing() {
        assertThat(Rendering.probe(() -> { }, () -> { })).isEmpty();
        assertThat(Rendering.missing()).as("this machine has its font libraries and fonts").isEmpty();
    }

    @Test
    void aFontLibraryThatDoesNotLoadNamesItsPackageFirst() {
        Rendering.Missing m = Rendering.probe(() -> { }, throwing(new UnsatisfiedLinkError(HARFBUZZ))).orElseThrow();
        assertThat(m.images()).as("pictures without text still work").isFalse();
        assertThat(m.cause()).isEqualTo("UnsatisfiedLinkError: " + HARFBUZZ);
        assertThat(m.remedy()).isEqualTo("install the font libraries and a font (Debian/Ubuntu: apt-get install"
                + " libharfbuzz0b libfreetype6 libfontconfig1 fontconfig fonts-dejavu-core; other systems: the"
                + " packages holding libharfbuzz.so.0)");
        assertThat(m.text()).startsWith("this Java runtime cannot draw text (UnsatisfiedLinkError: ")
                .doesNotContain("\n");
    }

    @Test
    void freeTypeMissingNamesLibfreetype6() {
        Rendering.Missing m = Rendering.failure(new UnsatisfiedLinkError("/opt/jre/lib/libfontmanager.so:"
                + " libfreetype.so.6: cannot open shared object file: No such file or directory")).orElseThrow();
        assertThat(m.remedy()).startsWith("install the font libraries and a font (Debian/Ubuntu: apt-get install"
                + " libfreetype6 libharfbuzz0b ");
    }

    @Test
    void laterUsesOfTheBrokenFontMachineryAreRecognised() {
        NoClassDefFoundError later = new NoClassDefFoundError("Could not initialize class sun.font.SunFontManager");
        assertThat(Rendering.failure(later)).hasValueSatisfying(m -> {
            assertThat(m.images()).isFalse();
            assertThat(m.remedy()).contains("fonts-dejavu-core");
        });
        InternalError noFonts = new InternalError("Fontconfig head is null, check your fonts or fonts configuration");
        assertThat(Rendering.failure(noFonts)).hasValueSatisfying(m -> assertThat(m.remedy()).contains("fontconfig"));
        assertThat(Rendering.failure(new RuntimeException("chart", later))).as("along the cause chain").isPresent();
        NoClassDefFoundError again = new NoClassDefFoundError("Could not initialize class sun.font.SunFontManager");
        again.initCause(new ExceptionInInitializerError("Exception java.lang.UnsatisfiedLinkError: " + HARFBUZZ
                + " [in thread \"inspect\"]"));
        assertThat(Rendering.failure(again)).hasValueSatisfying(m -> assertThat(m.remedy())
                .as("the library the first failure named").startsWith("install the font libraries and a font"
                        + " (Debian/Ubuntu: apt-get install libharfbuzz0b "));
        assertThat(Rendering.failure(again)).hasValueSatisfying(m -> assertThat(m.cause())
                .as("told as the first failure was thrown, whichever thread met it")
                .isEqualTo("UnsatisfiedLinkError: " + HARFBUZZ));
    }

    @Test
    void aRuntimeWithoutImagingOrDisplayIsToldWhatItNeeds() {
        Rendering.Missing desktop = Rendering.probe(
                throwing(new NoClassDefFoundError("java/awt/image/BufferedImage")), () -> { }).orElseThrow();
        assertThat(desktop.images()).isTrue();
        assertThat(desktop.text()).startsWith("this Java runtime cannot make pictures").contains("java.desktop");
        Rendering.Missing display = Rendering.failure(new java.awt.AWTError("Can't connect to X11 window server"
                + " using ':99' as the value of the DISPLAY variable.")).orElseThrow();
        assertThat(display.remedy()).contains("-Djava.awt.headless=true");
        assertThat(Rendering.failure(new java.awt.HeadlessException())).isPresent();
        NoClassDefFoundError later = new NoClassDefFoundError("Could not initialize class"
                + " java.awt.GraphicsEnvironment$LocalGE");
        later.initCause(new ExceptionInInitializerError("Exception java.awt.AWTError: Can't connect to X11 window"
                + " server using ':99' as the value of the DISPLAY variable. [in thread \"main\"]"));
        assertThat(Rendering.failure(later)).hasValueSatisfying(m -> {
            assertThat(m.cause()).as("the deepest cause says most").contains("Can't connect to X11");
            assertThat(m.remedy()).contains("-Djava.awt.headless=true");
        });
    }

    @Test
    void otherFailuresAreNotMissingLibraries() {
        assertThat(Rendering.failure(new IllegalStateException("disk full"))).isEmpty();
        assertThat(Rendering.failure(new NoClassDefFoundError("org/apache/pdfbox/pdmodel/PDDocument"))).isEmpty();
        assertThat(Rendering.failure(new UnsupportedOperationException())).isEmpty();
    }

    @Test
    void theJvmsOwnErrorsAreNotTakenForAMissingLibrary() {
        assertThatThrownBy(() -> Rendering.probe(() -> { }, throwing(new OutOfMemoryError("Java heap space"))))
                .isInstanceOf(OutOfMemoryError.class);
    }

    @Test
    void anyOtherFailureOfTheTextStepStillCountsAsMissingFonts() {
        Optional<Rendering.Missing> m = Rendering.probe(() -> { }, throwing(new NullPointerException(
                "Cannot load from short array because \"sun.awt.FontConfiguration.head\" is null")));
        assertThat(m).hasValueSatisfying(x -> {
            assertThat(x.images()).isFalse();
            assertThat(x.cause()).startsWith("NullPointerException: Cannot load");
            assertThat(x.remedy()).contains("libfreetype6");
        });
    }
}
