package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;

/** A JSON text that cannot be read is explained to the writer of the file, not to the programmer. */
class JsonErrorsTest {
    private static JsonProcessingException failure(String json) {
        try {
            new ObjectMapper().readTree(json);
        } catch (JsonProcessingException e) {
            return e;
        }
        throw new AssertionError("read: " + json);
    }

    @Test
    void nanAndInfinityAreSaidToBeNoJsonNumbersWithoutTheParsersFeatureName() {
        for (String token : new String[] {"NaN", "Infinity", "-Infinity"}) {
            String m = JsonErrors.notJson(failure("{\"conditions\": {\"srv_cm_s\": " + token + "}}"));
            assertThat(m).as(token).startsWith("line 1, column ")
                    .contains("not valid JSON: '" + token + "' is not a number in JSON (JSON has no NaN or Infinity")
                    .doesNotContain("ALLOW_NON_NUMERIC_NUMBERS").doesNotContain("enable");
        }
    }

    @Test
    void aCommentIsSaidToBeNoJson() {
        String m = JsonErrors.reason(failure("{\"a\": 1 // note\n}"));
        assertThat(m).endsWith("JSON has no comments").doesNotContain("ALLOW_COMMENTS");
    }

    @Test
    void otherReasonsStayAsTheParserGivesThem() {
        String m = JsonErrors.reason(failure("{\"a\": "));
        assertThat(m).isEqualTo(failure("{\"a\": ").getOriginalMessage());
    }

    @Test
    void aSidecarWithNaNNamesTheFileThePlaceAndTheRule() {
        assertThatThrownBy(() -> Sidecar.parse("{\"format\": \"trapmap-map/1\",\n \"pixel_pitch_mm\": NaN}", "w.json"))
                .isInstanceOf(MapFormatException.class)
                .hasMessageContaining("w.json").hasMessageContaining("line 2")
                .hasMessageContaining("'NaN' is not a number in JSON")
                .hasMessageNotContaining("ALLOW_NON_NUMERIC_NUMBERS");
    }
}
