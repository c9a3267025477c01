package org.rungs.sampler;

/**
 * One group's log-likelihood gradient per answer, tabulated as a function of the latent level's
 * mean eta on equally spaced nodes and read by four-point Lagrange interpolation: the leapfrog
 * force of {@link CollapsedPosterior#force} on large surveys, where every respondent of a
 * (group, answer) cell has the same class probit (without style covariates; under attraction,
 * one table per row of categorical style covariates for the coarse points, and one for all rows
 * for the other answers, whose gradient depends on the row only through d log P / d zeta: a lean
 * table, {@link #AnswerGrid(int, int[])}) and so a log-likelihood that depends on eta alone
 * (MODEL.md 4c). Between nodes j and j+1 the interpolant through nodes
 * j-1..j+2 is a cubic in s = (eta - node j) / h, so a respondent reads d log P / d eta as that
 * cubic's value (Horner) and adds 1, s, s^2, s^3 to the interval's power sums; {@link #flush}
 * turns those sums into the nodes' interpolation weights and the gradient in the group's
 * thresholds, attractions and class intercept into those weights times the tabulated gradients,
 * once per node instead of once per respondent.
 *
 * <p>Any force that is a fixed function of the position keeps the leapfrog map reversible and
 * volume-preserving, so the Hamiltonian proposal stays exact when its acceptance uses the exact
 * density at both ends (Neal 2011, MCMC using Hamiltonian dynamics, section 5.5.1). The cubic
 * Lagrange error is at most (9/16) h^4 / 4! times a fourth derivative in eta (Abramowitz &
 * Stegun 1964, 25.2.13 with n = 4; from memory). One group at a time; not thread-safe.
 */
final class AnswerGrid {
    /** Node spacing in latent units unless the range needs more than {@link #CAPACITY} nodes. */
    static final double SPACING = 0.0625;
    static final int CAPACITY = 1024;
    /** The widest spacing used; beyond it no grid is built. */
    static final double WIDEST = 0.25;
    /** A cell is tabulated when it has at least this many respondents per node (else it is computed respondent by respondent). */
    static final int RESPONDENTS_PER_NODE = 2;
    /**
     * Rows of the four-point Lagrange weights of nodes j-1..j+2 as polynomials in s: weight k is
     * sum_d LAGRANGE[k][d] s^d.
     */
    private static final double[][] LAGRANGE = {
        {0, -1.0 / 3, 0.5, -1.0 / 6},
        {1, -0.5, -1, 0.5},
        {0, 1, 0.5, -0.5},
        {0, -1.0 / 6, 0, 1.0 / 6}};

    private final int m;
    /** Quantities per node besides d log P / d eta: the M-1 thresholds, the attracted numbers, the class probit. */
    private final int width;
    /** Per answer and node: d log P / d eta, at r * CAPACITY + node. */
    private final double[] slope;
    /** Per answer and interval j (nodes j to j+1): the coefficients of d log P / d eta as a cubic in s, at 4 (r * CAPACITY + j). */
    private final double[] curve;
    /** Per answer and interval: the sums of 1, s, s^2, s^3 over the respondents read so far, laid out as {@link #curve}. */
    private final double[] power;
    /** Per answer and node: d log P / d(c_t - eta) for t = 1..M-1, d log P / d a_k by position in the attraction set, d log P / d zeta. */
    private final double[] gradient;
    /** Per answer and node: the sum of the interpolation weights of the respondents read so far, filled by {@link #flush}. */
    private final double[] weight;
    private final boolean[] on;
    /**
     * Lean tables ({@link #AnswerGrid(int, int[])}): per node, the part of the gradient that every
     * answer shares (through the normaliser N of MODEL.md 4b), in the layout of {@link #gradient};
     * null otherwise, where {@link #gradient} holds each answer's whole gradient.
     */
    private final double[] shared;
    /** Lean tables: per node, the sum of every answer's interpolation weights, filled by {@link #flush}. */
    private final double[] nodeWeight;
    /** Lean tables: whether each answer is in the attraction set. */
    private final boolean[] attractedAnswer;
    private double lowest;
    private double spacing;
    private int nodes;

    AnswerGrid(int categories, int attracted) {
        this(categories, categories - 1 + attracted + 1, null);
    }

    /**
     * A lean table for answers whose likelihood is the full-scale part alone (weight 1): each
     * answer keeps only its own two thresholds' gradient per node, and the normaliser's part,
     * the same for every answer, is kept once per node ({@link #storeShared}).
     */
    AnswerGrid(int categories, int[] attracted) {
        this(categories, 2, attracted);
    }

