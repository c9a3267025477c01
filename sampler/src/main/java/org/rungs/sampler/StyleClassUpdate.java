package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import java.util.Arrays;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.priors.Normal;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;

/**
 * The coarse class of MODEL.md 4, in three steps.
 *
 * <p>First a random-walk Metropolis move of the group's coarse-class intercept gamma[g] with the
 * classes summed out (the likelihood of MODEL.md 4c): the Gibbs cycle of class indicators and
 * probit latents alone moves gamma only as far as the current classes allow, which is little
 * when a heap can be read either as coarse answers or as wide categories; then a joint move of
 * the coefficients delta in the same way. Scales adapt during warm-up only (Roberts & Rosenthal
 * 2009, section 3).
 *
 * <p>Then each respondent's class from its full conditional with the latent level and intended
 * answer summed out: P(coarse | r) = q P(r | coarse) / ((1 - q) P(r | full) + q P(r | coarse)),
 * q = Phi(gamma[g] + w' delta); a rating that is not a coarse point is always full-scale. Last,
 * the class's probit latent from its normal truncated to the class's side of zero (Albert & Chib
 * 1993, section 3), keeping only the sums the conjugate update of gamma and delta needs.
 */
final class StyleClassUpdate implements Update, Checkpointed {
    private static final double TARGET_ACCEPTANCE = 0.44;
    private final ChainState state;
    private final UniformRandomProvider rng;
    private final TruncatedNormalSampler truncatedNormal;
    private final ZigguratSampler.NormalizedGaussian normal;
    private final Normal meanPrior;
    private final Normal coefficientPrior;
    private final double[] logScale;
    private final double[] full;
    private final double[] coarse;
    private final double[] linear;
    private final double[] coefficientStep;
    /** exp(a[g,k]) - 1 by group and position (attraction on). */
    private final double[] excess;
    private double coefficientLogScale;
    private int warmupStep;

    private StyleClassUpdate(ChainState state, Priors priors, UniformRandomProvider rng) {
        this.state = state;
        this.rng = rng;
        this.truncatedNormal = TruncatedNormalSampler.of(rng);
        this.normal = ZigguratSampler.NormalizedGaussian.of(rng);
        this.meanPrior = priors.styleMean();
        this.coefficientPrior = priors.style();
        this.logScale = new double[state.groups];
        int m = state.categories;
        for (int g = 0; g < state.groups; g++) {
            int size = state.start[(g + 1) * m] - state.start[g * m];
            logScale[g] = Math.log(2.0 / Math.sqrt(1.0 + size));
        }
        this.full = new double[state.size];
        this.coarse = new double[state.size];
        this.linear = new double[state.size];
        this.coefficientStep = new double[state.style.count];
        this.excess = new double[state.attractionOn() ? state.groups * m : 0];
        this.coefficientLogScale = Math.log(1.0 / Math.sqrt(1.0 + state.size));
    }

    static StyleClassUpdate of(ChainState state, Priors priors, UniformRandomProvider rng) {
        return new StyleClassUpdate(state, priors, rng);
    }

    @Override
    public void update(boolean adapt) {
        ChainState s = state;
        RegressionBlock style = s.style;
        Arrays.fill(style.latentSum, 0);
        Arrays.fill(style.latentCross, 0);
        int m = s.categories;
        for (int g = 0; g < s.groups; g++) {
            int from = s.start[g * m];
            int to = s.start[(g + 1) * m];
            prepare(g, from, to);
            moveIntercept(g, from, to, adapt);
        }
        if (style.count > 0) {
            moveCoefficients(adapt);
        }
        for (int g = 0; g < s.groups; g++) {
            drawClasses(g, s.start[g * m], s.start[(g + 1) * m]);
        }
        if (adapt) {
            warmupStep++;
        }
    }

    /**
     * Caches each respondent's P(r | full) (with attraction, MODEL.md 4b, from the threshold
     * update's N_i, still current), P(r | coarse) and style linear predictor.
     */
    private void prepare(int g, int from, int to) {
        ChainState s = state;
        int m = s.categories;
        if (s.attractionOn()) {
            for (int k = 0; k < m; k++) {
                excess[g * m + k] = Math.expm1(s.attraction[g * m + k]);
            }
        }
        RoundingChannel channel = s.channel;
        int row = g * (s.categories + 1);
        for (int i = from; i < to; i++) {
            int r = s.category[i];
            int at = i;
            linear[at] = s.style.linear(i, g);
            if (channel.isPoint(r)) {
                double eta = s.eta(i);
                full[at] = ResponseLikelihood.full(s.thresholds, row, r, eta, -1, 0);
                if (s.attractionOn()) {
                    full[at] *= (excess[g * m + r] + 1) / s.normaliser[i];
                }
                coarse[at] = ResponseLikelihood.coarse(channel, s.thresholds, row, r, eta, -1, 0);
            } else {
                full[at] = Double.NaN;
            }
        }
    }

