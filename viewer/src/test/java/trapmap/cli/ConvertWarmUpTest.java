package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThatCode;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The early warm-up of {@code convert} reads the raw arguments before picocli has checked any of them: no argument
 * list may make it (or {@link TrapmapCommand#prepare}) throw, so that every error is still picocli's one-line message.
 */
class ConvertWarmUpTest {
    @ParameterizedTest
    @ValueSource(strings = {"convert m.tif -o x.tif --defect fe-i --generation 1e19",
        "convert m.tif -o x.tif --defect=fe-i --injection=1e15", "convert m.tif --defect", "convert --defect=",
        "convert --defect nonsense --generation 1e19", "convert --defect FE-I --generation", "convert --generation",
        "convert --defect fe-i --generation 1 --injection 1", "convert @args.txt --defect fe-i --generation 1e19",
        "convert --defect fe-i --generation 1e19 --quantity status", "convert = --defect=fe-i --generation=",
        "convert --defect bo-lid --generation 1e19", "convert --help --defect fe-i --generation 1e19",
        "inspect dir --rules r.json --out o", "inspect --help", "inspect"})
    void neverThrows(String line) {
        String[] args = line.split(" ");
        assertThatCode(() -> ConvertCommand.warmUpEarly(args)).doesNotThrowAnyException();
        assertThatCode(() -> TrapmapCommand.prepare(args)).doesNotThrowAnyException();
    }
}
