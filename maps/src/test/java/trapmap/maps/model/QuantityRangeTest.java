package trapmap.maps.model;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class QuantityRangeTest {
    @Test
    void fractionsDefaultToZeroToOneAndOtherQuantitiesFollowTheirData() {
        assertThat(Quantity.FRACTION.isFraction()).isTrue();
        assertThat(Quantity.FRACTION.defaultRange()).containsExactly(0, 1);
        for (Quantity q : Quantity.values()) {
            if (q != Quantity.FRACTION) {
                assertThat(q.isFraction()).as(q.key()).isFalse();
                assertThat(q.defaultRange()).as(q.key()).isNull();
            }
        }
    }
}