    private void moveIntercept(int g, int from, int to, boolean adapt) {
        ChainState s = state;
        RegressionBlock style = s.style;
        double step = Math.exp(logScale[g]) * normal.sample();
        double change = 0;
        for (int i = from; i < to; i++) {
            int at = i;
            double before = linear[at];
            double after = before + step;
            if (Double.isNaN(full[at])) {
                change += StandardNormal.logUpperTail(after) - StandardNormal.logUpperTail(before);
            } else {
                change += logMixture(at, after) - logMixture(at, before);
            }
        }
        double intercept = style.intercept[g];
        double prior;
        if (s.groups > 1) {
            double a = (intercept - style.mean) / style.sd;
            double b = (intercept + step - style.mean) / style.sd;
            prior = 0.5 * (a * a - b * b);
        } else {
            prior = meanPrior.logDensity(intercept + step) - meanPrior.logDensity(intercept);
        }
        boolean accept = Math.log(rng.nextDouble()) < change + prior;
        if (accept) {
            style.intercept[g] += step;
            if (s.groups == 1) {
                style.mean = style.intercept[g];
            }
            for (int i = from; i < to; i++) {
                linear[i] += step;
            }
        }
        if (adapt) {
            logScale[g] += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /**
     * A random-walk move of all coarse-class coefficients delta together, with the classes summed
     * out as in {@link #moveIntercept}: the class indicators otherwise tie delta to the current
     * classification. Every respondent's likelihood changes; the step scale adapts in warm-up.
     */
    private void moveCoefficients(boolean adapt) {
        ChainState s = state;
        RegressionBlock style = s.style;
        double scale = Math.exp(coefficientLogScale);
        for (int j = 0; j < style.count; j++) {
            coefficientStep[j] = scale * normal.sample();
        }
        double change = 0;
        for (int i = 0; i < s.size; i++) {
            double before = linear[i];
            double after = before;
            for (int j = 0; j < style.count; j++) {
                after += style.columns[j][i] * coefficientStep[j];
            }
            if (Double.isNaN(full[i])) {
                change += StandardNormal.logUpperTail(after) - StandardNormal.logUpperTail(before);
            } else {
                change += logMixture(i, after) - logMixture(i, before);
            }
        }
        double prior = 0;
        for (int j = 0; j < style.count; j++) {
            prior += coefficientPrior.logDensity(style.coefficient[j] + coefficientStep[j])
                    - coefficientPrior.logDensity(style.coefficient[j]);
        }
        boolean accept = Math.log(rng.nextDouble()) < change + prior;
        if (accept) {
            for (int j = 0; j < style.count; j++) {
                style.coefficient[j] += coefficientStep[j];
            }
            for (int i = 0; i < s.size; i++) {
                for (int j = 0; j < style.count; j++) {
                    linear[i] += style.columns[j][i] * coefficientStep[j];
                }
            }
        }
        if (adapt) {
            coefficientLogScale += Math.pow(warmupStep + 1.0, -0.6) * ((accept ? 1 : 0) - TARGET_ACCEPTANCE);
        }
    }

    /** log((1 - q) P(r | full) + q P(r | coarse)) with q = Phi(linear). */
    private double logMixture(int at, double linearPredictor) {
        double q = StandardNormal.cdf(linearPredictor);
        double p = (1 - q) * full[at] + q * coarse[at];
        if (p > 1e-280) {
            return Math.log(p);
        }
        return ResponseLikelihood.logSum(StandardNormal.logUpperTail(linearPredictor) + Math.log(full[at]),
                StandardNormal.logCdf(linearPredictor) + Math.log(coarse[at]));
    }

    private void drawClasses(int g, int from, int to) {
        ChainState s = state;
        RegressionBlock style = s.style;
        for (int i = from; i < to; i++) {
            int at = i;
            double mean = linear[at];
            byte z = 0;
            if (!Double.isNaN(full[at])) {
                double q = StandardNormal.cdf(mean);
                double pf = (1 - q) * full[at];
                double pc = q * coarse[at];
                double share;
                if (pf + pc > 1e-280) {
                    share = pc / (pf + pc);
                } else {
                    double logFull = StandardNormal.logUpperTail(mean) + Math.log(full[at]);
                    double logCoarse = StandardNormal.logCdf(mean) + Math.log(coarse[at]);
                    share = 1 / (1 + Math.exp(logFull - logCoarse));
                }
                z = rng.nextDouble() < share ? (byte) 1 : (byte) 0;
            }
            s.coarse[i] = z;
            double latent = mean + (z == 1
                    ? truncatedNormal.sample(-mean, Double.POSITIVE_INFINITY)
                    : truncatedNormal.sample(Double.NEGATIVE_INFINITY, -mean));
            style.latentSum[g] += latent;
            for (int j = 0; j < style.count; j++) {
                style.latentCross[j] += style.columns[j][i] * latent;
            }
        }
    }

    /** The adapted scales; the per-respondent caches are rebuilt at the start of every update. */
    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, logScale);
        Checkpointed.writeDouble(out, coefficientLogScale);
        out.writeInt(warmupStep);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, logScale);
        coefficientLogScale = Checkpointed.readDouble(in);
        warmupStep = in.readInt();
    }
}
