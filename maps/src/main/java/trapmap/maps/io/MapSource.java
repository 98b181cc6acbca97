package trapmap.maps.io;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.MappedByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.NonWritableChannelException;
import java.nio.channels.ReadableByteChannel;
import java.nio.channels.WritableByteChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import javax.imageio.stream.FileImageInputStream;
import javax.imageio.stream.ImageInputStream;

/**
 * Where the bytes of a map are read from: a file, or the file's bytes already in memory (a map fetched from another
 * file system, e.g. by a cluster job). The readers ask for the bytes in the three ways they read them: positional
 * reads ({@link #channel}: the TIFF structure checks and the direct strip path), an image stream for the image
 * plugins ({@link #images}) and a plain stream for CSV ({@link #stream}); both sources give the same bytes, so a map
 * reads the same from either.
 */
interface MapSource {
    FileChannel channel() throws IOException;

    ImageInputStream images() throws IOException;

    InputStream stream() throws IOException;

    static MapSource of(Path file) {
        return new MapSource() {
            @Override
            public FileChannel channel() throws IOException {
                return FileChannel.open(file, StandardOpenOption.READ);
            }

            @Override
            public ImageInputStream images() throws IOException {
                return new FileImageInputStream(file.toFile());
            }

            @Override
            public InputStream stream() throws IOException {
                return Files.newInputStream(file);
            }
        };
    }

    /** The bytes of a file, held in memory (not copied: the caller must not change them). */
    static MapSource of(byte[] bytes) {
        return new MapSource() {
            @Override
            public FileChannel channel() {
                return new BytesChannel(bytes);
            }

            @Override
            public ImageInputStream images() {
                return new com.twelvemonkeys.imageio.stream.ByteArrayImageInputStream(bytes);
            }

            @Override
            public InputStream stream() {
                return new ByteArrayInputStream(bytes);
            }
        };
    }

    /** A read-only channel over bytes in memory, as a {@link FileChannel} over a file of those bytes reads them. */
    final class BytesChannel extends FileChannel {
        private final byte[] bytes;
        private long position;

        BytesChannel(byte[] bytes) {
            this.bytes = bytes;
        }

        @Override
        public int read(ByteBuffer dst, long at) {
            if (at < 0) {
                throw new IllegalArgumentException("negative position " + at);
            }
            if (at >= bytes.length) {
                return -1;
            }
            int n = (int) Math.min(dst.remaining(), bytes.length - at);
            dst.put(bytes, (int) at, n);
            return n;
        }

        @Override
        public int read(ByteBuffer dst) {
            int n = read(dst, position);
            if (n > 0) {
                position += n;
            }
            return n;
        }

        @Override
        public long read(ByteBuffer[] dsts, int offset, int length) {
            long total = 0;
            for (int i = offset; i < offset + length; i++) {
                int n = read(dsts[i]);
                if (n < 0) {
                    return total == 0 ? -1 : total;
                }
                total += n;
            }
            return total;
        }

        @Override
        public long position() {
            return position;
        }

        @Override
        public FileChannel position(long newPosition) {
            position = newPosition;
            return this;
        }

        @Override
        public long size() {
            return bytes.length;
        }

        @Override
        public long transferTo(long at, long count, WritableByteChannel target) throws IOException {
            if (at >= bytes.length) {
                return 0;
            }
            return target.write(ByteBuffer.wrap(bytes, (int) at, (int) Math.min(count, bytes.length - at)));
        }

        @Override
        public int write(ByteBuffer src) {
            throw new NonWritableChannelException();
        }

        @Override
        public long write(ByteBuffer[] srcs, int offset, int length) {
            throw new NonWritableChannelException();
        }

        @Override
        public int write(ByteBuffer src, long at) {
            throw new NonWritableChannelException();
        }

        @Override
        public FileChannel truncate(long size) {
            throw new NonWritableChannelException();
        }

        @Override
        public long transferFrom(ReadableByteChannel src, long at, long count) {
            throw new NonWritableChannelException();
        }

        @Override
        public void force(boolean metaData) {
            // nothing to write
        }

        @Override
        public MappedByteBuffer map(MapMode mode, long at, long size) {
            throw new UnsupportedOperationException("bytes in memory are not mapped");
        }

        @Override
        public FileLock lock(long at, long size, boolean shared) {
            throw new UnsupportedOperationException("bytes in memory are not locked");
        }

        @Override
        public FileLock tryLock(long at, long size, boolean shared) {
            throw new UnsupportedOperationException("bytes in memory are not locked");
        }

        @Override
        protected void implCloseChannel() {
            // nothing held
        }
    }
}
