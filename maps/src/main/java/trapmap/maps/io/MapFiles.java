package trapmap.maps.io;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.AccessDeniedException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.WaferMap;

/**
 * Reads and writes wafer maps. The format follows the file name extension:
 * <ul>
 *   <li>{@code .tif}, {@code .tiff} — TIFF, read and written. Reads 32-bit float, 16-bit unsigned and 8-bit unsigned
 *       greyscale, uncompressed, LZW, Deflate or PackBits, one map per page; integer samples are scaled by the
 *       sidecar's {@code scale}/{@code offset} or, without them, read as PL counts. Writes 32-bit float with all the
 *       map's metadata embedded, so that a written map reads back equal (samples bit for bit, grid, quantity, wafer
 *       id, conditions and provenance).</li>
 *   <li>{@code .csv} (also {@code .txt}, {@code .tsv}) — read: point lists with a header {@code x_mm,y_mm,value}
 *       (the points must lie on a regular grid, whose pitch is inferred, unless
 *       {@link ReadOptions#csvResampling()} is on) or plain grids of numbers (one image row per line, separated by
 *       commas, semicolons, tabs or spaces; empty or {@code NaN} = no data); {@code # key=value} comment lines
 *       before the data may carry the sidecar's fields. Written: point lists of the valid pixels under comment
 *       lines with quantity, unit, pitch, centre, size and conditions.</li>
 *   <li>{@code .png} — written only: an 8-bit picture of the map, not quantitative (see {@link PngStyle}).</li>
 * </ul>
 * A sidecar {@code <name>.json} beside a map is read with it (schema in {@link Sidecar}). Lifetime maps are
 * converted to µs; when nothing says the unit, µs is assumed and the provenance says so.
 *
 * <p>Reading never changes the input files. Every reading failure — missing, truncated, malformed, unsupported or
 * above the limits of {@link ReadOptions} — is a {@link MapFormatException} naming file, place and unit; limits are
 * checked from headers before memory is allocated. A directory, FIFO, device or dangling link (as the map or as its
 * sidecar) is refused from its attributes, without being opened (a FIFO would block). Writing is atomic: a temporary
 * file in the same directory is renamed over the target.
 */
public final class MapFiles {

    /** File formats by extension. */
    public enum Format { TIFF, CSV, PNG }

    private MapFiles() {
    }

    /** The maps in {@code file} (one per page of a multi-page TIFF), with the default limits. */
    public static List<WaferMap> read(Path file) throws MapFormatException {
        return read(file, ReadOptions.DEFAULTS);
    }

    /**
     * The maps in {@code file}, one per page (a multi-page TIFF gives several, e.g. before and after a treatment).
     *
     * @throws MapFormatException for any reason the file cannot be read, naming file, place and unit
     */
    public static List<WaferMap> read(Path file, ReadOptions options) throws MapFormatException {
        String name = file.toString();
        try {
            return readChecked(file, name, options);
        } catch (IOException | RuntimeException | OutOfMemoryError e) {
            throw readFailure(name, e);
        }
    }

    /**
     * What a failure while reading {@code name} becomes: a {@link MapFormatException} as it is, else one naming the
     * file and the cause (permission denied, an I/O error, an unexpected failure, or too little memory).
     */
    static MapFormatException readFailure(String name, Throwable e) {
        if (e instanceof MapFormatException m) {
            return m;
        }
        if (e instanceof AccessDeniedException) {
            return new MapFormatException(name, null, "permission denied", "", e);
        }
        if (e instanceof IOException) {
            return new MapFormatException(name, null, "cannot be read (" + e.getMessage() + ")", "", e);
        }
        if (e instanceof OutOfMemoryError) {
            return new MapFormatException(name, null, "not enough memory to read the file; give Java more memory"
                    + " (-Xmx) or lower ReadOptions.maxPixels", "", e);
        }
        return new MapFormatException(name, null, "unexpected failure while reading (" + e + ")", "", e);
    }

    /** The one map in {@code file}, with the default limits. */
    public static WaferMap readSingle(Path file) throws MapFormatException {
        return readSingle(file, ReadOptions.DEFAULTS);
    }

