package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import java.util.List;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Assertions;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.priors.Priors;

class BoundedRedrawStepsTest {
    /** Numbers 2 and 4 of the 1..5 scale, positions 1 and 3. */
    private static ChainState state() {
        ChainState s = new ChainState(SurveyOrder.of(FitterTest.smallSurvey(3L, 30)), true, null, new int[] {1, 3});
        InitialValues.apply(s, -1, RandomSource.XO_RO_SHI_RO_128_PP.create(1L));
        return s;
    }

    /** The range counts 0 (the numbers outside the set) and is read in every group. */
    @Test
    void boundReadsEveryGroupsRangeWithZeroIncluded() {
        ChainState s = state();
        int m = s.categories;
        double limit = BoundedRedrawSteps.MAX_RANGE;
        s.attraction[2 * m + 1] = -(limit - 1e-9);
        assertTrue(BoundedRedrawSteps.bounded(s), "below 0 by just under the limit");
        s.attraction[2 * m + 1] = -(limit + 1e-9);
        assertFalse(BoundedRedrawSteps.bounded(s), "below 0 by just over the limit, in the third group");
        s.attraction[2 * m + 1] = 0.5 - limit;
        s.attraction[2 * m + 3] = 0.5 + 1e-9;
        assertFalse(BoundedRedrawSteps.bounded(s), "both attracted numbers together span the limit");
        s.attraction[2 * m + 3] = 0.5 - 1e-9;
        assertTrue(BoundedRedrawSteps.bounded(s));
        s.attraction[2 * m + 3] = Double.NaN;
        assertFalse(BoundedRedrawSteps.bounded(s), "a NaN attraction never reaches the redraw scheme");
    }

    /** The steps run only while bounded; only sampling sweeps count towards the share. */
    @Test
    void stepsRunOnlyWhileBoundedAndSamplingSkipsAreCounted() {
        ChainState s = state();
        int[] calls = new int[2];
        BoundedRedrawSteps steps = BoundedRedrawSteps.of(s, List.of(adapt -> calls[0]++, adapt -> calls[1]++));
        steps.update(true);
        s.attraction[1] = -10;
        steps.update(true);
        steps.update(false);
        s.attraction[1] = 0.2;
        steps.update(false);
        steps.update(false);
        assertEquals(3, calls[0]);
        assertEquals(3, calls[1]);
        assertEquals(1 / 3.0, steps.skippedShare(), 1e-15, "one of three sampling sweeps skipped");
    }

    /**
     * A chain started where every group's number 2 has attraction 40 and a category 1e-12 wide
     * finishes its sweeps: a respondent's acceptance probability in the redraw scheme is then
     * about 1e-12 + e^-40, so about 10^12 draws each. The timeout only guards against a hang;
     * without the bound the first sweep would not end (checked by raising the bound).
     */
    @Test
    void aRunAwayStateDoesNotStallTheSweep() {
        ModelSpec spec = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.none())
                .withAttraction(NumberAttraction.of(2, 4));
        Chain chain = Chain.of(SurveyOrder.of(FitterTest.smallSurvey(5L, 40)), spec, true, 20,
                RandomSource.XO_RO_SHI_RO_128_PP.create(2L));
        ChainState s = chain.state();
        for (int g = 0; g < s.groups; g++) {
            s.attraction[g * s.categories + 1] = 40;
            int row = g * (s.categories + 1);
            s.thresholds[row + 2] = s.thresholds[row + 1] + 1e-12;
        }
        Assertions.assertTimeoutPreemptively(Duration.ofSeconds(60), () -> {
            for (int sweep = 0; sweep < 5; sweep++) {
                chain.sweepOnce(false);
            }
        });
        assertTrue(chain.latentStepsSkipped() > 0, "the latent-level steps were skipped at least once");
    }
}
