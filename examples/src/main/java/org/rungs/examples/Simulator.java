package org.rungs.examples;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ContinuousSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;

/**
 * Draws a survey from the hierarchical ordered probit of MODEL.md sections 2-3, written apart
 * from the fitting code so that it can serve as ground truth:
 * {@code y*_i = alpha[g_i] + x_i' beta + e_i}, {@code e_i ~ Normal(0, 1)}, and the rating is k
 * when {@code c[g,k-1] < y*_i <= c[g,k]}.
 *
 * <p>The true values are reported under the names the engine gives its draws, on its internal
 * scale, where each numeric covariate is centred and divided by its sample standard deviation
 * (MODEL.md section 1). Hence {@code level.<x> = beta_x * sd(x)} and, because centring moves
 * the origin of x to its mean, {@code alpha_internal[g] = alpha[g] + sum_p beta_p * mean(x_p)}
 * (likewise {@code group_mean}); thresholds are unchanged.
 */
public final class Simulator {

    /** Mixed into the scenario's seed so that its parameter stream differs from a data stream with the same seed. */
    private static final long PARAMETER_STREAM = 0x9E3779B97F4A7C15L;

    /** Attempts to draw increasing thresholds for one group before giving up. */
    private static final int MAX_THRESHOLD_ATTEMPTS = 10_000;

    private Simulator() {
    }

    /** A survey with the scenario's own seed for the respondents. */
    public static SimulatedSurvey simulate(Scenario scenario) {
        return simulate(scenario, scenario.seed());
    }

    /** A survey whose respondents (covariates, latent errors) come from {@code seed}. */
    public static SimulatedSurvey simulate(Scenario scenario, long seed) {
        UniformRandomProvider parameterRng = RandomSource.XO_RO_SHI_RO_128_PP.create(scenario.seed() ^ PARAMETER_STREAM);
        double[] alpha = groupLevels(scenario, parameterRng);
        double[][] deviations = thresholdDeviations(scenario, parameterRng);
        double[] common = scenario.thresholds();
        int groupCount = scenario.groupCount();
        double[][] groupThresholds = new double[groupCount][common.length];
        for (int g = 0; g < groupCount; g++) {
            for (int k = 0; k < common.length; k++) {
                groupThresholds[g][k] = common[k] + deviations[g][k];
            }
        }

        List<Scenario.LevelCovariate> covariates = scenario.levelCovariates();
        int n = scenario.respondents();
        int p = covariates.size();
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        ContinuousSampler error = ZigguratSampler.NormalizedGaussian.of(rng);
        ContinuousSampler[] draw = new ContinuousSampler[p];
        double[] beta = new double[p];
        double[] unit = new double[p];
        for (int j = 0; j < p; j++) {
            draw[j] = covariates.get(j).distribution().sampler(rng);
            beta[j] = covariates.get(j).perUnitEffect();
            unit[j] = Math.pow(10, covariates.get(j).decimals());
        }
        int[] group = new int[n];
        int[] rating = new int[n];
        double[][] x = new double[p][n];
        int lowest = scenario.scale().lowest();
        int row = 0;
        for (int g = 0; g < groupCount; g++) {
            double[] c = groupThresholds[g];
            for (int i = 0; i < scenario.groups().get(g).respondents(); i++, row++) {
                double eta = alpha[g];
                for (int j = 0; j < p; j++) {
                    double value = Math.round(draw[j].sample() * unit[j]) / unit[j];
                    x[j][row] = value;
                    eta += beta[j] * value;
                }
                double latent = eta + error.sample();
                int above = 0;
                while (above < c.length && c[above] < latent) {
                    above++;
                }
                group[row] = g;
                rating[row] = lowest + above;
            }
        }
        Map<String, Double> truth = truth(scenario, alpha, groupThresholds, deviations, x);
        return new SimulatedSurvey(scenario, group, rating, x, truth);
    }