    private AnswerGrid(int categories, int width, int[] attracted) {
        this.m = categories;
        this.width = width;
        this.slope = new double[categories * CAPACITY];
        this.curve = new double[categories * CAPACITY * 4];
        this.power = new double[categories * CAPACITY * 4];
        this.gradient = new double[categories * CAPACITY * width];
        this.weight = new double[categories * CAPACITY];
        this.on = new boolean[categories];
        this.shared = attracted == null ? null : new double[CAPACITY * (categories - 1 + attracted.length)];
        this.nodeWeight = attracted == null ? null : new double[CAPACITY];
        this.attractedAnswer = new boolean[categories];
        for (int k : attracted == null ? new int[0] : attracted) {
            attractedAnswer[k] = true;
        }
    }

    /**
     * Lays out nodes over [low, high], with two nodes' margin below and three above so that every
     * eta inside has four nodes around it; false when the range would need nodes wider than
     * {@link #WIDEST} (or is not finite).
     */
    boolean place(double low, double high) {
        double needed = (high - low) / (CAPACITY - 5);
        if (!(needed <= WIDEST)) {
            return false;
        }
        spacing = Math.max(SPACING, needed);
        lowest = low - 2 * spacing;
        // the cap only guards against rounding in the ceiling
        nodes = Math.min(CAPACITY, (int) Math.ceil((high - low) / spacing) + 6);
        return true;
    }

    int nodes() {
        return nodes;
    }

    /** The latent level at node j. */
    double node(int j) {
        return lowest + j * spacing;
    }

    /** Whether answer r is read from the grid in this pass. */
    boolean on(int r) {
        return on[r];
    }

    void set(int r, boolean value) {
        on[r] = value;
    }

    /** Stores answer r's gradients at node j: d log P / d eta, and the rest in the layout of {@link #gradient}. */
    void store(int r, int j, double gradEta, double[] thresholds, double[] attractions, int attracted, double gradZeta) {
        slope[r * CAPACITY + j] = gradEta;
        int at = (r * CAPACITY + j) * width;
        System.arraycopy(thresholds, 1, gradient, at, m - 1);
        System.arraycopy(attractions, 0, gradient, at + m - 1, attracted);
        gradient[at + width - 1] = gradZeta;
    }

    /** Lean tables: answer r's d log P / d eta at node j, and its own d log P / d(c_t - eta) at its lower and upper threshold. */
    void storeLean(int r, int j, double gradEta, double lower, double upper) {
        slope[r * CAPACITY + j] = gradEta;
        int at = (r * CAPACITY + j) * 2;
        gradient[at] = lower;
        gradient[at + 1] = upper;
    }

    /** Lean tables: the normaliser's part at node j, d log P / d(c_t - eta) for t = 1..M-1 in thresholds[1..], then d log P / d a_k by position. */
    void storeShared(int j, double[] thresholds, double[] attractions, int attracted) {
        int at = j * (m - 1 + attracted);
        System.arraycopy(thresholds, 1, shared, at, m - 1);
        System.arraycopy(attractions, 0, shared, at + m - 1, attracted);
    }

    /** After every node of answer r is stored: the cubic of each interval from the node slopes around it. */
    void finish(int r) {
        for (int j = 1; j <= nodes - 3; j++) {
            int v = r * CAPACITY + j - 1;
            int at = 4 * (r * CAPACITY + j);
            for (int d = 0; d < 4; d++) {
                double c = 0;
                for (int k = 0; k < 4; k++) {
                    c += LAGRANGE[k][d] * slope[v + k];
                }
                curve[at + d] = c;
            }
        }
    }

    /**
     * Reads the respondents from..to-1 of answer r, whose latent level's mean is intercept plus
     * their covariates x[p][i] times coefficient[p]: adds each one's powers of s to its
     * interval's sums and its d log P / d eta times x[p][i] to sums[p]; returns the sum of
     * d log P / d eta.
     */
    double read(int r, double[][] x, double[] coefficient, int count, double intercept, int from, int to, double[] sums) {
        if (count == 0 || count > 4) {
            return readAny(r, x, coefficient, count, intercept, from, to, sums);
        }
        // Up to four covariates in registers; the missing ones repeat the first with coefficient 0.
        double[] x0 = x[0];
        double[] x1 = count > 1 ? x[1] : x0;
        double[] x2 = count > 2 ? x[2] : x0;
        double[] x3 = count > 3 ? x[3] : x0;
        double b0 = coefficient[0];
        double b1 = count > 1 ? coefficient[1] : 0;
        double b2 = count > 2 ? coefficient[2] : 0;
        double b3 = count > 3 ? coefficient[3] : 0;
        double low = lowest;
        double perNode = 1 / spacing;
        int last = nodes - 3;
        int offset = r * CAPACITY;
        double total = 0;
        double s0 = 0;
        double s1 = 0;
        double s2 = 0;
        double s3 = 0;
        for (int i = from; i < to; i++) {
            double v0 = x0[i];
            double v1 = x1[i];
            double v2 = x2[i];
            double v3 = x3[i];
            double gradEta = readOne(intercept + v0 * b0 + v1 * b1 + v2 * b2 + v3 * b3, low, perNode, last, offset);
            total += gradEta;
            s0 += gradEta * v0;
            s1 += gradEta * v1;
            s2 += gradEta * v2;
            s3 += gradEta * v3;
        }
        sums[0] += s0;
        if (count > 1) {
            sums[1] += s1;
        }
        if (count > 2) {
            sums[2] += s2;
        }
        if (count > 3) {
            sums[3] += s3;
        }
        return total;
    }

