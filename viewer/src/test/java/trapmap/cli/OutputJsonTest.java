package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.SerializationFeature;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.NumberText;

class OutputJsonTest {
    @Test
    void theJsonPreparedInTheBackgroundIsTheTextOfAFreshWriter() throws Exception {
        Map<String, Object> value = new LinkedHashMap<>();
        value.put("file", "a b.tif");
        value.put("mean", 0.1 + 0.2);
        value.put("p5", 1.1e-7f);
        value.put("count", 12345);
        value.put("inside", false);
        value.put("none", null);
        List<Map<String, Object>> rows = new ArrayList<>();
        for (int i = 0; i < 50; i++) {
            Map<String, Object> row = new LinkedHashMap<>();
            row.put("id", i);
            row.put("area_mm2", i / 3.0);
            rows.add(row);
        }
        value.put("regions", rows);
        String expected = NumberText.jsonMapper().enable(SerializationFeature.INDENT_OUTPUT)
                .writeValueAsString(value);
        Output.prepareJson(); // races with the calls below: they must write the same text
        for (int i = 0; i < 20; i++) {
            assertThat(Output.json(value)).isEqualTo(expected);
        }
    }
}
