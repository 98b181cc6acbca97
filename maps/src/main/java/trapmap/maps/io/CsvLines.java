package trapmap.maps.io;

import static trapmap.maps.io.CsvNumbers.abbreviate;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.Reader;
import java.nio.charset.CharacterCodingException;
import org.apache.commons.csv.CSVParser;

/**
 * Line reading for CSV maps: lines of at most {@link #MAX_LINE_CHARS} characters (a longer one is refused with its
 * line number), the byte-order mark of the first line, and the readers that hand the data lines to commons-csv
 * (one reader after another, a line-length limit, runs of blanks turned into one tab).
 */
final class CsvLines {
    private CsvLines() {
    }

    /** Longest line accepted, characters: far beyond any row of a map, small enough to hold safely. */
    static final int MAX_LINE_CHARS = 4 << 20;

    /** Signals a line beyond {@link #MAX_LINE_CHARS}. */
    static final class LineTooLong extends IOException {
        private static final long serialVersionUID = 1L;
        final long line;

        LineTooLong(long line) {
            super("line " + line + " is longer than " + MAX_LINE_CHARS + " characters");
            this.line = line;
        }
    }

    static MapFormatException tooLong(String name, long line) {
        return new MapFormatException(name, "line " + line, "is longer than " + MAX_LINE_CHARS + " characters; this"
                + " is not a map in CSV form");
    }

    /** The next line without its terminator, or null at the end; refuses lines beyond {@link #MAX_LINE_CHARS}. */
    static String readLine(BufferedReader in, String name, int lineNumber) throws IOException {
        StringBuilder b = new StringBuilder();
        int c = in.read();
        if (c < 0) {
            return null;
        }
        while (c >= 0 && c != '\n' && c != '\r') {
            if (b.length() >= MAX_LINE_CHARS) {
                throw tooLong(name, lineNumber);
            }
            b.append((char) c);
            c = in.read();
        }
        if (c == '\r') {
            in.mark(1);
            if (in.read() != '\n') {
                in.reset();
            }
        }
        return b.toString();
    }

    static String stripBom(String line, int lineNumber) {
        return lineNumber == 1 && line.startsWith("\uFEFF") ? line.substring(1) : line;
    }

    /** The message for a parser failure at the parser's current line (after {@code offset} earlier lines). */
    static MapFormatException malformed(RuntimeException e, CSVParser parser, int offset, String name) {
        Throwable cause = e.getCause() != null ? e.getCause() : e;
        if (cause instanceof CharacterCodingException) {
            return new MapFormatException(name, null, "is not UTF-8 text", "", e);
        }
        if (cause instanceof LineTooLong t) {
            return tooLong(name, t.line);
        }
        String m = cause.getMessage() == null ? cause.getClass().getSimpleName() : cause.getMessage();
        return new MapFormatException(name, "line " + (offset + parser.getCurrentLineNumber() + 1),
                "malformed CSV (" + abbreviate(MapFormatException.oneLine(m)) + ")", "", e);
    }

    /** One reader after another. */
    static final class ConcatReader extends Reader {
        private final Reader first;
        private final Reader second;
        private boolean firstDone;

        ConcatReader(Reader first, Reader second) {
            this.first = first;
            this.second = second;
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            if (!firstDone) {
                int r = first.read(buf, off, len);
                if (r >= 0) {
                    return r;
                }
                firstDone = true;
            }
            return second.read(buf, off, len);
        }

        @Override
        public void close() throws IOException {
            first.close();
            second.close();
        }
    }

    /** Refuses lines longer than {@link #MAX_LINE_CHARS}, counting lines after {@code offset} earlier ones. */
    static final class LineLimitReader extends Reader {
        private final Reader in;
        private long line;
        private int length;
        private boolean afterCr;

        LineLimitReader(Reader in, int offset) {
            this.in = in;
            this.line = offset + 1;
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            int n = in.read(buf, off, len);
            for (int i = off; i < off + Math.max(n, 0); i++) {
                char c = buf[i];
                if (c == '\r' || (c == '\n' && !afterCr)) {
                    line++;
                    length = 0;
                } else if (c != '\n' && ++length > MAX_LINE_CHARS) {
                    throw new LineTooLong(line);
                }
                afterCr = c == '\r';
            }
            return n;
        }

        @Override
        public void close() throws IOException {
            in.close();
        }
    }

    /** Turns each run of spaces and tabs into one tab, dropping runs at the start and end of lines. */
    static final class WhitespaceReader extends Reader {
        private final Reader in;
        private boolean gap;
        private boolean lineStart = true;
        private int pending = -1;

        WhitespaceReader(Reader in) {
            this.in = new BufferedReader(in, 1 << 16);
        }

        private int next() throws IOException {
            if (pending >= 0) {
                int c = pending;
                pending = -1;
                return c;
            }
            while (true) {
                int c = in.read();
                if (c == ' ' || c == '\t') {
                    gap = !lineStart;
                    continue;
                }
                if (c < 0 || c == '\n' || c == '\r') {
                    gap = false;
                    lineStart = true;
                    return c;
                }
                lineStart = false;
                if (gap) {
                    gap = false;
                    pending = c;
                    return '\t';
                }
                return c;
            }
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            int i = 0;
            while (i < len) {
                int c = next();
                if (c < 0) {
                    return i == 0 ? -1 : i;
                }
                buf[off + i++] = (char) c;
            }
            return i;
        }

        @Override
        public void close() throws IOException {
            in.close();
        }
    }
}
