package trapmap.maps.trend;

/**
 * The tests for special causes applied to a control chart, on the plotted values in units of the chart's own σ
 * (one third of the distance from the centre line to a limit).
 */
public enum RunRule {
    /** One point beyond 3σ (Western Electric, <i>Statistical Quality Control Handbook</i>, 1956, test 1). */
    BEYOND_3_SIGMA("1 point beyond 3 sigma"),
    /** Two of three successive points beyond 2σ on the same side (Western Electric 1956, test 2). */
    TWO_OF_THREE_BEYOND_2_SIGMA("2 of 3 beyond 2 sigma, same side"),
    /** Four of five successive points beyond 1σ on the same side (Western Electric 1956, test 3). */
    FOUR_OF_FIVE_BEYOND_1_SIGMA("4 of 5 beyond 1 sigma, same side"),
    /** Eight successive points on the same side of the centre line (Western Electric 1956, test 4). */
    EIGHT_ON_ONE_SIDE("8 in a row on one side"),
    /** Six points in a row steadily rising or falling (Nelson, J. Qual. Technol. 16, 237 (1984), test 3). */
    SIX_TRENDING("6 in a row rising or falling");

    private final String description;

    RunRule(String description) {
        this.description = description;
    }

    /** The rule in words, as listed beside a chart. */
    public String description() {
        return description;
    }
}
