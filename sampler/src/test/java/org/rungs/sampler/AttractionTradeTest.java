package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Survey;
import org.rungs.priors.Priors;

/**
 * The ridge and trade steps of the attractions against the thresholds ({@link ThresholdRescaleUpdate}),
 * checked against the augmented density written out here value by value: each latent value
 * (answers and rejected draws of the redraw scheme) mapped by hand onto its category's new
 * interval, the acceptance factors exp(a - A) and 1 - exp(a - A) of MODEL.md 4b's redraw scheme,
 * the priors of MODEL.md 5 (t[g,k] ~ Normal(0, tau_a), tau_a ~ Half-Normal(0, 0.3), the deviations'
 * density tau_d^-(M-2) exp(-|d|^2 / (2 tau_d^2))), and the thresholds' Jacobian taken by central
 * differences of the map rather than from its formula.
 */
class AttractionTradeTest {
    /** Scale 1..5: positions 0 (an end) and 1, 3 attracted; 2 inner and 4 at the end not. */
    private static final int[] ATTRACTED = {0, 1, 3};

    @Test
    void ratiosMatchTheAugmentedDensityWrittenOut() {
        Survey survey = FitterTest.smallSurvey(5L, 70);
        ChainState s = new ChainState(SurveyOrder.of(survey), true, null, ATTRACTED);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(9L);
        InitialValues.apply(s, -1, rng);
        int m = s.categories;
        int stride = m + 1;
        s.level.coefficient[0] = 0.4;
        s.attractionSd = 0.2;
        s.thresholdSd = 0.15;
        for (int g = 0; g < s.groups; g++) {
            s.level.intercept[g] = 0.1 * g - 0.2;
            for (int k = 1; k < m; k++) {
                s.thresholds[g * stride + k] += 0.03 * (g - 1.5) * (k - 2);
            }
        }
        for (int k : ATTRACTED) {
            s.attractionMean[k] = 0.1 * k - 0.15;
            for (int g = 0; g < s.groups; g++) {
                s.attraction[g * m + k] = s.attractionMean[k] + 0.07 * (g - 1.5) * (k - 1.2);
            }
        }
        // every respondent's accepted value, and one rejected draw for every third respondent in a
        // category whose acceptance is below 1
        TruncatedNormalSampler tn = TruncatedNormalSampler.of(rng);
        int n = s.size;
        double[] z = new double[2 * n];
        int[] cell = new int[2 * n];
        int[] owner = new int[2 * n];
        boolean[] answer = new boolean[2 * n];
        int values = 0;
        s.cells.clear();
        for (int i = 0; i < n; i++) {
            int g = s.group[i];
            double eta = s.eta(i);
            int r = s.category[i];
            int at = g * stride + r;
            z[values] = eta + tn.sample(s.thresholds[at] - eta, s.thresholds[at + 1] - eta);
            cell[values] = g * m + r;
            owner[values] = i;
            answer[values] = true;
            s.cells.add(cell[values], s.level.columns, i, z[values]);
            s.cells.countAnswers(cell[values], 1);
            values++;
            int k = ATTRACTED[i % ATTRACTED.length];
            if (i % 3 == 0 && s.attraction[g * m + k] < s.attractionTop(g)) {
                int kt = g * stride + k;
                z[values] = eta + tn.sample(s.thresholds[kt] - eta, s.thresholds[kt + 1] - eta);
                cell[values] = g * m + k;
                owner[values] = i;
                s.cells.add(cell[values], s.level.columns, i, z[values]);
                s.cells.countRejected(cell[values]);
                values++;
            }
        }
        ThresholdRescaleUpdate update = ThresholdRescaleUpdate.of(s, s.start, Priors.defaults(), rng);
        s.cells.prepare(s.level.coefficient);
        Explicit before = new Explicit(s, z, cell, owner, answer, values);

        for (int g = 0; g < s.groups; g++) {
            for (int k : new int[] {1, 3}) {
                double e = 0.3 * (g % 2 == 0 ? 1 : -1);
                double[] rows = s.thresholds.clone();
                double[] attraction = s.attraction.clone();
                double logJacobian = widthJacobian(rows, g * stride, new int[] {k}, new double[] {e});
                attraction[g * m + k] += e;
                double expected = before.changeTo(rows, attraction, s.attractionSd) + logJacobian;
                // sums over about 370 values of order 1, rearranged algebraically: 1e-9 is ample
                // beside the 1e-7 or so of the Jacobian's central differences
                assertEquals(expected, update.ridgeChange(g, k, e), 1e-6, "ridge step of group " + g + ", position " + k);
            }
        }
        for (boolean ascending : new boolean[] {true, false}) {
            for (double factor : new double[] {1.4, 0.6}) {
                double[] rows = s.thresholds.clone();
                double[] attraction = s.attraction.clone();
                double logJacobian = Math.log(factor) * (1 + s.groups * ATTRACTED.length);
                for (int g = 0; g < s.groups; g++) {
                    int[] order = new int[ATTRACTED.length];
                    double[] delta = new double[ATTRACTED.length];
                    for (int j = 0; j < order.length; j++) {
                        order[j] = ATTRACTED[ascending ? j : order.length - 1 - j];
                        delta[j] = (factor - 1) * (s.attraction[g * m + order[j]] - s.attractionMean[order[j]]);
                        attraction[g * m + order[j]] += delta[j];
                    }
                    logJacobian += widthJacobian(rows, g * stride, order, delta);
                }
                double expected = before.changeTo(rows, attraction, s.attractionSd * factor) + logJacobian;
                assertEquals(expected, update.tradeChange(factor, ascending), 1e-6,
                        "trade step by " + factor + (ascending ? " ascending" : " descending"));
            }
        }

        // a kept trade step moves the cell sums as the values move one by one
        double factor = 1.4;
        double[] rows = s.thresholds.clone();
        update.tradeChange(factor, true);
        update.keepTrade(factor);
        s.cells.finish(s.level, m);
        double[] sums = new double[s.groups];
        for (int v = 0; v < values; v++) {
            int g = cell[v] / m;
            sums[g] += before.mapped(z[v], cell[v], rows, s.thresholds)[0];
        }
        for (int g = 0; g < s.groups; g++) {
            assertEquals(sums[g], s.level.latentSum[g], 1e-9, "latent sum of group " + g + " after the trade step");
        }
        assertEquals(0.2 * factor, s.attractionSd, 1e-15);
    }

