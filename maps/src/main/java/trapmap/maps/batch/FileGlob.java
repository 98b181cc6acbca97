package trapmap.maps.batch;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import trapmap.shared.text.TextLimits;

/**
 * A glob on file names, with the syntax of {@code java.nio}'s {@code glob:} path matchers: {@code *} (any run of
 * characters but {@code /}), {@code **} (any run), {@code ?} (one character but {@code /}), {@code [abc]},
 * {@code [a-z]}, {@code [!a-z]} (one character of, or not of, a class; never {@code /}), {@code {one,two}} (one of
 * the comma-separated parts; groups do not nest) and {@code \} before a character that stands for itself. Matching
 * is case-sensitive, the same on every system.
 *
 * <p>The glob is compiled into a small automaton whose states are followed all at once over the name (Thompson's
 * construction: K. Thompson, "Regular expression search algorithm", Commun. ACM 11 (1968) 419), so a match costs at
 * most the glob's length times the name's, whatever the glob: a regular expression made from a glob with many stars
 * backtracks for a time that grows like a power of the name's length.
 */
public final class FileGlob {
    private static final int CHAR = 0;
    private static final int ONE = 1;
    private static final int CLASS = 2;
    private static final int STAR = 3;
    private static final int ANY_STAR = 4;
    private static final int SPLIT = 5;
    private static final int MATCH = 6;

    private final String glob;
    private final int[] kind;
    private final char[] ch;
    private final int[] out;
    private final int[][] split;
    private final char[][] ranges;
    private final boolean[] negated;
    private final int start;

    private FileGlob(String glob, Builder b, int start) {
        this.glob = glob;
        int n = b.size;
        this.kind = Arrays.copyOf(b.kind, n);
        this.ch = Arrays.copyOf(b.ch, n);
        this.out = Arrays.copyOf(b.out, n);
        this.split = Arrays.copyOf(b.split, n);
        this.ranges = Arrays.copyOf(b.ranges, n);
        this.negated = Arrays.copyOf(b.negated, n);
        this.start = start;
    }

    /**
     * Compiles a glob.
     *
     * @throws IllegalArgumentException saying what is wrong and where (0-based index) when the glob is longer than
     *                                  {@link TextLimits#MAX_GLOB_CHARS} or not valid
     */
    public static FileGlob compile(String glob) {
        String p = TextLimits.problem(glob, TextLimits.MAX_GLOB_CHARS);
        if (p != null) {
            throw new IllegalArgumentException("the glob " + p);
        }
        List<List<List<Token>>> elements = parse(glob);
        Builder b = new Builder();
        int next = b.add(MATCH, (char) 0, -1);
        for (int e = elements.size() - 1; e >= 0; e--) {
            List<List<Token>> alternatives = elements.get(e);
            if (alternatives.size() == 1) {
                next = b.sequence(alternatives.get(0), next);
            } else {
                int[] starts = new int[alternatives.size()];
                for (int a = 0; a < starts.length; a++) {
                    starts[a] = b.sequence(alternatives.get(a), next);
                }
                next = b.add(SPLIT, (char) 0, -1);
                b.split[next] = starts;
            }
        }
        return new FileGlob(glob, b, next);
    }

    /** The glob as given. */
    public String glob() {
        return glob;
    }

    /** True when the whole of {@code name} matches. */
    public boolean matches(String name) {
        int n = kind.length;
        int[] current = new int[n];
        int[] following = new int[n];
        int[] mark = new int[n];
        int[] stack = new int[n];
        int generation = 1;
        int size = close(start, current, 0, mark, generation, stack);
        for (int i = 0; i < name.length() && size > 0; i++) {
            char c = name.charAt(i);
            generation++;
            int nextSize = 0;
            for (int k = 0; k < size; k++) {
                int s = current[k];
                switch (kind[s]) {
                    case CHAR -> {
                        if (c == ch[s]) {
                            nextSize = close(out[s], following, nextSize, mark, generation, stack);
                        }
                    }
                    case ONE -> {
                        if (c != '/') {
                            nextSize = close(out[s], following, nextSize, mark, generation, stack);
                        }
                    }
                    case CLASS -> {
                        if (c != '/' && inClass(s, c)) {
                            nextSize = close(out[s], following, nextSize, mark, generation, stack);
                        }
                    }
                    case STAR -> {
                        if (c != '/') {
                            nextSize = close(s, following, nextSize, mark, generation, stack);
                        }
                    }
                    case ANY_STAR -> nextSize = close(s, following, nextSize, mark, generation, stack);
                    default -> {
                        // SPLIT never stays in a set; MATCH consumes nothing
                    }
                }
            }
            int[] t = current;
            current = following;
            following = t;
            size = nextSize;
        }
        for (int k = 0; k < size; k++) {
            if (kind[current[k]] == MATCH) {
                return true;
            }
        }
        return false;
    }

