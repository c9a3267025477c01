package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;

/**
 * The rescaling step's ratio and its update of the cell sums, checked against latent values held
 * explicitly: each value is mapped by hand onto its category's new interval and the normal log
 * densities and Jacobians are summed respondent by respondent.
 */
class ThresholdRescaleUpdateTest {

    @Test
    void ratioAndSumsMatchExplicitLatentValues() {
        Survey survey = FitterTest.smallSurvey(5L, 70);
        for (boolean byGroup : new boolean[] {true, false}) {
            ChainState s = new ChainState(SurveyOrder.of(survey), byGroup, null);
            UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(8L);
            InitialValues.apply(s, -1, rng);
            int m = s.categories;
            int stride = m + 1;
            s.level.coefficient[0] = 0.4;
            for (int g = 0; g < s.groups; g++) {
                s.level.intercept[g] = 0.1 * g - 0.2;
                for (int k = 1; k < m; k++) {
                    s.thresholds[g * stride + k] += byGroup ? 0.03 * (g - 1.5) * (k - 2) : 0;
                }
            }
            TruncatedNormalSampler tn = TruncatedNormalSampler.of(rng);
            double[] z = new double[s.size];
            s.cells.clear();
            for (int i = 0; i < s.size; i++) {
                int g = s.group[i];
                double eta = s.eta(i);
                int at = g * stride + s.category[i];
                z[i] = eta + tn.sample(s.thresholds[at] - eta, s.thresholds[at + 1] - eta);
                s.cells.add(g * m + s.category[i], s.level.columns, i, z[i]);
            }
            ThresholdRescaleUpdate update = ThresholdRescaleUpdate.of(s, s.start, Priors.defaults(), rng);
            s.cells.prepare(s.level.coefficient);
            int blocks = byGroup ? s.groups + 1 : 1;
            double delta = 0.09;
            int cuts = m - 1;
            double[] last = null;
            for (int b = 0; b < blocks; b++) {
                boolean common = b == blocks - 1;
                for (int k = 1; k <= cuts; k++) {
                    double share = delta / cuts;
                    double expected = 0;
                    double[] moved = z.clone();
                    for (int i = 0; i < s.size; i++) {
                        int g = s.group[i];
                        if (!common && g != b) {
                            continue;
                        }
                        int r = s.category[i];
                        double[] t = s.thresholds;
                        int row = g * stride;
                        double lower = t[row + r];
                        double upper = t[row + r + 1];
                        double newLower = lower - share + (r == k ? delta : 0);
                        double newUpper = upper - share + (r + 1 == k ? delta : 0);
                        double zi = z[i];
                        double mapped;
                        double logJacobian = 0;
                        if (Double.isInfinite(lower)) {
                            mapped = zi + (newUpper - upper);
                        } else if (Double.isInfinite(upper)) {
                            mapped = zi + (newLower - lower);
                        } else {
                            double scale = (newUpper - newLower) / (upper - lower);
                            mapped = newLower + scale * (zi - lower);
                            logJacobian = Math.log(scale);
                        }
                        moved[i] = mapped;
                        double eta = s.eta(i);
                        double etaNew = eta - share;
                        expected += -0.5 * ((mapped - etaNew) * (mapped - etaNew) - (zi - eta) * (zi - eta)) + logJacobian;
                    }
                    // Sums over ~100 to ~300 values of order 1, rearranged algebraically: 1e-9 is ample.
                    assertEquals(expected, update.logLikelihoodChange(b, k, delta), 1e-9,
                            "block " + b + " threshold " + k + " byGroup " + byGroup);
                    if (common && k == 2) {
                        last = moved;
                    }
                }
            }
            if (byGroup) {
                checkSpreadChange(s, update, z);
            }
            checkAcceptedSums(s, update, blocks - 1, 2, delta, last);
        }
    }

    /** The non-centred spread step: every deviation from the common thresholds scaled by 1.3. */
    private static void checkSpreadChange(ChainState s, ThresholdRescaleUpdate update, double[] z) {
        int m = s.categories;
        int stride = m + 1;
        double factor = 1.3;
        double expected = 0;
        for (int i = 0; i < s.size; i++) {
            int g = s.group[i];
            int r = s.category[i];
            double[] t = s.thresholds;
            int row = g * stride;
            double lower = t[row + r];
            double upper = t[row + r + 1];
            double newLower = r == 0 ? lower : s.common[r] + factor * (lower - s.common[r]);
            double newUpper = r == m - 1 ? upper : s.common[r + 1] + factor * (upper - s.common[r + 1]);
            double mapped;
            double logJacobian = 0;
            if (r == 0) {
                mapped = z[i] + newUpper - upper;
            } else if (r == m - 1) {
                mapped = z[i] + newLower - lower;
            } else {
                double scale = (newUpper - newLower) / (upper - lower);
                mapped = newLower + scale * (z[i] - lower);
                logJacobian = Math.log(scale);
            }
            double eta = s.eta(i);
            expected += -0.5 * ((mapped - eta) * (mapped - eta) - (z[i] - eta) * (z[i] - eta)) + logJacobian;
        }
        // about 280 values of order 1, rearranged algebraically: 1e-9 is ample
        assertEquals(expected, update.spreadChange(factor), 1e-9, "spread step");
    }

    /** After accepting, the group sums and cross-products equal those of the explicitly moved values. */
    private static void checkAcceptedSums(ChainState s, ThresholdRescaleUpdate update, int b, int k, double delta, double[] moved) {
        update.logLikelihoodChange(b, k, delta);
        update.accepted(b, k, delta);
        s.cells.finish(s.level, s.categories);
        double[] sums = new double[s.groups];
        double cross = 0;
        for (int i = 0; i < s.size; i++) {
            sums[s.group[i]] += moved[i];
            cross += s.level.columns[0][i] * moved[i];
        }
        for (int g = 0; g < s.groups; g++) {
            assertEquals(sums[g], s.level.latentSum[g], 1e-9, "latent sum of group " + g);
        }
        assertEquals(cross, s.level.latentCross[0], 1e-9, "cross-product with the covariate");
    }
}