    /**
     * Moves each listed category of the row at {@code row} in turn to width w exp(-delta) about its
     * midpoint (ends skipped) and returns the log of the map's Jacobian determinant, by central
     * differences over the row's inner thresholds.
     */
    private static double widthJacobian(double[] rows, int row, int[] order, double[] delta) {
        int cuts = 4;
        double[] start = new double[cuts];
        System.arraycopy(rows, row + 1, start, 0, cuts);
        double[][] jacobian = new double[cuts][cuts];
        double h = 1e-6;
        for (int c = 0; c < cuts; c++) {
            double[] up = start.clone();
            double[] down = start.clone();
            up[c] += h;
            down[c] -= h;
            double[] fu = widths(up, order, delta);
            double[] fd = widths(down, order, delta);
            for (int r = 0; r < cuts; r++) {
                jacobian[r][c] = (fu[r] - fd[r]) / (2 * h);
            }
        }
        System.arraycopy(widths(start, order, delta), 0, rows, row + 1, cuts);
        return Math.log(Math.abs(new org.apache.commons.math3.linear.LUDecomposition(
                new org.apache.commons.math3.linear.Array2DRowRealMatrix(jacobian)).getDeterminant()));
    }

    /** The inner thresholds c[1..4] (index 0..3) after the moves of {@link #widthJacobian}. */
    private static double[] widths(double[] inner, int[] order, double[] delta) {
        double[] c = inner.clone();
        for (int j = 0; j < order.length; j++) {
            int k = order[j];
            if (k == 0 || k == 4) {
                continue;
            }
            // category k lies between c[k] and c[k+1], at indices k-1 and k
            double h = 0.5 * (c[k] - c[k - 1]) * -Math.expm1(-delta[j]);
            c[k - 1] += h;
            c[k] -= h;
        }
        return c;
    }

    /** The augmented log density at the current state, and its change to other thresholds, attractions and tau_a. */
    private static final class Explicit {
        private final ChainState s;
        private final double[] z;
        private final int[] cell;
        private final int[] owner;
        private final boolean[] answer;
        private final int values;
        private final double at;

        Explicit(ChainState s, double[] z, int[] cell, int[] owner, boolean[] answer, int values) {
            this.s = s;
            this.z = z;
            this.cell = cell;
            this.owner = owner;
            this.answer = answer;
            this.values = values;
            this.at = logDensity(s.thresholds, s.attraction, s.attractionSd, s.thresholds);
        }

        double changeTo(double[] rows, double[] attraction, double sd) {
            return logDensity(rows, attraction, sd, s.thresholds) - at;
        }

        /** Value z of cell c mapped from the thresholds {@code from} onto {@code to}, and the log Jacobian. */
        double[] mapped(double value, int c, double[] from, double[] to) {
            int m = s.categories;
            int row = (c / m) * (m + 1);
            int k = c % m;
            double lower = from[row + k];
            double upper = from[row + k + 1];
            if (k == 0) {
                return new double[] {value + to[row + 1] - upper, 0};
            }
            if (k == m - 1) {
                return new double[] {value + to[row + k] - lower, 0};
            }
            double scale = (to[row + k + 1] - to[row + k]) / (upper - lower);
            return new double[] {to[row + k] + scale * (value - lower), Math.log(scale)};
        }

        private double logDensity(double[] rows, double[] attraction, double sd, double[] from) {
            int m = s.categories;
            int stride = m + 1;
            double log = 0;
            for (int v = 0; v < values; v++) {
                double[] moved = mapped(z[v], cell[v], from, rows);
                double eta = s.eta(owner[v]);
                log += -0.5 * (moved[0] - eta) * (moved[0] - eta) + moved[1];
                int g = cell[v] / m;
                double top = 0;
                for (int k : ATTRACTED) {
                    top = Math.max(top, attraction[g * m + k]);
                }
                double a = attraction[cell[v]];
                log += answer[v] ? a - top : Math.log(1 - Math.exp(a - top));
            }
            for (int g = 0; g < s.groups; g++) {
                for (int k : ATTRACTED) {
                    double t = attraction[g * m + k] - s.attractionMean[k];
                    log += -0.5 * t * t / (sd * sd) - Math.log(sd);
                }
                for (int k = 1; k < m; k++) {
                    double d = rows[g * stride + k] - s.common[k];
                    log += -0.5 * d * d / (s.thresholdSd * s.thresholdSd);
                }
            }
            // tau_a ~ Half-Normal(0, 0.3), MODEL.md 5
            return log - 0.5 * sd * sd / 0.09;
        }
    }
}