    /**
     * Adds {@code s} and what it reaches without consuming a character to {@code set} (each state once per
     * generation); returns the new size.
     */
    private int close(int s, int[] set, int size, int[] mark, int generation, int[] stack) {
        if (mark[s] == generation) {
            return size;
        }
        int top = 0;
        mark[s] = generation;
        stack[top++] = s;
        while (top > 0) {
            int x = stack[--top];
            if (kind[x] == SPLIT) {
                for (int y : split[x]) {
                    if (mark[y] != generation) {
                        mark[y] = generation;
                        stack[top++] = y;
                    }
                }
                continue;
            }
            set[size++] = x;
            if ((kind[x] == STAR || kind[x] == ANY_STAR) && mark[out[x]] != generation) {
                mark[out[x]] = generation;
                stack[top++] = out[x];
            }
        }
        return size;
    }

    private boolean inClass(int s, char c) {
        char[] r = ranges[s];
        boolean in = false;
        for (int i = 0; i < r.length && !in; i += 2) {
            in = c >= r[i] && c <= r[i + 1];
        }
        return in != negated[s];
    }

    /** One token: a character, ?, *, ** or a class (ranges as low/high pairs). */
    private record Token(int kind, char c, char[] ranges, boolean negated) {
    }

    /** The glob as elements, each a list of alternatives (one for a plain token), each a list of tokens. */
    private static List<List<List<Token>>> parse(String g) {
        List<List<List<Token>>> elements = new ArrayList<>();
        List<List<Token>> group = null;
        int i = 0;
        while (i < g.length()) {
            char c = g.charAt(i++);
            Token t = null;
            switch (c) {
                case '\\' -> {
                    if (i == g.length()) {
                        throw syntax("no character to escape", g, i - 1);
                    }
                    t = new Token(CHAR, g.charAt(i++), null, false);
                }
                case '*' -> {
                    if (i < g.length() && g.charAt(i) == '*') {
                        i++;
                        t = new Token(ANY_STAR, c, null, false);
                    } else {
                        t = new Token(STAR, c, null, false);
                    }
                }
                case '?' -> t = new Token(ONE, c, null, false);
                case '[' -> {
                    int[] end = new int[1];
                    t = charClass(g, i, end);
                    i = end[0];
                }
                case '{' -> {
                    if (group != null) {
                        throw syntax("groups cannot nest", g, i - 1);
                    }
                    group = new ArrayList<>();
                    group.add(new ArrayList<>());
                }
                case '}' -> {
                    if (group != null) {
                        elements.add(group);
                        group = null;
                    } else {
                        t = new Token(CHAR, c, null, false);
                    }
                }
                case ',' -> {
                    if (group != null) {
                        group.add(new ArrayList<>());
                    } else {
                        t = new Token(CHAR, c, null, false);
                    }
                }
                default -> t = new Token(CHAR, c, null, false);
            }
            if (t != null) {
                if (group != null) {
                    group.get(group.size() - 1).add(t);
                } else {
                    elements.add(List.of(List.of(t)));
                }
            }
        }
        if (group != null) {
            throw syntax("missing '}'", g, g.length() - 1);
        }
        return elements;
    }

