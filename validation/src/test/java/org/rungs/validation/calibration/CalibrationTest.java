package org.rungs.validation.calibration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.ModelSpec;
import org.rungs.models.ThresholdMode;
import org.rungs.priors.Priors;

/**
 * Small calibrations of each threshold mode, and one with a deliberately wrong prior.
 *
 * <p>Decision rule (CalibrationSummary): with K quantities, each fails when its chi-square p is
 * below alpha/(2K) or its ECDF leaves the band of simultaneous level 1 - alpha/(2K). For a correct
 * engine and independent ranks, the probability that any of the K quantities fails is at most
 * alpha = 0.01 (union bound, whatever the dependence between quantities). The thinned draws are
 * autocorrelated here (bulk ESS often below L = 99), which makes ranks over-dispersed and the
 * true false-alarm rate somewhat larger; the fixed seeds make every outcome deterministic, so a
 * passing test fails again only if the engine's draws change.
 */
class CalibrationTest {

    /** Scale 0..4, 3 groups of 40, one covariate, by-group thresholds, 50 replications. */
    @Test
    void byGroupThresholdsAreCalibrated(@TempDir Path dir) {
        CalibrationSummary s = SbcRuns.run(CalibrationConfig.small(20240601L, 50), dir);
        assertEquals(50, s.results().size());
        assertEquals(26, s.verdicts().size(), "23 parameters and 3 intended means");
        assertTrue(s.failed().isEmpty(), SbcRuns.report(s));
    }

    @Test
    void sharedThresholdsAreCalibrated(@TempDir Path dir) {
        CalibrationConfig config = CalibrationConfig.small(20240602L, 40)
                .withModel(new ModelSpec(ThresholdMode.SHARED, Priors.defaults()));
        CalibrationSummary s = SbcRuns.run(config, dir);
        assertTrue(s.parameters().stream().noneMatch(p -> p.startsWith("threshold_sd") || p.startsWith("threshold.g")));
        assertTrue(s.failed().isEmpty(), SbcRuns.report(s));
    }

    /**
     * One group of 120, two covariates. 400 replications rather than 40: with the truncated
     * normal draws of commit 8a36163 the first 40 of this seed flagged threshold.1 (p = 1e-4
     * against the level 0.01/16), a false alarm the rule allows (see the class comment); the 400
     * of the same seed, which include them, give it p = 0.37, and 400 on seeds 6 and 7 pass too
     * (`calibrate --groups 1 --respondents 120 --covariates 2 --warmup 200 --draws 200`). Each fit
     * takes about 10 ms.
     */
    @Test
    void oneGroupIsCalibrated(@TempDir Path dir) {
        CalibrationSummary s = SbcRuns.run(CalibrationConfig.small(20240603L, 400).withDesign(1, 120, 2), dir);
        assertEquals(List.of("level.x1", "level.x2", "group_mean", "threshold.1", "threshold.2", "threshold.3",
                "threshold.4", "intended_mean.g1"), s.parameters());
        assertTrue(s.failed().isEmpty(), SbcRuns.report(s));
    }

    /**
     * Simulated with level ~ normal(0,1), fitted with level ~ normal(1.5,0.3): with 120 ratings
     * the posterior of beta has sd near 0.12, so the prior pulls it towards 1.5 by about a
     * seventh of (1.5 - beta), often over two posterior sd, and the true value ranks low. The
     * rule must flag level.x1. How often this could pass by chance: the ranks pile at the bottom
     * so strongly (chi-square in the hundreds with 50 replications, against a threshold near 33
     * for p = alpha/(2K) with 9 df) that a miss is not a practical possibility; the seed is fixed anyway.
     */
    @Test
    void aWrongLevelPriorInTheFitIsFlagged(@TempDir Path dir) {
        CalibrationConfig right = CalibrationConfig.small(20240604L, 50);
        CalibrationConfig wrong = right.withFit(new ModelSpec(ThresholdMode.BY_GROUP,
                Priors.defaults().with("level=normal(1.5,0.3)")));
        CalibrationSummary s = SbcRuns.run(wrong, dir);
        assertTrue(s.failed().contains("level.x1"), SbcRuns.report(s));
        Verdict level = s.verdicts().get(s.parameters().indexOf("level.x1"));
        assertTrue(level.chiSquare().p() < 1e-6 && level.bandExceeded(), SbcRuns.report(s));
    }
}
