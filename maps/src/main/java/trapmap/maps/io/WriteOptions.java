package trapmap.maps.io;

import trapmap.shared.check.Checks;

/**
 * Choices for writing map files.
 *
 * @param tiffCompression compression of TIFF sample data (uncompressed by default: fastest to write and read)
 * @param png             look of PNG pictures
 */
public record WriteOptions(TiffCompression tiffCompression, PngStyle png) {

    /** Uncompressed TIFF, default PNG style. */
    public static final WriteOptions DEFAULTS = new WriteOptions(TiffCompression.NONE, PngStyle.DEFAULT);

    /** Compression of the sample data of written TIFF files. All are lossless. */
    public enum TiffCompression { NONE, DEFLATE, LZW, PACKBITS }

    public WriteOptions {
        Checks.notNull(tiffCompression, "tiffCompression");
        Checks.notNull(png, "png");
    }

    public WriteOptions withTiffCompression(TiffCompression c) {
        return new WriteOptions(c, png);
    }

    public WriteOptions withPng(PngStyle style) {
        return new WriteOptions(tiffCompression, style);
    }
}
