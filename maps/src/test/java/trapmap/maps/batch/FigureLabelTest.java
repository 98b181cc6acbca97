package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/** Figures read in reports by a readable label with its unit; the results' columns keep the names. */
class FigureLabelTest {

    @Test
    void everyFigureHasAReadableLabelWithItsUnit() {
        assertThat(Figure.parse("largest_interior_region_mm2").label()).isEqualTo("largest interior region (mm²)");
        assertThat(Figure.parse("largest_region_mm2").label()).isEqualTo("largest region (mm²)");
        assertThat(Figure.parse("harmonic_mean_lifetime_us").label()).isEqualTo("harmonic-mean lifetime (µs)");
        assertThat(Figure.parse("median_lifetime_us").label()).isEqualTo("median lifetime (µs)");
        assertThat(Figure.parse("p5_lifetime_us").label()).isEqualTo("lifetime P5 (µs)");
        assertThat(Figure.parse("p12.5_lifetime_us").label()).isEqualTo("lifetime P12.5 (µs)");
        assertThat(Figure.parse("trap_density_p95_cm3").label()).isEqualTo("trap density P95 (cm⁻³)");
        assertThat(Figure.parse("flagged_area_fraction").label()).isEqualTo("flagged area fraction");
        assertThat(Figure.parse("below_limit_area_fraction").label()).isEqualTo("below-limit area fraction");
        assertThat(Figure.parse("invalid_area_fraction").label()).isEqualTo("invalid area fraction");
        assertThat(Figure.parse("edge_to_centre_ratio").label()).isEqualTo("edge-to-centre lifetime ratio");
        // the name stays the machine name
        assertThat(Figure.parse("largest_interior_region_mm2").name()).isEqualTo("largest_interior_region_mm2");
    }

    @Test
    void failedRulesReadWithTheFiguresReadableNameAndKeepTheirReason() {
        assertThat(Figure.readable("largest_interior_region_mm2")).isEqualTo("largest interior region");
        assertThat(Figure.readable("invalid_area_fraction 0.34 > 0.05 (default limit)"))
                .isEqualTo("invalid area fraction 0.34 > 0.05 (default limit)");
        assertThat(Figure.readable("not a figure")).isEqualTo("not a figure");
        assertThat(Figure.labelOf("trap_density_p90_cm3")).isEqualTo("trap density P90 (cm⁻³)");
        assertThat(Figure.labelOf("wafer_id")).isEqualTo("wafer_id");
    }
}
