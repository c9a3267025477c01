package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.rungs.priors.StandardNormal;

class ThresholdUpdateTest {
    /**
     * Interval probabilities from the cached smaller tails must equal those computed in log space
     * by StandardNormal (itself checked against 256-bit values), in the body and in both tails.
     */
    @Test
    void intervalFromTailsMatchesLogSpaceComputation() {
        double[][] cases = {
            {-0.5, 0.3}, {-1e300, 0.1}, {1.5, 2.0}, {6, 7}, {9, 12}, {-10, -9}, {-3, Double.POSITIVE_INFINITY},
            {Double.NEGATIVE_INFINITY, -30}, {0.2, 0.2001}, {-0.7, 0.9}, {25, 26}
        };
        for (double[] c : cases) {
            double p = ThresholdUpdate.interval(c[0], ThresholdUpdate.tail(c[0]), c[1], ThresholdUpdate.tail(c[1]));
            double expected = StandardNormal.logIntervalProbability(c[0], c[1]);
            // Each tail is exact to ~1e-15 relative and the difference is taken where it does not
            // cancel: 1e-12 relative, looser for the narrow interval whose bounds' rounding costs ~1e-12.
            assertEquals(expected, Math.log(p), 1e-9 * Math.max(1, Math.abs(expected)), java.util.Arrays.toString(c));
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
            update.refresh();
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

    /**
     * Under number attraction (MODEL.md 4b; coarse points 0, 3 and 6, numbers 2 and 4 attracted)
     * the step's likelihood change, from the cached cdfs and N_i cell by cell, equals the change
     * of the sum over respondents of {@link org.rungs.models.ResponseLikelihood#logRespondentAttracted}
     * with the class summed out (4c), for every block and threshold, in both threshold modes, with
     * one group's levels 6 and 40 above the scale's middle: its cells leave the normal table
     * (the general cdf path), and at 40 their probabilities fall below 1e-300 (the log-space
     * path). Tolerance 1e-9 as above; with the coarse-point cells' N_i taken before and after the
     * wrong way round, the test failed.
     */
    @Test
    void attractedLikelihoodChangeMatchesTheModel() {
        for (double far : new double[] {6, 40}) {
            for (boolean byGroup : new boolean[] {true, false}) {
                ChainState s = CollapsedPosteriorTest.state(byGroup, true, true, far);
                org.apache.commons.rng.UniformRandomProvider rng = org.apache.commons.rng.simple.RandomSource.XO_RO_SHI_RO_128_PP.create(6L);
                ThresholdUpdate update = ThresholdUpdate.of(s, s.start, org.rungs.priors.Priors.defaults(), rng);
                update.refresh();
                int m = s.categories;
                int stride = m + 1;
                int blocks = byGroup ? s.groups + 1 : 1;
                for (int b = 0; b < blocks; b++) {
                    boolean common = b == blocks - 1;
                    for (int k = 1; k < m; k++) {
                        for (double delta : new double[] {0.07, -0.04}) {
                            double[] moved = s.thresholds.clone();
                            for (int g = 0; g < s.groups; g++) {
                                if (common || g == b) {
                                    moved[g * stride + k] += delta;
                                    assertTrue(moved[g * stride + k] > moved[g * stride + k - 1]
                                            && moved[g * stride + k] < moved[g * stride + k + 1], "the moved thresholds stay ordered");
                                }
                            }
                            double expected = 0;
                            double[] a = new double[m];
                            for (int i = 0; i < s.size; i++) {
                                int g = s.group[i];
                                System.arraycopy(s.attraction, g * m, a, 0, m);
                                double q = org.rungs.priors.StandardNormal.cdf(s.style.linear(i, g));
                                int r = s.category[i];
                                expected += org.rungs.models.ResponseLikelihood.logRespondentAttracted(s.channel, moved, g * stride, r, s.eta(i), q, a)
                                        - org.rungs.models.ResponseLikelihood.logRespondentAttracted(s.channel, s.thresholds, g * stride, r, s.eta(i), q, a);
                            }
                            assertEquals(expected, update.logLikelihoodChange(b, k, delta), 1e-9,
                                    "block " + b + " threshold " + k + " delta " + delta + " byGroup " + byGroup + " far " + far);
                        }
                    }
                }
            }
        }
    }

    /** After a sweep of accepted and rejected moves, the tails kept up to date equal freshly computed ones. */
    @Test
    void cachedTailsFollowAcceptedMoves() {
        org.rungs.models.survey.Survey survey = FitterTest.smallSurvey(9L, 60);
        org.rungs.models.RoundingChannel channel = org.rungs.models.RoundingChannel.of(survey.scale(), new int[] {1, 3, 5});
        for (int variant = 0; variant < 4; variant++) {
            boolean byGroup = variant % 2 == 0;
            ChainState s = new ChainState(SurveyOrder.of(survey), byGroup, variant < 2 ? null : channel);
            org.apache.commons.rng.UniformRandomProvider rng = org.apache.commons.rng.simple.RandomSource.XO_RO_SHI_RO_128_PP.create(4L);
            InitialValues.apply(s, -1, rng);
            ThresholdUpdate update = ThresholdUpdate.of(s, s.start, org.rungs.priors.Priors.defaults(), rng);
            for (int sweep = 0; sweep < 5; sweep++) {
                update.update(true);
            }
            double[] lower = update.lowerTail.clone();
            double[] upper = update.upperTail.clone();
            double[] full = update.mixtureFull.clone();
            double[] coarse = update.mixtureCoarse.clone();
            update.refresh();
            for (int i = 0; i < full.length; i++) {
                assertEquals(update.mixtureFull[i], full[i], 1e-13, "P(r | full) of respondent " + i);
                assertEquals(update.mixtureCoarse[i], coarse[i], 1e-13, "P(r | coarse) of respondent " + i);
            }
            for (int i = 0; i < s.size; i++) {
                if (s.channel != null && s.channel.isPoint(s.category[i])) {
                    continue; // a coarse-point reporter's steps read its mixture, not its tails
                }
                // Both are the same function of the same doubles up to the order of two additions.
                assertEquals(update.lowerTail[i], lower[i], 1e-13, "lower tail of respondent " + i);
                assertEquals(update.upperTail[i], upper[i], 1e-13, "upper tail of respondent " + i);
            }
        }
    }
}
