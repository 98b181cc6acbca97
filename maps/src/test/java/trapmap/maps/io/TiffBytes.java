package trapmap.maps.io;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.zip.Deflater;

/**
 * Builds TIFF files byte by byte for tests: any tags, any order of bytes, strips placed after each directory with
 * StripOffsets and StripByteCounts filled in. Independent of the production writers.
 */
final class TiffBytes {
    static final int SHORT = 3;
    static final int LONG = 4;
    static final int RATIONAL = 5;
    static final int ASCII = 2;

    private final ByteOrder order;
    private final List<Page> pages = new ArrayList<>();

    private TiffBytes(ByteOrder order) {
        this.order = order;
    }

    static TiffBytes littleEndian() {
        return new TiffBytes(ByteOrder.LITTLE_ENDIAN);
    }

    static TiffBytes bigEndian() {
        return new TiffBytes(ByteOrder.BIG_ENDIAN);
    }

    ByteOrder order() {
        return order;
    }

    /** A new page with the basic tags of a greyscale image; add strips with {@link Page#strips}. */
    Page page(int width, int height, int bits, int sampleFormat, int compression) {
        Page p = new Page();
        p.tag(256, LONG, width).tag(257, LONG, height).tag(258, SHORT, bits).tag(259, SHORT, compression)
                .tag(262, SHORT, 1).tag(277, SHORT, 1).tag(278, LONG, height).tag(339, SHORT, sampleFormat);
        pages.add(p);
        return p;
    }

    /** An uncompressed 32-bit float page. */
    Page floatPage(int width, int height, float[] samples) {
        return page(width, height, 32, 3, 1).strips(floats(samples));
    }

    byte[] floats(float[] samples) {
        ByteBuffer b = ByteBuffer.allocate(4 * samples.length).order(order);
        for (float v : samples) {
            b.putInt(Float.floatToRawIntBits(v));
        }
        return b.array();
    }

    byte[] ushorts(int[] raw) {
        ByteBuffer b = ByteBuffer.allocate(2 * raw.length).order(order);
        for (int v : raw) {
            b.putShort((short) v);
        }
        return b.array();
    }

    /** A field value: numbers of a type, or raw bytes (ASCII). */
    private record Field(int type, long[] values, byte[] bytes) {
        long count() {
            return bytes != null ? bytes.length : type == RATIONAL ? values.length / 2 : values.length;
        }

        int size() {
            return (int) (bytes != null ? bytes.length : type == RATIONAL ? 4L * values.length
                    : (type == SHORT ? 2L : 4L) * values.length);
        }
    }

    final class Page {
        private final Map<Integer, Field> fields = new TreeMap<>();
        private final List<byte[]> strips = new ArrayList<>();
        private boolean autoStrips = true;

        Page tag(int tag, int type, long... values) {
            fields.put(tag, new Field(type, values, null));
            return this;
        }

        Page ascii(int tag, String text) {
            fields.put(tag, new Field(ASCII, null, (text + "\0").getBytes(StandardCharsets.UTF_8)));
            return this;
        }

        Page rational(int tag, long num, long den) {
            fields.put(tag, new Field(RATIONAL, new long[] {num, den}, null));
            return this;
        }

        Page remove(int tag) {
            fields.remove(tag);
            return this;
        }

        /** Strip data; StripOffsets/StripByteCounts are written to match unless {@link #manualStrips()}. */
        Page strips(byte[]... data) {
            strips.addAll(List.of(data));
            return this;
        }

        /** Keep StripOffsets/StripByteCounts as given by {@link #tag}. */
        Page manualStrips() {
            autoStrips = false;
            return this;
        }
    }

