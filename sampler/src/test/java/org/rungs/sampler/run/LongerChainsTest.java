package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.rungs.posteriors.ParameterSummary;

class LongerChainsTest {
    private static ParameterSummary summary(String name, double rhat, double bulk, double tail) {
        return ParameterSummary.of(name, 0, 1, -1.6, 0, 1.6, rhat, bulk, tail, 0.01, 0.5, 4);
    }

    @Test
    void namesTheSlowestParameterAndScalesTheThinning() {
        List<ParameterSummary> s = List.of(summary("fast", 1.0, 3000, 2500), summary("slow", 1.05, 80, 120),
                summary("tail-slow", 1.02, 150, 100));
        String text = LongerChains.advice(s, 4, 1, 1000, null);
        // 400 needed over 80 reached: 5 times, --thin 5
        assertTrue(text.contains("the smallest effective sample size is 80 (slow) where 400 are needed"), text);
        assertTrue(text.contains("--thin 5 "), text);
        // already thinned by 3: 15
        assertTrue(LongerChains.advice(s, 4, 3, 1000, null).contains("--thin 15 "), LongerChains.advice(s, 4, 3, 1000, null));
    }

    /** The demo on seed 5: every parameter fine, a derived share at bulk ESS 357. */
    @Test
    void aSlowDerivedQuantityCountsToo() {
        List<ParameterSummary> parameters = List.of(summary("threshold.1", 1.004, 640, 700));
        List<ParameterSummary> derived = List.of(summary("coarse_share.Vellanmoor", 1.009, 357, 508),
                summary("intended_share.Tarnwhistle.4", 1.011, 858, 953));
        String text = LongerChains.advice(parameters, derived, 4, 2, 1000, null);
        // 400 / 357 = 1.12 times 2: --thin 3
        assertTrue(text.contains("is 357 (coarse_share.Vellanmoor) where 400 are needed") && text.contains("--thin 3 "), text);
        assertTrue(!text.contains("--resume"), "chains not kept: no command to continue them; " + text);
    }

    /** Kept chains continue with a multiple of their thin: 3 is suggested, 4 is the smallest multiple of 2 above it. */
    @Test
    void keptChainsAreContinuedWithAMultipleOfTheirThin() {
        List<ParameterSummary> parameters = List.of(summary("threshold.1", 1.004, 640, 700));
        List<ParameterSummary> derived = List.of(summary("coarse_share.Vellanmoor", 1.009, 357, 508));
        String text = LongerChains.advice(parameters, derived, 4, 2, 1000, Path.of("results"));
        assertTrue(text.contains("--thin 3 ") && text.contains("'rungs fit --resume results --thin 4' continues them"), text);
        String once = LongerChains.advice(parameters, derived, 4, 1, 1000, Path.of("results"));
        assertTrue(once.contains("'rungs fit --resume results --thin 2'"), once);
    }

    @Test
    void rhatAloneAsksForTwiceTheIterations() {
        String text = LongerChains.advice(List.of(summary("a", 1.03, 900, 800)), 4, 2, 1000, null);
        assertTrue(text.contains("--thin 4 ") && !text.contains("smallest effective"), text);
    }

    /**
     * Our rule: with fewer than 100 kept draws per chain no thinning reaches an ESS of 100 per
     * chain, so the advice asks for --draws (an audit found --draws 1 told to use --thin 2, and
     * --draws 20 --thin 50 told to use --thin 787).
     */
    @Test
    void tooFewDrawsAskForMoreDrawsNotMoreThinning() {
        List<ParameterSummary> s = List.of(summary("slow", 1.05, 13, 20));
        String text = LongerChains.advice(s, 2, 50, 20, null);
        assertTrue(text.contains("20 per chain cannot reach") && text.contains("--draws 100 or more"), text);
        assertTrue(!text.contains("--thin") && !text.contains("--resume"), text);
        String kept = LongerChains.advice(s, 2, 50, 20, Path.of("results"));
        assertTrue(kept.contains("'rungs fit --resume results --draws 100' continues them"), kept);
        assertTrue(LongerChains.advice(s, 2, 1, 100, null).contains("--thin 16 "), LongerChains.advice(s, 2, 1, 100, null));
    }
}