    /** The class that starts after the '[' at {@code from - 1}; {@code end[0]} is set after its ']'. */
    private static Token charClass(String g, int from, int[] end) {
        int i = from;
        boolean negated = false;
        StringBuilder r = new StringBuilder();
        if (i < g.length() && g.charAt(i) == '^') {
            r.append("^^");
            i++;
        } else {
            if (i < g.length() && g.charAt(i) == '!') {
                negated = true;
                i++;
            }
            if (i < g.length() && g.charAt(i) == '-') {
                r.append("--");
                i++;
            }
        }
        boolean hasRangeStart = false;
        char last = 0;
        boolean closed = false;
        while (i < g.length()) {
            char c = g.charAt(i++);
            if (c == ']') {
                closed = true;
                break;
            }
            if (c == '/') {
                throw syntax("a class cannot hold the name separator '/'", g, i - 1);
            }
            if (c == '-') {
                if (!hasRangeStart) {
                    throw syntax("invalid range", g, i - 1);
                }
                if (i >= g.length()) {
                    break;
                }
                char high = g.charAt(i++);
                if (high == ']') {
                    r.append("--");
                    closed = true;
                    break;
                }
                if (high < last) {
                    throw syntax("invalid range", g, i - 3);
                }
                r.setCharAt(r.length() - 1, high);
                hasRangeStart = false;
            } else {
                r.append(c).append(c);
                hasRangeStart = true;
                last = c;
            }
        }
        if (!closed) {
            throw syntax("missing ']'", g, i - 1);
        }
        end[0] = i;
        return new Token(CLASS, '[', r.toString().toCharArray(), negated);
    }

    private static IllegalArgumentException syntax(String what, String g, int at) {
        return new IllegalArgumentException(what + " at index " + Math.max(0, at));
    }

    /** The automaton's states being built, from the end of the glob towards its start. */
    private static final class Builder {
        int size;
        int[] kind = new int[16];
        char[] ch = new char[16];
        int[] out = new int[16];
        int[][] split = new int[16][];
        char[][] ranges = new char[16][];
        boolean[] negated = new boolean[16];

        int add(int k, char c, int next) {
            if (size == kind.length) {
                int n = size * 2;
                kind = Arrays.copyOf(kind, n);
                ch = Arrays.copyOf(ch, n);
                out = Arrays.copyOf(out, n);
                split = Arrays.copyOf(split, n);
                ranges = Arrays.copyOf(ranges, n);
                negated = Arrays.copyOf(negated, n);
            }
            kind[size] = k;
            ch[size] = c;
            out[size] = next;
            return size++;
        }

        /** States for {@code tokens} leading to {@code next}; returns the first. */
        int sequence(List<Token> tokens, int next) {
            int s = next;
            for (int t = tokens.size() - 1; t >= 0; t--) {
                Token tok = tokens.get(t);
                s = add(tok.kind(), tok.c(), s);
                ranges[s] = tok.ranges();
                negated[s] = tok.negated();
            }
            if (tokens.isEmpty()) {
                return next;
            }
            return s;
        }
    }

    /**
     * What each wildcard of a glob of only {@code *}, {@code ?} and plain characters matched in {@code name}, in
     * order, each {@code *} taking as few characters as the rest allows; null when the name does not match. A table
     * of which parts of the glob match which ends of the name keeps this to the glob's length times the name's.
     */
    public static List<String> wildcardParts(String glob, String name) {
        int m = glob.length();
        int n = name.length();
        boolean[][] ok = new boolean[m + 1][n + 1];
        ok[m][n] = true;
        for (int i = m - 1; i >= 0; i--) {
            matches(glob.charAt(i), name, ok[i], ok[i + 1]);
        }
        if (!ok[0][0]) {
            return null;
        }
        List<String> parts = new ArrayList<>();
        int j = 0;
        for (int i = 0; i < m; i++) {
            char g = glob.charAt(i);
            if (g == '*') {
                int k = j;
                while (!ok[i + 1][k]) {
                    k++;
                }
                parts.add(name.substring(j, k));
                j = k;
            } else {
                if (g == '?') {
                    parts.add(name.substring(j, j + 1));
                }
                j++;
            }
        }
        return parts;
    }

    /**
     * Row {@code here} of the table: whether glob character {@code g} and the rest of the glob after it (row
     * {@code after}) match each end {@code name[j..)}. Loops without tests of the end inside, a method of its own:
     * called for every file name, the table's loops in one method were deoptimised and compiled again five times a
     * batch.
     */
    private static void matches(char g, String name, boolean[] here, boolean[] after) {
        int n = name.length();
        if (g == '*') {
            here[n] = after[n];
            for (int j = n - 1; j >= 0; j--) {
                here[j] = after[j] || here[j + 1];
            }
        } else {
            here[n] = false;
            for (int j = n - 1; j >= 0; j--) {
                here[j] = (g == '?' || name.charAt(j) == g) && after[j + 1];
            }
        }
    }
}
