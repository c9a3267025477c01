package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;

/**
 * Random-walk Metropolis steps of single thresholds, shared by the two threshold updates; a
 * subclass says how the likelihood changes and what to refresh after an accepted step.
 *
 * <p>The step moves the cut-point gamma[k] = c[k] - level of one block (a group's thresholds in
 * by-group mode; the common thresholds in shared mode) by delta: c[k] gains delta, then every
 * threshold of the block and its level lose delta/(M-1), which keeps the thresholds summing to
 * zero (MODEL.md 3) and leaves every other c[j] - level unchanged. The level is alpha[g] in
 * by-group mode; in shared mode mu_alpha and every alpha[g] move together. The map from
 * (gamma) to (level, thresholds) is linear, so the random-walk proposal stays symmetric and
 * needs no Jacobian. Moving the level with the threshold follows the ridge along which the
 * data pin c[g,k] - alpha[g] far more tightly than either part.
 *
 * <p>In by-group mode a last block moves the common threshold c[k] and every group's c[g,k]
 * together (deviations d unchanged), with mu_alpha and every alpha[g]: without it, c and the
 * c[g] can only follow each other through the prior, which is slow where a category has few
 * answers and the prior holds c[g,k] close to c[k]. The two end thresholds are moved on the log
 * of their gap to the neighbour instead: an end category with few answers leaves that gap
 * uncertain over orders of magnitude, where an additive step crawls. Each step's scale adapts
 * during warm-up only (Roberts & Rosenthal 2009, section 3) towards acceptance 0.44.
 */
