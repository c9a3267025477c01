package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.priors.Priors;

class JointHamiltonianUpdateTest {
    /**
     * Where the metric cannot be fitted (here a group's thresholds out of order, so the collapsed
     * density is zero at the state), the step stays off and tries again every sixteenth of
     * warm-up, not every sweep: from sweep 80 of 160, at 80, 90, ..., 160.
     */
    @Test
    void aFailedFitIsRetriedEverySixteenthOfWarmup() {
        ChainState s = CollapsedPosteriorTest.state(true, true, false, 6);
        int stride = s.categories + 1;
        double second = s.thresholds[stride + 2];
        s.thresholds[stride + 2] = s.thresholds[stride + 3];
        s.thresholds[stride + 3] = second;
        JointHamiltonianUpdate step = JointHamiltonianUpdate.of(s, Priors.defaults(), 160,
                RandomSource.XO_RO_SHI_RO_128_PP.create(3L));
        for (int sweep = 0; sweep < 160; sweep++) {
            step.update(true);
        }
        assertEquals(9, step.buildAttempts());
        step.update(false);
        assertFalse(Double.isFinite(step.acceptanceRate()), "the step never ran");
    }
}
