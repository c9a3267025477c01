package org.rungs.validation.calibration;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.models.ThresholdMode;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.priors.StandardNormal;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * One replication of simulation-based calibration (Talts et al. 2018, algorithm 1): draw the
 * parameters from the prior, simulate a survey from them, fit it, and rank every true value (and
 * the derived intended means and, with the coarse class, coarse shares) among L thinned posterior
 * draws. Everything random comes from the stream of (base seed, index).
 */
public final class Replication {
    /** Prefix of the derived intended mean of each group. */
    public static final String INTENDED_MEAN = "intended_mean.";
    /** Prefix of the derived coarse share of each group. */
    public static final String COARSE_SHARE = "coarse_share.";

    private Replication() {
    }

    /**
     * @param stop set it to abandon the fit
     * @return the ranks, or null when the fit was stopped before all its iterations
     */
    public static ReplicationResult run(CalibrationConfig config, int index, AtomicBoolean stop) {
        UniformRandomProvider rng = ReplicationSeeds.stream(config.seed(), index);
        SimulatedData data = SimulatedData.draw(config, rng);
        long fitSeed = rng.nextLong() >>> 1;
        FitResult fit = Fitter.fit(data.survey(), config.fit(),
                new SamplerSettings(config.chains(), config.warmup(), config.draws(), fitSeed, 1),
                ProgressListener.NONE, stop);
        if (fit.interrupted()) {
            return null;
        }
        Draws draws = fit.draws();
        List<ParameterRank> ranks = new ArrayList<>();
        Map<String, Double> truth = data.truth().named(config.covariateNames(), config.groupLabels(),
                config.scale().lowest());
        if (data.style() != null) {
            data.style().name(config.styleCovariateNames(), config.groupLabels(), truth);
        }
        if (data.attraction() != null) {
            data.attraction().name(config.groupLabels(), truth);
        }
        List<ParameterSummary> summaries = Summaries.of(draws);
        for (Map.Entry<String, Double> e : truth.entrySet()) {
            int column = draws.indexOf(e.getKey());
            if (column >= 0) {
                ranks.add(rank(e.getKey(), e.getValue(), draws.chainsOf(column), summaries.get(column), config, rng));
            }
        }
        addIntendedMeans(config, data, draws, ranks, rng);
        if (data.style() != null && config.fit().styleClasses().coarse()) {
            addCoarseShares(config, data, draws, ranks, rng);
        }
        String[] moves = fit.spreadMoves();
        return new ReplicationResult(index, ranks, moves.length > 0 && moves[0] != null ? List.of(moves) : null);
    }

    private static ParameterRank rank(String name, double truth, double[][] chains, ParameterSummary summary,
            CalibrationConfig config, UniformRandomProvider rng) {
        int r = RankStatistic.of(truth, chains, config.rankDraws(), rng);
        return new ParameterRank(name, truth, r, config.rankDraws(), summary.rhat(), summary.essBulk(),
                summary.essTail(), summary.flagged());
    }

