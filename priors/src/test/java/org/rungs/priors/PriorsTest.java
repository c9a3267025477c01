package org.rungs.priors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** Priors given as text ({@code --prior NAME=DIST}). */
class PriorsTest {

    @Test
    void aPriorInTheRangeReplacesTheDefault() {
        Priors p = Priors.defaults().with("group_mean=normal(-100,1e-6)").with("threshold_sd=half-normal(1e6)");
        assertEquals(new Normal(-100, 1e-6), p.groupMean());
        assertEquals(new HalfNormal(1e6), p.thresholdSd());
    }

    /**
     * Our rule, after an audit in which threshold_sd=half-normal(1e-155) and
     * group_mean=normal(1e200,1) hung the sampler: sds outside 1e-6..1e6 and means beyond 100 are
     * refused with the prior's name and the range expected, and so are an sd of 0 or below.
     */
    @Test
    void extremePriorsAreRefusedNamingThePriorAndTheRange() {
        String[][] cases = {
                {"threshold_sd=half-normal(1e-155)", "prior threshold_sd: the sd 1.0E-155 is outside 1e-6..1e6"},
                {"group_sd=half-normal(2e6)", "prior group_sd: the sd 2000000.0 is outside 1e-6..1e6"},
                {"level=normal(0,0)", "prior level: the sd 0.0 is outside 1e-6..1e6"},
                {"style=normal(0,-1)", "prior style: the sd -1.0 is outside 1e-6..1e6"},
                {"group_mean=normal(1e200,1)", "prior group_mean: the mean 1.0E200 is outside -100..100"},
                {"style_mean=normal(-101,1)", "prior style_mean: the mean -101.0 is outside -100..100"},
        };
        for (String[] c : cases) {
            IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Priors.defaults().with(c[0]), c[0]);
            assertTrue(e.getMessage().startsWith(c[1]), e.getMessage());
            assertTrue(e.getMessage().contains("expected"), e.getMessage());
        }
    }
}
