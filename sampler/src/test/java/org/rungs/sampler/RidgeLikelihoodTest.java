package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * The exact stage of {@link AttractionUpdate}'s ridge moves against a direct computation of
 * MODEL.md 4a-4c given the classes: a full-scale respondent log pi[g,r] + a[g,r] - log N_i, a
 * coarse one log P(r | coarse), each interval from {@link StandardNormal#intervalProbability}.
 */
class RidgeLikelihoodTest {

    /**
     * Scale 0..6 with coarse points 0, 2 and 6 (category 4 is a tie, half to 2 and half to 6), every
     * second coarse-point reporter in the coarse class, numbers 1, 3 and 4 attracted; moves of
     * each attracted number's attraction and width, on the ridge and off it, with one group's levels near the scale's
     * middle and, second, 6 sd above it (its probabilities near 1e-9, where the cached cdfs'
     * differences fall back to the tail-exact path). Tolerance 1e-8 on totals near 10: the cached
     * cdfs' differences carry an absolute error near 1e-16, so each ratio above the 1e-6 cut-off
     * is good to 1e-10 (a few hundred respondents). With the tie's half weight taken as 1 in the
     * coarse reporters' ratio, the test failed.
     */
    @Test
    void ridgeMovesChangeTheLikelihoodAsTheModelSays() {
        for (double far : new double[] {0.3, 6}) {
            ChainState s = state(far);
            UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(3L);
            Priors priors = Priors.defaults();
            ThresholdUpdate.of(s, s.start, priors, rng).refresh();
            AttractionUpdate update = AttractionUpdate.of(s, priors, rng);
            int m = s.categories;
            for (int k : new int[] {1, 3, 4}) {
                for (double e : new double[] {0.35, -0.5, 0}) {
                    // on the ridge (pi[k] exp(a[k]) nearly kept, a small change) and off it
                    double ridge = 0.5 * (s.common[k + 1] - s.common[k]) * -Math.expm1(-e);
                    for (double h : new double[] {ridge, ridge + 0.05, ridge - 0.05}) {
                        if (h == 0) {
                            continue;
                        }
                        for (int g = 0; g < s.groups; g++) {
                            int row = g * (m + 1);
                            assertTrue(s.thresholds[row + k] + h > s.thresholds[row + k - 1]
                                    && s.thresholds[row + k] + h < s.thresholds[row + k + 1] - h
                                    && s.thresholds[row + k + 1] - h < s.thresholds[row + k + 2], "the moved thresholds stay ordered");
                        }
                        double expected = direct(s, k, e, h) - direct(s, k, 0, 0);
                        double got = update.ridgeLikelihoodChange(k, e, h);
                        assertEquals(expected, got, 1e-8, "number at " + k + ", e = " + e + ", h = " + h + ", group 2 at " + far);
                        assertTrue(Math.abs(expected) > 1e-5, "the move changes the likelihood: " + expected);
                    }
                }
            }
            assertEquals(7, m);
        }
    }

    /**
     * The exact stage of the block and spread moves of tau_a (every a[g,j] moved at once) against
     * the direct sum over full-scale respondents of log N_i - log N_i' (MODEL.md 4b), N_i =
     * sum_c exp(a[g,c]) pi[g,c] with each pi from {@link StandardNormal#intervalProbability};
     * coarse-class respondents do not read N_i. Tolerance 1e-9 on totals near 10: a few hundred
     * terms, each exact to about 1e-13. Likewise a move of one a[g,j] alone. With a 1% error in each
     * respondent's N_i' the test failed; no other test reads these passes directly.
     */
    @Test
    void blockAndSpreadMovesChangeTheLikelihoodAsTheModelSays() {
        for (double far : new double[] {0.3, 6}) {
            ChainState s = state(far);
            UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(7L);
            Priors priors = Priors.defaults();
            ThresholdUpdate.of(s, s.start, priors, rng).refresh();
            AttractionUpdate update = AttractionUpdate.of(s, priors, rng);
            int m = s.categories;
            double[] proposed = s.attraction.clone();
            for (int g = 0; g < s.groups; g++) {
                proposed[g * m + 1] += 0.3 - 0.1 * g;
                proposed[g * m + 3] -= 0.25;
                proposed[g * m + 4] += 0.4;
            }
            double expected = 0;
            for (int i = 0; i < s.size; i++) {
                if (s.coarse[i] == 1) {
                    continue;
                }
                int g = s.group[i];
                int row = g * (m + 1);
                double eta = s.eta(i);
                double before = 0;
                double after = 0;
                for (int c = 0; c < m; c++) {
                    double pi = StandardNormal.intervalProbability(s.thresholds[row + c] - eta, s.thresholds[row + c + 1] - eta);
                    before += Math.exp(s.attraction[g * m + c]) * pi;
                    after += Math.exp(proposed[g * m + c]) * pi;
                }
                expected += Math.log(before) - Math.log(after);
            }
            assertTrue(Math.abs(expected) > 1, "the move changes the likelihood: " + expected);
            assertEquals(expected, update.normaliserChange(proposed, false), 1e-9, "block moves, group 2 at " + far);
            assertEquals(expected, update.normaliserChange(proposed, true), 1e-9, "spread move, group 2 at " + far);
            // a[g,3] alone (its other part, the answers' a[g,3] itself, is outside the pass)
            for (int g = 0; g < s.groups; g++) {
                double single = 0;
                for (int i = s.start[g * m]; i < s.start[(g + 1) * m]; i++) {
                    if (s.coarse[i] == 1) {
                        continue;
                    }
                    int row = g * (m + 1);
                    double pi = StandardNormal.intervalProbability(s.thresholds[row + 3] - s.eta(i), s.thresholds[row + 4] - s.eta(i));
                    double change = (Math.exp(proposed[g * m + 3]) - Math.exp(s.attraction[g * m + 3])) * pi;
                    double n = 0;
                    for (int c = 0; c < m; c++) {
                        n += Math.exp(s.attraction[g * m + c])
                                * StandardNormal.intervalProbability(s.thresholds[row + c] - s.eta(i), s.thresholds[row + c + 1] - s.eta(i));
                    }
                    single += Math.log(n) - Math.log(n + change);
                }
                assertEquals(single, update.singleChange(g, 3, proposed[g * m + 3]), 1e-9, "a[" + g + ",3] alone, group 2 at " + far);
            }
        }
    }

    private static ChainState state(double far) {
        Survey survey = CollapsedPosteriorTest.survey(150, false);
        RoundingChannel channel = RoundingChannel.of(survey.scale(), new int[] {0, 2, 6});
        assertTrue(channel.tieAbove(2) && channel.tieBelow(6), "category 4 is a tie");
        ChainState s = new ChainState(SurveyOrder.of(survey), true, channel, new int[] {1, 3, 4});
        InitialValues.apply(s, -1, RandomSource.XO_RO_SHI_RO_128_PP.create(5L));
        s.level.intercept[2] = far;
        s.level.coefficient[0] = 0.4;
        int m = s.categories;
        for (int g = 0; g < s.groups; g++) {
            s.attraction[g * m + 1] = 0.2 + 0.1 * g;
            s.attraction[g * m + 3] = -0.3;
            s.attraction[g * m + 4] = 0.5 - 0.2 * g;
        }
        int every = 0;
        for (int i = 0; i < s.size; i++) {
            if (channel.isPoint(s.category[i])) {
                s.coarse[i] = (byte) (every++ % 2);
            }
        }
        return s;
    }

    /** Sum over respondents of their log-likelihood given the classes after the ridge move (k, e, h). */
    private static double direct(ChainState s, int k, double e, double h) {
        int m = s.categories;
        int stride = m + 1;
        double[] t = s.thresholds.clone();
        double total = 0;
        for (int i = 0; i < s.size; i++) {
            int g = s.group[i];
            int row = g * stride;
            t[row + k] = s.thresholds[row + k] + h;
            t[row + k + 1] = s.thresholds[row + k + 1] - h;
            int r = s.category[i];
            double eta = s.eta(i);
            if (s.coarse[i] == 1) {
                total += ResponseLikelihood.logCoarse(s.channel, t, row, r, eta, -1, 0);
                continue;
            }
            double n = 0;
            for (int c = 0; c < m; c++) {
                double a = s.attraction[g * m + c] + (c == k ? e : 0);
                n += Math.exp(a) * StandardNormal.intervalProbability(t[row + c] - eta, t[row + c + 1] - eta);
            }
            double a = s.attraction[g * m + r] + (r == k ? e : 0);
            total += StandardNormal.logIntervalProbability(t[row + r] - eta, t[row + r + 1] - eta) + a - Math.log(n);
        }
        return total;
    }
}
