package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.rungs.priors.StandardNormal;

class ThresholdUpdateTest {
    /**
     * The fast ratio must equal the difference of log interval probabilities computed in log
     * space by StandardNormal (itself checked against 256-bit references), in the body and in
     * both tails, including where the probabilities underflow.
     */
    @Test
    void fastLikelihoodRatioMatchesLogSpaceComputation() {
        double[][] cases = {
            {-0.5, 0.3, 0.35}, {-1e300, 0.1, -0.2}, {1.5, 2.0, 2.5}, {6, 7, 6.5}, {9, 10, 12},
            {-10, -9, -9.5}, {-3, Double.POSITIVE_INFINITY, 2}, {39, 40, 41}, {-41, -40, -39.9}, {0.2, 0.2001, 0.2002}
        };
        for (double[] c : cases) {
            double lower = c[0];
            double upper = c[1];
            double moved = c[2];
            if (!(moved > lower)) {
                continue;
            }
            double expected = StandardNormal.logIntervalProbability(lower, moved) - StandardNormal.logIntervalProbability(lower, upper);
            double actual = ThresholdUpdate.logRatioUpperMoved(lower, upper, moved);
            assertTrue(Double.isFinite(actual), "finite for " + java.util.Arrays.toString(c));
            // Ratios of probabilities each accurate to ~1e-15 relative: 1e-9 absolute leaves room for
            // the narrow interval, whose probabilities lose ~1e-12 to the rounding of the bounds.
            assertEquals(expected, actual, 1e-9 * Math.max(1, Math.abs(expected)), java.util.Arrays.toString(c));
        }
    }

    /**
     * The Metropolis step's likelihood change, read from the sorted runs, equals the change of the
     * sum over all respondents of the log-likelihood of MODEL.md 4c with the class summed out,
     * computed respondent by respondent by ResponseLikelihood (itself checked against a direct
     * computation) on a copy of the thresholds with one moved, in both threshold modes.
     */
    @Test
    void likelihoodChangeMatchesRespondentByRespondentSum() {
        org.rungs.models.survey.Survey survey = FitterTest.smallSurvey(7L, 80);
        org.rungs.models.RoundingChannel channel = org.rungs.models.RoundingChannel.of(survey.scale(), new int[] {1, 3, 5});
        for (boolean byGroup : new boolean[] {true, false}) {
            ChainState s = new ChainState(SurveyOrder.of(survey), byGroup, channel);
            org.apache.commons.rng.UniformRandomProvider rng = org.apache.commons.rng.simple.RandomSource.XO_RO_SHI_RO_128_PP.create(3L);
            InitialValues.apply(s, -1, rng);
            int stride = s.categories + 1;
            if (byGroup) {
                for (int g = 0; g < s.groups; g++) {
                    for (int k = 1; k < s.categories; k++) {
                        s.thresholds[g * stride + k] += 0.05 * (g - 1.5) * (k - 2);
                    }
                }
            }
            ThresholdUpdate update = ThresholdUpdate.of(s, s.start, org.rungs.priors.Priors.defaults(), rng);
            int blocks = byGroup ? s.groups : 1;
            double delta = 0.07;
            for (int b = 0; b < blocks; b++) {
                for (int k = 1; k < s.categories; k++) {
                    double[] moved = s.thresholds.clone();
                    for (int g = 0; g < s.groups; g++) {
                        if (!byGroup || g == b) {
                            moved[g * stride + k] += delta;
                        }
                    }
                    double expected = 0;
                    for (int i = 0; i < s.size; i++) {
                        int g = s.group[i];
                        double eta = s.eta(i);
                        double q = org.rungs.priors.StandardNormal.cdf(s.style.linear(i, g));
                        int r = s.category[i];
                        expected += org.rungs.models.ResponseLikelihood.logRespondent(channel, moved, g * stride, r, eta, q)
                                - org.rungs.models.ResponseLikelihood.logRespondent(channel, s.thresholds, g * stride, r, eta, q);
                    }
                    // Sums of a few hundred terms each exact to ~1e-15: 1e-9 absolute is ample.
                    assertEquals(expected, update.logLikelihoodChange(b, k, delta), 1e-9, "block " + b + " threshold " + k + " byGroup " + byGroup);
                }
            }
        }
    }
}