    /**
     * The one map in {@code file}.
     *
     * @throws MapFormatException also when the file holds more than one page
     */
    public static WaferMap readSingle(Path file, ReadOptions options) throws MapFormatException {
        List<WaferMap> maps = read(file, options);
        if (maps.size() != 1) {
            throw new MapFormatException(file.toString(), null, "holds " + maps.size() + " maps (pages) where one"
                    + " is expected");
        }
        return maps.get(0);
    }

    /** Writes {@code map} in the format of the file name's extension, with default options. */
    public static void write(WaferMap map, Path file) throws IOException {
        writeAll(List.of(map), file, WriteOptions.DEFAULTS);
    }

    public static void write(WaferMap map, Path file, WriteOptions options) throws IOException {
        writeAll(List.of(map), file, options);
    }

    /**
     * Writes maps into one file: several pages for TIFF; CSV and PNG hold exactly one map.
     *
     * @throws MapFormatException for an extension trapmap cannot write or too many maps for the format
     * @throws IOException        when the file cannot be written (the target is then unchanged)
     */
    public static void writeAll(List<WaferMap> maps, Path file, WriteOptions options) throws IOException {
        String name = file.toString();
        if (maps.isEmpty()) {
            throw new IllegalArgumentException(name + ": no maps to write");
        }
        Format f = formatOf(file);
        if (f == null) {
            throw new MapFormatException(name, null, "unsupported file type '" + extension(file) + "' for writing;"
                    + " use .tif, .tiff, .csv or .png");
        }
        if (f != Format.TIFF && maps.size() != 1) {
            throw new MapFormatException(name, null, "a " + f.name() + " file holds one map, not " + maps.size()
                    + "; write several maps to a multi-page .tif");
        }
        List<WaferMap> copy = List.copyOf(maps);
        switch (f) {
            case TIFF -> AtomicFiles.write(file, tmp -> {
                if (options.tiffCompression() == WriteOptions.TiffCompression.NONE) {
                    FastTiffWriter.write(copy, tmp);
                } else {
                    TiffMaps.writeWithImageIo(copy, tmp, options.tiffCompression());
                }
            });
            case CSV -> AtomicFiles.write(file, tmp -> CsvMaps.write(copy.get(0), tmp));
            case PNG -> AtomicFiles.write(file, tmp -> PngMaps.write(copy.get(0), tmp, options.png()));
            default -> throw new IllegalStateException(f.name());
        }
    }

    /**
     * Parses a doping in the sidecar's notation: {@code p:1e16} (net density, cm^-3) or {@code p:1.5ohmcm}
     * (resistivity at 23 °C, Ω·cm, ASTM F723); the same as {@link trapmap.physics.material.Doping#parse}.
     *
     * @throws trapmap.shared.error.InvalidValueException (an {@link IllegalArgumentException}) with field
     *                                                    {@code doping}, the unit and the rule broken
     */
    public static trapmap.physics.material.Doping parseDoping(String text) {
        return trapmap.physics.material.Doping.parse(text);
    }

    /** A picture of the map in the colours {@link #write} uses for PNG files (headless {@code java.awt.image}). */
    public static java.awt.image.BufferedImage picture(WaferMap map, PngStyle style) {
        return PngMaps.render(map, style);
    }

    /** The sidecar file of a map: {@code w07.tif} → {@code w07.json} in the same directory. */
    public static Path sidecarOf(Path file) {
        String n = file.getFileName().toString();
        return file.resolveSibling(stem(n) + ".json");
    }

    /** The format of a file name's extension, or null when trapmap has none for it. */
    public static Format formatOf(Path file) {
        return formatOf(extension(file));
    }

    private static Format formatOf(String extension) {
        switch (extension) {
            case ".tif": case ".tiff": return Format.TIFF;
            case ".csv": case ".txt": case ".tsv": return Format.CSV;
            case ".png": return Format.PNG;
            default: return null;
        }
    }

    private static String extension(Path file) {
        Path fn = file.getFileName();
        return extension(fn == null ? "" : fn.toString());
    }

    private static String extension(String n) {
        int dot = n.lastIndexOf('.');
        return dot <= 0 ? "" : n.substring(dot).toLowerCase(Locale.ROOT);
    }

    private static String stem(String fileName) {
        int dot = fileName.lastIndexOf('.');
        return dot <= 0 ? fileName : fileName.substring(0, dot);
    }

