package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;

class ScenarioTest {

    private static final List<Scenario.Group> TWO_GROUPS = List.of(new Scenario.Group("A", 10), new Scenario.Group("B", 10));
    private static final Scenario.GroupLevels LEVELS = new Scenario.GroupLevels.Fixed(new double[] {0, 0.5});

    private static Scenario withThresholds(double[] thresholds, Scenario.ThresholdDeviations deviations) {
        return new Scenario(new Scenario.Scale(1, 4), TWO_GROUPS, List.of(), LEVELS, thresholds, deviations, 1L);
    }

    @Test
    void centredSubtractsTheMean() {
        assertArrayEquals(new double[] {-1.5, -0.5, 2}, Scenario.centred(-1, 0, 2.5), 1e-15);
    }

    @Test
    void commonThresholdsMustIncreaseAndSumToZero() {
        Scenario.ThresholdDeviations shared = Scenario.ThresholdDeviations.shared();
        assertThrows(IllegalArgumentException.class, () -> withThresholds(new double[] {-1, 0, 2}, shared));
        assertThrows(IllegalArgumentException.class, () -> withThresholds(new double[] {0, -1, 1}, shared));
        assertThrows(IllegalArgumentException.class, () -> withThresholds(new double[] {-1, 1}, shared));
    }

    @Test
    void statedDeviationsMustSumToZeroAndKeepTheOrder() {
        double[] common = {-1, 0, 1};
        assertThrows(IllegalArgumentException.class, () -> withThresholds(common,
                new Scenario.ThresholdDeviations.Fixed(new double[][] {{0, 0, 0}, {0.1, 0, 0}})));
        assertThrows(IllegalArgumentException.class, () -> withThresholds(common,
                new Scenario.ThresholdDeviations.Fixed(new double[][] {{0, 0, 0}, {1.2, -1.2, 0}})));
        assertThrows(IllegalArgumentException.class, () -> withThresholds(common,
                new Scenario.ThresholdDeviations.Fixed(new double[][] {{0, 0, 0}})));
    }

    @Test
    void namesMustBeUniqueAndFitInACsvFile() {
        assertThrows(IllegalArgumentException.class, () -> new Scenario.Group("North,South", 5));
        assertThrows(IllegalArgumentException.class, () -> new Scenario(new Scenario.Scale(1, 4),
                List.of(new Scenario.Group("A", 10), new Scenario.Group("A", 10)), List.of(), LEVELS,
                new double[] {-1, 0, 1}, Scenario.ThresholdDeviations.shared(), 1L));
        CovariateDistribution uniform = new CovariateDistribution.Uniform(0, 1);
        assertThrows(IllegalArgumentException.class, () -> new Scenario(new Scenario.Scale(1, 4), TWO_GROUPS,
                List.of(new Scenario.LevelCovariate("rating", uniform, 1, 2)), LEVELS,
                new double[] {-1, 0, 1}, Scenario.ThresholdDeviations.shared(), 1L));
    }

    @Test
    void oneInterceptPerGroupAndOneGroupHasOnlyGlobalTerms() {
        assertThrows(IllegalArgumentException.class, () -> new Scenario(new Scenario.Scale(1, 4), TWO_GROUPS, List.of(),
                new Scenario.GroupLevels.Fixed(new double[] {0}), new double[] {-1, 0, 1},
                Scenario.ThresholdDeviations.shared(), 1L));
        assertThrows(IllegalArgumentException.class, () -> new Scenario(new Scenario.Scale(1, 4),
                List.of(new Scenario.Group("A", 10)), List.of(), new Scenario.GroupLevels.Fixed(new double[] {0}),
                new double[] {-1, 0, 1}, new Scenario.ThresholdDeviations.Drawn(0.1), 1L));
    }
}