    /** {@code alpha[g]} on the user's scale. */
    private static double[] groupLevels(Scenario scenario, UniformRandomProvider rng) {
        if (scenario.groupLevels() instanceof Scenario.GroupLevels.Fixed fixed) {
            return fixed.alpha();
        }
        Scenario.GroupLevels.Drawn drawn = (Scenario.GroupLevels.Drawn) scenario.groupLevels();
        ContinuousSampler u = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] alpha = new double[scenario.groupCount()];
        for (int g = 0; g < alpha.length; g++) {
            alpha[g] = drawn.mean() + drawn.sd() * u.sample();
        }
        return alpha;
    }

    /** {@code d[g,k]}, zero in mode shared. */
    private static double[][] thresholdDeviations(Scenario scenario, UniformRandomProvider rng) {
        int groupCount = scenario.groupCount();
        double[] common = scenario.thresholds();
        if (scenario.thresholdDeviations() instanceof Scenario.ThresholdDeviations.Shared) {
            return new double[groupCount][common.length];
        }
        if (scenario.thresholdDeviations() instanceof Scenario.ThresholdDeviations.Fixed fixed) {
            return fixed.deviations();
        }
        double sd = ((Scenario.ThresholdDeviations.Drawn) scenario.thresholdDeviations()).sd();
        ContinuousSampler s = ZigguratSampler.NormalizedGaussian.of(rng);
        double[][] deviations = new double[groupCount][];
        for (int g = 0; g < groupCount; g++) {
            deviations[g] = increasingDeviations(common, sd, s, scenario.groups().get(g).label());
        }
        return deviations;
    }

    /** MODEL.md section 3: the prior restricted to increasing thresholds, drawn by rejection. */
    private static double[] increasingDeviations(double[] common, double sd, ContinuousSampler s, String label) {
        double[] raw = new double[common.length];
        for (int attempt = 0; attempt < MAX_THRESHOLD_ATTEMPTS; attempt++) {
            for (int k = 0; k < raw.length; k++) {
                raw[k] = sd * s.sample();
            }
            double[] d = Scenario.centred(raw);
            boolean increasing = true;
            for (int k = 1; k < d.length && increasing; k++) {
                increasing = common[k] + d[k] > common[k - 1] + d[k - 1];
            }
            if (increasing) {
                return d;
            }
        }
        throw new IllegalArgumentException("deviations with sd " + sd + " rarely keep the thresholds of group " + label
                + " increasing; use a smaller sd or wider common thresholds");
    }

    private static Map<String, Double> truth(Scenario scenario, double[] alpha, double[][] groupThresholds,
                                             double[][] deviations, double[][] x) {
        Map<String, Double> truth = new LinkedHashMap<>();
        List<Scenario.LevelCovariate> covariates = scenario.levelCovariates();
        double shift = 0;
        for (int j = 0; j < covariates.size(); j++) {
            double beta = covariates.get(j).perUnitEffect();
            String name = covariates.get(j).name();
            shift += beta * mean(x[j]);
            truth.put("level." + name, beta * sampleSd(x[j]));
            truth.put("level." + name + ".per_unit", beta);
        }
        List<Scenario.Group> groups = scenario.groups();
        if (groups.size() == 1) {
            truth.put("group_mean", alpha[0] + shift);
        } else if (scenario.groupLevels() instanceof Scenario.GroupLevels.Drawn drawn) {
            truth.put("group_mean", drawn.mean() + shift);
            truth.put("group_sd", drawn.sd());
        } else {
            // Stated intercepts have no hyperparameters; their own mean and sd stand in.
            truth.put("group_mean", mean(alpha) + shift);
            truth.put("group_sd", sampleSd(alpha));
        }
        if (groups.size() > 1) {
            for (int g = 0; g < groups.size(); g++) {
                truth.put("group." + groups.get(g).label(), alpha[g] + shift);
            }
        }
        int lowest = scenario.scale().lowest();
        double[] common = scenario.thresholds();
        for (int k = 0; k < common.length; k++) {
            truth.put("threshold." + (lowest + 1 + k), common[k]);
        }
        Scenario.ThresholdDeviations mode = scenario.thresholdDeviations();
        if (!(mode instanceof Scenario.ThresholdDeviations.Shared)) {
            for (int g = 0; g < groups.size(); g++) {
                for (int k = 0; k < common.length; k++) {
                    truth.put("threshold." + groups.get(g).label() + "." + (lowest + 1 + k), groupThresholds[g][k]);
                }
            }
            truth.put("threshold_sd", mode instanceof Scenario.ThresholdDeviations.Drawn drawn
                    ? drawn.sd() : deviationSd(deviations));
        }
        return truth;
    }

    /**
     * Moment estimate of tau_d from stated deviations: with {@code s ~ Normal(0, tau_d)} on K
     * thresholds, {@code E sum_k d[g,k]^2 = tau_d^2 (K - 1)}.
     */
    private static double deviationSd(double[][] deviations) {
        double sum = 0;
        for (double[] row : deviations) {
            for (double d : row) {
                sum += d * d;
            }
        }
        return Math.sqrt(sum / (deviations.length * (deviations[0].length - 1)));
    }

    private static double mean(double[] values) {
        double sum = 0;
        for (double v : values) {
            sum += v;
        }
        return sum / values.length;
    }

    /** Standard deviation with denominator n-1, as the engine standardises (MODEL.md section 1). */
    private static double sampleSd(double[] values) {
        double mean = mean(values);
        double sum = 0;
        for (double v : values) {
            sum += (v - mean) * (v - mean);
        }
        return Math.sqrt(sum / (values.length - 1));
    }
}
