package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Parameters;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class OutOfMemoryMessageTest {
    @TempDir
    Path dir;

    /** A command that reads its map and then runs out of memory, the way a conversion too big for the heap does. */
    @Command(name = "convert")
    static final class Hungry implements Callable<Integer> {
        @Parameters(index = "0")
        Path input;
        @picocli.CommandLine.Option(names = "-o")
        Path output;
        boolean wrapped;

        @Override
        public Integer call() throws MapFormatException {
            MapInput.page(input, 1);
            if (wrapped) {
                throw new IllegalStateException("worker failed", new OutOfMemoryError("Java heap space"));
            }
            throw new OutOfMemoryError("Java heap space");
        }
    }

    private String run(Hungry command, Path map, String... more) {
        StringWriter err = new StringWriter();
        CommandLine cl = new CommandLine(command);
        ErrorHandler errors = new ErrorHandler();
        cl.setErr(new PrintWriter(err, true));
        cl.setOut(new PrintWriter(new StringWriter(), true));
        cl.setExecutionExceptionHandler(errors);
        cl.setExecutionStrategy(errors);
        String[] args = new String[more.length + 1];
        args[0] = map.toString();
        System.arraycopy(more, 0, args, 1, more.length);
        assertThat(cl.execute(args)).isEqualTo(Exit.INTERNAL_ERROR);
        return err.toString();
    }

    private Path map() throws Exception {
        Path f = dir.resolve("big.tif");
        MapFiles.write(new WaferMap(FloatRaster.filled(300, 200, 50f), PixelGrid.centred(300, 200, 0.5),
                Quantity.EFFECTIVE_LIFETIME, "big", MeasurementConditions.UNKNOWN, Provenance.of("test")), f);
        return f;
    }

    @Test
    void outOfMemoryIsOneLineNamingTheFileItsSizeAndTheHeapToTry() throws Exception {
        Path f = map();
        String err = run(new Hungry(), f);
        assertThat(err.lines()).hasSize(1);
        assertThat(err).startsWith("convert: out of memory while processing " + f + " (300×200 pixels need about"
                + " 2 MB; the maximum heap is ").contains("; run with JAVA_OPTS=-Xmx").doesNotContain("\tat ");
    }

    @Test
    void anOutOfMemoryErrorWrappedInAnExceptionGivesTheSameLine() throws Exception {
        Path f = map();
        Hungry h = new Hungry();
        h.wrapped = true;
        String err = run(h, f);
        assertThat(err.lines()).hasSize(1);
        assertThat(err).startsWith("convert: out of memory while processing " + f);
    }

    @Test
    void aConvertToTiffIsEstimatedByItsInputAloneSinceItStreamsItsBands() throws Exception {
        Path f = map();
        // 300 x 200 pixels: 4 bytes each (the input) to a .tif, 24 each (whole-map conversion) to a .csv
        assertThat(run(new Hungry(), f, "-o", dir.resolve("out.tif").toString()))
                .contains("300×200 pixels need about 1 MB;");
        assertThat(run(new Hungry(), f, "-o", dir.resolve("out.csv").toString()))
                .contains("300×200 pixels need about 2 MB;");
    }
}
