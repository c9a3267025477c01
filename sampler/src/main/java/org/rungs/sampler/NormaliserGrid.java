package org.rungs.sampler;

import org.rungs.priors.StandardNormal;

/**
 * Under number attraction, one group's normaliser N(eta) = sum_k pi[g,k](eta) exp(a[g,k])
 * (MODEL.md 4b) and the gradient of log N in the group's thresholds and attractions, tabulated
 * on a grid of latent levels and read by cubic Hermite interpolation: the leapfrog force of
 * {@link CollapsedPosterior#force}, where a respondent then needs the normal tails of its own
 * answer only, not of every threshold.
 *
 * <p>Any force that is a fixed function of the position keeps the leapfrog map reversible and
 * volume-preserving, so the Hamiltonian proposal stays exact when its acceptance uses the exact
 * density at both ends (Neal 2011, MCMC using Hamiltonian dynamics, section 5.5.1; the same
 * argument as for surrogate forces). The sum over a group's respondents of u_i times a tabulated
 * function at eta_i is taken from per-node sums of u_i times the Hermite basis (the node
 * weights), so each respondent adds four numbers whatever the number of thresholds.
 *
 * <p>For a node x with o_k = exp(a[g,k]) (1 outside the attraction set): N = sum_t Phi(c_t - x)
 * (o_{t-1} - o_t) + o_{M-1}; F_t = d log N / d c_t = phi(c_t - x)(o_{t-1} - o_t) / N; the slope
 * in eta G = d log N / d eta = -sum_t F_t; for an attracted k, d log N / d a_k = pi_k o_k / N;
 * and each one's derivative in x for the Hermite slopes. One group at a time; not thread-safe.
 */
final class NormaliserGrid {
    /** Node spacing in latent units unless the range needs more than {@link #CAPACITY} nodes: cubic Hermite error about h^4/384 times the fourth derivative. */
    static final double SPACING = 0.125;
    static final int CAPACITY = 1024;
    /** The widest spacing used (a range of about 500 latent units); beyond it no grid is built. */
    static final double WIDEST = 0.5;

    private final int m;
    private final int[] attracted;
    private final int na;
    /** Per node: N, dN/deta, G, dG/deta. */
    private final double[] value = new double[CAPACITY * 4];
    /** Per node and threshold t = 1..M-1: F_t and its slope, at node * 2(M-1) + 2(t-1). */
    private final double[] threshold;
    /** Per node and attracted number: d log N / d a_k and its slope. */
    private final double[] attraction;
    /** The node weights: sums of u_i times the value basis and times h times the slope basis. */
    private final double[] weightValue = new double[CAPACITY];
    private final double[] weightSlope = new double[CAPACITY];
    private final double[] offset;
    private final double[] tail;
    private final double[] density;
    private double lowest;
    private double spacing;
    /** 1 / spacing: {@link #locate} multiplies, a division being several times slower per respondent. */
    private double perSpacing;
    private int nodes;
    // The last located respondent: its node and Hermite basis (slope terms times the spacing).
    private int at;
    private double b00;
    private double b10;
    private double b01;
    private double b11;

    NormaliserGrid(int categories, int[] attracted) {
        this.m = categories;
        this.attracted = attracted.clone();
        this.na = attracted.length;
        this.threshold = new double[CAPACITY * 2 * (m - 1)];
        this.attraction = new double[CAPACITY * 2 * Math.max(na, 1)];
        this.offset = new double[m + 1];
        this.tail = new double[m + 1];
        this.density = new double[m + 1];
        offset[0] = Double.NEGATIVE_INFINITY;
        offset[m] = Double.POSITIVE_INFINITY;
    }

    /**
     * Tabulates the group whose thresholds are rows[base..base+M] and odds odds[row..row+M-1] on
     * [low, high] (every eta of its respondents must lie inside). False, with nothing tabulated,
     * when the range would need nodes wider than {@link #WIDEST} (or is not finite): the caller
     * then computes that group exactly, which is as much a fixed function of the position.
     */
    boolean build(double[] rows, int base, double[] odds, int row, double low, double high) {
        double needed = (high - low) / (CAPACITY - 2);
        if (!(needed <= WIDEST)) {
            return false;
        }
        spacing = Math.max(SPACING, needed);
        perSpacing = 1 / spacing;
        lowest = low;
        // the last node lies at or above high; the cap only guards against rounding in the ceiling
        nodes = Math.min(CAPACITY, (int) Math.ceil((high - low) / spacing) + 2);
        for (int j = 0; j < nodes; j++) {
            node(rows, base, odds, row, low + j * spacing, j);
        }
        return true;
    }

