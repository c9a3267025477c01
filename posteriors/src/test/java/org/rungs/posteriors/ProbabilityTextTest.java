package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Probabilities as text: none that is uncertain reads as 1 or 0. */
class ProbabilityTextTest {
    @Test
    void aProbabilityThatRoundsToOneOrZeroSaysOnWhichSideItLies() {
        assertEquals("> 0.99", ProbabilityText.of(0.997, 2), "P(top 3) of 0.997 is not 1.00");
        assertEquals("> 0.99", ProbabilityText.of(0.995, 2), "0.995 would print as 1.00");
        assertEquals("0.99", ProbabilityText.of(0.9949, 2));
        assertEquals("< 0.01", ProbabilityText.of(0.004, 2));
        assertEquals("0.01", ProbabilityText.of(0.005, 2), "0.005 prints as 0.01, not 0.00");
        assertEquals("> 0.999", ProbabilityText.of(0.99962, 3));
        assertEquals("< 0.001", ProbabilityText.of(1e-12, 3));
        assertEquals("0.64", ProbabilityText.of(0.6412, 2));
    }

    /** A computed chance of exactly 1 or 0 is a rounding of the arithmetic, not a certainty. */
    @Test
    void aComputedOneOrZeroIsNotCertainEither() {
        assertEquals("> 0.99", ProbabilityText.of(1, 2));
        assertEquals("< 0.01", ProbabilityText.of(0, 2));
        assertEquals("NaN", ProbabilityText.of(Double.NaN, 2));
    }

    /** With 4,000 draws a share of exactly 1 says no draw fell below, not that none could. */
    @Test
    void aShareOfDrawsOfExactlyOneOrZeroSaysAllOrNoDraws() {
        assertEquals("all draws", ProbabilityText.ofDraws(1, 2));
        assertEquals("no draw", ProbabilityText.ofDraws(0, 2));
        assertEquals("> 0.99", ProbabilityText.ofDraws(3999.0 / 4000, 2));
        assertEquals("< 0.01", ProbabilityText.ofDraws(1.0 / 4000, 2));
        assertEquals("0.70", ProbabilityText.ofDraws(0.7, 2));
    }
}
