package trapmap.maps.model;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class QuantityRangeTest {
    @Test
    void fractionsDefaultToZeroToOneAndOtherQuantitiesFollowTheirData() {
        for (Quantity q : new Quantity[] {Quantity.FRACTION, Quantity.EXCEEDANCE_PROBABILITY}) {
            assertThat(q.isFraction()).as(q.key()).isTrue();
            assertThat(q.defaultRange()).as(q.key()).containsExactly(0, 1);
        }
        for (Quantity q : Quantity.values()) {
            if (q != Quantity.FRACTION && q != Quantity.EXCEEDANCE_PROBABILITY) {
                assertThat(q.isFraction()).as(q.key()).isFalse();
                assertThat(q.defaultRange()).as(q.key()).isNull();
            }
        }
    }
}
