package org.rungs.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Scale;

/**
 * The per-respondent likelihood of MODEL.md 4c against a direct computation written here from
 * the text of MODEL.md: pi from Commons Math 3.6.1's NormalDistribution, the rounding channel by
 * brute force (nearest coarse point, ties split), the sum over intended answers done explicitly.
 */
class ResponseLikelihoodTest {
    private static final NormalDistribution PHI = new NormalDistribution(0, 1);

    private static double[] row(double... cuts) {
        double[] r = new double[cuts.length + 2];
        r[0] = Double.NEGATIVE_INFINITY;
        System.arraycopy(cuts, 0, r, 1, cuts.length);
        r[r.length - 1] = Double.POSITIVE_INFINITY;
        return r;
    }

    /** R(j|k) by brute force: the nearest coarse points to k share the answer equally. */
    private static double rounding(int[] points, int j, int k) {
        int best = Integer.MAX_VALUE;
        int ties = 0;
        boolean jIsNearest = false;
        for (int p : points) {
            int d = Math.abs(p - k);
            if (d < best) {
                best = d;
                ties = 1;
                jIsNearest = p == j;
            } else if (d == best) {
                ties++;
                jIsNearest |= p == j;
            }
        }
        int dj = Math.abs(j - k);
        return jIsNearest && dj == best ? 1.0 / ties : 0;
    }

    private static double direct(double[] thr, int[] points, int r, double eta, double q) {
        int m = thr.length - 1;
        double full = PHI.cumulativeProbability(thr[r + 1] - eta) - PHI.cumulativeProbability(thr[r] - eta);
        double coarse = 0;
        for (int k = 0; k < m; k++) {
            double pk = PHI.cumulativeProbability(thr[k + 1] - eta) - PHI.cumulativeProbability(thr[k] - eta);
            coarse += pk * rounding(points, r, k);
        }
        return Math.log((1 - q) * full + q * coarse);
    }

    @Test
    void matchesDirectComputationOnZeroToTen() {
        Scale scale = new Scale(0, 10);
        int[] points = {0, 5, 10};
        RoundingChannel channel = RoundingChannel.of(scale, points);
        double[] thr = row(-2.1, -1.7, -1.3, -0.9, -0.4, 0.1, 0.6, 1.2, 1.8, 2.6);
        for (double eta : new double[] {-1.3, 0.0, 0.4, 2.2}) {
            for (double q : new double[] {0.05, 0.3, 0.9}) {
                for (int r = 0; r <= 10; r++) {
                    double expected = direct(thr, points, r, eta, q);
                    assertEquals(expected, ResponseLikelihood.logRespondent(channel, thr, 0, r, eta, q), 1e-10,
                            "r=" + r + " eta=" + eta + " q=" + q);
                }
            }
        }
    }

    /** On 1..10 with coarse points 1, 5, 10 the rating 3 is equally near 1 and 5: ties split half and half. */
    @Test
    void tiesSplitHalfAndHalf() {
        Scale scale = new Scale(1, 10);
        int[] points = {1, 5, 10};
        RoundingChannel channel = RoundingChannel.of(scale, points);
        assertEquals(0.5, channel.probability(scale.position(1), scale.position(3)));
        assertEquals(0.5, channel.probability(scale.position(5), scale.position(3)));
        assertEquals(1.0, channel.probability(scale.position(10), scale.position(8)));
        double[] thr = row(-1.8, -1.2, -0.7, -0.2, 0.2, 0.6, 1.1, 1.6, 2.3);
        int[] positions = {0, 4, 9};
        for (double eta : new double[] {-0.8, 0.3, 1.5}) {
            for (int r = 0; r < 10; r++) {
                double expected = direct(thr, positions, r, eta, 0.4);
                assertEquals(expected, ResponseLikelihood.logRespondent(channel, thr, 0, r, eta, 0.4), 1e-10, "r=" + r);
            }
        }
    }

    /**
     * A latent level far in the tail: every category keeps a finite log-probability; the bottom
     * one equals log Phi(-2.1 - 40) from StandardNormal.logCdf, itself tested against 256-bit
     * references (priors module).
     */
    @Test
    void farTailStaysFinite() {
        RoundingChannel channel = RoundingChannel.of(new Scale(0, 10), new int[] {0, 5, 10});
        double[] thr = row(-2.1, -1.7, -1.3, -0.9, -0.4, 0.1, 0.6, 1.2, 1.8, 2.6);
        for (int r = 0; r <= 10; r++) {
            double value = ResponseLikelihood.logRespondent(channel, thr, 0, r, 40, 0.3);
            assertTrue(Double.isFinite(value), "r=" + r + " gives " + value);
        }
        double top = ResponseLikelihood.logRespondent(channel, thr, 0, 10, 40, 0.3);
        assertEquals(0.0, top, 1e-12, "the top rating is all but certain at eta = 40");
        double bottom = ResponseLikelihood.logFull(thr, 0, 0, 40);
        assertEquals(org.rungs.priors.StandardNormal.logCdf(-2.1 - 40), bottom, 1e-9 * Math.abs(bottom));
    }

    /**
     * Number attraction (MODEL.md 4b) against the formula computed directly here:
     * P(r | full) = pi_r exp(a_r) / sum_k pi_k exp(a_k), mixed with the coarse class as in 4c.
     */
    @Test
    void attractionMatchesDirectComputation() {
        Scale scale = new Scale(0, 10);
        int[] points = {0, 5, 10};
        RoundingChannel channel = RoundingChannel.of(scale, points);
        double[] thr = row(-2.1, -1.7, -1.3, -0.9, -0.4, 0.1, 0.6, 1.2, 1.8, 2.6);
        double[] a = new double[11];
        a[7] = 0.47;
        a[4] = -0.69;
        a[3] = 0.1;
        for (double eta : new double[] {-1.0, 0.3, 1.9}) {
            double denominator = 0;
            for (int k = 0; k <= 10; k++) {
                denominator += (PHI.cumulativeProbability(thr[k + 1] - eta) - PHI.cumulativeProbability(thr[k] - eta)) * Math.exp(a[k]);
            }
            for (int r = 0; r <= 10; r++) {
                double pi = PHI.cumulativeProbability(thr[r + 1] - eta) - PHI.cumulativeProbability(thr[r] - eta);
                double full = pi * Math.exp(a[r]) / denominator;
                double coarse = Math.exp(direct(thr, points, r, eta, 1.0));
                double expected = Math.log(0.75 * full + 0.25 * (channel.isPoint(r) ? coarse : 0));
                assertEquals(expected, ResponseLikelihood.logRespondentAttracted(channel, thr, 0, r, eta, 0.25, a), 1e-10,
                        "r=" + r + " eta=" + eta);
            }
        }
    }

    /** Far in the tail the attracted probabilities stay finite and the certain category has log-probability 0. */
    @Test
    void attractionFarTailStaysFinite() {
        double[] thr = row(-2.1, -1.7, -1.3, -0.9, -0.4, 0.1, 0.6, 1.2, 1.8, 2.6);
        double[] a = new double[11];
        a[7] = 0.8;
        a[9] = -0.5;
        for (int r = 0; r <= 10; r++) {
            assertTrue(Double.isFinite(ResponseLikelihood.logFullAttracted(thr, 0, r, -45, a)), "r=" + r);
        }
        assertEquals(0.0, ResponseLikelihood.logFullAttracted(thr, 0, 0, -45, a), 1e-12);
    }
}
