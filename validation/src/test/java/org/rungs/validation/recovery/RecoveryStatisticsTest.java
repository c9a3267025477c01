package org.rungs.validation.recovery;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The figures of a recovery study on fabricated posterior summaries, against hand computations
 * (reference values worked out with pencil and checked in Python 3 with exact arithmetic on the
 * same numbers; the formulas are those of Morris, White & Crowther 2019, table 6).
 */
final class RecoveryStatisticsTest {
    private static final double EXACT = 1e-12;

    /**
     * Four replications of one quantity, truths 1, 1, 2, 2. Errors (mean - truth) 0.1, -0.2, 0.3, 0:
     * bias 0.05, sd 0.2081666 so MCSE 0.1040833; squared errors 0.01, 0.04, 0.09, 0: MSE 0.035,
     * RMSE 0.1870829, sd(e^2) 0.0404145 so MCSE(MSE) 0.0202073 and MCSE(RMSE) =
     * 0.0202073 / (2 x 0.1870829) = 0.0540062. Intervals chosen so that the 50% ones cover in
     * replications 1 and 4 (4 on its closed end) and the 90% ones in 1, 2 and 4.
     */
    private static final List<QuantityEstimate> FOUR = List.of(
            new QuantityEstimate("level.x", 1.0, 1.1, 0.5, 0.9, 1.05, 1.5, false),
            new QuantityEstimate("level.x", 1.0, 0.8, 0.2, 0.6, 0.95, 1.4, true),
            new QuantityEstimate("level.x", 2.0, 2.3, 2.1, 2.2, 2.4, 2.6, false),
            new QuantityEstimate("level.x", 2.0, 2.0, 1.5, 2.0, 2.2, 2.5, false));

    @Test
    void biasRmseAndTheirStandardErrorsMatchTheHandComputation() {
        QuantityRecovery q = QuantityRecovery.of(FOUR);
        assertEquals("level.x", q.quantity());
        assertEquals(4, q.replications());
        assertEquals(1.5, q.truthMean(), EXACT);
        assertEquals(0.05, q.bias(), EXACT);
        assertEquals(0.10408329997330663, q.biasMcse(), EXACT);
        assertEquals(0.18708286933869708, q.rmse(), EXACT);
        assertEquals(0.05400617248673216, q.rmseMcse(), EXACT);
        assertEquals(1, q.flagged());
    }

    @Test
    void coverageCountsClosedIntervalsAndHasABinomialStandardError() {
        QuantityRecovery q = QuantityRecovery.of(FOUR);
        assertEquals(0.5, q.coverage50(), EXACT);
        assertEquals(0.25, q.coverage50Mcse(), EXACT); // sqrt(0.5 x 0.5 / 4)
        assertEquals(0.75, q.coverage90(), EXACT);
        assertEquals(0.21650635094610965, q.coverage90Mcse(), EXACT); // sqrt(0.75 x 0.25 / 4)
    }

    /**
     * Central 99% band: exact binomial sums (Python 3, math.comb) give for Binomial(20, 0.5)
     * P(X <= 3) = 0.00129, P(X <= 4) = 0.00591, P(X <= 15) = 0.99409, P(X <= 16) = 0.99871, so
     * the band is 4..16; for Binomial(4, 0.9) P(X <= 1) = 0.0037, P(X <= 3) = 0.3439, band 2..4.
     */
    @Test
    void bandIsTheCentralBinomialRange() {
        assertArrayEquals(new int[] {4, 16}, QuantityRecovery.band(20, 0.5));
        assertArrayEquals(new int[] {2, 4}, QuantityRecovery.band(4, 0.9));
        assertTrue(QuantityRecovery.outside(3, 20, 0.5));
        assertFalse(QuantityRecovery.outside(4, 20, 0.5));
        assertFalse(QuantityRecovery.outside(16, 20, 0.5));
        assertTrue(QuantityRecovery.outside(17, 20, 0.5));
        QuantityRecovery q = QuantityRecovery.of(FOUR);
        assertFalse(q.outside50()); // 2 of 4, band of Binomial(4, 0.5) is 0..4
        assertFalse(q.outside90()); // 3 of 4, band 2..4
    }

    /**
     * Overall coverage is the mean over replications of each one's covered share, and its MCSE
     * the sd of those shares over sqrt(R): shares 50% (1 of 2) and 100% (2 of 2) give 0.75 and
     * sd 0.3535534 / sqrt(2) = 0.25. A truth no replication estimated is listed; one estimated
     * in another replication is not.
     */
    @Test
    void overallCoverageAveragesTheReplicationsShares() {
        ReplicationEstimates first = new ReplicationEstimates(0, List.of(
                new QuantityEstimate("a", 0, 0, -1, -0.5, 0.5, 1, false),
                new QuantityEstimate("b", 0, 3, 2, 2.5, 3.5, 4, false)), List.of("reported_mean.g1", "c"));
        ReplicationEstimates second = new ReplicationEstimates(1, List.of(
                new QuantityEstimate("a", 0, 0.1, -1, -0.4, 0.6, 1, true),
                new QuantityEstimate("b", 0, 0.2, -1, -0.3, 0.7, 1, false),
                new QuantityEstimate("c", 0, 0.2, -1, -0.3, 0.7, 1, false)), List.of("reported_mean.g1"));
        RecoverySummary s = RecoverySummary.of(List.of(first, second));
        assertEquals(0.5 * (1.0 / 2 + 3.0 / 3), s.coverage50(), EXACT);
        assertEquals(0.25, s.coverage50Mcse(), EXACT);
        assertEquals(0.75, s.coverage90(), EXACT);
        assertEquals(1, s.nonConverged());
        assertEquals(List.of("a", "b", "c"), s.quantities().stream().map(QuantityRecovery::quantity).toList());
        assertEquals(1, s.quantities().get(2).replications());
        assertEquals(List.of("reported_mean.g1"), s.unmatched());
    }

    /** R's quantile type 7 by its definition, x[floor(h)] + (h - floor(h)) (x[floor(h)+1] - x[floor(h)]), h = (n-1)p. */
    @Test
    void quantileIsType7() {
        double[] sorted = {1, 2, 3, 4, 5};
        assertEquals(1.2, RecoveryReplication.quantile(sorted, 0.05), EXACT);
        assertEquals(2.0, RecoveryReplication.quantile(sorted, 0.25), EXACT);
        assertEquals(4.8, RecoveryReplication.quantile(sorted, 0.95), EXACT);
        assertEquals(5.0, RecoveryReplication.quantile(sorted, 1.0), EXACT);
    }

    @Test
    void longListsOfUnmatchedNamesAreShortenedByPrefix() {
        assertEquals("reported_mean.* (4), style.x",
                RecoveryReport.compact(List.of("reported_mean.a", "reported_mean.b", "reported_mean.c", "reported_mean.d",
                        "style.x")));
    }
}
