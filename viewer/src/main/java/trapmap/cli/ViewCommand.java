package trapmap.cli;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** {@code trapmap view FILES…}: opens maps and folders in the desktop viewer. */
@Command(name = "view", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, usageHelpAutoWidth = true,
        header = "Opens wafer maps in the desktop viewer.",
        description = {
            "Opens the given maps (TIFF or CSV with their sidecars) and folders of maps in the viewer window, or",
            "one saved session (.json); without FILES, the bundled demonstration set. Needs a display. Returns",
            "when the window is closed.",
            ""},
        footer = {"", "Exit codes: 0 closed normally; 2 no display or a file that does not exist."})
final class ViewCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0..*", arity = "0..*", paramLabel = "FILES", description = "Map files, folders of maps, or one session file.")
    List<Path> files;

    @Override
    public Integer call() throws IOException {
        if (files != null) {
            for (Path f : files) {
                if (!Files.exists(f)) {
                    throw new InputException(f + " does not exist");
                }
            }
        }
        if (!ViewerLaunch.displayAvailable()) {
            throw new InputException("no display available (DISPLAY is not set or does not answer); use"
                    + " 'trapmap inspect' or 'trapmap stats' for the same figures without a window");
        }
        List<Path> open = files == null || files.isEmpty()
                ? List.of(ViewerLaunch.demoFolder(spec.commandLine().getErr())) : files;
        ViewerLaunch.open(open);
        return Exit.OK;
    }
}
