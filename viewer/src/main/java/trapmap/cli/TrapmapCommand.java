package trapmap.cli;

/** Placeholder entry point, replaced by the picocli command tree. */
public final class TrapmapCommand {
    private TrapmapCommand() { }
    public static void main(String[] args) { }
}
