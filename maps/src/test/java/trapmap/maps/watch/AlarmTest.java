package trapmap.maps.watch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@link Alarm}: a wafer's verdict and a control-chart signal, in the alarm file and as the program's arguments. */
class AlarmTest {
    @Test
    void anAlarmFileIsCheckedWithoutWritingToIt(@TempDir Path dir) throws Exception {
        Path fresh = dir.resolve("alarms.txt");
        assertThat(Alarm.unusableFile(fresh)).isNull();
        assertThat(fresh).doesNotExist(); // made to try, removed again
        Path kept = Files.writeString(dir.resolve("kept.txt"), "earlier line\n");
        assertThat(Alarm.unusableFile(kept)).isNull();
        assertThat(kept).hasContent("earlier line");
        assertThat(Alarm.unusableFile(dir.resolve("none").resolve("a.txt")))
                .isEqualTo("its folder " + dir.resolve("none") + " does not exist");
        assertThat(Alarm.unusableFile(dir)).isEqualTo("it is a folder; give a file");
        if (Files.isDirectory(Path.of("/proc/self"))) { // a folder that takes no new files
            assertThat(Alarm.unusableFile(Path.of("/proc/trapmap-alarms.txt"))).startsWith("it cannot be made in /proc");
        }
    }

    @Test
    void aSignalWritesItsLineAndRunsTheProgramWithFiveArgumentsAfterTheVerdictBefore(@TempDir Path dir)
            throws Exception {
        Path log = dir.resolve("args.log");
        Path hook = dir.resolve("hook.sh");
        Files.writeString(hook, "#!/bin/sh\nprintf '%s|' \"$#\" \"$@\" >> '" + log + "'\nprintf '\\n' >> '" + log
                + "'\n");
        Files.setPosixFilePermissions(hook, PosixFilePermissions.fromString("rwx------"));
        Path file = dir.resolve("alarms.txt");
        List<String> problems = new ArrayList<>();
        Instant t = Instant.parse("2026-10-16T08:00:00Z");
        try (Alarm a = new Alarm(hook, file, problems::add)) {
            a.raise(t, "L0034-S07", "fail", "/in/L0034-S07.tif");
            a.signal(t, "L0036-S02", "beyond_3_sigma", "T2", "trap_density_p50_cm3");
        }
        assertThat(problems).isEmpty();
        assertThat(Files.readAllLines(file)).containsExactly(
                "2026-10-16T08:00:00Z\tL0034-S07\tfail\t/in/L0034-S07.tif",
                "2026-10-16T08:00:00Z\tL0036-S02\tsignal\tbeyond_3_sigma T2 trap_density_p50_cm3");
        assertThat(Files.readAllLines(log)).containsExactly("2|L0034-S07|fail|",
                "5|L0036-S02|signal|beyond_3_sigma|T2|trap_density_p50_cm3|");
    }

    @Test
    void aProgramThatFailsOnASignalIsNamedWithItsArguments(@TempDir Path dir) throws Exception {
        Path hook = dir.resolve("fails.sh");
        Files.writeString(hook, "#!/bin/sh\nexit 3\n");
        Files.setPosixFilePermissions(hook, PosixFilePermissions.fromString("rwx------"));
        List<String> problems = new ArrayList<>();
        try (Alarm a = new Alarm(hook, null, problems::add)) {
            a.signal(Instant.EPOCH, "W1", "eight_on_one_side", "L7", "median_density_cm3");
        }
        assertThat(problems).containsExactly("--on-fail " + hook
                + " W1 signal eight_on_one_side L7 median_density_cm3: exit status 3");
    }
}
