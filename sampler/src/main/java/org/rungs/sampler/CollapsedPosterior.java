package org.rungs.sampler;

import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * The log posterior of the parameters that the data touch, with every respondent's latent level,
 * class, intended answer and rejected draws summed out (MODEL.md 4c), and its gradient: the
 * target of {@link JointHamiltonianUpdate}. The hyperparameters tau_alpha, tau_d and tau_gamma are
 * read from the chain state and held fixed; tau_a is part of the vector.
 *
 * <p>The vector, in order: the level intercepts alpha[g] and mu_alpha (with one group, alpha
 * alone), beta, the logs of the M-2 gaps G[k] = c[k+1] - c[k] between the common thresholds
 * (which fix them, as they sum to zero, MODEL.md 3), by group each group's deviations
 * d[g,1..M-2] = c[g,.] - c[.] (d[g,M-1] = minus their sum), or under attraction its M-2 gaps as
 * u[g,k] = (G[k] / tau_d) log(g[g,k] / G[k]), g[g,k] = c[g,k+1] - c[g,k] (the group row sums to
 * zero too, as its deviations do), then for the coarse class gamma[g] and
 * mu_gamma (or gamma alone), delta, then the attraction: with several groups non-centred,
 * z[g,j] with a[g,j] = abar[j] + tau_a z[g,j], then abar[j], then log tau_a (the group
 * deviations are weakly identified, and centred they and tau_a form a funnel); with one group
 * a[j] alone. The density is the one of MODEL.md 3 to 5 in these coordinates, with the
 * Jacobians of the logs, of u (sum of log(g / G), up to a constant in tau_d, which the step
 * holds: its factor tau_d^(M-2) per group cancels the deviations' normaliser tau_d^-(M-2), which
 * is left out too, so the density is also the joint one of tau_d and u) and of z, and zero where
 * a group's thresholds are not increasing (with the deviations as coordinates). On the log scale the common row's lowest gap, whose long flat tail appears
 * when most answers at that end can be coarse ones, is closer to Gaussian. A group's gap is
 * G + tau_d u to first order, so where the deviations' prior and the data hold it well away from
 * 0, u is a standardised deviation and the prior on d[g,.] stays nearly Gaussian in it (a plain
 * log of the group's gaps made a funnel of it: SAMPLER-RESEARCH.md, fifth session); where a
 * category is empty in a group, or the coarse class can explain all its answers, the gap's
 * density stays positive up to 0, and u turns that edge into a smooth tail instead of a wall
 * where the thresholds cross, which ended about a fifth of the joint step's trajectories on the
 * attraction demo (1 to 9% now, the rest diverging far out). Without attraction the coarse demo
 * lost the walls likewise (a quarter to 2 to 7%) and needed fewer leapfrog steps, but on its
 * default seed the derived shares' smallest tail ESS fell from 569 to 336, so there the
 * deviations stay (thirtieth session, SAMPLER-RESEARCH.md).
 */
final class CollapsedPosterior {
    private static final double LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);
    private static final double LN2 = Math.log(2);
    /** Below this a probability is recomputed in log space. */
    private static final double TINY = 1e-280;
    /**
     * The probability path ({@link #plain}) is taken above this probability and within this
     * distance of 0 for the class probit, where 1 - q and the ratios it divides keep full precision.
     */
    private static final double PLAIN_FLOOR = 1e-200;
    private static final double PLAIN_PROBIT = 6;
    /**
     * {@link #attractedCell} takes N_i from differences of cdfs, whose absolute error is about
     * 1e-16 times the group's sum of |exp(a[g,k-1]) - exp(a[g,k])|; below this share of that sum N_i
     * would keep fewer than about 10 digits, and the respondent takes the tail-exact path.
     */
    private static final double NORMALISER_FLOOR = 1e-6;

    private final ChainState state;
    private final Priors priors;
    private final RoundingChannel channel;
    private final int groups;
    private final int m;
    private final int free;
    private final int levelCount;
    private final int styleCount;
    private final int[] attracted;
    private final boolean pooled;
    private final boolean byGroup;
    /**
     * By group under attraction: the group rows in the gap coordinates u (class comment); otherwise
     * their deviations d[g,1..M-2] themselves (d[g,M-1] = minus their sum).
     */
    private final boolean gapRows;

    final int alphaAt;
    final int betaAt;
    final int commonAt;
    final int deviationAt;
    final int gammaAt;
    final int deltaAt;
    final int attractionAt;
    final int attractionMeanAt;
    /** log tau_a, when attraction is on with several groups; -1 otherwise. */
    final int attractionSdAt;
    private final int dimension;
    /**
     * Per coordinate, the group whose respondents and prior terms alone it touches (-1 for a
     * survey-wide one) and its position among that group's own coordinates; by group and position,
     * the coordinate.
     */
    private final int[] owner;
    private final int[] slot;
    private final int slots;
    private final int[] member;

    /** Coarse point r: the thresholds k with R(r|k-1) != R(r|k), and that difference. */
    private final int[][] coarseBound;
    private final double[][] coarseWeight;

    // Unpacked vector and gradient in the model's own coordinates; reused by every call.
    private final double[] alpha;
    private final double[] beta;
    private final double[] rows;
    private final double[] common;
    private final double[] gamma;
    private final double[] delta;
    private final double[] odds;
    private final double[] attraction;
    /** Unpacked abar[j] by position in A, and tau_a (with several groups). */
    private final double[] means;
    private double spread;
    private final double[] gradAlpha;
    private final double[] gradBeta;
    private final double[] gradRows;
    private final double[] gradGamma;
    private final double[] gradDelta;
    private final double[] gradAttraction;
    /**
     * Per respondent, d log P / d eta and d log P / d zeta of the last gradient pass; the
     * coefficients' gradients are their sums against the covariate columns, taken after the pass
     * ({@link #columnSums}) so that no sum waits on the one before it.
     */
    private final double[] respondentGradEta;
    private final double[] respondentGradZeta;
    private final double[] cdf;
    /**
     * Scratch of {@link #attractedCell}: per threshold exp(a[g,k-1]) - exp(a[g,k]), and the cell's
     * sums of d log P / d(c[g,k] - eta) through N_i (before that factor) and through the coarse
     * class; per attracted number, the cell's sum through N_i (before exp(a)).
     */
    private final double[] change;
    private final double[] cellDensity;
    private final double[] cellCoarse;
    private final double[] cellShare;
    private final double[] gradT;
    private final double[] fullCoords;
    /** Scratch: a row's gaps, and the log density's slope in each gap ({@link #gapSlopes}). */
    private final double[] gapValues;
    private final double[] slopes;
    /** Scratch: phi at the answer's lower and upper bound and at the class probit; at each threshold. */
    private final double[] density = new double[3];
    private final double[] thresholdDensity;
    /** Scratch of {@link #attracted}: c[g,k] - eta and its smaller normal tail, by threshold; pi[g,k] of the attracted numbers. */
    private final double[] offset;
    private final double[] tail;
    private final double[] probability;
    /** Coarse point r: the categories k with R(r|k) > 0 and R(r|k) (MODEL.md 4a). */
    private final int[][] coarseFrom;
    private final double[][] coarseShare;
    /** The last class probit zeta seen by {@link #plain}, and Phi and phi there; NaN at the start of every pass. */
    private double lastZeta = Double.NaN;
    private double lastQ;
    private double lastPhi;
    private int sampled = 1;
    /** Where the density pass writes each respondent's cdfs, or null ({@link #logDensity(double[], double[])}). */
    private double[] keptCdf;
    /** Where the density pass writes each respondent's N_i beside its cdfs, or null. */
    private double[] keptNormaliser;
    /** False while {@link #gradientOnly} runs: the probability paths then skip each respondent's logarithm. */
    private boolean densityWanted = true;
    /** The running product of {@link #keep} and its power of 2 besides: the product is product * 2^productExponent. */
    private double product;
    private int productExponent;
    /** True while {@link #force} runs: under attraction the normaliser's part then comes from {@link #grid}. */
    private boolean onGrid;
    /** Under attraction, the tabulated normaliser of one group at a time; null otherwise. */
    private final NormaliserGrid grid;
    /**
     * One group's gradient per answer tabulated in eta ({@link AnswerGrid}), one table per row of
     * style covariates (one without them), as every respondent of a row has the same class probit;
     * null with style covariates but no {@link ChainState#styleRows}.
     */
    private final AnswerGrid[] answers;
    /** Per respondent, the number of its row of style covariates; null without style covariates or without tables. */
    private final int[] styleRow;
    /** The distinct rows of style covariates, [row][covariate], in order of first appearance. */
    private final double[][] styleRows;
    /** Respondents per (group, style row, answer), at (g * rows + row) * M + r. */
    private final int[] rowCellCount;
    /** Per style row: whether {@link #buildAnswers} tabulated some answer for the current group. */
    private final boolean[] rowBuilt;
    /** Per style row: d log P / d zeta summed over the current group's respondents read from its table. */
    private final double[] rowGradZeta;
    /** Per style row: its class probit in the current group ({@link #buildAnswers}). */
    private final double[] rowZeta;
    /** Per style row: its class probability Phi(zeta) and density phi(zeta) in the current group. */
    private final double[] rowQ;
    private final double[] rowPhi;
    /** Per style row: whether its class probit lets the current group's respondents of the row read a table. */
    private final boolean[] rowUsable;
    /**
     * With several rows of style covariates: one table for the answers that are not coarse
     * points, read by every row (their gradient does not depend on the class probit but through
     * d log P / d zeta = -phi / (1 - Phi), a constant per row); null otherwise.
     */
    private final AnswerGrid plainAnswers;
    /** Whether {@link #buildAnswers} tabulated some answer in {@link #plainAnswers} for the current group. */
    private boolean plainBuilt;
    /** Per style row: the current group's respondents of the row read from {@link #plainAnswers}. */
    private final double[] rowPlainCount;
    /** Respondents the last {@link #force} read from answer tables. */
    private int tableReads;
    /** Scratch of {@link #answer}: d log P / d a[g,k] by position in the attraction set, and d log P / d zeta. */
    private final double[] answerAttraction;
    /** Scratch of {@link #etaRange}. */
    private final double[] range = new double[2];
    private double answerGradZeta;
    /** Per group and level covariate, the smallest and largest value among the group's respondents (for the grid's range). */
    private final double[] levelLow;
    private final double[] levelHigh;

    CollapsedPosterior(ChainState state, Priors priors) {
        this.state = state;
        this.priors = priors;
        this.channel = state.channel;
        this.groups = state.groups;
        this.m = state.categories;
        this.free = m - 2;
        this.levelCount = state.level.count;
        this.styleCount = state.style == null ? 0 : state.style.count;
        this.attracted = state.attracted.clone();
        this.pooled = groups > 1;
        this.byGroup = state.byGroup;
        this.gapRows = state.byGroup && state.attractionOn();
        int at = 0;
        alphaAt = at;
        at += pooled ? groups + 1 : 1;
        betaAt = at;
        at += levelCount;
        commonAt = at;
        at += Math.max(free, 0);
        deviationAt = at;
        at += byGroup ? groups * free : 0;
        gammaAt = at;
        at += channel == null ? 0 : (pooled ? groups + 1 : 1);
        deltaAt = at;
        at += styleCount;
        attractionAt = at;
        at += attracted.length * (pooled ? groups : 1);
        attractionMeanAt = at;
        at += pooled ? attracted.length : 0;
        attractionSdAt = pooled && attracted.length > 0 ? at++ : -1;
        dimension = at;
        owner = new int[dimension];
        slot = new int[dimension];
        java.util.Arrays.fill(owner, -1);
        int perGroup = 0;
        if (pooled) {
            perGroup = own(alphaAt, 1, perGroup);
            perGroup = own(deviationAt, byGroup ? free : 0, perGroup);
            perGroup = own(gammaAt, channel == null ? 0 : 1, perGroup);
            perGroup = own(attractionAt, attracted.length, perGroup);
        }
        slots = perGroup;
        member = new int[groups * slots];
        for (int k = 0; k < dimension; k++) {
            if (owner[k] >= 0) {
                member[owner[k] * slots + slot[k]] = k;
            }
        }
        coarseBound = new int[m][];
        coarseWeight = new double[m][];
        coarseFrom = new int[m][];
        coarseShare = new double[m][];
        if (channel != null) {
            for (int r = 0; r < m; r++) {
                if (!channel.isPoint(r)) {
                    continue;
                }
                int n = 0;
                int[] bound = new int[m];
                double[] weight = new double[m];
                for (int k = 1; k < m; k++) {
                    double w = channel.probability(r, k - 1) - channel.probability(r, k);
                    if (w != 0) {
                        bound[n] = k;
                        weight[n++] = w;
                    }
                }
                coarseBound[r] = java.util.Arrays.copyOf(bound, n);
                coarseWeight[r] = java.util.Arrays.copyOf(weight, n);
                int from = 0;
                int[] categories = new int[m];
                double[] shares = new double[m];
                for (int k = 0; k < m; k++) {
                    if (channel.probability(r, k) > 0) {
                        categories[from] = k;
                        shares[from++] = channel.probability(r, k);
                    }
                }
                coarseFrom[r] = java.util.Arrays.copyOf(categories, from);
                coarseShare[r] = java.util.Arrays.copyOf(shares, from);
            }
        }
        alpha = new double[groups];
        beta = new double[levelCount];
        rows = new double[groups * (m + 1)];
        common = new double[m + 1];
        gamma = new double[groups];
        delta = new double[styleCount];
        odds = new double[groups * m];
        attraction = new double[groups * m];
        means = new double[attracted.length];
        gradAlpha = new double[groups];
        gradBeta = new double[levelCount];
        gradRows = new double[groups * (m + 1)];
        gradGamma = new double[groups];
        gradDelta = new double[styleCount];
        respondentGradEta = levelCount > 0 ? new double[state.size] : null;
        respondentGradZeta = channel != null && styleCount > 0 ? new double[state.size] : null;
        gradAttraction = new double[groups * m];
        cdf = new double[m + 1];
        cdf[m] = 1;
        change = new double[m + 1];
        cellDensity = new double[m + 1];
        cellCoarse = new double[m + 1];
        cellShare = new double[attracted.length];
        gradT = new double[m + 1];
        fullCoords = new double[m + 1];
        gapValues = new double[Math.max(free, 0)];
        slopes = new double[Math.max(free, 0)];
        thresholdDensity = new double[m + 1];
        offset = new double[m + 1];
        tail = new double[m + 1];
        // The sentinels: c[g,0] = -inf and c[g,M] = +inf, whose tails are 0; attracted() fills 1..M-1.
        offset[0] = Double.NEGATIVE_INFINITY;
        offset[m] = Double.POSITIVE_INFINITY;
        probability = new double[m];
        grid = attracted.length > 0 ? new NormaliserGrid(m, attracted) : null;
        answerAttraction = new double[attracted.length];
        StyleRows distinct = state.styleRows;
        styleRows = styleCount == 0 ? new double[1][0] : distinct == null ? null : distinct.values();
        styleRow = distinct == null ? null : distinct.number();
        if (styleRows == null) {
            answers = null;
            rowCellCount = null;
        } else {
            answers = new AnswerGrid[styleRows.length];
            for (int q = 0; q < answers.length; q++) {
                answers[q] = new AnswerGrid(m, attracted.length);
            }
            rowCellCount = new int[groups * answers.length * m];
            for (int i = 0; i < state.size; i++) {
                int q = styleRow == null ? 0 : styleRow[i];
                rowCellCount[(state.group[i] * answers.length + q) * m + state.category[i]]++;
            }
        }
        rowBuilt = new boolean[answers == null ? 0 : answers.length];
        rowGradZeta = new double[rowBuilt.length];
        rowZeta = new double[rowBuilt.length];
        rowQ = new double[rowBuilt.length];
        rowPhi = new double[rowBuilt.length];
        rowUsable = new boolean[rowBuilt.length];
        rowPlainCount = new double[rowBuilt.length];
        plainAnswers = styleRow != null && channel != null ? new AnswerGrid(m, attracted) : null;
        levelLow = new double[groups * levelCount];
        levelHigh = new double[groups * levelCount];
        java.util.Arrays.fill(levelLow, Double.POSITIVE_INFINITY);
        java.util.Arrays.fill(levelHigh, Double.NEGATIVE_INFINITY);
        for (int p = 0; p < levelCount; p++) {
            double[] x = state.level.columns[p];
            for (int i = 0; i < state.size; i++) {
                int cell = state.group[i] * levelCount + p;
                levelLow[cell] = Math.min(levelLow[cell], x[i]);
                levelHigh[cell] = Math.max(levelHigh[cell], x[i]);
            }
        }
    }

    int dimension() {
        return dimension;
    }

    /** Marks the block at {@code at}, {@code width} coordinates per group laid out group by group, as the groups' own from position {@code first}. */
    private int own(int at, int width, int first) {
        for (int g = 0; g < groups; g++) {
            for (int j = 0; j < width; j++) {
                owner[at + g * width + j] = g;
                slot[at + g * width + j] = first + j;
            }
        }
        return first + width;
    }

    /**
     * Minus the Hessian of the log density at x, row-major d x d, by forward differences of the
     * gradient (step 1e-6 max(1, |x_j|), reversed where it leaves the support), symmetrised; null
     * if the gradient cannot be evaluated near x. A group's own coordinates (alpha[g], d[g,.],
     * gamma[g], z[g,.]) touch only its respondents and its prior terms, so two groups' own
     * coordinates share no Hessian entry and one gradient perturbs the same coordinate of every
     * group at once (Curtis, Powell & Reid 1974, "On the estimation of sparse Jacobian matrices",
     * J. Inst. Maths Applics 13, 117-119): 1 + (survey-wide coordinates) + (coordinates per group)
     * gradients instead of d + 1.
     */
    double[] negativeHessian(double[] x) {
        int d = dimension;
        double[] h = new double[d * d];
        boolean[] known = new boolean[d * d];
        if (!measureHessian(x, (i, j, v) -> {
            h[i * d + j] = v;
            known[i * d + j] = true;
        })) {
            return null;
        }
        for (int i = 0; i < d; i++) {
            for (int j = 0; j < i; j++) {
                boolean a = known[i * d + j];
                boolean b = known[j * d + i];
                double v = a && b ? 0.5 * (h[i * d + j] + h[j * d + i]) : a ? h[i * d + j] : b ? h[j * d + i] : 0;
                h[i * d + j] = v;
                h[j * d + i] = v;
            }
        }
        return h;
    }

    /**
     * The same entries as {@link #negativeHessian(double[])}, those that can be non-zero, into the
     * metric's blocks ({@link ArrowMetric#measured}); false if the gradient cannot be evaluated near x.
     */
    boolean negativeHessian(double[] x, ArrowMetric into) {
        into.clearMeasured();
        return measureHessian(x, into::measured);
    }

    /** Receives entry (i, j) of minus the Hessian, measured from the gradient's change when coordinate j moved. */
    interface HessianEntries {
        void measured(int i, int j, double value);
    }

    /** Measures the columns of minus the Hessian at x as {@link #negativeHessian(double[])} describes. */
    private boolean measureHessian(double[] x, HessianEntries out) {
        int d = dimension;
        double[] base = new double[d];
        if (gradient(x, base) == Double.NEGATIVE_INFINITY) {
            return false;
        }
        double[] step = new double[d];
        for (int j = 0; j < d; j++) {
            step[j] = 1e-6 * Math.max(1, Math.abs(x[j]));
        }
        double[] moved = new double[d];
        for (int j = 0; j < d; j++) {
            if (owner[j] < 0 && !column(x, new int[] {j}, step, base, moved, out)) {
                return false;
            }
        }
        for (int s = 0; s < slots; s++) {
            int[] set = new int[groups];
            for (int g = 0; g < groups; g++) {
                set[g] = member[g * slots + s];
            }
            if (!perturbed(x, set, step, moved)) {
                for (int c : set) {
                    if (!column(x, new int[] {c}, step, base, moved, out)) {
                        return false;
                    }
                }
                continue;
            }
            for (int i = 0; i < d; i++) {
                if (owner[i] >= 0) {
                    int c = member[owner[i] * slots + s];
                    out.measured(i, c, -(moved[i] - base[i]) / step[c]);
                }
            }
        }
        return true;
    }

    /** Measures column {@code set[0]} from one perturbed gradient; false if it cannot be evaluated. */
    private boolean column(double[] x, int[] set, double[] step, double[] base, double[] moved, HessianEntries out) {
        if (!perturbed(x, set, step, moved)) {
            return false;
        }
        int c = set[0];
        for (int i = 0; i < dimension; i++) {
            out.measured(i, c, -(moved[i] - base[i]) / step[c]);
        }
        return true;
    }

    /** For {@link ArrowMetric}: per coordinate, its group (-1 if survey-wide), and its position among the group's own. */
    int[] owners() {
        return owner.clone();
    }

    int[] slotsOf() {
        return slot.clone();
    }

    /** Own coordinates per group (every group has as many). */
    int ownPerGroup() {
        return slots;
    }

    int groupCount() {
        return groups;
    }

    /** The gradient with every coordinate of {@code set} moved by its step, or by minus it where that leaves the support. */
    private boolean perturbed(double[] x, int[] set, double[] step, double[] moved) {
        double[] point = x.clone();
        for (int sign = 0; sign < 2; sign++) {
            for (int c : set) {
                if (sign == 1) {
                    step[c] = -step[c];
                }
                point[c] = x[c] + step[c];
            }
            if (gradientOnly(point, moved) != Double.NEGATIVE_INFINITY) {
                return true;
            }
        }
        return false;
    }

    /**
     * From now on the likelihood reads every {@code every}-th respondent of the sorted survey
     * (a systematic sample across groups and answers) and counts each that many times: an
     * approximation, used only to fit the joint step's metric on large surveys.
     */
    void sampleEvery(int every) {
        if (every < 1) {
            throw new IllegalArgumentException("need every >= 1, got " + every);
        }
        this.sampled = every;
    }

    /** Reads the chain state into {@code theta}. */
    void read(double[] theta) {
        ChainState s = state;
        int stride = m + 1;
        readBlock(s.level, theta, alphaAt, betaAt);
        for (int j = 0; j < free; j++) {
            theta[commonAt + j] = Math.log(s.common[j + 2] - s.common[j + 1]);
        }
        if (byGroup) {
            for (int g = 0; g < groups; g++) {
                for (int j = 0; j < free; j++) {
                    int at = g * stride + j + 1;
                    if (gapRows) {
                        double common = s.common[j + 2] - s.common[j + 1];
                        theta[deviationAt + g * free + j] = common / s.thresholdSd * Math.log((s.thresholds[at + 1] - s.thresholds[at]) / common);
                    } else {
                        theta[deviationAt + g * free + j] = s.thresholds[at] - s.common[j + 1];
                    }
                }
            }
        }
        if (channel != null) {
            readBlock(s.style, theta, gammaAt, deltaAt);
        }
        int na = attracted.length;
        for (int j = 0; j < na; j++) {
            int k = attracted[j];
            if (pooled) {
                for (int g = 0; g < groups; g++) {
                    theta[attractionAt + g * na + j] = (s.attraction[g * m + k] - s.attractionMean[k]) / s.attractionSd;
                }
                theta[attractionMeanAt + j] = s.attractionMean[k];
            } else {
                theta[attractionAt + j] = s.attraction[k];
            }
        }
        if (attractionSdAt >= 0) {
            theta[attractionSdAt] = Math.log(s.attractionSd);
        }
    }

    /** A regression block's intercepts then mean (or its one intercept) at {@code at}, its coefficients at {@code coefficientsAt}. */
    private void readBlock(RegressionBlock block, double[] theta, int at, int coefficientsAt) {
        if (pooled) {
            System.arraycopy(block.intercept, 0, theta, at, groups);
            theta[at + groups] = block.mean;
        } else {
            theta[at] = block.intercept[0];
        }
        System.arraycopy(block.coefficient, 0, theta, coefficientsAt, block.count);
    }

    /** Writes {@code theta} into the chain state. */
    void write(double[] theta) {
        ChainState s = state;
        unpack(theta);
        System.arraycopy(alpha, 0, s.level.intercept, 0, groups);
        s.level.mean = pooled ? theta[alphaAt + groups] : alpha[0];
        System.arraycopy(beta, 0, s.level.coefficient, 0, levelCount);
        System.arraycopy(common, 0, s.common, 0, m + 1);
        System.arraycopy(rows, 0, s.thresholds, 0, rows.length);
        if (channel != null) {
            System.arraycopy(gamma, 0, s.style.intercept, 0, groups);
            s.style.mean = pooled ? theta[gammaAt + groups] : gamma[0];
            System.arraycopy(delta, 0, s.style.coefficient, 0, styleCount);
        }
        int na = attracted.length;
        for (int j = 0; j < na; j++) {
            int k = attracted[j];
            for (int g = 0; g < groups; g++) {
                s.attraction[g * m + k] = attraction[g * m + k];
            }
            s.attractionMean[k] = pooled ? theta[attractionMeanAt + j] : attraction[k];
        }
        if (attractionSdAt >= 0) {
            s.attractionSd = Math.exp(theta[attractionSdAt]);
        }
    }

    /** The log posterior at theta up to a constant; minus infinity where a group's thresholds are not increasing. */
    double logDensity(double[] theta) {
        return evaluate(theta, null);
    }

    /**
     * {@link #logDensity}, also writing Phi(c[g,k] - eta_i) for k = 1..M-1 of every respondent to
     * {@code cdfs} (laid out as {@link ChainState#cdf}), bit for bit as
     * {@link ThresholdUpdate#refresh} computes them once theta is written to the state; only where
     * {@link #keepsCdfs}.
     */
    double logDensity(double[] theta, double[] cdfs) {
        return logDensity(theta, cdfs, null);
    }

    /**
     * {@link #logDensity(double[], double[])}, also writing each respondent's N_i of MODEL.md 4b to
     * {@code normalisers} (by position in sorted order, as {@link ChainState#normaliser}): the
     * pass's own, by summation by parts, where it keeps about 10 digits or more, else
     * sum_k pi[g,k] (exp(a[g,k]) - 1) + 1 from the kept cdfs, as
     * {@link ChainState#refreshNormalisers} sums it.
     */
    double logDensity(double[] theta, double[] cdfs, double[] normalisers) {
        keptCdf = cdfs;
        keptNormaliser = normalisers;
        try {
            return evaluate(theta, null);
        } finally {
            keptCdf = null;
            keptNormaliser = null;
        }
    }

    /** Whether {@link #logDensity(double[], double[])} can write the cdfs: attraction on, one to four level covariates. */
    boolean keepsCdfs() {
        return attractedCells();
    }

    /** The log posterior at theta, and its gradient in {@code gradient} (left unset where it is minus infinity). */
    double gradient(double[] theta, double[] gradient) {
        return evaluate(theta, gradient);
    }

    /**
     * The gradient at theta, the same doubles as {@link #gradient} gives; the value returned is
     * minus infinity or NaN where that one's is, and otherwise not the log density: the
     * probability paths skip each respondent's logarithm, which a leapfrog step between the ends
     * of a trajectory never reads (the coarse demo's processor time fell by about 3%).
     */
    double gradientOnly(double[] theta, double[] gradient) {
        densityWanted = false;
        try {
            return evaluate(theta, gradient);
        } finally {
            densityWanted = true;
        }
    }

    /**
     * True when {@link #force} may approximate the gradient (under attraction, or without style
     * covariates on cells large enough for {@link AnswerGrid}); else it is {@link #gradientOnly}.
     */
    boolean approximatesForce() {
        return grid != null || answers != null;
    }

    /** How many respondents the last {@link #force} read from answer tables (for tests). */
    int lastForceTableReads() {
        return tableReads;
    }

    /** Whether {@link #force} may read (group, answer) cells from answer tables ({@link AnswerGrid}). */
    boolean readsAnswerTables() {
        return answers != null;
    }

    /**
     * Whether a trajectory's ends should take {@link #force} and {@link #logDensity} instead of
     * the exact gradient: under attraction, where the gradient's normal densities at every
     * threshold make it cost about twice the density (benchmark survey of 200,000 respondents,
     * complete model: 168 against 84 ns per respondent, the force 18).
     */
    boolean forceAtEnds() {
        return grid != null;
    }

    /**
     * The leapfrog force at theta: under attraction, the gradient with the normaliser's part
     * (MODEL.md 4b) read from a grid of latent levels ({@link NormaliserGrid}), a fixed function
     * of theta within about 1e-7 of the gradient; otherwise {@link #gradientOnly}. The value
     * returned is minus infinity or NaN where the log density is, and otherwise not the log
     * density. The caller must judge its trajectories with {@link #logDensity}.
     */
    double force(double[] theta, double[] gradient) {
        if (!approximatesForce()) {
            return gradientOnly(theta, gradient);
        }
        onGrid = true;
        try {
            return gradientOnly(theta, gradient);
        } finally {
            onGrid = false;
        }
    }

    /** Fills the model-coordinate arrays from theta; false if some group's thresholds are not increasing. */
    private boolean unpack(double[] theta) {
        int stride = m + 1;
        if (pooled) {
            System.arraycopy(theta, alphaAt, alpha, 0, groups);
        } else {
            alpha[0] = theta[alphaAt];
        }
        System.arraycopy(theta, betaAt, beta, 0, levelCount);
        fillFromGaps(theta, commonAt, common, 0);
        boolean increasing = true;
        for (int g = 0; g < groups; g++) {
            if (byGroup) {
                int base = g * stride;
                if (gapRows) {
                    double tau = state.thresholdSd;
                    for (int j = 0; j < free; j++) {
                        double common = this.common[j + 2] - this.common[j + 1];
                        gapValues[j] = common * Math.exp(tau * theta[deviationAt + g * free + j] / common);
                    }
                    fillFromGapValues(gapValues, rows, base);
                } else {
                    double sum = 0;
                    for (int j = 0; j < free; j++) {
                        double d = theta[deviationAt + g * free + j];
                        rows[base + j + 1] = common[j + 1] + d;
                        sum += d;
                    }
                    rows[base + m - 1] = common[m - 1] - sum;
                    rows[base] = Double.NEGATIVE_INFINITY;
                    rows[base + m] = Double.POSITIVE_INFINITY;
                }
                for (int k = 2; k < m; k++) {
                    increasing &= rows[base + k] > rows[base + k - 1];
                }
            } else {
                System.arraycopy(common, 0, rows, g * stride, stride);
            }
        }
        if (channel != null) {
            if (pooled) {
                System.arraycopy(theta, gammaAt, gamma, 0, groups);
            } else {
                gamma[0] = theta[gammaAt];
            }
            System.arraycopy(theta, deltaAt, delta, 0, styleCount);
        }
        int na = attracted.length;
        spread = attractionSdAt >= 0 ? Math.exp(theta[attractionSdAt]) : 0;
        for (int j = 0; j < na; j++) {
            int k = attracted[j];
            means[j] = pooled ? theta[attractionMeanAt + j] : 0;
            for (int g = 0; g < groups; g++) {
                double a = pooled
                        ? means[j] + spread * theta[attractionAt + g * na + j]
                        : theta[attractionAt + j];
                attraction[g * m + k] = a;
                odds[g * m + k] = Math.exp(a);
            }
        }
        return increasing;
    }

    /**
     * A row of thresholds with sentinels, out[base..base+M], whose entries 1..M-1 sum to zero,
     * from the logs of its M-2 gaps at theta[from..].
     */
    private void fillFromGaps(double[] theta, int from, double[] out, int base) {
        for (int j = 0; j < free; j++) {
            gapValues[j] = Math.exp(theta[from + j]);
        }
        fillFromGapValues(gapValues, out, base);
    }

    /** As {@link #fillFromGaps}, from the M-2 gaps themselves. */
    private void fillFromGapValues(double[] gaps, double[] out, int base) {
        double value = 0;
        double sum = 0;
        out[base + 1] = 0;
        for (int j = 0; j < free; j++) {
            value += gaps[j];
            out[base + j + 2] = value;
            sum += value;
        }
        double mean = sum / (m - 1);
        for (int k = 1; k < m; k++) {
            out[base + k] -= mean;
        }
        out[base] = Double.NEGATIVE_INFINITY;
        out[base + m] = Double.POSITIVE_INFINITY;
    }

    /**
     * Adds to gradient[at..] the gradient in a row's gap logs, given the gradient in its entries
     * 1..M-1 ({@link #fullCoords}) and the row: entry k minus the row's mean moves with gap log j
     * by exp(u_j) ([k >= j+2] - (M-2-j)/(M-1)); plus 1 per gap for the Jacobian.
     */
    private void gapGradient(double[] row, int base, double[] gradient, int at) {
        gapSlopes();
        for (int j = 0; j < free; j++) {
            double gap = row[base + j + 2] - row[base + j + 1];
            gradient[at + j] += gap * slopes[j] + 1;
        }
    }

    /**
     * Into {@link #slopes}: the gradient in a row's M-2 gaps, given the gradient in its entries
     * 1..M-1 ({@link #fullCoords}) of the centred row that the gaps fix: entry k moves with gap j
     * by [k >= j+2] - (M-2-j)/(M-1).
     */
    private void gapSlopes() {
        double total = 0;
        for (int k = 1; k < m; k++) {
            total += fullCoords[k];
        }
        double above = total - fullCoords[1];
        for (int j = 0; j < free; j++) {
            slopes[j] = above - (m - 2.0 - j) / (m - 1) * total;
            above -= fullCoords[j + 2];
        }
    }

    private double evaluate(double[] theta, double[] gradient) {
        java.util.Arrays.fill(odds, 1.0);
        java.util.Arrays.fill(attraction, 0.0);
        if (!unpack(theta)) {
            return Double.NEGATIVE_INFINITY;
        }
        boolean grad = gradient != null;
        if (grad) {
            java.util.Arrays.fill(gradAlpha, 0);
            java.util.Arrays.fill(gradBeta, 0);
            java.util.Arrays.fill(gradRows, 0);
            java.util.Arrays.fill(gradGamma, 0);
            java.util.Arrays.fill(gradDelta, 0);
            java.util.Arrays.fill(gradAttraction, 0);
        }
        double logLik = likelihood(grad);
        if (sampled > 1) {
            logLik *= sampled;
            if (grad) {
                for (double[] part : new double[][] {gradAlpha, gradBeta, gradRows, gradGamma, gradDelta, gradAttraction}) {
                    for (int j = 0; j < part.length; j++) {
                        part[j] *= sampled;
                    }
                }
            }
        }
        if (grad) {
            java.util.Arrays.fill(gradient, 0);
        }
        double logPrior = prior(theta, gradient);
        if (grad) {
            scatter(gradient);
        }
        return logLik + logPrior;
    }

    /** Sum over respondents of log P(r_i) (MODEL.md 4c) and, if asked, its gradient in model coordinates. */
    private double likelihood(boolean grad) {
        ChainState s = state;
        boolean gridPass = onGrid && grad && sampled == 1;
        if (gridPass && (answers != null || attractedCells())) {
            return forcePass();
        }
        if (sampled == 1 && styleCount == 0 && attracted.length == 0 && channel != null) {
            return cellPass(grad);
        }
        if (!onGrid && sampled == 1 && attractedCells()) {
            return attractedCellPass(grad);
        }
        byte[] category = s.category;
        int[] group = s.group;
        double[][] x = s.level.columns;
        double[][] w = s.style == null ? null : s.style.columns;
        int gridGroup = -1;
        boolean gridBuilt = false;
        double total = 0;
        lastZeta = Double.NaN;
        product = 1;
        productExponent = 0;
        for (int i = 0; i < s.size; i += sampled) {
            int g = group[i];
            if (gridPass && g != gridGroup) {
                flushGrids(gridGroup, gridBuilt, false);
                gridBuilt = buildGrid(g);
                gridGroup = g;
            }
            total += respondent(i, g, category[i], grad, gridPass && gridBuilt);
        }
        flushGrids(gridGroup, gridBuilt, false);
        total += Math.log(product) + productExponent * LN2;
        if (grad && respondentGradEta != null) {
            columnSums(x, levelCount, respondentGradEta, 0, s.size, sampled, gradBeta);
        }
        if (grad && respondentGradZeta != null) {
            columnSums(w, styleCount, respondentGradZeta, 0, s.size, sampled, gradDelta);
        }
        return total;
    }

    /**
     * The force's pass, (group, answer) cell by cell: a cell, or with style covariates a run of
     * one style row in it, with enough respondents reads {@link #answers} (its coefficients'
     * gradient summed as it goes); under
     * attraction a group whose {@link #grid} could not be built takes {@link #attractedCell}, the
     * exact gradient's path; any other respondent takes {@link #respondent}'s path; the
     * coefficients' gradients are summed over each cell after it. Not the log density: the sum of the respondent paths' values (0 on the probability
     * paths, which skip the logarithm here).
     */
    private double forcePass() {
        double[][] x = state.level.columns;
        int[] start = state.start;
        double total = 0;
        lastZeta = Double.NaN;
        product = 1;
        productExponent = 0;
        tableReads = 0;
        for (int g = 0; g < groups; g++) {
            boolean answersBuilt = answers != null && buildAnswers(g);
            boolean gridBuilt = grid != null && (!answersBuilt || !allOn(g)) && buildGrid(g);
            double floor = !gridBuilt && attractedCells() ? prepareAttractedGroup(g) : 0;
            for (int r = 0; r < m; r++) {
                int from = start[g * m + r];
                int to = start[g * m + r + 1];
                if (from == to) {
                    continue;
                }
                if (!answersBuilt) {
                    total += forceCell(g, r, from, to, floor, gridBuilt);
                } else if (styleRow == null) {
                    if (answers[0].on(r)) {
                        gradAlpha[g] += answers[0].read(r, x, beta, levelCount, alpha[g], from, to, gradBeta);
                        tableReads += to - from;
                    } else {
                        total += forceCell(g, r, from, to, floor, gridBuilt);
                    }
                } else {
                    // runs of one style row (SurveyOrder keeps them together under attraction)
                    for (int i = from; i < to;) {
                        int q = styleRow[i];
                        int end = i + 1;
                        while (end < to && styleRow[end] == q) {
                            end++;
                        }
                        if (plainBuilt && rowUsable[q] && plainAnswers.on(r)) {
                            gradAlpha[g] += plainAnswers.read(r, x, beta, levelCount, alpha[g], i, end, gradBeta);
                            rowPlainCount[q] += end - i;
                            tableReads += end - i;
                        } else if (rowBuilt[q] && answers[q].on(r)) {
                            gradAlpha[g] += answers[q].read(r, x, beta, levelCount, alpha[g], i, end, gradBeta);
                            tableReads += end - i;
                        } else {
                            total += forceCell(g, r, i, end, floor, gridBuilt);
                        }
                        i = end;
                    }
                }
            }
            flushGrids(g, gridBuilt, answersBuilt);
        }
        return total;
    }

    /** The force's respondents from..to-1 of (group g, answer r) that no answer table takes (see {@link #forcePass}). */
    private double forceCell(int g, int r, int from, int to, double floor, boolean gridBuilt) {
        double total = 0;
        if (floor > 0) {
            // no grid for this group: the exact gradient's own path, so the force is that gradient bit for bit
            total += attractedCell(g, r, from, to, floor, true);
        } else if (gridBuilt && gridCells() && (channel == null || !channel.isPoint(r))) {
            gridCell(g, r, from, to);
        } else {
            for (int i = from; i < to; i++) {
                total += respondent(i, g, r, true, gridBuilt);
            }
        }
        if (respondentGradEta != null) {
            columnSums(state.level.columns, levelCount, respondentGradEta, from, to, 1, gradBeta);
        }
        if (respondentGradZeta != null) {
            columnSums(state.style.columns, styleCount, respondentGradZeta, from, to, 1, gradDelta);
        }
        return total;
    }

    /**
     * The exact pass under attraction with one to four level covariates, (group, answer) cell by
     * cell through {@link #attractedCell}, the coefficients' gradients summed over each cell after it.
     */
    private double attractedCellPass(boolean grad) {
        double[][] x = state.level.columns;
        double[][] w = state.style == null ? null : state.style.columns;
        int[] start = state.start;
        double total = 0;
        lastZeta = Double.NaN;
        product = 1;
        productExponent = 0;
        for (int g = 0; g < groups; g++) {
            int row = g * m;
            double floor = prepareAttractedGroup(g);
            for (int r = 0; r < m; r++) {
                int from = start[row + r];
                int to = start[row + r + 1];
                if (from == to) {
                    continue;
                }
                total += attractedCell(g, r, from, to, floor, grad);
                if (grad) {
                    columnSums(x, levelCount, respondentGradEta, from, to, 1, gradBeta);
                    if (respondentGradZeta != null) {
                        columnSums(w, styleCount, respondentGradZeta, from, to, 1, gradDelta);
                    }
                }
            }
        }
        return total + Math.log(product) + productExponent * LN2;
    }

    /** Whether the exact pass goes through {@link #attractedCell}: attraction on, one to four level covariates. */
    private boolean attractedCells() {
        return attracted.length > 0 && levelCount >= 1 && levelCount <= 4;
    }

    /**
     * Fills {@link #change} for group g; returns the floor below which {@link #attractedCell}
     * leaves a respondent's N_i to the tail-exact path (positive).
     */
    private double prepareAttractedGroup(int g) {
        int row = g * m;
        double spread = odds[row + m - 1];
        for (int k = 1; k < m; k++) {
            change[k] = odds[row + k - 1] - odds[row + k];
            spread += Math.abs(change[k]);
        }
        return NORMALISER_FLOOR * spread;
    }

    /**
     * Under attraction, the respondents from..to-1 of group g who gave answer r, on probabilities
     * as {@link #answer} takes them, but with each threshold's cdf read once: N_i of MODEL.md 4b as
     * sum_k exp(a[g,k]) pi[g,k] = exp(a[g,M-1]) + sum_k Phi(c[g,k] - eta_i) (exp(a[g,k-1]) - exp(a[g,k]))
     * (summation by parts), and the gradient's parts that every respondent of the cell shares
     * (per threshold, per attracted number) summed over the cell and added to the group's once. A
     * respondent off the probability path, or whose N_i is below {@code floor} (where the
     * differences of cdfs lose relative precision), takes {@link #respondent}'s.
     */
    private double attractedCell(int g, int r, int from, int to, double floor, boolean grad) {
        double[][] x = state.level.columns;
        double[][] w = state.style == null ? null : state.style.columns;
        int p = levelCount;
        double[] x0 = x[0];
        double[] x1 = p > 1 ? x[1] : x0;
        double[] x2 = p > 2 ? x[2] : x0;
        double[] x3 = p > 3 ? x[3] : x0;
        double b0 = beta[0];
        double b1 = p > 1 ? beta[1] : 0;
        double b2 = p > 2 ? beta[2] : 0;
        double b3 = p > 3 ? beta[3] : 0;
        double intercept = alpha[g];
        int base = g * (m + 1);
        int row = g * m;
        double top = odds[row + m - 1];
        double oddsAnswer = odds[row + r];
        boolean point = channel != null && channel.isPoint(r);
        int[] coarseCategories = coarseFrom[r];
        double[] shares = coarseShare[r];
        if (grad) {
            java.util.Arrays.fill(cellDensity, 0);
            java.util.Arrays.fill(cellCoarse, 0);
            java.util.Arrays.fill(cellShare, 0);
        }
        double total = 0;
        double sumLower = 0;
        double sumUpper = 0;
        double sumWeight = 0;
        double sumEta = 0;
        double sumZeta = 0;
        double[] kept = keptCdf;
        double[] keptN = kept != null ? keptNormaliser : null;
        double[] out = kept != null ? kept : cdf;
        int step = kept != null ? state.size : 1;
        for (int i = from; i < to; i++) {
            // eta as RegressionBlock.linear sums it (a missing covariate adds 0), and each cdf as
            // StandardNormal.cdf takes it, so that the kept cdfs are the ones the threshold update computes
            double eta = intercept + x0[i] * b0 + x1[i] * b1 + x2[i] * b2 + x3[i] * b3;
            int o = kept != null ? i : 0;
            double normaliser = grad ? Double.NaN : tableCdfs(base, eta, top, out, o, step);
            if (Double.isNaN(normaliser)) {
                normaliser = cdfs(base, eta, top, out, o, step, grad);
            }
            if (keptN != null) {
                keptN[i] = normaliser > floor ? normaliser : summedNormaliser(row, out, i);
            }
            double zeta = 0;
            if (channel != null) {
                zeta = gamma[g];
                for (int q = 0; q < styleCount; q++) {
                    zeta += w[q][i] * delta[q];
                }
                if (Math.abs(zeta) > PLAIN_PROBIT) {
                    total += respondent(i, g, r, grad, false);
                    continue;
                }
            }
            double pi = category(r);
            if (!(pi > PLAIN_FLOOR) || !(normaliser > floor)) {
                total += respondent(i, g, r, grad, false);
                continue;
            }
            double full = pi * oddsAnswer / normaliser;
            double q = classProbit(zeta);
            double likelihood = (1 - q) * full;
            double coarse = 0;
            if (point) {
                for (int b = 0; b < coarseCategories.length; b++) {
                    coarse += shares[b] * category(coarseCategories[b]);
                }
                if (!(coarse > PLAIN_FLOOR)) {
                    total += respondent(i, g, r, grad, false);
                    continue;
                }
                likelihood += q * coarse;
            }
            keep(likelihood);
            if (!grad) {
                continue;
            }
            // d log P / d(c[g,k] - eta): the answer's own bounds, N_i through every threshold, the coarse class's bounds
            double weightFull = (1 - q) * full / likelihood;
            double scaled = weightFull / normaliser;
            double gradEta = 0;
            if (r > 0) {
                double v = weightFull * thresholdDensity[r] / pi;
                sumLower += v;
                gradEta += v;
            }
            if (r < m - 1) {
                double v = weightFull * thresholdDensity[r + 1] / pi;
                sumUpper += v;
                gradEta -= v;
            }
            for (int k = 1; k < m; k++) {
                double d = scaled * thresholdDensity[k];
                cellDensity[k] += d;
                gradEta += d * change[k];
            }
            for (int a = 0; a < attracted.length; a++) {
                int k = attracted[a];
                cellShare[a] += scaled * (cdf[k + 1] - cdf[k]);
            }
            sumWeight += weightFull;
            if (point) {
                gradEta = addCoarse(r, q / likelihood, cellCoarse, 0, gradEta);
            }
            sumEta += gradEta;
            respondentGradEta[i] = gradEta;
            if (channel != null) {
                double gradZeta = point ? lastPhi * (coarse - full) / likelihood : -lastPhi / (1 - q);
                sumZeta += gradZeta;
                if (respondentGradZeta != null) {
                    respondentGradZeta[i] = gradZeta;
                }
            }
        }
        if (grad) {
            for (int k = 1; k < m; k++) {
                gradRows[base + k] += cellCoarse[k] - change[k] * cellDensity[k];
            }
            if (r > 0) {
                gradRows[base + r] -= sumLower;
            }
            if (r < m - 1) {
                gradRows[base + r + 1] += sumUpper;
            }
            for (int a = 0; a < attracted.length; a++) {
                int k = attracted[a];
                gradAttraction[row + k] += (k == r ? sumWeight : 0) - odds[row + k] * cellShare[a];
            }
            gradAlpha[g] += sumEta;
            if (channel != null) {
                gradGamma[g] += sumZeta;
            }
        }
        return total;
    }

    /**
     * For {@link #attractedCell}: c[g,k] - eta, its smaller tail and Phi(c[g,k] - eta) for k =
     * 1..M-1 into {@link #offset}, {@link #tail} and out[o + k step] (with the densities into
     * {@link #thresholdDensity} if grad); returns N_i = top + sum_k Phi(c[g,k] - eta) change[k]
     * (summation by parts).
     */
    private double cdfs(int base, double eta, double top, double[] out, int o, int step, boolean grad) {
        double normaliser = top;
        for (int k = 1; k < m; k++) {
            double below = rows[base + k] - eta;
            double smaller = grad ? StandardNormal.smallerTail(below, thresholdDensity, k) : StandardNormal.smallerTail(below);
            normaliser += keepThreshold(k, below, smaller, out, o + k * step);
        }
        return normaliser;
    }

    /**
     * {@link #cdfs} without densities, bit for bit, from the normal table alone
     * ({@link StandardNormal#smallerTailInTable}): a loop without calls. NaN when some threshold
     * lies beyond the table, where the caller takes {@link #cdfs}.
     */
    private double tableCdfs(int base, double eta, double top, double[] out, int o, int step) {
        double normaliser = top;
        boolean inTable = true;
        for (int k = 1; k < m; k++) {
            double below = rows[base + k] - eta;
            inTable &= Math.abs(below) < StandardNormal.TABLE_END;
            normaliser += keepThreshold(k, below, StandardNormal.smallerTailInTable(below), out, o + k * step);
        }
        return inTable ? normaliser : Double.NaN;
    }

    /** N_i from respondent i's kept cdfs, term by term over the attracted numbers of the group whose row is at {@code row}. */
    private double summedNormaliser(int row, double[] kept, int i) {
        int n = state.size;
        double normaliser = 1;
        for (int k : attracted) {
            normaliser += (kept[(k + 1) * n + i] - kept[k * n + i]) * Math.expm1(attraction[row + k]);
        }
        return normaliser;
    }

    /** Keeps threshold k's offset, smaller tail and cdf (at out[index]); returns its term of N_i, Phi change[k]. */
    private double keepThreshold(int k, double below, double smaller, double[] out, int index) {
        offset[k] = below;
        tail[k] = smaller;
        double phi = below > 0 ? 1 - smaller : smaller;
        out[index] = phi;
        return phi * change[k];
    }

    /**
     * The exact pass without style covariates or attraction, (group, answer) cell by cell: a cell
     * whose answer is not a coarse point goes through {@link #fullScaleCell}, any other
     * respondent through {@link #respondent}, the coefficients' gradient summed over its cell after it.
     */
    private double cellPass(boolean grad) {
        double[][] x = state.level.columns;
        int[] start = state.start;
        double total = 0;
        lastZeta = Double.NaN;
        product = 1;
        productExponent = 0;
        for (int g = 0; g < groups; g++) {
            for (int r = 0; r < m; r++) {
                int from = start[g * m + r];
                int to = start[g * m + r + 1];
                if (from == to) {
                    continue;
                }
                if (!channel.isPoint(r) && levelCount >= 1 && levelCount <= 4 && Math.abs(gamma[g]) <= PLAIN_PROBIT) {
                    total += fullScaleCell(g, r, from, to, grad);
                    continue;
                }
                for (int i = from; i < to; i++) {
                    total += respondent(i, g, r, grad, false);
                }
                if (grad && respondentGradEta != null) {
                    columnSums(x, levelCount, respondentGradEta, from, to, 1, gradBeta);
                }
            }
        }
        return total + Math.log(product) + productExponent * LN2;
    }

    /**
     * The respondents from..to-1 of group g who gave answer r, not a coarse point, so full-scale
     * for sure (MODEL.md 4c: P = (1 - q) pi_r with q = Phi(gamma[g]) shared by the cell): the
     * log-likelihood of each on the probability path ({@link #keep}), the cell's log(1 - q) once,
     * and, if asked, the gradient summed in registers (one to four level covariates) and added
     * once per cell. A respondent whose pi_r is below {@link #PLAIN_FLOOR} takes
     * {@link #respondent}'s path.
     */
    private double fullScaleCell(int g, int r, int from, int to, boolean grad) {
        double[][] x = state.level.columns;
        int p = levelCount;
        double[] x0 = x[0];
        double[] x1 = p > 1 ? x[1] : x0;
        double[] x2 = p > 2 ? x[2] : x0;
        double[] x3 = p > 3 ? x[3] : x0;
        double b0 = beta[0];
        double b1 = p > 1 ? beta[1] : 0;
        double b2 = p > 2 ? beta[2] : 0;
        double b3 = p > 3 ? beta[3] : 0;
        double intercept = alpha[g];
        int base = g * (m + 1);
        double lowerRow = rows[base + r];
        double upperRow = rows[base + r + 1];
        double lowerWeight = r > 0 ? 1 : 0;
        double upperWeight = r < m - 1 ? 1 : 0;
        double total = 0;
        int count = 0;
        double sumLower = 0;
        double sumUpper = 0;
        double sumEta = 0;
        double s0 = 0;
        double s1 = 0;
        double s2 = 0;
        double s3 = 0;
        for (int i = from; i < to; i++) {
            double v0 = x0[i];
            double v1 = x1[i];
            double v2 = x2[i];
            double v3 = x3[i];
            double eta = intercept + v0 * b0 + v1 * b1 + v2 * b2 + v3 * b3;
            // the densities come with the tails' table lookups, so this is also the cheaper call without the gradient
            double pi = StandardNormal.intervalProbability(lowerRow - eta, upperRow - eta, density, 0);
            if (!(pi > PLAIN_FLOOR)) {
                total += respondent(i, g, r, grad, false);
                if (grad) {
                    double gradEta = respondentGradEta[i];
                    s0 += gradEta * v0;
                    s1 += gradEta * v1;
                    s2 += gradEta * v2;
                    s3 += gradEta * v3;
                }
                continue;
            }
            keep(pi);
            count++;
            if (grad) {
                double lower = -lowerWeight * density[0] / pi;
                double upper = upperWeight * density[1] / pi;
                sumLower += lower;
                sumUpper += upper;
                double gradEta = -(lower + upper);
                sumEta += gradEta;
                s0 += gradEta * v0;
                s1 += gradEta * v1;
                s2 += gradEta * v2;
                s3 += gradEta * v3;
            }
        }
        double zeta = gamma[g];
        total += count * StandardNormal.logUpperTail(zeta);
        if (grad) {
            gradRows[base + r] += sumLower;
            gradRows[base + r + 1] += sumUpper;
            gradAlpha[g] += sumEta;
            gradBeta[0] += s0;
            if (p > 1) {
                gradBeta[1] += s1;
            }
            if (p > 2) {
                gradBeta[2] += s2;
            }
            if (p > 3) {
                gradBeta[3] += s3;
            }
            classProbit(zeta);
            gradGamma[g] -= count * lastPhi / (1 - lastQ);
        }
        return total;
    }

    /**
     * Respondent i's log-likelihood (MODEL.md 4c) and, if asked, its gradient added in model
     * coordinates: on a probability path where it holds, else in log space; under attraction,
     * with {@code onNormaliserGrid}, the normaliser from {@link #grid} (the force only).
     */
    private double respondent(int i, int g, int r, boolean grad, boolean onNormaliserGrid) {
        ChainState s = state;
        double[][] x = s.level.columns;
        double[][] w = s.style == null ? null : s.style.columns;
        boolean attractionOn = attracted.length > 0;
        int base = g * (m + 1);
        double eta = alpha[g];
        for (int p = 0; p < levelCount; p++) {
            eta += x[p][i] * beta[p];
        }
        double zeta = 0;
        if (channel != null) {
            zeta = gamma[g];
            for (int q = 0; q < styleCount; q++) {
                zeta += w[q][i] * delta[q];
            }
        }
        double fast = onNormaliserGrid ? attractedOnGrid(i, g, r, base, eta, zeta)
                : attractionOn ? attracted(i, g, r, base, eta, zeta, grad) : plain(i, g, r, base, eta, zeta, grad);
        if (!Double.isNaN(fast)) {
            return fast;
        }
        double lower = rows[base + r] - eta;
        double upper = rows[base + r + 1] - eta;
        double logPi = logInterval(lower, upper);
        double logFull = logPi;
        double normaliser = 1;
        if (attractionOn) {
            cdf[0] = 0;
            cdf[m] = 1;
            for (int k = 1; k < m; k++) {
                cdf[k] = StandardNormal.cdf(rows[base + k] - eta);
            }
            for (int k : attracted) {
                normaliser += (cdf[k + 1] - cdf[k]) * (odds[g * m + k] - 1);
            }
            logFull += attraction[g * m + r] - Math.log(normaliser);
        }
        double logQ = 0;
        double logNotQ = 0;
        double logCoarse = Double.NEGATIVE_INFINITY;
        double log;
        boolean point = channel != null && channel.isPoint(r);
        if (channel == null) {
            log = logFull;
        } else {
            logNotQ = StandardNormal.logUpperTail(zeta);
            if (point) {
                logQ = StandardNormal.logCdf(zeta);
                logCoarse = logCoarse(base, r, eta);
                log = logSum(logNotQ + logFull, logQ + logCoarse);
            } else {
                log = logNotQ + logFull;
            }
        }
        if (!grad) {
            return log;
        }
        // d log P / d(threshold - eta) for each threshold of the row, then the chain rule.
        java.util.Arrays.fill(gradT, 0);
        double weightFull = channel == null ? 1 : Math.exp(logNotQ + logFull - log);
        if (r > 0) {
            gradT[r] -= weightFull * Math.exp(logDensity(lower) - logPi);
        }
        if (r < m - 1) {
            gradT[r + 1] += weightFull * Math.exp(logDensity(upper) - logPi);
        }
        if (attractionOn) {
            for (int k = 1; k < m; k++) {
                double change = odds[g * m + k - 1] - odds[g * m + k];
                if (change != 0) {
                    gradT[k] -= weightFull * StandardNormal.density(rows[base + k] - eta) * change / normaliser;
                }
            }
            gradAttraction[g * m + r] += weightFull;
            for (int k : attracted) {
                gradAttraction[g * m + k] -= weightFull * (cdf[k + 1] - cdf[k]) * odds[g * m + k] / normaliser;
            }
        }
        if (point) {
            int[] bound = coarseBound[r];
            double[] weight = coarseWeight[r];
            for (int b = 0; b < bound.length; b++) {
                int k = bound[b];
                gradT[k] += weight[b] * Math.exp(logDensity(rows[base + k] - eta) + logQ - log);
            }
        }
        double gradEta = rowGradient(base);
        double gradZeta = 0;
        if (channel != null) {
            double logPhi = logDensity(zeta);
            gradZeta = point
                    ? Math.exp(logPhi + logCoarse - log) - Math.exp(logPhi + logFull - log)
                    : -Math.exp(logPhi - logNotQ);
        }
        chainRule(i, g, gradEta, gradZeta);
        return log;
    }

    /**
     * Without attraction, respondent i's log-likelihood and gradient computed on probabilities,
     * which costs about half the normal-function calls of the log-space path; NaN, with nothing
     * accumulated, when a probability is too small for that or the class probit is far out.
     */
    private double plain(int i, int g, int r, int base, double eta, double zeta, boolean grad) {
        double lower = rows[base + r] - eta;
        double upper = rows[base + r + 1] - eta;
        // With the gradient, the normal densities come with the probabilities (the same table lookup).
        double full = grad ? StandardNormal.intervalProbability(lower, upper, density, 0)
                : StandardNormal.intervalProbability(lower, upper);
        if (!(full > PLAIN_FLOOR) || Math.abs(zeta) > PLAIN_PROBIT) {
            return Double.NaN;
        }
        boolean point = channel != null && channel.isPoint(r);
        double q = classProbit(zeta);
        double coarse = 0;
        double likelihood = channel == null ? full : (1 - q) * full;
        if (point) {
            coarse = grad ? ResponseLikelihood.coarse(channel, rows, base, r, eta, thresholdDensity)
                    : ResponseLikelihood.coarse(channel, rows, base, r, eta, -1, 0);
            if (!(coarse > PLAIN_FLOOR)) {
                return Double.NaN;
            }
            likelihood += q * coarse;
        }
        if (!grad) {
            return keep(likelihood);
        }
        double weightFull = (channel == null ? 1 : 1 - q) / likelihood;
        double gradEta = 0;
        if (r > 0) {
            double v = -weightFull * density[0];
            gradRows[base + r] += v;
            gradEta -= v;
        }
        if (r < m - 1) {
            double v = weightFull * density[1];
            gradRows[base + r + 1] += v;
            gradEta -= v;
        }
        double gradZeta = 0;
        if (channel != null) {
            double phi = lastPhi;
            gradZeta = point ? phi * (coarse - full) / likelihood : -phi / (1 - q);
        }
        if (point) {
            gradEta = addCoarse(r, q / likelihood, gradRows, base, gradEta);
        }
        chainRule(i, g, gradEta, gradZeta);
        return densityWanted ? keep(likelihood) : 0;
    }

    /**
     * Multiplies a respondent's likelihood on a probability path into the pass's running product,
     * whose logarithm {@link #likelihood} adds once at the end instead of one logarithm per
     * respondent; returns 0. The product is rescaled by a power of 2 (exact) before it could
     * underflow: above 2^-300 times a likelihood above {@link #PLAIN_FLOOR} stays normal.
     */
    private double keep(double likelihood) {
        double p = product * likelihood;
        if (p < 0x1p-300) {
            int e = Math.getExponent(p);
            productExponent += e;
            p = Math.scalb(p, -e);
        }
        product = p;
        return 0;
    }

    /** q = Phi(zeta), and phi(zeta) in {@link #lastPhi}; 0 without the coarse class. */
    private double classProbit(double zeta) {
        if (channel != null && zeta != lastZeta) {
            // Respondents of a group who share their style covariates share zeta, and with
            // categorical ones (or none) SurveyOrder places them together within each cell.
            lastQ = StandardNormal.cdf(zeta, density, 2);
            lastPhi = density[2];
            lastZeta = zeta;
        }
        return channel == null ? 0 : lastQ;
    }

    /**
     * Under attraction, respondent i's log-likelihood (MODEL.md 4b, 4c) and gradient computed on
     * probabilities, as {@link #plain} does: each threshold's smaller normal tail and density from
     * one call, each category's probability a difference of tails on the side where it
     * lies, the coarse probability a sum of categories. NaN, with nothing accumulated, when the
     * answer's probability is too small for that or the class probit is far out.
     */
    private double attracted(int i, int g, int r, int base, double eta, double zeta, boolean grad) {
        if (channel != null && Math.abs(zeta) > PLAIN_PROBIT) {
            return Double.NaN;
        }
        fillTails(base, eta);
        double likelihood = answer(g, r, zeta, grad);
        if (Double.isNaN(likelihood)) {
            return Double.NaN;
        }
        if (!grad) {
            return keep(likelihood);
        }
        for (int p = 0; p < attracted.length; p++) {
            gradAttraction[g * m + attracted[p]] += answerAttraction[p];
        }
        double gradEta = rowGradient(base);
        chainRule(i, g, gradEta, answerGradZeta);
        return densityWanted ? keep(likelihood) : 0;
    }

    /** Each threshold's offset c[g,k] - eta, smaller normal tail and density, for {@link #answer}. */
    private void fillTails(int base, double eta) {
        for (int k = 1; k < m; k++) {
            offset[k] = rows[base + k] - eta;
            tail[k] = StandardNormal.smallerTail(offset[k], thresholdDensity, k);
        }
    }

    /**
     * Answer r's likelihood in group g at the latent level whose tails {@link #fillTails} left,
     * with class probit zeta; NaN when the answer's probability is too small for the probability
     * path. With the gradient: d log P / d(c[g,k] - eta) in {@link #gradT}, d log P / d a[g,k] by
     * position in the attraction set in {@link #answerAttraction}, d log P / d zeta in
     * {@link #answerGradZeta}.
     */
    private double answer(int g, int r, double zeta, boolean grad) {
        double q = classProbit(zeta);
        return answer(g, r, q, lastPhi, normaliser(g), grad);
    }

    /**
     * {@link #probability} of each attracted number and the normaliser N of MODEL.md 4b in group g at
     * the latent level whose tails {@link #fillTails} left; shared by every answer at that level.
     */
    private double normaliser(int g) {
        int row = g * m;
        double normaliser = 1;
        for (int k : attracted) {
            probability[k] = category(k);
            normaliser += probability[k] * (odds[row + k] - 1);
        }
        return normaliser;
    }

    /**
     * {@link #answer(int, int, double, boolean)} with the class probability q = Phi(zeta), its
     * density phi and the {@link #normaliser} given.
     */
    private double answer(int g, int r, double q, double phi, double normaliser, boolean grad) {
        double pi = category(r);
        if (!(pi > PLAIN_FLOOR)) {
            return Double.NaN;
        }
        int row = g * m;
        double full = pi * odds[row + r] / normaliser;
        boolean point = channel != null && channel.isPoint(r);
        double coarse = 0;
        double likelihood = (1 - q) * full;
        if (point) {
            int[] from = coarseFrom[r];
            double[] share = coarseShare[r];
            for (int b = 0; b < from.length; b++) {
                coarse += share[b] * category(from[b]);
            }
            if (!(coarse > PLAIN_FLOOR)) {
                return Double.NaN;
            }
            likelihood += q * coarse;
        }
        if (!grad) {
            return likelihood;
        }
        double weightFull = (1 - q) * full / likelihood;
        java.util.Arrays.fill(gradT, 0);
        if (r > 0) {
            gradT[r] -= weightFull * thresholdDensity[r] / pi;
        }
        if (r < m - 1) {
            gradT[r + 1] += weightFull * thresholdDensity[r + 1] / pi;
        }
        for (int k = 1; k < m; k++) {
            double change = odds[row + k - 1] - odds[row + k];
            if (change != 0) {
                gradT[k] -= weightFull * thresholdDensity[k] * change / normaliser;
            }
        }
        for (int p = 0; p < attracted.length; p++) {
            int k = attracted[p];
            answerAttraction[p] = (k == r ? weightFull : 0) - weightFull * probability[k] * odds[row + k] / normaliser;
        }
        if (point) {
            addCoarse(r, q / likelihood, gradT, 0, 0);
        }
        answerGradZeta = 0;
        if (channel != null) {
            answerGradZeta = point ? phi * (coarse - full) / likelihood : -phi / (1 - q);
        }
        return likelihood;
    }

    /** Adds what the grids of group g (if any) gathered over its respondents to the gradient. */
    private void flushGrids(int g, boolean gridBuilt, boolean answersBuilt) {
        if (g < 0) {
            return;
        }
        if (gridBuilt) {
            grid.flush(gradRows, g * (m + 1), gradAttraction, g * m);
        }
        if (!answersBuilt) {
            return;
        }
        if (styleRow == null) {
            answers[0].flush(attracted, gradRows, g * (m + 1), gradAttraction, g * m, channel == null ? null : gradGamma, g);
            return;
        }
        if (plainBuilt) {
            plainAnswers.flush(attracted, gradRows, g * (m + 1), gradAttraction, g * m, null, g);
        }
        // d zeta / d delta_p is the row's covariate p
        for (int q = 0; q < answers.length; q++) {
            rowGradZeta[q] = 0;
            if (rowPlainCount[q] > 0) {
                // d log P / d zeta = -phi / (1 - Phi) for every answer that is not a coarse point
                rowGradZeta[q] = rowPlainCount[q] * (-rowPhi[q] / (1 - rowQ[q]));
                rowPlainCount[q] = 0;
            }
            if (rowBuilt[q]) {
                answers[q].flush(attracted, gradRows, g * (m + 1), gradAttraction, g * m, rowGradZeta, q);
            }
            if (rowGradZeta[q] == 0) {
                continue;
            }
            gradGamma[g] += rowGradZeta[q];
            for (int p = 0; p < styleCount; p++) {
                gradDelta[p] += rowGradZeta[q] * styleRows[q][p];
            }
        }
    }

    /** The smallest then the largest eta that group g's respondents can have at the current alpha and beta, in {@link #range}. */
    private void etaRange(int g) {
        double low = alpha[g];
        double high = alpha[g];
        for (int p = 0; p < levelCount; p++) {
            double a = beta[p] * levelLow[g * levelCount + p];
            double b = beta[p] * levelHigh[g * levelCount + p];
            low += Math.min(a, b);
            high += Math.max(a, b);
        }
        range[0] = low;
        range[1] = high;
    }

    /**
     * Tabulates group g's normaliser over every eta its respondents can have at the current alpha
     * and beta; false when that range is too wide for the grid (the group is then computed exactly).
     */
    private boolean buildGrid(int g) {
        etaRange(g);
        // a node's width of margin: eta summed in another order may differ in its last bits
        return grid.build(rows, g * (m + 1), odds, g * m, range[0] - NormaliserGrid.SPACING, range[1] + NormaliserGrid.SPACING);
    }

    /**
     * Tabulates group g's gradient per answer ({@link AnswerGrid}), per row of style covariates,
     * for the answers with at least {@link AnswerGrid#RESPONDENTS_PER_NODE} respondents of the row
     * per node and a likelihood on the probability path at every node; false when none qualifies
     * or the range is too wide. A fixed function of the position either way.
     */
    private boolean buildAnswers(int g) {
        etaRange(g);
        int rowCount = answers.length;
        boolean shared = plainAnswers != null;
        boolean any = false;
        int nodes = 0;
        for (int q = 0; q < rowCount; q++) {
            AnswerGrid table = answers[q];
            rowBuilt[q] = false;
            rowZeta[q] = rowZeta(g, q);
            rowUsable[q] = Math.abs(rowZeta[q]) <= PLAIN_PROBIT && table.place(range[0], range[1]);
            if (!rowUsable[q]) {
                continue;
            }
            rowQ[q] = classProbit(rowZeta[q]);
            rowPhi[q] = lastPhi;
            nodes = table.nodes();
            for (int r = 0; r < m; r++) {
                boolean large = (!shared || channel.isPoint(r))
                        && rowCellCount[(g * rowCount + q) * m + r] >= AnswerGrid.RESPONDENTS_PER_NODE * nodes;
                table.set(r, large);
                rowBuilt[q] |= large;
            }
            any |= rowBuilt[q];
        }
        plainBuilt = false;
        if (shared && nodes > 0) {
            // every table has the same nodes: place() depends on the range alone
            plainAnswers.place(range[0], range[1]);
            for (int r = 0; r < m; r++) {
                int count = 0;
                for (int q = 0; q < rowCount && !channel.isPoint(r); q++) {
                    count += rowUsable[q] ? rowCellCount[(g * rowCount + q) * m + r] : 0;
                }
                boolean large = count >= AnswerGrid.RESPONDENTS_PER_NODE * nodes;
                plainAnswers.set(r, large);
                plainBuilt |= large;
            }
            any |= plainBuilt;
        }
        if (!any) {
            plainBuilt = false;
            return false;
        }
        int base = g * (m + 1);
        AnswerGrid placed = plainAnswers;
        for (int q = rowCount - 1; q >= 0 && !plainBuilt; q--) {
            placed = rowBuilt[q] ? answers[q] : placed;
        }
        nodes = placed.nodes();
        for (int j = 0; j < nodes; j++) {
            fillTails(base, placed.node(j));
            double normaliser = normaliser(g);
            if (plainBuilt) {
                tabulatePlain(g, j, normaliser);
            }
            for (int q = 0; q < rowCount; q++) {
                if (rowBuilt[q]) {
                    tabulate(answers[q], g, j, rowQ[q], rowPhi[q], normaliser);
                }
            }
        }
        if (plainBuilt) {
            finish(plainAnswers);
        }
        for (int q = 0; q < rowCount; q++) {
            if (rowBuilt[q]) {
                finish(answers[q]);
            }
        }
        return true;
    }

    /** Stores, at node j of the table, the gradient of each answer it reads; an answer whose likelihood is off the probability path is switched off. */
    private void tabulate(AnswerGrid table, int g, int j, double q, double phi, double normaliser) {
        for (int r = 0; r < m; r++) {
            if (!table.on(r)) {
                continue;
            }
            if (Double.isNaN(answer(g, r, q, phi, normaliser, true))) {
                table.set(r, false);
                continue;
            }
            double gradEta = 0;
            for (int k = 1; k < m; k++) {
                gradEta -= gradT[k];
            }
            table.store(r, j, gradEta, gradT, answerAttraction, attracted.length, answerGradZeta);
        }
    }

    /**
     * {@link #plainAnswers} at node j: the full-scale part is the whole likelihood of these
     * answers, so d log P / d(c_t - eta) is the answer's own two thresholds' terms plus the
     * normaliser's, -phi(c_t - eta) (exp(a_{t-1}) - exp(a_t)) / N, the same for every answer, and
     * d log P / d a_k is 1 for the answer itself less P_k exp(a_k) / N (as {@link #answer} with
     * q = 0); an answer whose probability is off the probability path is switched off.
     */
    private void tabulatePlain(int g, int j, double normaliser) {
        int row = g * m;
        double sum = 0;
        for (int t = 1; t < m; t++) {
            double change = odds[row + t - 1] - odds[row + t];
            gradT[t] = change == 0 ? 0 : -thresholdDensity[t] * change / normaliser;
            sum += gradT[t];
        }
        for (int p = 0; p < attracted.length; p++) {
            int k = attracted[p];
            answerAttraction[p] = -probability[k] * odds[row + k] / normaliser;
        }
        plainAnswers.storeShared(j, gradT, answerAttraction, attracted.length);
        for (int r = 0; r < m; r++) {
            if (!plainAnswers.on(r)) {
                continue;
            }
            double pi = category(r);
            if (!(pi > PLAIN_FLOOR)) {
                plainAnswers.set(r, false);
                continue;
            }
            double lower = r > 0 ? -thresholdDensity[r] / pi : 0;
            double upper = r < m - 1 ? thresholdDensity[r + 1] / pi : 0;
            plainAnswers.storeLean(r, j, -(sum + lower + upper), lower, upper);
        }
    }

    private void finish(AnswerGrid table) {
        for (int r = 0; r < m; r++) {
            if (table.on(r)) {
                table.finish(r);
            }
        }
    }

    /** The class probit of style row q in group g: gamma[g] plus the row's covariates times delta (0 without classes). */
    private double rowZeta(int g, int q) {
        if (channel == null) {
            return 0;
        }
        double zeta = gamma[g];
        for (int p = 0; p < styleCount; p++) {
            zeta += styleRows[q][p] * delta[p];
        }
        return zeta;
    }

    /** Whether every (style row, answer) of group g with respondents is read from {@link #answers} or {@link #plainAnswers}. */
    private boolean allOn(int g) {
        int rowCount = answers.length;
        for (int q = 0; q < rowCount; q++) {
            for (int r = 0; r < m; r++) {
                boolean read = rowBuilt[q] && answers[q].on(r) || plainBuilt && rowUsable[q] && plainAnswers.on(r);
                if (rowCellCount[(g * rowCount + q) * m + r] > 0 && !read) {
                    return false;
                }
            }
        }
        return true;
    }

    /**
     * {@link #attracted} with the gradient only, the normaliser and its gradient from the grid:
     * respondent i reads the tails of its own answer (and of its coarse point's range) alone.
     * NaN, with nothing accumulated, where {@link #attracted} would give NaN for the answer.
     */
    private double attractedOnGrid(int i, int g, int r, int base, double eta, double zeta) {
        if (channel != null && Math.abs(zeta) > PLAIN_PROBIT) {
            return Double.NaN;
        }
        double pi = StandardNormal.intervalProbability(rows[base + r] - eta, rows[base + r + 1] - eta, density, 0);
        if (!(pi > PLAIN_FLOOR)) {
            return Double.NaN;
        }
        boolean point = channel != null && channel.isPoint(r);
        double coarse = 0;
        if (point) {
            coarse = ResponseLikelihood.coarse(channel, rows, base, r, eta, thresholdDensity);
            if (!(coarse > PLAIN_FLOOR)) {
                return Double.NaN;
            }
        }
        int row = g * m;
        grid.locate(eta);
        double full = pi * odds[row + r] / grid.normaliser();
        double q = classProbit(zeta);
        double likelihood = (1 - q) * full + q * coarse;
        double weightFull = (1 - q) * full / likelihood;
        // log P = log(pi_r) + a_r - log N for the full-scale part; N's share through the grid
        double gradEta = -weightFull * grid.logSlope();
        grid.add(weightFull);
        gradAttraction[row + r] += weightFull;
        if (r > 0) {
            double v = -weightFull * density[0] / pi;
            gradRows[base + r] += v;
            gradEta -= v;
        }
        if (r < m - 1) {
            double v = weightFull * density[1] / pi;
            gradRows[base + r + 1] += v;
            gradEta -= v;
        }
        double gradZeta = 0;
        if (channel != null) {
            gradZeta = point ? lastPhi * (coarse - full) / likelihood : -lastPhi / (1 - q);
        }
        if (point) {
            gradEta = addCoarse(r, q / likelihood, gradRows, base, gradEta);
        }
        chainRule(i, g, gradEta, gradZeta);
        return 0;
    }

    /** Whether {@link #gridCell} can take a cell: one to four level covariates, at most four style covariates. */
    private boolean gridCells() {
        return levelCount >= 1 && levelCount <= 4 && styleCount <= 4;
    }

    /**
     * {@link #attractedOnGrid} for the respondents from..to-1 of group g whose answer r is not a
     * coarse point, in one loop: the full-scale part is then the whole likelihood (its weight is
     * 1), so N_i itself is never read, only the slope of log N from the grid; the answer's tails
     * and densities come from the normal table without calls, and the cell's shares of the
     * thresholds' and attraction's gradients are summed in registers. A respondent beyond the table,
     * with a class probit far out or an answer too improbable for the probability path takes
     * {@link #respondent}.
     */
    private void gridCell(int g, int r, int from, int to) {
        double[][] x = state.level.columns;
        int p = levelCount;
        double[] x0 = x[0];
        double[] x1 = p > 1 ? x[1] : x0;
        double[] x2 = p > 2 ? x[2] : x0;
        double[] x3 = p > 3 ? x[3] : x0;
        double b0 = beta[0];
        double b1 = p > 1 ? beta[1] : 0;
        double b2 = p > 2 ? beta[2] : 0;
        double b3 = p > 3 ? beta[3] : 0;
        boolean classes = channel != null;
        int sc = classes ? styleCount : 0;
        double[][] w = sc > 0 ? state.style.columns : null;
        double[] w0 = sc > 0 ? w[0] : x0;
        double[] w1 = sc > 1 ? w[1] : w0;
        double[] w2 = sc > 2 ? w[2] : w0;
        double[] w3 = sc > 3 ? w[3] : w0;
        double d0 = sc > 0 ? delta[0] : 0;
        double d1 = sc > 1 ? delta[1] : 0;
        double d2 = sc > 2 ? delta[2] : 0;
        double d3 = sc > 3 ? delta[3] : 0;
        double intercept = alpha[g];
        double zetaIntercept = classes ? gamma[g] : 0;
        int base = g * (m + 1);
        double lowerCut = rows[base + r];
        double upperCut = rows[base + r + 1];
        boolean hasLower = r > 0;
        boolean hasUpper = r < m - 1;
        double sumLower = 0;
        double sumUpper = 0;
        double sumEta = 0;
        double sumZeta = 0;
        double answered = 0;
        for (int i = from; i < to; i++) {
            double eta = intercept + x0[i] * b0 + x1[i] * b1 + x2[i] * b2 + x3[i] * b3;
            double zeta = zetaIntercept + w0[i] * d0 + w1[i] * d1 + w2[i] * d2 + w3[i] * d3;
            double lower = lowerCut - eta;
            double upper = upperCut - eta;
            double lowerTail = hasLower ? StandardNormal.smallerTailInTable(lower) : 0;
            double upperTail = hasUpper ? StandardNormal.smallerTailInTable(upper) : 0;
            double pi = StandardNormal.intervalFromTails(lower, upper, lowerTail, upperTail);
            if (!(pi > PLAIN_FLOOR) || Math.abs(zeta) > PLAIN_PROBIT
                    || hasLower && !(Math.abs(lower) < StandardNormal.TABLE_END)
                    || hasUpper && !(Math.abs(upper) < StandardNormal.TABLE_END)) {
                respondent(i, g, r, true, true);
                continue;
            }
            grid.locate(eta);
            grid.add(1);
            double gradEta = -grid.logSlope();
            double inverse = 1 / pi;
            if (hasLower) {
                double v = -StandardNormal.densityInTable(lower) * inverse;
                sumLower += v;
                gradEta -= v;
            }
            if (hasUpper) {
                double v = StandardNormal.densityInTable(upper) * inverse;
                sumUpper += v;
                gradEta -= v;
            }
            answered += 1;
            sumEta += gradEta;
            if (respondentGradEta != null) {
                respondentGradEta[i] = gradEta;
            }
            if (classes) {
                double q = classProbit(zeta);
                double gradZeta = -lastPhi / (1 - q);
                sumZeta += gradZeta;
                if (respondentGradZeta != null) {
                    respondentGradZeta[i] = gradZeta;
                }
            }
        }
        gradRows[base + r] += sumLower;
        gradRows[base + r + 1] += sumUpper;
        gradAttraction[g * m + r] += answered;
        gradAlpha[g] += sumEta;
        if (classes) {
            gradGamma[g] += sumZeta;
        }
    }

    /**
     * Adds the coarse class's part of d log P / d(c[g,k] - eta) for coarse point r,
     * R-weight x weightCoarse x phi(c[g,k] - eta) from {@link #thresholdDensity}, to
     * {@code target[offset + k]}; returns {@code gradEta} less each part added.
     */
    private double addCoarse(int r, double weightCoarse, double[] target, int offset, double gradEta) {
        int[] bound = coarseBound[r];
        double[] weight = coarseWeight[r];
        for (int b = 0; b < bound.length; b++) {
            int k = bound[b];
            double v = weight[b] * weightCoarse * thresholdDensity[k];
            target[offset + k] += v;
            gradEta -= v;
        }
        return gradEta;
    }

    /** Adds gradT[1..M-1], d log P / d(c[g,k] - eta), to the row at {@code base}; returns d log P / d eta. */
    private double rowGradient(int base) {
        double gradEta = 0;
        for (int k = 1; k < m; k++) {
            gradRows[base + k] += gradT[k];
            gradEta -= gradT[k];
        }
        return gradEta;
    }

    /** Category k's probability from the tails {@link #attracted} filled: between thresholds k and k + 1. */
    private double category(int k) {
        return StandardNormal.intervalFromTails(offset[k], offset[k + 1], tail[k], tail[k + 1]);
    }

    /**
     * Adds respondent i's d log P / d eta and d log P / d zeta to its group's gradients and keeps
     * them for the coefficients', which {@link #columnSums} adds up after the pass.
     */
    private void chainRule(int i, int g, double gradEta, double gradZeta) {
        gradAlpha[g] += gradEta;
        if (respondentGradEta != null) {
            respondentGradEta[i] = gradEta;
        }
        if (channel != null) {
            gradGamma[g] += gradZeta;
            if (respondentGradZeta != null) {
                respondentGradZeta[i] = gradZeta;
            }
        }
    }

    /**
     * Adds to sums[p] the sum over respondents i = from, from + every, ... below to of
     * columns[p][i] * weight[i] (the pass's sums start at 0, so they are those sums), each added in
     * respondent order, four columns per pass so that four independent sums advance
     * together, the remaining columns one at a time (the same additions, in the same order, as
     * one running sum per column).
     */
    private static void columnSums(double[][] columns, int count, double[] weight, int from, int to, int every, double[] sums) {
        int p = 0;
        for (; p + 4 <= count; p += 4) {
            double[] x0 = columns[p];
            double[] x1 = columns[p + 1];
            double[] x2 = columns[p + 2];
            double[] x3 = columns[p + 3];
            double s0 = 0;
            double s1 = 0;
            double s2 = 0;
            double s3 = 0;
            for (int i = from; i < to; i += every) {
                double v = weight[i];
                s0 += x0[i] * v;
                s1 += x1[i] * v;
                s2 += x2[i] * v;
                s3 += x3[i] * v;
            }
            sums[p] += s0;
            sums[p + 1] += s1;
            sums[p + 2] += s2;
            sums[p + 3] += s3;
        }
        for (; p < count; p++) {
            double[] x0 = columns[p];
            double s0 = 0;
            for (int i = from; i < to; i += every) {
                s0 += x0[i] * weight[i];
            }
            sums[p] += s0;
        }
    }

    /** log P(r | coarse, eta) from the row at {@code base} (MODEL.md 4a). */
    private double logCoarse(int base, int r, double eta) {
        double p = ResponseLikelihood.coarse(channel, rows, base, r, eta, -1, 0);
        return p > TINY ? Math.log(p) : ResponseLikelihood.logCoarse(channel, rows, base, r, eta, -1, 0);
    }

    private static double logInterval(double lower, double upper) {
        double p = StandardNormal.intervalProbability(lower, upper);
        return p > TINY ? Math.log(p) : StandardNormal.logIntervalProbability(lower, upper);
    }

    private static double logDensity(double x) {
        return -0.5 * x * x - LOG_SQRT_2PI;
    }

    private static double logSum(double a, double b) {
        return ResponseLikelihood.logSum(a, b);
    }

    /** The log prior (MODEL.md 3 and 5) and, if {@code gradient} is not null, its gradient added there. */
    private double prior(double[] theta, double[] gradient) {
        ChainState s = state;
        double lp = pooledNormals(theta, alphaAt, groups, priors.groupMean(), s.level.sd, gradient);
        lp += normals(theta, betaAt, levelCount, priors.level(), gradient);
        double thresholdPrecision = priors.threshold().precision();
        double deviationPrecision = byGroup ? 1.0 / (s.thresholdSd * s.thresholdSd) : 0;
        for (int k = 1; k < m; k++) {
            lp -= 0.5 * thresholdPrecision * common[k] * common[k];
        }
        for (int j = 0; j < free; j++) {
            lp += theta[commonAt + j]; // the Jacobian of the gaps' logs
        }
        if (byGroup) {
            int stride = m + 1;
            for (int g = 0; g < groups; g++) {
                for (int k = 1; k < m; k++) {
                    double d = rows[g * stride + k] - common[k];
                    lp -= 0.5 * deviationPrecision * d * d;
                }
                // the Jacobian of the group's gaps in its coordinates, up to a constant: sum_j log(gap / common gap)
                for (int j = 0; j < free && gapRows; j++) {
                    lp += Math.log((rows[g * stride + j + 2] - rows[g * stride + j + 1]) / (common[j + 2] - common[j + 1]));
                }
            }
        }
        if (channel != null) {
            lp += pooledNormals(theta, gammaAt, groups, priors.styleMean(), s.style.sd, gradient);
            lp += normals(theta, deltaAt, styleCount, priors.style(), gradient);
        }
        int na = attracted.length;
        if (na > 0) {
            if (pooled) {
                // Non-centred: t[g,j] = tau_a z[g,j] with z standard normal, and log tau_a with
                // its Half-Normal prior and the Jacobian tau_a.
                lp += normals(theta, attractionMeanAt, na, priors.attractionMean(), gradient);
                for (int g = 0; g < groups; g++) {
                    for (int j = 0; j < na; j++) {
                        double z = theta[attractionAt + g * na + j];
                        lp -= 0.5 * z * z;
                        if (gradient != null) {
                            gradient[attractionAt + g * na + j] -= z;
                        }
                    }
                }
                double logSd = theta[attractionSdAt];
                double sd = Math.exp(logSd);
                lp += priors.attractionSd().logDensity(sd) + logSd;
                if (gradient != null) {
                    double scale = priors.attractionSd().sd();
                    gradient[attractionSdAt] += 1 - sd * sd / (scale * scale);
                }
            } else {
                lp += normals(theta, attractionAt, na, priors.attractionMean(), gradient);
            }
        }
        return lp;
    }

    /** Independent normal priors on theta[from..from+n-1]. */
    private static double normals(double[] theta, int from, int n, Normal prior, double[] gradient) {
        double lp = 0;
        for (int j = 0; j < n; j++) {
            double x = theta[from + j];
            lp += prior.logDensity(x);
            if (gradient != null) {
                gradient[from + j] -= (x - prior.mean()) * prior.precision();
            }
        }
        return lp;
    }

    /**
     * Group intercepts at {@code from} pooled around their mean (stored after them) with spread
     * {@code sd}, the mean with its prior; with one group the intercept is the mean.
     */
    private double pooledNormals(double[] theta, int from, int n, Normal meanPrior, double sd, double[] gradient) {
        if (!pooled) {
            return normals(theta, from, 1, meanPrior, gradient);
        }
        double mean = theta[from + n];
        double lp = normals(theta, from + n, 1, meanPrior, gradient);
        double precision = 1.0 / (sd * sd);
        for (int g = 0; g < n; g++) {
            double d = theta[from + g] - mean;
            lp -= 0.5 * precision * d * d;
            if (gradient != null) {
                gradient[from + g] -= precision * d;
                gradient[from + n] += precision * d;
            }
        }
        return lp;
    }

    /** Adds the likelihood's gradient, held in model coordinates, to the vector's coordinates. */
    private void scatter(double[] gradient) {
        ChainState s = state;
        int stride = m + 1;
        for (int g = 0; g < groups; g++) {
            gradient[alphaAt + (pooled ? g : 0)] += gradAlpha[g];
        }
        for (int p = 0; p < levelCount; p++) {
            gradient[betaAt + p] += gradBeta[p];
        }
        // The gradient in the entries 1..M-1 of the common row, then in its gap logs; with the
        // deviations as coordinates every group row follows the common row, and each group's
        // gradient goes to its d[g,1..M-2], d[g,M-1] = -their sum. With the gap coordinates
        // (gapRows) the common row's entries take the prior terms alone, and each group row's
        // gradient goes to its gaps, then to u (gap = G exp(v), v = tau_d u / G, G the common
        // row's gap: d gap / d u = gap tau_d / G, d gap / d log G = gap (1 - v); the Jacobian
        // sum v adds tau_d / G and -v).
        double thresholdPrecision = priors.threshold().precision();
        double deviationPrecision = byGroup ? 1.0 / (s.thresholdSd * s.thresholdSd) : 0;
        for (int k = 1; k < m; k++) {
            double sum = -thresholdPrecision * common[k];
            for (int g = 0; g < groups; g++) {
                sum += gapRows ? deviationPrecision * (rows[g * stride + k] - common[k]) : gradRows[g * stride + k];
            }
            fullCoords[k] = sum;
        }
        gapGradient(common, 0, gradient, commonAt);
        if (byGroup) {
            double tau = s.thresholdSd;
            for (int g = 0; g < groups; g++) {
                int base = g * stride;
                for (int k = 1; k < m; k++) {
                    fullCoords[k] = gradRows[base + k] - deviationPrecision * (rows[base + k] - common[k]);
                }
                if (!gapRows) {
                    for (int j = 0; j < free; j++) {
                        gradient[deviationAt + g * free + j] += fullCoords[j + 1] - fullCoords[m - 1];
                    }
                    continue;
                }
                gapSlopes();
                for (int j = 0; j < free; j++) {
                    double shared = common[j + 2] - common[j + 1];
                    double gap = rows[base + j + 2] - rows[base + j + 1];
                    double v = Math.log(gap / shared);
                    gradient[deviationAt + g * free + j] += slopes[j] * gap * tau / shared + tau / shared;
                    gradient[commonAt + j] += slopes[j] * gap * (1 - v) - v;
                }
            }
        }
        if (channel != null) {
            for (int g = 0; g < groups; g++) {
                gradient[gammaAt + (pooled ? g : 0)] += gradGamma[g];
            }
            for (int q = 0; q < styleCount; q++) {
                gradient[deltaAt + q] += gradDelta[q];
            }
        }
        int na = attracted.length;
        for (int j = 0; j < na; j++) {
            int k = attracted[j];
            for (int g = 0; g < groups; g++) {
                double d = gradAttraction[g * m + k];
                if (pooled) {
                    // a = abar + tau z: d/dz = tau d/da, d/dabar = d/da, d/dlog tau = (a - abar) d/da
                    gradient[attractionAt + g * na + j] += spread * d;
                    gradient[attractionMeanAt + j] += d;
                    gradient[attractionSdAt] += (attraction[g * m + k] - means[j]) * d;
                } else {
                    gradient[attractionAt + j] += d;
                }
            }
        }
    }
}
