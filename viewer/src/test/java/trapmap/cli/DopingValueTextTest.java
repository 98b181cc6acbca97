package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.lang.reflect.RecordComponent;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** {@link DopingValue#toString()} (written out) gives the generated record text, built here by reflection. */
class DopingValueTextTest {
    @Test
    void textIsTheGeneratedRecordText() throws ReflectiveOperationException {
        for (String given : new String[] {"p:1e16", "n:5e15", "p:1.5ohmcm", "n:2Ohm.cm"}) {
            DopingValue v = DopingValue.parse(given);
            List<String> parts = new ArrayList<>();
            for (RecordComponent c : DopingValue.class.getRecordComponents()) {
                parts.add(c.getName() + "=" + c.getAccessor().invoke(v));
            }
            assertThat(v.toString()).isEqualTo("DopingValue[" + String.join(", ", parts) + "]");
        }
    }
}
