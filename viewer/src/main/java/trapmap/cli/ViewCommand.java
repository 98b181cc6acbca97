package trapmap.cli;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.viewer.model.StoreHistory;

/** {@code trapmap view FILES…}: opens maps and folders in the desktop viewer. */
@Command(name = "view", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, usageHelpAutoWidth = true,
        header = "Opens wafer maps in the desktop viewer.",
        description = {
            "Opens the given maps (TIFF or CSV with their sidecars) and folders of maps in the viewer window, or one"
                    + " saved session (.json); without FILES, the bundled demonstration set. With --rules, every"
                    + " wafer is judged by the rules file exactly as 'trapmap inspect' judges it. Needs a display."
                    + " Returns when the window is closed. With --store, the history window shows the control charts"
                    + " of that results store (as 'trapmap trend'); without FILES the viewer then starts empty.",
            ""},
        footer = {"", "Exit codes: 0 closed normally; 2 no display, a file that does not exist or an invalid rules"
                + " file."})
final class ViewCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0..*", arity = "0..*", paramLabel = "FILES", description = "Map files, folders of maps, or one session file.")
    List<Path> files;

    @Option(names = "--rules", paramLabel = "R.json", description = "Judge the wafers by this rules file, as"
            + " 'trapmap inspect' does: each converted with its profile's defect, with the batch's verdict and grade."
            + " Without it the viewer's quick threshold check judges them (not a rules verdict).")
    Path rules;

    @Option(names = "--physics", paramLabel = "<physics.json>", description = PhysicsOption.DESCRIPTION
            + " Replaces the rules file's physics block.")
    Path physics;

    @Option(names = "--store", paramLabel = "<store>", description = "Open the history window on this results store:"
            + " a SQLite file written by 'inspect --store', or postgresql://host[:port]/database (user and password"
            + " from PGUSER/PGPASSWORD or ~/.pgpass).")
    String store;

    @Override
    public Integer call() throws IOException {
        if (files != null) {
            for (Path f : files) {
                if (!Files.exists(f)) {
                    throw new InputException(f + " does not exist");
                }
            }
        }
        if (rules != null) {
            try {
                Rules.read(rules);
            } catch (RulesException e) {
                throw new InputException("--rules " + e.getMessage());
            }
        }
        PhysicsOption.load(physics); // checked before any window opens
        if (store != null) {
            try {
                StoreHistory.address(store);
            } catch (IllegalArgumentException e) {
                throw new InputException("--store: " + e.getMessage());
            }
        }
        if (!ViewerLaunch.displayAvailable()) {
            throw new InputException("no display available (DISPLAY is not set or does not answer); use"
                    + " 'trapmap inspect' or 'trapmap stats' for the same figures without a window");
        }
        boolean none = files == null || files.isEmpty();
        List<Path> open = none && store == null ? List.of(ViewerLaunch.demoFolder(spec.commandLine().getErr()))
                : none ? List.of() : files;
        if (store == null) {
            ViewerLaunch.open(open, rules, physics);
        } else {
            ViewerLaunch.open(open, rules, physics, store);
        }
        return Exit.OK;
    }
}
