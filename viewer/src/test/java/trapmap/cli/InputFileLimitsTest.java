package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assumptions.assumeThat;

import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.InputFiles;

class InputFileLimitsTest {
    @TempDir
    Path dir;

    @Test
    void aRulesFileLinkedToDevZeroIsOneLineAndExitTwo() throws Exception {
        assumeThat(Files.exists(Path.of("/dev/zero"))).as("/dev/zero exists (Linux)").isTrue();
        Path link = Files.createSymbolicLink(dir.resolve("rules.json"), Path.of("/dev/zero"));
        Path map = Files.createDirectories(dir.resolve("maps"));
        Cli.Run r = Cli.run("inspect", map.toString(), "--rules", link.toString(), "--out",
                dir.resolve("out").toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains(link + ": rules file is a FIFO, socket or device, not a regular file");
    }

    @Test
    @Timeout(30)
    void aCasesPipeIsRefusedWithoutBlocking() throws Exception {
        Path pipe = Fifo.make(dir.resolve("cases.csv"));
        Cli.Run r = Cli.run("calc", "--cases", pipe.toString(), "--out", dir.resolve("out.csv").toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.err()).contains("--cases " + pipe + ": is a FIFO, socket or device, not a regular file");
    }

    @Test
    void aCasesFileOverTheLimitIsRefusedNamingItsSizeAndTheLimit() throws Exception {
        Path f = dir.resolve("cases.csv");
        try (FileChannel ch = FileChannel.open(f, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE,
                StandardOpenOption.SPARSE)) {
            ch.write(ByteBuffer.wrap(new byte[] {'\n'}), InputFiles.TABLE_MAX_BYTES);
        }
        Cli.Run r = Cli.run("calc", "--cases", f.toString(), "--out", dir.resolve("out.csv").toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.err()).contains("--cases " + f + ": is 67108865 bytes, more than the limit of 67108864 bytes"
                + " (64 MB)");
    }
}
