package trapmap.launcher;

/** The main class of the small jar that {@link LauncherArchiveTest} runs through the launcher: prints its arguments. */
public final class LauncherProbe {
    private LauncherProbe() {
    }

    public static void main(String[] args) {
        System.out.println("probe ran with [" + String.join(" ", args) + "]");
    }
}