    byte[] build() {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteBuffer head = ByteBuffer.allocate(8).order(order);
        head.put(order == ByteOrder.LITTLE_ENDIAN ? (byte) 'I' : (byte) 'M')
                .put(order == ByteOrder.LITTLE_ENDIAN ? (byte) 'I' : (byte) 'M').putShort((short) 42).putInt(8);
        out.writeBytes(head.array());
        long pos = 8;
        for (int pi = 0; pi < pages.size(); pi++) {
            Page p = pages.get(pi);
            if (p.autoStrips && !p.strips.isEmpty()) {
                p.tag(273, LONG, new long[p.strips.size()]);
                long[] counts = new long[p.strips.size()];
                for (int i = 0; i < counts.length; i++) {
                    counts[i] = p.strips.get(i).length;
                }
                p.tag(279, LONG, counts);
            }
            int n = p.fields.size();
            long ifdEnd = pos + 2 + 12L * n + 4;
            // out-of-line values
            long extra = ifdEnd;
            Map<Integer, Long> at = new TreeMap<>();
            for (Map.Entry<Integer, Field> e : p.fields.entrySet()) {
                if (e.getValue().size() > 4) {
                    at.put(e.getKey(), extra);
                    extra += e.getValue().size() + (e.getValue().size() & 1);
                }
            }
            long dataPos = extra;
            if (p.autoStrips && !p.strips.isEmpty()) {
                long[] offs = p.fields.get(273).values();
                long d = dataPos;
                for (int i = 0; i < offs.length; i++) {
                    offs[i] = d;
                    d += p.strips.get(i).length;
                }
            }
            long end = dataPos;
            for (byte[] s : p.strips) {
                end += s.length;
            }
            end += end & 1;
            ByteBuffer b = ByteBuffer.allocate((int) (end - pos)).order(order);
            b.putShort((short) n);
            for (Map.Entry<Integer, Field> e : p.fields.entrySet()) {
                Field f = e.getValue();
                b.putShort(e.getKey().shortValue()).putShort((short) f.type()).putInt((int) f.count());
                if (f.size() > 4) {
                    b.putInt((int) (long) at.get(e.getKey()));
                } else {
                    int start = b.position();
                    putValues(b, f);
                    b.position(start + 4);
                }
            }
            b.putInt(pi == pages.size() - 1 ? 0 : (int) end);
            for (Map.Entry<Integer, Long> e : at.entrySet()) {
                b.position((int) (e.getValue() - pos));
                putValues(b, p.fields.get(e.getKey()));
            }
            b.position((int) (dataPos - pos));
            for (byte[] s : p.strips) {
                b.put(s);
            }
            out.writeBytes(b.array());
            pos = end;
        }
        return out.toByteArray();
    }

    private static void putValues(ByteBuffer b, Field f) {
        if (f.bytes() != null) {
            b.put(f.bytes());
            return;
        }
        for (long v : f.values()) {
            if (f.type() == SHORT) {
                b.putShort((short) v);
            } else {
                b.putInt((int) v);
            }
        }
    }

    /**
     * Samples encoded with the floating-point predictor (TIFF predictor 3): per row, the bytes of the samples are
     * regrouped most significant byte first (all first bytes, then all second bytes, ...), then each byte is replaced
     * by its difference to the previous one.
     */
    static byte[] floatingPointPredictor(float[] samples, int width, int height) {
        byte[] out = new byte[4 * width * height];
        for (int y = 0; y < height; y++) {
            byte[] row = new byte[4 * width];
            for (int x = 0; x < width; x++) {
                int bits = Float.floatToRawIntBits(samples[y * width + x]);
                for (int k = 0; k < 4; k++) {
                    row[k * width + x] = (byte) (bits >>> (24 - 8 * k));
                }
            }
            for (int i = row.length - 1; i > 0; i--) {
                row[i] = (byte) (row[i] - row[i - 1]);
            }
            System.arraycopy(row, 0, out, y * row.length, row.length);
        }
        return out;
    }

    /** zlib-wrapped Deflate (TIFF compression 8). */
    static byte[] deflate(byte[] data) {
        Deflater d = new Deflater();
        d.setInput(data);
        d.finish();
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        byte[] buf = new byte[8192];
        while (!d.finished()) {
            out.write(buf, 0, d.deflate(buf));
        }
        d.end();
        return out.toByteArray();
    }
}