    /**
     * A map file that passed the checks made before its content is read: its format, length, sidecar (or null) and
     * the names recorded as source and default wafer id.
     */
    record Opened(Format format, long size, Sidecar sidecar, String sidecarName, String source, String stem) {
    }

    private static List<WaferMap> readChecked(Path file, String name, ReadOptions options) throws IOException {
        return readOpened(MapSource.of(file), name, options, open(file, name, options), null);
    }

    /**
     * The maps of a file that passed {@link #open}; {@code scanned} are its TIFF pages when {@link TiffHeader#scan}
     * has already checked them, else null.
     */
    static List<WaferMap> readOpened(MapSource file, String name, ReadOptions options, Opened o,
                                     List<TiffHeader.Page> scanned) throws IOException {
        List<WaferMap> maps = new ArrayList<>();
        if (o.format() == Format.TIFF) {
            List<TiffMaps.Decoded> pages = scanned != null ? TiffMaps.read(file, name, scanned)
                    : TiffMaps.read(file, name, o.size(), options);
            for (int i = 0; i < pages.size(); i++) {
                TiffMaps.Decoded d = pages.get(i);
                MapBuilder.Raw raw = tiffRaw(d.page(), d.samples(), d.decoder(), d.embedded(), o.source(), i,
                        pages.size());
                maps.add(MapBuilder.build(raw, name, o.source(), o.stem(), o.sidecar(), o.sidecarName(), i,
                        pages.size(), options));
            }
        } else {
            MapBuilder.Raw raw = CsvMaps.read(file, name, o.source(), o.sidecar(), options);
            maps.add(MapBuilder.build(raw, name, o.source(), o.stem(), o.sidecar(), o.sidecarName(), 0, 1,
                    options));
        }
        return List.copyOf(maps);
    }

    /** What {@link MapBuilder} needs of page {@code i} (0-based) of {@code pages} of a TIFF file. */
    static MapBuilder.Raw tiffRaw(TiffHeader.Page p, float[] samples, String decoder, Sidecar embedded,
                                  String source, int i, int pages) {
        List<ProcessingStep> steps = new ArrayList<>();
        steps.add(ProcessingStep.of("read", "file", source, "format", "tiff", "page", (i + 1) + " of "
                + pages, "samples", p.type().label, "compression", p.compressionName(), "decoder", decoder));
        if (p.nonSquare()) {
            steps.add(ProcessingStep.of("warning", "file", source, "message", "pixels are not square (X "
                    + p.xResolution() + ", Y " + p.yResolution() + " per unit); the X resolution is used"));
        }
        return new MapBuilder.Raw(samples, p.width(), p.height(), p.type().integer(), embedded, p.pitchMm(), null,
                steps, false);
    }

    /**
     * The checks made before a map file's content is read (kind of file, permission, size, format, sidecar).
     *
     * @throws IOException naming the file (a {@link MapFormatException} for a reason of the file)
     */
    static Opened open(Path file, String name, ReadOptions options) throws IOException {
        BasicFileAttributes attrs;
        try {
            attrs = Files.readAttributes(file, BasicFileAttributes.class);
        } catch (NoSuchFileException e) {
            if (Files.isSymbolicLink(file)) {
                throw new MapFormatException(name, null, "is a dangling link to " + Files.readSymbolicLink(file)
                        + " (no such file)", "", e);
            }
            throw new MapFormatException(name, null, "no such file", "", e);
        }
        if (!attrs.isRegularFile()) { // checked before opening: opening a FIFO would wait for a writer
            throw new MapFormatException(name, null, InputFiles.notRegular(attrs));
        }
        if (!Files.isReadable(file)) {
            throw new MapFormatException(name, null, "permission denied");
        }
        long size = attrs.size();
        byte[] head = new byte[8];
        int got;
        try (InputStream in = Files.newInputStream(file)) {
            got = in.readNBytes(head, 0, head.length);
        }
        String source = file.getFileName().toString();
        Path sidecarPath = sidecarOf(file);
        return opened(name, source, size, java.util.Arrays.copyOf(head, got), sidecarPath.toString(), () -> {
            if (Files.exists(sidecarPath)) {
                if (!Files.isRegularFile(sidecarPath)) {
                    BasicFileAttributes sa = Files.readAttributes(sidecarPath, BasicFileAttributes.class);
                    throw new MapFormatException(sidecarPath.toString(), null, "the sidecar of " + file.getFileName()
                            + " " + InputFiles.notRegular(sa) + "; remove or rename it");
                }
                if (!Files.isReadable(sidecarPath)) {
                    throw new MapFormatException(sidecarPath.toString(), null, "the sidecar of " + file.getFileName()
                            + " cannot be read: permission denied");
                }
                return Sidecar.read(sidecarPath);
            } else if (Files.exists(sidecarPath, LinkOption.NOFOLLOW_LINKS)) {
                // there, but not when links are followed: a link to nothing
                throw new MapFormatException(sidecarPath.toString(), null, "is a dangling link to "
                        + Files.readSymbolicLink(sidecarPath) + " (no such sidecar file)");
            }
            return null;
        }, options);
    }

