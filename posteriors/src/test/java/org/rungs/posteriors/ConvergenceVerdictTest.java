package org.rungs.posteriors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The verdict's three outcomes, on summaries built by hand (4 chains: ESS 400 is the limit). */
class ConvergenceVerdictTest {
    private static ParameterSummary summary(String name, double rhat, double ess, double chance) {
        return ParameterSummary.of(name, 0, 1, -1.6, 0, 1.6, rhat, ess, ess, 0.03, chance, 4);
    }

    /** 200 quantities that pass, plus the given ones. */
    private static List<ParameterSummary> family(ParameterSummary... extra) {
        List<ParameterSummary> all = new ArrayList<>();
        for (int p = 0; p < 200; p++) {
            all.add(summary("p" + p, 1.002, 800, 0.5));
        }
        all.addAll(List.of(extra));
        return all;
    }

    @Test
    void noFlagsIsConverged() {
        ConvergenceVerdict v = ConvergenceVerdict.of(family());
        assertEquals(ConvergenceVerdict.Kind.CONVERGED, v.kind());
        assertEquals("All 200 parameters converged (R-hat <= 1.01, bulk and tail ESS >= 100 per chain).", v.line("parameters"));
    }

    /** 1 - (1 - 0.02)^202 = 0.983: an R-hat that likely is what one in 202 quantities shows. */
    @Test
    void anRhatFlagAsLikelyAsChanceIsWithinChance() {
        ConvergenceVerdict v = ConvergenceVerdict.of(family(summary("t.7", 1.0103, 800, 0.02), summary("t.8", 1.0101, 900, 0.3)));
        assertEquals(ConvergenceVerdict.Kind.WITHIN_CHANCE, v.kind());
        assertTrue(v.readable());
        assertEquals(0.983, v.familyChance(), 5e-4);
        assertEquals("Converged within chance: 2 of 202 parameters have R-hat above 1.01 (largest t.7: 1.0103) and every"
                + " ESS is sufficient; among 202 parameters, chains drawing from the posterior itself give R-hat this far"
                + " from 1 with probability 0.98 (README, reading the verdict).", v.line("parameters"));
    }

    /** 1 - (1 - 0.1)^201 rounds to 1 at two decimals: the console does not call it certain (ProbabilityText). */
    @Test
    void aFamilyChanceThatRoundsToOneIsNotPrintedAsCertain() {
        ConvergenceVerdict v = ConvergenceVerdict.of(family(summary("t.7", 1.0103, 800, 0.1)));
        assertEquals(ConvergenceVerdict.Kind.WITHIN_CHANCE, v.kind());
        assertTrue(v.line("parameters").endsWith(" from 1 with probability > 0.99 (README, reading the verdict)."),
                v.line("parameters"));
    }

    /** 1 - (1 - 1e-5)^201 = 0.002 < 0.05: the chains disagree. */
    @Test
    void anUnlikelyRhatIsNotConverged() {
        ConvergenceVerdict v = ConvergenceVerdict.of(family(summary("t.7", 1.0103, 800, 1e-5)));
        assertEquals(ConvergenceVerdict.Kind.NOT_CONVERGED, v.kind());
        assertFalse(v.readable());
        assertEquals("Not converged: 1 of 201 parameters flagged: t.7.", v.line("parameters"));
    }

    /** An unlikely R-hat anywhere in the family counts, flagged or not. */
    @Test
    void anUnlikelyUnflaggedRhatStillCounts() {
        assertEquals(ConvergenceVerdict.Kind.NOT_CONVERGED, ConvergenceVerdict.of(family(
                summary("t.7", 1.0103, 800, 0.3), summary("big", 1.009, 40_000, 1e-6))).kind());
    }

    @Test
    void lowEssOrAnRhatAboveTheCeilingIsNeverChance() {
        assertEquals(ConvergenceVerdict.Kind.NOT_CONVERGED, ConvergenceVerdict.of(family(summary("t.7", 1.0, 399, 0.9))).kind());
        assertEquals(ConvergenceVerdict.Kind.NOT_CONVERGED,
                ConvergenceVerdict.of(family(summary("t.7", 1.0103, 399, 0.9))).kind());
        assertEquals(ConvergenceVerdict.Kind.NOT_CONVERGED, ConvergenceVerdict.of(family(summary("t.7", 1.031, 800, 0.9))).kind());
        assertEquals(ConvergenceVerdict.Kind.NOT_CONVERGED,
                ConvergenceVerdict.of(family(summary("t.7", 1.0103, 800, Double.NaN))).kind());
    }
}