    /** The intended mean of each group, computed per draw from the fitted parameters and at the truth. */
    private static void addIntendedMeans(CalibrationConfig config, SimulatedData data, Draws draws,
            List<ParameterRank> ranks, UniformRandomProvider rng) {
        int groups = config.groups();
        int p = config.covariates();
        int m1 = config.scale().categories() - 1;
        int lowest = config.scale().lowest();
        List<String> labels = config.groupLabels();
        boolean byGroup = config.fit().effectiveThresholdMode(groups) == ThresholdMode.BY_GROUP;
        int[] betaColumn = new int[p];
        for (int j = 0; j < p; j++) {
            betaColumn[j] = draws.indexOf("level." + config.covariateNames().get(j));
        }
        int[] alphaColumn = new int[groups];
        int[][] thresholdColumn = new int[groups][m1];
        for (int g = 0; g < groups; g++) {
            alphaColumn[g] = draws.indexOf(groups > 1 ? "group." + labels.get(g) : "group_mean");
            for (int k = 0; k < m1; k++) {
                String rating = Integer.toString(lowest + 1 + k);
                thresholdColumn[g][k] = draws.indexOf(byGroup ? "threshold." + labels.get(g) + "." + rating
                        : "threshold." + rating);
            }
        }
        int chains = draws.chains();
        int iterations = draws.iterations();
        double[][][] means = new double[groups][chains][iterations];
        double[] beta = new double[p];
        double[] alpha = new double[groups];
        double[][] thresholds = new double[groups][m1];
        double[] out = new double[groups];
        int[] group = data.survey().group();
        for (int c = 0; c < chains; c++) {
            for (int t = 0; t < iterations; t++) {
                for (int j = 0; j < p; j++) {
                    beta[j] = draws.get(betaColumn[j], c, t);
                }
                for (int g = 0; g < groups; g++) {
                    alpha[g] = draws.get(alphaColumn[g], c, t);
                    for (int k = 0; k < m1; k++) {
                        thresholds[g][k] = draws.get(thresholdColumn[g][k], c, t);
                    }
                }
                IntendedMeans.of(beta, alpha, thresholds, data.standardised(), group, lowest, out);
                for (int g = 0; g < groups; g++) {
                    means[g][c][t] = out[g];
                }
            }
        }
        TrueParameters truth = data.truth();
        double[] trueMeans = new double[groups];
        IntendedMeans.of(truth.beta(), truth.alpha(), truth.groupThresholds(), data.standardised(), group, lowest,
                trueMeans);
        for (int g = 0; g < groups; g++) {
            String name = INTENDED_MEAN + labels.get(g);
            ranks.add(rank(name, trueMeans[g], means[g], Summaries.of(name, means[g]), config, rng));
        }
    }

    /**
     * The coarse share of each group (MODEL.md 6, unweighted): the mean of
     * q_i = Phi(gamma[g] + w_i' delta) over the group's respondents, per draw and at the truth.
     */
    private static void addCoarseShares(CalibrationConfig config, SimulatedData data, Draws draws,
            List<ParameterRank> ranks, UniformRandomProvider rng) {
        int groups = config.groups();
        List<String> labels = config.groupLabels();
        List<String> names = config.styleCovariateNames();
        double[][] w = data.styleStandardised();
        int[] deltaColumn = new int[w.length];
        for (int j = 0; j < w.length; j++) {
            deltaColumn[j] = draws.indexOf("style." + names.get(j));
        }
        int[] gammaColumn = new int[groups];
        for (int g = 0; g < groups; g++) {
            gammaColumn[g] = draws.indexOf(groups > 1 ? "style_group." + labels.get(g) : "style_mean");
        }
        int[] group = data.survey().group();
        int[] sizes = data.survey().groupSizes();
        int chains = draws.chains();
        int iterations = draws.iterations();
        double[][][] shares = new double[groups][chains][iterations];
        double[] delta = new double[w.length];
        double[] gamma = new double[groups];
        double[] out = new double[groups];
        for (int c = 0; c < chains; c++) {
            for (int t = 0; t < iterations; t++) {
                for (int j = 0; j < w.length; j++) {
                    delta[j] = draws.get(deltaColumn[j], c, t);
                }
                for (int g = 0; g < groups; g++) {
                    gamma[g] = draws.get(gammaColumn[g], c, t);
                }
                coarseShares(gamma, delta, w, group, sizes, out);
                for (int g = 0; g < groups; g++) {
                    shares[g][c][t] = out[g];
                }
            }
        }
        StyleParameters truth = data.style();
        double[] trueShares = new double[groups];
        coarseShares(truth.gamma(), truth.delta(), w, group, sizes, trueShares);
        for (int g = 0; g < groups; g++) {
            String name = COARSE_SHARE + labels.get(g);
            ranks.add(rank(name, trueShares[g], shares[g], Summaries.of(name, shares[g]), config, rng));
        }
    }

    private static void coarseShares(double[] gamma, double[] delta, double[][] w, int[] group, int[] sizes,
            double[] out) {
        Arrays.fill(out, 0);
        for (int i = 0; i < group.length; i++) {
            out[group[i]] += StandardNormal.cdf(StyleParameters.linear(gamma, delta, w, group[i], i));
        }
        for (int g = 0; g < out.length; g++) {
            out[g] /= sizes[g];
        }
    }
}