    private double readAny(int r, double[][] x, double[] coefficient, int count, double intercept, int from, int to, double[] sums) {
        double low = lowest;
        double perNode = 1 / spacing;
        int last = nodes - 3;
        int offset = r * CAPACITY;
        double total = 0;
        for (int i = from; i < to; i++) {
            double eta = intercept;
            for (int p = 0; p < count; p++) {
                eta += x[p][i] * coefficient[p];
            }
            double gradEta = readOne(eta, low, perNode, last, offset);
            total += gradEta;
            for (int p = 0; p < count; p++) {
                sums[p] += gradEta * x[p][i];
            }
        }
        return total;
    }

    /** d log P / d eta at eta from its interval's cubic, its powers of s added to the interval's sums. */
    private double readOne(double eta, double low, double perNode, int last, int offset) {
        double t = (eta - low) * perNode;
        int j = Math.max(1, Math.min(last, (int) t));
        double s = t - j;
        double square = s * s;
        int v = 4 * (offset + j);
        double[] power = this.power;
        double[] curve = this.curve;
        power[v] += 1;
        power[v + 1] += s;
        power[v + 2] += square;
        power[v + 3] += square * s;
        return curve[v] + s * (curve[v + 1] + s * (curve[v + 2] + s * curve[v + 3]));
    }

    /** Answer r's node weights from its intervals' power sums (into {@link #weight}), the sums cleared. */
    private void weigh(int r) {
        for (int j = 1; j <= nodes - 3; j++) {
            int at = 4 * (r * CAPACITY + j);
            if (power[at] == 0) {
                continue;
            }
            for (int k = 0; k < 4; k++) {
                double[] lagrange = LAGRANGE[k];
                weight[r * CAPACITY + j - 1 + k] += lagrange[0] * power[at] + lagrange[1] * power[at + 1]
                        + lagrange[2] * power[at + 2] + lagrange[3] * power[at + 3];
            }
            java.util.Arrays.fill(power, at, at + 4, 0);
        }
    }

    /**
     * Adds, for every answer read from the grid, the node sums times the tabulated gradients to
     * the thresholds' gradient at gradRows[base + t] (t = 1..M-1), the attractions' at
     * gradAttraction[row + k] and the class intercept's at gradGamma[g] (if not null); clears the
     * sums. A lean table adds each answer's own two thresholds and, if attracted, its own
     * attraction (d log P / d a_r = 1), then the normaliser's part once per node from every
     * answer's weights together.
     */
    void flush(int[] attracted, double[] gradRows, int base, double[] gradAttraction, int row, double[] gradGamma, int g) {
        boolean lean = shared != null;
        for (int r = 0; r < m; r++) {
            if (!on[r]) {
                continue;
            }
            weigh(r);
            double lower = 0;
            double upper = 0;
            double total = 0;
            for (int j = 0; j < nodes; j++) {
                int v = r * CAPACITY + j;
                double w = weight[v];
                if (w == 0) {
                    continue;
                }
                weight[v] = 0;
                if (lean) {
                    lower += w * gradient[2 * v];
                    upper += w * gradient[2 * v + 1];
                    total += w;
                    nodeWeight[j] += w;
                    continue;
                }
                int at = v * width;
                add(w, gradient, at, attracted, gradRows, base, gradAttraction, row);
                if (gradGamma != null) {
                    gradGamma[g] += w * gradient[at + width - 1];
                }
            }
            if (lean) {
                gradRows[base + r] += lower;
                gradRows[base + r + 1] += upper;
                if (attractedAnswer[r]) {
                    gradAttraction[row + r] += total;
                }
            }
        }
        int stride = m - 1 + attracted.length;
        for (int j = 0; j < nodes && lean; j++) {
            double w = nodeWeight[j];
            if (w == 0) {
                continue;
            }
            nodeWeight[j] = 0;
            add(w, shared, j * stride, attracted, gradRows, base, gradAttraction, row);
        }
    }

    /** Adds w times the thresholds' and attractions' gradient laid out from source[at] (as {@link #gradient}). */
    private void add(double w, double[] source, int at, int[] attracted, double[] gradRows, int base, double[] gradAttraction, int row) {
        for (int t = 1; t < m; t++) {
            gradRows[base + t] += w * source[at + t - 1];
        }
        for (int p = 0; p < attracted.length; p++) {
            gradAttraction[row + attracted[p]] += w * source[at + m - 1 + p];
        }
    }
}