    private void node(double[] rows, int base, double[] odds, int row, double x, int j) {
        for (int t = 1; t < m; t++) {
            offset[t] = rows[base + t] - x;
            tail[t] = StandardNormal.smallerTail(offset[t], density, t);
        }
        double n = 1;
        for (int k : attracted) {
            n += StandardNormal.intervalFromTails(offset[k], offset[k + 1], tail[k], tail[k + 1]) * (odds[row + k] - 1);
        }
        double g = 0;
        int at = j * 2 * (m - 1);
        for (int t = 1; t < m; t++) {
            double f = density[t] * (odds[row + t - 1] - odds[row + t]) / n;
            threshold[at + 2 * (t - 1)] = f;
            // d phi(c_t - x) / dx = (c_t - x) phi(c_t - x); the -F_t G part is added below
            threshold[at + 2 * (t - 1) + 1] = offset[t] * f;
            g -= f;
        }
        double slope = 0;
        for (int t = 1; t < m; t++) {
            double s = threshold[at + 2 * (t - 1) + 1] - threshold[at + 2 * (t - 1)] * g;
            threshold[at + 2 * (t - 1) + 1] = s;
            slope -= s;
        }
        int a = j * 2 * na;
        for (int p = 0; p < na; p++) {
            int k = attracted[p];
            double o = odds[row + k] / n;
            double f = StandardNormal.intervalFromTails(offset[k], offset[k + 1], tail[k], tail[k + 1]) * o;
            double lower = k == 0 ? 0 : density[k];
            double upper = k + 1 == m ? 0 : density[k + 1];
            attraction[a + 2 * p] = f;
            attraction[a + 2 * p + 1] = (lower - upper) * o - f * g;
        }
        value[4 * j] = n;
        value[4 * j + 1] = n * g;
        value[4 * j + 2] = g;
        value[4 * j + 3] = slope;
    }

    /** Locates eta between two nodes; {@link #normaliser}, {@link #logSlope} and {@link #add} then read it. */
    void locate(double eta) {
        double t = (eta - lowest) * perSpacing;
        int j = Math.max(0, Math.min(nodes - 2, (int) Math.floor(t)));
        double s = Math.max(0, Math.min(1, t - j));
        double r = 1 - s;
        at = j;
        b00 = (1 + 2 * s) * r * r;
        b10 = spacing * s * r * r;
        b01 = s * s * (3 - 2 * s);
        b11 = spacing * s * s * (s - 1);
    }

    /** N at the located eta. */
    double normaliser() {
        int v = 4 * at;
        return b00 * value[v] + b10 * value[v + 1] + b01 * value[v + 4] + b11 * value[v + 5];
    }

    /** d log N / d eta at the located eta. */
    double logSlope() {
        int v = 4 * at;
        return b00 * value[v + 2] + b10 * value[v + 3] + b01 * value[v + 6] + b11 * value[v + 7];
    }

    /** Adds u times the interpolants at the located eta to the sums that {@link #flush} spreads. */
    void add(double u) {
        weightValue[at] += u * b00;
        weightSlope[at] += u * b10;
        weightValue[at + 1] += u * b01;
        weightSlope[at + 1] += u * b11;
    }

    /**
     * Subtracts sum_i u_i d log N / d theta (eta_i) from the thresholds' gradient at
     * gradRows[base + t] and the attractions' at gradAttraction[row + k], and clears the weights.
     */
    void flush(double[] gradRows, int base, double[] gradAttraction, int row) {
        for (int j = 0; j < nodes; j++) {
            double wv = weightValue[j];
            double ws = weightSlope[j];
            if (wv == 0 && ws == 0) {
                continue;
            }
            int at = j * 2 * (m - 1);
            for (int t = 1; t < m; t++) {
                gradRows[base + t] -= wv * threshold[at + 2 * (t - 1)] + ws * threshold[at + 2 * (t - 1) + 1];
            }
            int a = j * 2 * na;
            for (int p = 0; p < na; p++) {
                gradAttraction[row + attracted[p]] -= wv * attraction[a + 2 * p] + ws * attraction[a + 2 * p + 1];
            }
            weightValue[j] = 0;
            weightSlope[j] = 0;
        }
    }
}