    /**
     * The one map of a file whose bytes were fetched from elsewhere (another file system, e.g. by a cluster job),
     * with the bytes of its sidecar: read exactly as {@link #readSingle(Path, ReadOptions)} reads a file of these
     * bytes with a sidecar of those beside it (the same checks, messages and map), {@code name} standing for the
     * file's path in messages and history.
     *
     * @param name        the file's path or URI; its last part ({@code /}-separated) gives format, source and
     *                    default wafer id
     * @param content     the file's bytes (read, never changed or kept)
     * @param sidecarName the sidecar's path or URI, for messages
     * @param sidecar     the sidecar's bytes, or null when the file has no sidecar
     * @throws MapFormatException for any reason the map cannot be read, naming file (or sidecar), place and unit
     */
    public static WaferMap readSingle(String name, byte[] content, String sidecarName, byte[] sidecar,
                                      ReadOptions options) throws MapFormatException {
        try {
            String source = name.substring(name.lastIndexOf('/') + 1);
            Opened o = opened(name, source, content.length,
                    java.util.Arrays.copyOf(content, Math.min(8, content.length)), sidecarName,
                    () -> sidecar == null ? null : Sidecar.parse(sidecar, sidecarName), options);
            List<WaferMap> maps = readOpened(MapSource.of(content), name, options, o, null);
            if (maps.size() != 1) {
                throw new MapFormatException(name, null, "holds " + maps.size() + " maps (pages) where one"
                        + " is expected");
            }
            return maps.get(0);
        } catch (IOException | RuntimeException | OutOfMemoryError e) {
            throw readFailure(name, e);
        }
    }

    /** The sidecar of a map being opened, read when the map's own checks have passed; null when there is none. */
    @FunctionalInterface
    private interface SidecarSource {
        Sidecar read() throws IOException;
    }

    /**
     * The checks of {@link #open} after the file's kind and permission (size, format from the name and the first
     * bytes {@code head}, sidecar), for a file of {@code size} bytes named {@code source} (its last part).
     */
    private static Opened opened(String name, String source, long size, byte[] head, String sidecarName,
                                 SidecarSource sidecarSource, ReadOptions options) throws IOException {
        if (size > options.maxFileBytes()) {
            throw new MapFormatException(name, null, "is " + size + " bytes, more than the limit of "
                    + options.maxFileBytes() + " bytes (ReadOptions.maxFileBytes)");
        }
        if (size == 0) {
            throw new MapFormatException(name, null, "is empty");
        }
        int got = head.length;
        String ext = extension(source);
        Format f = formatOf(ext);
        boolean tiffMagic = TiffHeader.looksLikeTiff(head);
        if (f == Format.PNG || (got >= 4 && (head[0] & 0xFF) == 0x89 && head[1] == 'P' && head[2] == 'N'
                && head[3] == 'G')) {
            throw new MapFormatException(name, null, "is a PNG picture; pictures are not quantitative, so maps are"
                    + " read from TIFF or CSV files");
        }
        if (f == null) {
            if (!tiffMagic) {
                throw new MapFormatException(name, null, "unsupported file type '" + ext + "'; maps are"
                        + " read from .tif, .tiff and .csv files");
            }
            f = Format.TIFF;
        }
        if (f == Format.CSV && tiffMagic) {
            f = Format.TIFF;
        }
        Sidecar sidecar = ext.equals(".json") ? null : sidecarSource.read();
        return new Opened(f, size, sidecar, sidecarName, source, stem(source));
    }
}
