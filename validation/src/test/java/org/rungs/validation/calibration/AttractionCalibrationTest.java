package org.rungs.validation.calibration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.priors.Priors;

/**
 * Calibration of the complete model: coarse class and number attraction (MODEL.md 4, 4a, 4b,
 * 4c). It checks the redraw augmentation of the latent levels, the threshold update given the
 * rejected draws, the joint move of attraction and category width and the pooling of the
 * attraction terms together.
 *
 * <p>Decision rule as in {@link CalibrationTest}: family-wise false-alarm rate at most
 * alpha = 0.01 with independent ranks (Bonferroni over the quantities), somewhat more when the
 * thinned draws are autocorrelated, as they are here; the seeds are fixed, so the outcome is
 * deterministic.
 */
class AttractionCalibrationTest {

    /** Scale 0..4, coarse points {0,2,4}, attraction on {1,3}, 3 groups of 60, 30 replications. */
    @Test
    void completeModelIsCalibrated(@TempDir Path dir) {
        CalibrationSummary s = SbcRuns.run(CalibrationConfig.attraction(20261202L, 30), dir);
        assertEquals(30, s.results().size());
        assertTrue(s.parameters().containsAll(List.of("attraction.1", "attraction.3", "attraction_sd",
                "attraction.g1.1", "attraction.g2.3", "attraction.g3.1")), s.parameters().toString());
        assertEquals(44, s.verdicts().size(), "35 quantities of the coarse model and 9 attraction parameters");
        assertTrue(s.failed().isEmpty(), SbcRuns.report(s));
    }

    /**
     * The same without the style covariate, where the class intercepts move with every probit
     * latent integrated out ({@code StyleClassUpdate}), 40 replications: all 43 quantities pass
     * (smallest p 0.013, threshold.3, measured from the command line with the same settings).
     */
    @Test
    void completeModelWithoutStyleCovariatesIsCalibrated(@TempDir Path dir) {
        assertCalibrated(CalibrationConfig.attraction(16L, 40).withStyleCovariates(0), 40, 43,
                "44 quantities of the model above less the style coefficient", dir);
    }

    /**
     * The same with the style covariate taking two values (a categorical covariate coded 0/1):
     * under attraction the respondents who are full-scale for sure are then counted per style row
     * and their probit latents integrated out ({@code StyleClassUpdate}, {@code ChainState.styleRows})
     * instead of drawn, and the conjugate step of the class's coefficients is left out. All 44
     * quantities pass (smallest p 0.055, level.x1, measured from the command line with the same
     * settings). With those respondents' term left out of the moves it failed (style_sd); with it
     * halved it passed: IndependentPosteriorTest has the sharper check of that step.
     */
    @Test
    void completeModelWithACategoricalStyleCovariateIsCalibrated(@TempDir Path dir) {
        assertCalibrated(CalibrationConfig.attraction(17L, 30).withStyleLevels(2), 30, 44, "as the first test", dir);
    }

    /** Runs the calibration: every replication done, {@code quantities} verdicts, none failed. */
    private static void assertCalibrated(CalibrationConfig config, int replications, int quantities, String why, Path dir) {
        CalibrationSummary s = SbcRuns.run(config, dir);
        assertEquals(replications, s.results().size());
        assertEquals(quantities, s.verdicts().size(), why);
        assertTrue(s.failed().isEmpty(), SbcRuns.report(s));
    }

    /**
     * Simulated with abar ~ normal(0, 0.5), fitted with attraction_mean = normal(1.5, 0.2): three
     * groups of 60 say little about abar[j], so its posterior stays near the wrong prior and the
     * true value ranks at the bottom in nearly every replication. With 20 replications in 4 bins
     * such a pile-up gives a chi-square near 60 against a fail threshold near 22 (3 df,
     * p = 0.01/88); the seed is fixed, so the outcome does not vary from run to run.
     */
    @Test
    void aWrongAttractionPriorInTheFitIsFlagged(@TempDir Path dir) {
        CalibrationConfig right = CalibrationConfig.attraction(20261203L, 20).withSampler(2, 150, 150, 99);
        CalibrationConfig wrong = right.withFit(right.fit().withPriors(Priors.defaults().with("attraction_mean=normal(1.5,0.2)")));
        CalibrationSummary s = SbcRuns.run(wrong, dir);
        assertTrue(s.failed().contains("attraction.1") && s.failed().contains("attraction.3"), SbcRuns.report(s));
    }
}