abstract class ThresholdMoves implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    final ChainState state;
    final int[] start;
    final UniformRandomProvider rng;
    final ZigguratSampler.NormalizedGaussian normal;
    private final double commonPriorPrecision;
    private final Normal groupMeanPrior;
    final int blocks;
    final int stride;
    final int cuts;
    private final double[] logScale;
    private long accepted;
    private long tried;
    private int warmupStep;

    ThresholdMoves(ChainState state, int[] start, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.start = start;
        this.rng = rng;
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.commonPriorPrecision = priors.threshold().precision();
        this.groupMeanPrior = priors.groupMean();
        this.blocks = state.byGroup ? state.groups + 1 : 1;
        this.stride = state.categories + 1;
        this.cuts = state.categories - 1;
        this.logScale = new double[blocks * cuts];
        int m = state.categories;
        for (int b = 0; b < blocks; b++) {
            for (int k = 1; k <= cuts; k++) {
                long near = 0;
                for (int g = firstGroup(b); g <= lastGroup(b); g++) {
                    near += start[g * m + k + 1] - start[g * m + k - 1];
                }
                logScale[b * cuts + k - 1] = Math.log(2.0 / Math.sqrt(1.0 + near));
            }
        }
    }

    /**
     * The change of the log-likelihood when threshold k of block b moves by delta relative to
     * the levels, as described in the class comment.
     */
    abstract double logLikelihoodChange(int b, int k, double delta);

    /** Called after an accepted step has moved the thresholds and levels. */
    abstract void accepted(int b, int k, double delta);

    /** Passes over every threshold of every block, each step as in the class comment. */
    final void passes(int passes, boolean adapt) {
        for (int pass = 0; pass < passes; pass++) {
            for (int b = 0; b < blocks; b++) {
                for (int k = 1; k <= cuts; k++) {
                    if (moves(k)) {
                        step(b, k, adapt);
                    }
                }
            }
        }
        if (adapt) {
            warmupStep++;
        }
    }

    /** Whether the passes step threshold k. */
    boolean moves(int k) {
        return true;
    }

    /** The common block: the only block in shared mode, the last one in by-group mode. */
    final boolean isCommon(int block) {
        return block == blocks - 1;
    }

    final int firstGroup(int block) {
        return isCommon(block) ? 0 : block;
    }

    final int lastGroup(int block) {
        return isCommon(block) ? state.groups - 1 : block;
    }

    private void step(int b, int k, boolean adapt) {
        ChainState s = state;
        boolean common = isCommon(b);
        double[] rows = common ? s.common : s.thresholds;
        int base = common ? 0 : b * stride;
        int slot = b * cuts + k - 1;
        double step = Math.exp(logScale[slot]) * normal.sample();
        double delta = step;
        double jacobian = 0;
        if (cuts > 1 && (k == 1 || k == cuts)) {
            // an end threshold: a random walk on the log of its gap to the neighbour, which moves by
            // delta; exp(step) is the Jacobian (Green 1995, section 3.3)
            double gap = k == 1 ? rows[base + 2] - rows[base + 1] : rows[base + cuts] - rows[base + cuts - 1];
            delta = k == 1 ? -gap * Math.expm1(step) : gap * Math.expm1(step);
            jacobian = step;
        }
        boolean accept = false;
        if (staysOrdered(b, k, delta)) {
            double logRatio = logLikelihoodChange(b, k, delta) + logPriorChange(rows, base, k, delta, b) + jacobian;
            accept = Math.log(rng.nextDouble()) < logRatio;
        }
        if (accept) {
            double share = delta / cuts;
            move(rows, base, k, delta);
            if (common && s.byGroup) {
                for (int g = 0; g < s.groups; g++) {
                    move(s.thresholds, g * stride, k, delta);
                }
            } else if (common) {
                s.shareCommonThresholds();
            }
            shiftLevel(b, -share);
            accepted(b, k, delta);
        }
        if (adapt) {
            logScale[slot] += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        } else {
            tried++;
            if (accept) {
                accepted++;
            }
        }
    }

    /** c[k] += delta, then every threshold of the row loses delta/(M-1): the sum stays zero. */
    private void move(double[] rows, int base, int k, double delta) {
        double share = delta / cuts;
        for (int j = 1; j <= cuts; j++) {
            rows[base + j] -= share;
        }
        rows[base + k] += delta;
    }

    /** Whether every row the step moves keeps increasing thresholds (MODEL.md 3). */
    private boolean staysOrdered(int b, int k, double delta) {
        ChainState s = state;
        if (isCommon(b)) {
            if (!between(s.common, 0, k, delta)) {
                return false;
            }
            if (!s.byGroup) {
                return true;
            }
        }
        for (int g = firstGroup(b); g <= lastGroup(b); g++) {
            if (!between(s.thresholds, g * stride, k, delta)) {
                return false;
            }
        }
        return true;
    }

    private static boolean between(double[] rows, int base, int k, double delta) {
        double moved = rows[base + k] + delta;
        return moved > rows[base + k - 1] && moved < rows[base + k + 1];
    }

    /**
     * Log prior ratio of the moved thresholds and level (MODEL.md 3 and 5): a group block moves
     * d[g] and alpha[g]; the common block moves c and mu_alpha, leaving every d[g] and
     * alpha[g] - mu_alpha as they were.
     */
    private double logPriorChange(double[] rows, int base, int k, double delta, int b) {
        ChainState s = state;
        double share = delta / cuts;
        double before = 0;
        double after = 0;
        boolean common = isCommon(b);
        for (int j = 1; j <= cuts; j++) {
            double reference = common ? 0 : s.common[j];
            double d = rows[base + j] - reference;
            double e = d - share + (j == k ? delta : 0);
            before += d * d;
            after += e * e;
        }
        double precision = common ? commonPriorPrecision : 1.0 / (s.thresholdSd * s.thresholdSd);
        double thresholdPart = -0.5 * precision * (after - before);
        double level = common ? s.level.mean : s.level.intercept[b];
        double shifted = level - share;
        double levelPart;
        if (!common) {
            double from = (level - s.level.mean) / s.level.sd;
            double to = (shifted - s.level.mean) / s.level.sd;
            levelPart = 0.5 * (from * from - to * to);
        } else {
            levelPart = groupMeanPrior.logDensity(shifted) - groupMeanPrior.logDensity(level);
        }
        return thresholdPart + levelPart;
    }

    /** A group block moves alpha[g]; the common block mu_alpha and every alpha[g] (MODEL.md 2). */
    private void shiftLevel(int b, double amount) {
        ChainState s = state;
        if (!isCommon(b)) {
            s.level.intercept[b] += amount;
            return;
        }
        s.level.shiftIntercepts(amount);
    }

    /** Share of accepted proposals while sampling. */
    double acceptanceRate() {
        return tried == 0 ? Double.NaN : (double) accepted / tried;
    }

    /** The adapted scales and counters; per-respondent caches are rebuilt from the state. */
    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, logScale);
        out.writeInt(warmupStep);
        out.writeLong(accepted);
        out.writeLong(tried);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        warmupStep = in.readInt();
        accepted = in.readLong();
        tried = in.readLong();
    }
}
