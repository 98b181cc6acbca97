package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;

class SidecarTest {
    @TempDir
    Path dir;

    private static final String FULL = """
            {
              "wafer_id": "w07",
              "quantity": "effective-lifetime",
              "unit": "ms",
              "pixel_pitch_mm": 0.5,
              "centre_x_px": 10.5,
              "centre_y_px": 9,
              "scale": 0.01,
              "offset": -1,
              "no_data": 0,
              "pages": ["before", "after"],
              "conditions": {
                "doping": "p:1e16",
                "thickness_um": 180,
                "temperature_k": 298.15,
                "injection_cm3": 1e14,
                "generation_cm3_s": 1e19,
                "srv_cm_s": 10,
                "photon_flux_cm2_s": 2.5e17,
                "pl_calibration_counts_cm6": 3e-30,
                "passivation": "AlOx",
                "anneal_min": 30,
                "gettered": true,
                "extra": {"operator": "B. K."}
              }
            }
            """;

    @Test
    void everyFieldOfTheSchemaIsRead() throws Exception {
        Sidecar s = Sidecar.parse(FULL, "w07.json");
        assertThat(s.waferId()).isEqualTo("w07");
        assertThat(s.quantity()).isEqualTo(Quantity.EFFECTIVE_LIFETIME);
        assertThat(s.unit()).isEqualTo("ms");
        assertThat(s.pixelPitchMm()).isEqualTo(0.5);
        assertThat(s.centreXPx()).isEqualTo(10.5);
        assertThat(s.centreYPx()).isEqualTo(9.0);
        assertThat(s.scale()).isEqualTo(0.01);
        assertThat(s.offset()).isEqualTo(-1.0);
        assertThat(s.noData()).isEqualTo(0.0);
        assertThat(s.pages()).containsExactly("before", "after");
        MeasurementConditions c = s.conditions();
        assertThat(c.doping()).isEqualTo(Doping.pType(1e16));
        assertThat(c.thicknessUm()).isEqualTo(180.0);
        assertThat(c.temperatureK()).isEqualTo(298.15);
        assertThat(c.injectionPerCm3()).isEqualTo(1e14);
        assertThat(c.generationPerCm3PerS()).isEqualTo(1e19);
        assertThat(c.srvCmPerS()).isEqualTo(10.0);
        assertThat(c.photonFluxPerCm2PerS()).isEqualTo(2.5e17);
        assertThat(c.plCalibration()).isEqualTo(3e-30);
        assertThat(c.extra()).isEqualTo(Map.of("passivation", "AlOx", "anneal_min", "30", "gettered", "true",
                "operator", "B. K."));
        assertThat(s.warnings()).isEmpty();
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "p:1e16          | P | 1e16",
        "n:5e15 cm^-3    | N | 5e15",
        "P : 2.5E15      | P | 2.5e15",
        "n:2ohmcm        | N | -2",
        "p:1.5 Ohm.cm    | P | -1.5",
        "p:1.5Ω·cm       | P | -1.5",
        "p:3 ohm*cm      | P | -3",
    })
    void dopingIsWrittenLikeOnTheCommandLine(String text, ConductivityType type, double densityOrMinusOhmCm)
            throws Exception {
        Doping d = Sidecar.parse("{\"conditions\": {\"doping\": \"" + text + "\"}}", "d.json").conditions()
                .doping();
        Doping expected = densityOrMinusOhmCm > 0 ? new Doping(type, densityOrMinusOhmCm)
                : Doping.fromResistivity(type, -densityOrMinusOhmCm);
        assertThat(d).isEqualTo(expected);
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', quoteCharacter = '`', value = {
        "{\"pixel_pitch_mm\": \"0.5\"}            | field 'pixel_pitch_mm': must be a number but is a text (\"0.5\") (mm)",
        "{\"pixel_pitch_mm\": -1}                 | field 'pixel_pitch_mm': must be in (0, 1000] but was -1 (mm)",
        "{\"pixel_pitch_mm\": 0}                  | field 'pixel_pitch_mm': must be in (0, 1000] but was 0 (mm)",
        "{\"pixel_pitch_mm\": 1e400}              | field 'pixel_pitch_mm': must be a finite number but is beyond the range of numbers (mm)",
        "{\"centre_x_px\": true}                  | field 'centre_x_px': must be a number but is a boolean (true) (px)",
        "{\"centre_y_px\": 1e12}                  | field 'centre_y_px': must be in [-1e9, 1e9] but was 1e12 (px)",
        "{\"scale\": 0}                           | field 'scale': must not be 0",
        "{\"offset\": [1]}                        | field 'offset': must be a number but is an array ([1])",
        "{\"no_data\": null, \"unit\": 5}         | field 'unit': must be a text but is a number (5)",
        "{\"wafer_id\": {}}                       | field 'wafer_id': must be a text but is an object ({})",
        "{\"quantity\": \"lifetime\"}             | field 'quantity': unknown quantity 'lifetime' (known: effective-lifetime, pl-counts, injection, trap-density, density-min, density-max, occupancy, srh-lifetime, lifetime-at-reference, defect-index, chi-squared, identification-status, region, iron-density, normalised-density, status, difference, ratio, relative-change, fraction, exceedance-probability, density-quantile, unknown)",
        "{\"pages\": \"before\"}                  | field 'pages': must be an array of page labels but is a text",
        "{\"pages\": [\"a\", 2]}                  | field 'pages[1]': must be a text (a label) or an object with a label and condition fields but is a number",
        "{\"conditions\": []}                     | field 'conditions': must be an object but is an array",
        "{\"conditions\": {\"doping\": \"x:1e16\"}}        | field 'conditions.doping': must be <type>:<value> with type p or n and a density in cm^-3 (p:1e16) or a resistivity in Ω·cm (p:1.5ohmcm) (got 'x:1e16')",
        "{\"conditions\": {\"doping\": \"p:1e25\"}}        | field 'conditions.doping': density must be in [1e10, 1e19] cm^-3 (got 1e25)",
        "{\"conditions\": {\"doping\": \"p:1e9ohmcm\"}}    | field 'conditions.doping': resistivity must be in [1e-4, 10000] Ω·cm (got 1e9)",
        "{\"conditions\": {\"doping\": 1e16}}              | field 'conditions.doping': must be a text but is a number (1.0E16)",
        "{\"conditions\": {\"thickness_um\": -5}}          | field 'conditions.thickness_um': must be in [1, 5000] but was -5 (µm)",
        "{\"conditions\": {\"thickness_um\": \"180um\"}}   | field 'conditions.thickness_um': must be a number but is a text (\"180um\") (µm)",
        "{\"conditions\": {\"temperature_k\": 25}}         | field 'conditions.temperature_k': must be in [77, 500] but was 25 (K)",
        "{\"conditions\": {\"injection_cm3\": 1e20}}       | field 'conditions.injection_cm3': must be in [1e6, 1e19] but was 1e20 (cm^-3)",
        "{\"conditions\": {\"generation_cm3_s\": 1}}       | field 'conditions.generation_cm3_s': must be in [1e10, 1e24] but was 1 (cm^-3 s^-1)",
        "{\"conditions\": {\"srv_cm_s\": -1}}              | field 'conditions.srv_cm_s': must be in [0, 1e7] but was -1 (cm/s)",
        "{\"conditions\": {\"photon_flux_cm2_s\": 0}}      | field 'conditions.photon_flux_cm2_s': must be > 0 but was 0 (cm^-2 s^-1)",
        "{\"conditions\": {\"pl_calibration_counts_cm6\": -3e-30}} | field 'conditions.pl_calibration_counts_cm6': must be > 0 but was -3e-30 (counts·cm^6)",
        "{\"conditions\": {\"extra\": 5}}                  | field 'conditions.extra': must be an object of texts but is a number",
        "{\"history\": {\"steps\": [{\"parameters\": {}}]}} | field 'history.steps[0].operation': is missing",
        "{\"history\": {\"steps\": [{\"operation\": \"x\", \"parameters\": {\"a\": {}}}]}} | field 'history.steps[0].parameters.a': must be a text but is an object",
    })
    void wrongTypesAndRangesNameTheFieldAndUnit(String json, String expected) {
        assertThatThrownBy(() -> Sidecar.parse(json, "w.json")).isInstanceOf(MapFormatException.class)
                .hasMessage("w.json: " + expected);
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', quoteCharacter = '`', value = {
        "``                 | w.json: is empty; expected a JSON object",
        "[1, 2]             | w.json: holds an array; expected a JSON object",
        "{\"unit\": \"us\",   | w.json: line 1, column 15: not valid JSON: Unexpected end-of-input",
        "{\"a\": 1, \"a\": 2} | w.json: line 1, column 13: not valid JSON: Duplicate field 'a'",
        "{} {}              | w.json: line 1, column 4: not valid JSON: Trailing token",
    })
    void malformedJsonIsRefusedWithItsPosition(String json, String expectedStart) {
        assertThatThrownBy(() -> Sidecar.parse(json, "w.json")).isInstanceOf(MapFormatException.class)
                .hasMessageStartingWith(expectedStart);
    }

    @Test
    void unknownFieldsBecomeWarningsInTheProvenance() throws Exception {
        Files.write(dir.resolve("u.tif"), plainTiff());
        Files.writeString(dir.resolve("u.json"), "{\"unit\": \"us\", \"pixel_pitch_mm\": 1, \"operator\": \"K\","
                + " \"conditions\": {\"wafer_map\": [1, 2]}}");

        WaferMap m = MapFiles.readSingle(dir.resolve("u.tif"));
        String sidecar = dir.resolve("u.json").toString();
        assertThat(m.provenance().steps()).contains(
                ProcessingStep.of("warning", "file", sidecar, "message", "unknown field 'operator' ignored"),
                ProcessingStep.of("warning", "file", sidecar, "message", "field 'conditions.wafer_map' is an array,"
                        + " not a text, number or boolean; ignored"));
    }

    /** A hang guard only: the checks are on the result. */
    private static final java.time.Duration HANG_GUARD = java.time.Duration.ofSeconds(10);

    private static String unknownKeys(int n) {
        StringBuilder b = new StringBuilder("{\"unit\": \"us\", \"pixel_pitch_mm\": 1");
        for (int i = 0; i < n; i++) {
            b.append(", \"k").append(i).append("\": ").append(i);
        }
        return b.append('}').toString();
    }

    @Test
    void halfAMillionUnknownKeysAreRefusedNamingTheLimit() throws Exception {
        Files.write(dir.resolve("big.tif"), plainTiff());
        Path json = dir.resolve("big.json");
        Files.writeString(json, unknownKeys(500_000));
        org.junit.jupiter.api.Assertions.assertTimeoutPreemptively(HANG_GUARD, () ->
                assertThatThrownBy(() -> MapFiles.read(dir.resolve("big.tif"))).isInstanceOf(MapFormatException.class)
                        .hasMessage(json + ": has more than 10000 keys; a sidecar may have at most 10000"));
    }

    @Test
    void manyUnknownKeysAreListedUpToTheLimitAndCountedAfter() throws Exception {
        Files.write(dir.resolve("many.tif"), plainTiff());
        Files.writeString(dir.resolve("many.json"), unknownKeys(9_000));
        WaferMap m = MapFiles.readSingle(dir.resolve("many.tif"));
        List<String> messages = m.provenance().steps().stream().filter(s -> s.operation().equals("warning"))
                .map(s -> s.parameters().get("message")).toList();
        assertThat(messages).hasSize(trapmap.shared.text.TextLimits.MAX_LISTED_WARNINGS + 1);
        assertThat(messages.get(0)).isEqualTo("unknown field 'k0' ignored");
        assertThat(messages.get(19)).isEqualTo("unknown field 'k19' ignored");
        assertThat(messages.get(20)).isEqualTo("... and 8980 more unknown fields ignored");
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
            "wafer_id|257|field 'wafer_id': is 257 characters long; at most 256 are allowed",
            "unit|4097|field 'unit': is 4097 characters long; at most 4096 are allowed"})
    void overlongTextsNameTheFieldAndTheLimit(String key, int length, String expected) {
        String ok = "{\"" + key + "\": \"" + "u".repeat(length - 1) + "\"}";
        assertThat(catchMessage(ok)).isNull();
        String json = "{\"" + key + "\": \"" + "u".repeat(length) + "\"}";
        assertThat(catchMessage(json)).isEqualTo("s.json: " + expected);
    }

    @Test
    void overlongFactsAndKeysAreRefused() {
        assertThat(catchMessage("{\"conditions\": {\"passivation\": \"" + "a".repeat(4097) + "\"}}"))
                .isEqualTo("s.json: field 'conditions.passivation': is 4097 characters long; at most 4096 are"
                        + " allowed");
        assertThat(catchMessage("{\"conditions\": {\"extra\": {\"" + "k".repeat(300) + "\": \"x\"}}}"))
                .startsWith("s.json: key 'kkkkk").endsWith("': is 300 characters long; at most 256 are allowed");
        assertThat(catchMessage("{\"a\": {\"b\": [" + "{\"c\": 1},".repeat(10_000) + "{}]}}"))
                .isEqualTo("s.json: has more than 10000 keys; a sidecar may have at most 10000");
    }

    /** The message of parsing {@code json} as {@code s.json}; null when it parses (its unit aside). */
    private static String catchMessage(String json) {
        try {
            Sidecar.parse(json, "s.json");
            return null;
        } catch (MapFormatException e) {
            return e.getMessage();
        } catch (IllegalArgumentException e) {
            return "quantity: " + e.getMessage();
        }
    }

    @Test
    void sidecarIsFoundBesideTheMap() {
        assertThat(MapFiles.sidecarOf(Path.of("/data/w07.tif"))).isEqualTo(Path.of("/data/w07.json"));
        assertThat(MapFiles.sidecarOf(Path.of("w07.map.csv"))).isEqualTo(Path.of("w07.map.json"));
    }

    @Test
    void sidecarErrorsNameTheSidecarFile() throws Exception {
        Files.write(dir.resolve("e.tif"), plainTiff());
        Path json = dir.resolve("e.json");
        Files.writeString(json, "{\"conditions\": {\"thickness_um\": 0}}");

        assertThatThrownBy(() -> MapFiles.read(dir.resolve("e.tif"))).isInstanceOf(MapFormatException.class)
                .hasMessage(json + ": field 'conditions.thickness_um': must be in [1, 5000] but was 0 (µm)")
                .satisfies(e -> {
                    MapFormatException m = (MapFormatException) e;
                    assertThat(m.file()).isEqualTo(json.toString());
                    assertThat(m.location()).isEqualTo("field 'conditions.thickness_um'");
                    assertThat(m.unit()).isEqualTo("µm");
                });
    }

    @Test
    void pageLabelsMustMatchThePages() throws Exception {
        Files.write(dir.resolve("p.tif"), plainTiff());
        Path json = dir.resolve("p.json");
        Files.writeString(json, "{\"pages\": [\"before\", \"after\"]}");

        assertThatThrownBy(() -> MapFiles.read(dir.resolve("p.tif")))
                .hasMessage(json + ": field 'pages': gives 2 labels but " + dir.resolve("p.tif") + " has 1 page");
    }

    @Test
    void sidecarNotUtf8IsRefused() throws Exception {
        Path json = dir.resolve("x.json");
        Files.write(json, new byte[] {'{', '"', (byte) 0xFF, '"', '}'});
        assertThatThrownBy(() -> Sidecar.read(json)).hasMessage(json + ": is not UTF-8 text");
    }

    @Test
    void toJsonRoundTripsEveryFact() throws Exception {
        WaferMap m = Fixtures.lifetimeMap(3, 3, 1);
        Sidecar s = Sidecar.parse(Sidecar.toJson(m), "m");
        assertThat(s.conditions()).isEqualTo(m.conditions());
        assertThat(s.history()).isEqualTo(m.provenance());
        assertThat(s.pixelPitchMm()).isEqualTo(m.grid().pitchMm());
        assertThat(s.centreXPx()).isEqualTo(m.grid().centreXPx());
        assertThat(s.warnings()).isEmpty();
        assertThat(Sidecar.toJson(m)).matches("\\p{ASCII}*");
        assertThat(List.of(s.quantity(), s.unit())).containsExactly(Quantity.EFFECTIVE_LIFETIME, "us");
    }

    static byte[] plainTiff() {
        TiffBytes t = TiffBytes.littleEndian();
        t.floatPage(2, 2, new float[] {1, 2, 3, 4});
        return t.build();
    }

    @Test
    void pageObjectsGiveConditionsOfTheirPageOnly() throws Exception {
        Sidecar s = Sidecar.parse("""
                {"conditions": {"doping": "p:1e15", "generation_cm3_s": 1e19},
                 "pages": ["plain", {"label": "1e13", "injection_cm3": 1e13}, {"label": "g", "generation_cm3_s": 1e18,
                           "temperature_k": 310}]}
                """, "s.json");
        assertThat(s.pages()).containsExactly("plain", "1e13", "g");
        assertThat(s.conditionsOfPage(0).generationPerCm3PerS()).isEqualTo(1e19);
        assertThat(s.conditionsOfPage(1).injectionPerCm3()).isEqualTo(1e13);
        assertThat(s.conditionsOfPage(1).generationPerCm3PerS()).isNull();
        assertThat(s.conditionsOfPage(1).doping()).isEqualTo(Doping.pType(1e15));
        assertThat(s.conditionsOfPage(2).generationPerCm3PerS()).isEqualTo(1e18);
        assertThat(s.conditionsOfPage(2).temperatureK()).isEqualTo(310.0);
    }

    @Test
    void badPageObjectsNameTheFieldAndUnit() {
        assertThatThrownBy(() -> Sidecar.parse("{\"pages\": [{\"label\": \"a\", \"injection_cm3\": -1}]}",
                "s.json")).isInstanceOf(MapFormatException.class).hasMessageContaining("s.json")
                .hasMessageContaining("pages[0].injection_cm3").hasMessageContaining("cm^-3");
        assertThatThrownBy(() -> Sidecar.parse("{\"pages\": [{\"injection_cm3\": 1e13}]}", "s.json"))
                .hasMessageContaining("pages[0].label").hasMessageContaining("missing");
        assertThatThrownBy(() -> Sidecar.parse("{\"pages\": [{\"label\": \"a\", \"dn\": 1e13}]}", "s.json"))
                .hasMessageContaining("pages[0].dn").hasMessageContaining("injection_cm3");
        assertThatThrownBy(() -> Sidecar.parse("{\"pages\": [{\"label\": \"a\", \"injection_cm3\": 1e13,"
                + " \"generation_cm3_s\": 1e19}]}", "s.json")).hasMessageContaining("pages[0]")
                .hasMessageContaining("both");
        assertThatThrownBy(() -> Sidecar.parse("{\"pages\": [3]}", "s.json"))
                .hasMessageContaining("pages[0]").hasMessageContaining("a number");
    }
}
