package trapmap.maps.io;

import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Whether this Java runtime can make the pictures and PDF reports: a picture needs Java's imaging (the
 * {@code java.desktop} module and its native {@code libawt}), text in a picture or chart also the font machinery
 * (the native {@code libfontmanager} with the system's FreeType, HarfBuzz and fontconfig libraries, and at least one
 * font). A server's runtime may lack either: a JRE unpacked without its system libraries fails with
 * {@code UnsatisfiedLinkError: …libfontmanager.so: libharfbuzz.so.0: cannot open shared object file}, later font
 * uses with {@code NoClassDefFoundError: Could not initialize class sun.font.SunFontManager}, a machine without fonts
 * with an {@code Error} or {@code InternalError} from fontconfig, and a {@code DISPLAY} that does not answer (when
 * Java is not headless) with an {@code AWTError}.
 *
 * <p>{@link #missing()} tries both once per process (a small picture encoded as PNG, then a line of text drawn and
 * measured with the font the pictures use) and keeps the answer, when the first step that draws is due (a runtime
 * that draws loads its font machinery then, as that step would). {@link #failure} recognises the same failures thrown by a picture step
 * itself, for a step that failed although the probe passed. Each answer is one line: what is missing and the
 * packages to install.
 */
public final class Rendering {
    /**
     * What the runtime lacks.
     *
     * @param images true: no pictures at all (nor text); false: pictures work, text in them does not
     * @param cause  the failure, one line ({@code UnsatisfiedLinkError: …: libharfbuzz.so.0: cannot open …})
     * @param remedy what to install, one line
     */
    public record Missing(boolean images, String cause, String remedy) {
        /** One line: "this Java runtime cannot draw text (CAUSE); REMEDY". */
        public String text() {
            return "this Java runtime cannot " + (images ? "make pictures" : "draw text") + " (" + cause + "); "
                    + remedy;
        }
    }

    /** The Debian/Ubuntu packages of the font machinery: libraries, the fontconfig tools and one font family. */
    public static final String FONT_PACKAGES = "libfreetype6 libharfbuzz0b libfontconfig1 fontconfig fonts-dejavu-core";

    /** The answer of {@link #missing()}, probed once. */
    private static volatile Optional<Missing> answer;
    /**
     * What reading a failure's message takes, made on the first failure: {@link #headlessUnlessSet}, which every
     * command calls first, leaves them unmade.
     */
    private static final class Messages {
        /** Debian/Ubuntu package of each shared library the JDK's imaging and font libraries load, by name prefix. */
        private static final Map<String, String> PACKAGES = new LinkedHashMap<>();

        static {
            PACKAGES.put("libharfbuzz.so", "libharfbuzz0b");
            PACKAGES.put("libfreetype.so", "libfreetype6");
            PACKAGES.put("libfontconfig.so", "libfontconfig1");
            PACKAGES.put("libpng16.so", "libpng16-16");
            PACKAGES.put("libgraphite2.so", "libgraphite2-3");
            PACKAGES.put("libglib-2.0.so", "libglib2.0-0");
            PACKAGES.put("libbrotlidec.so", "libbrotli1");
            PACKAGES.put("libbrotlicommon.so", "libbrotli1");
            PACKAGES.put("libz.so", "zlib1g");
            PACKAGES.put("libexpat.so", "libexpat1");
            PACKAGES.put("libstdc++.so", "libstdc++6");
            PACKAGES.put("liblcms2.so", "liblcms2-2");
            PACKAGES.put("libjpeg.so", "libjpeg62-turbo");
        }

        /** The file name a dynamic-loader message says cannot be opened ({@code libharfbuzz.so.0}). */
        private static final Pattern NOT_OPENED =
                Pattern.compile("([\\w.+-]+\\.so[.\\d]*): cannot open shared object file");

        /**
         * The message of the {@link ExceptionInInitializerError} behind a class whose start failed earlier in the
         * process, possibly on another thread: {@code Exception java.lang.UnsatisfiedLinkError: ... [in thread "t"]}.
         */
        private static final Pattern EARLIER =
                Pattern.compile("Exception (\\S+(?:: .*?)?)(?: \\[in thread \"[^\"]*\"\\])?", Pattern.DOTALL);

        private Messages() {
        }
    }

    private Rendering() {
    }

    /**
     * Makes this process run Java's imaging headless (no display is used or needed) unless the
     * {@code java.awt.headless} property says otherwise; call before anything draws.
     */
    public static void headlessUnlessSet() {
        if (System.getProperty("java.awt.headless") == null) {
            System.setProperty("java.awt.headless", "true");
        }
    }

    /** What this runtime lacks to make pictures with text, or empty when it makes them; probed once per process. */
    public static Optional<Missing> missing() {
        Optional<Missing> a = answer;
        if (a == null) {
            synchronized (Rendering.class) {
                a = answer;
                if (a == null) {
                    a = probe(Rendering::drawPicture, Rendering::drawText);
                    answer = a;
                }
            }
        }
        return a;
    }

    /**
     * Runs {@code picture} (makes a picture without text) and then {@code text} (draws text into one) and says what
     * failed: empty when both ran. Any failure but the JVM's own ({@link VirtualMachineError}: out of memory, stack)
     * counts as missing, since both steps only call the runtime.
     */
    public static Optional<Missing> probe(Runnable picture, Runnable text) {
        try {
            picture.run();
        } catch (VirtualMachineError e) {
            throw e;
        } catch (Throwable t) {
            return Optional.of(failure(t).map(m -> new Missing(true, m.cause(), m.remedy()))
                    .orElseGet(() -> new Missing(true, cause(t), "install " + FONT_PACKAGES + " (Debian/Ubuntu)"
                            + " and use a complete Java runtime (e.g. openjdk-17-jre-headless)")));
        }
        try {
            text.run();
        } catch (VirtualMachineError e) {
            throw e;
        } catch (Throwable t) {
            return Optional.of(failure(t).orElseGet(() -> new Missing(false, cause(t), fontRemedy(List.of()))));
        }
        return Optional.empty();
    }

    /**
     * What a failure of a picture or PDF step says the runtime lacks, or empty when it is no such failure (a bug, a
     * full disk: the caller handles it as before). Recognised along the cause chain: a native library that did not
     * load ({@link UnsatisfiedLinkError}), an imaging or font class that failed or is absent
     * ({@link NoClassDefFoundError}, {@link ExceptionInInitializerError}), no display ({@code HeadlessException},
     * {@code AWTError}), and errors thrown from the font machinery (fontconfig, no fonts).
     */
    public static Optional<Missing> failure(Throwable thrown) {
        Optional<Missing> found = Optional.empty(); // the deepest cause recognised says most
        int depth = 0;
        for (Throwable t = thrown; t != null && depth < 32; t = t.getCause() == t ? null : t.getCause(), depth++) {
            Optional<Missing> m = one(t);
            if (m.isPresent()) {
                found = m;
            }
        }
        return found;
    }

    private static Optional<Missing> one(Throwable t) {
        String name = t.getClass().getName();
        String message = String.valueOf(t.getMessage());
        if (t instanceof UnsatisfiedLinkError
                || t instanceof LinkageError && message.contains("cannot open shared object file")) {
            List<String> libraries = new ArrayList<>();
            Matcher m = Messages.NOT_OPENED.matcher(message);
            while (m.find()) {
                libraries.add(m.group(1));
            }
            boolean images = !message.contains("fontmanager") && !libraries.stream().anyMatch(Rendering::fontLibrary);
            return Optional.of(new Missing(images, cause(t), fontRemedy(libraries)));
        }
        if (name.equals("java.awt.HeadlessException") || name.equals("java.awt.AWTError")
                || t instanceof LinkageError && (message.contains("java.awt.AWTError")
                || message.contains("GraphicsEnvironment$LocalGE") || message.contains("X11GraphicsEnvironment"))) {
            // no display: also the imaging classes whose start failed for want of one (a DISPLAY that does not answer)
            return Optional.of(new Missing(true, cause(t), "this command needs no display: unset DISPLAY or run Java"
                    + " headless (JAVA_OPTS=-Djava.awt.headless=true)"));
        }
        if (t instanceof NoClassDefFoundError || t instanceof ExceptionInInitializerError) {
            String cls = message.replace('/', '.');
            if (!message.startsWith("Could not initialize class") && (cls.startsWith("java.awt")
                    || cls.startsWith("javax.imageio"))) {
                return Optional.of(new Missing(true, cause(t), "use a Java runtime with the java.desktop module"
                        + " (a full JRE such as openjdk-17-jre-headless, or jlink --add-modules java.desktop)"));
            }
            if (imaging(cls) || fromImaging(t)) {
                return Optional.of(new Missing(!font(cls) && !fromFonts(t), cause(t), fontRemedy(List.of())));
            }
            return Optional.empty();
        }
        if (fromFonts(t) || (t instanceof Error && message.toLowerCase(Locale.ROOT).contains("font"))) {
            return Optional.of(new Missing(false, cause(t), fontRemedy(List.of())));
        }
        return Optional.empty();
    }

    private static boolean fontLibrary(String lib) {
        return lib.startsWith("libharfbuzz") || lib.startsWith("libfreetype") || lib.startsWith("libfontconfig")
                || lib.startsWith("libgraphite2") || lib.startsWith("libbrotli") || lib.startsWith("libglib");
    }

    private static boolean imaging(String cls) {
        return cls.contains("java.awt") || cls.contains("javax.imageio") || cls.contains("sun.awt")
                || cls.contains("sun.java2d") || font(cls);
    }

    private static boolean font(String text) {
        return text.contains("sun.font") || text.contains("FontManager") || text.contains("FontConfiguration");
    }

    /** Whether a frame of {@code t} lies in the font machinery. */
    private static boolean fromFonts(Throwable t) {
        for (StackTraceElement e : t.getStackTrace()) {
            String c = e.getClassName();
            if (c.startsWith("sun.font.") || c.startsWith("java.awt.Font") || font(c)) {
                return true;
            }
        }
        return false;
    }

    /** Whether a frame of {@code t} lies in Java's imaging. */
    private static boolean fromImaging(Throwable t) {
        for (StackTraceElement e : t.getStackTrace()) {
            if (imaging(e.getClassName())) {
                return true;
            }
        }
        return false;
    }

    /** The packages for the failed libraries first (known ones), then the rest of the font packages. */
    private static String fontRemedy(List<String> libraries) {
        List<String> packages = new ArrayList<>();
        for (String lib : libraries) {
            Messages.PACKAGES.forEach((prefix, pkg) -> {
                if (lib.startsWith(prefix) && !packages.contains(pkg)) {
                    packages.add(pkg);
                }
            });
        }
        for (String pkg : FONT_PACKAGES.split(" ")) {
            if (!packages.contains(pkg)) {
                packages.add(pkg);
            }
        }
        return "install the font libraries and a font (Debian/Ubuntu: apt-get install " + String.join(" ", packages)
                + (libraries.isEmpty() ? "" : "; other systems: the packages holding " + String.join(", ", libraries))
                + ")";
    }

    /** The failure in one line, without the {@code java.lang.} of its class. */
    private static String cause(Throwable t) {
        String s = t.getClass().getName() + (t.getMessage() == null ? "" : ": " + t.getMessage());
        Matcher earlier = Messages.EARLIER.matcher(String.valueOf(t.getMessage()));
        if (t instanceof ExceptionInInitializerError && earlier.matches()) {
            s = earlier.group(1); // the first failure, as it was thrown (here or on another thread)
        }
        return s.replaceFirst("^java\\.(lang|awt)\\.", "").replaceAll("\\s*\\R\\s*", " ").strip();
    }

    /** A small picture as the thumbnails make it, encoded as PNG. */
    private static void drawPicture() {
        BufferedImage img = new BufferedImage(8, 8, BufferedImage.TYPE_INT_ARGB);
        Graphics2D g = img.createGraphics();
        try {
            g.fillRect(0, 0, 4, 4);
        } finally {
            g.dispose();
        }
        PngFiles.encode(img);
    }

    /** A line of text drawn and measured with the font and style of the pictures' captions and colour bars. */
    private static void drawText() {
        BufferedImage img = new BufferedImage(32, 16, BufferedImage.TYPE_INT_ARGB);
        Graphics2D g = img.createGraphics();
        try {
            g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 10));
            FontMetrics fm = g.getFontMetrics();
            g.drawString("0 %", 1, fm.getAscent());
            g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 10));
            g.drawString("µm", 1, fm.getAscent());
        } finally {
            g.dispose();
        }
    }
}
