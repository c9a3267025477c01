package org.rungs.examples;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.IntStream;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ContinuousSampler;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.apache.commons.rng.simple.RandomSource;
import org.rungs.priors.StandardNormal;

/**
 * Draws a survey from the model of MODEL.md sections 2-4, written apart from the fitting code so
 * that it can serve as ground truth: {@code y*_i = alpha[g_i] + x_i' beta + e_i},
 * {@code e_i ~ Normal(0, 1)}, and the intended rating is k when {@code c[g,k-1] < y*_i <= c[g,k]}.
 * With style classes a respondent is coarse with probability {@code q_i = Phi(gamma[g_i] + w_i' delta)}
 * and reports the coarse point nearest to the intended rating, a tie split by a fair coin (4a); a
 * full-scale responder under number attraction reports j with probability proportional to
 * {@code pi[g,j](eta_i) exp(a[g,j])} (4b), else the intended rating.
 *
 * <p>The true values are reported under the names the engine gives its draws, on its internal
 * scale, where each numeric covariate is centred and divided by its sample standard deviation
 * and a categorical one becomes 0/1 indicators against a reference level (MODEL.md section 1).
 * Hence {@code level.<x> = beta_x * sd(x)} and, because centring moves the origin of x to its
 * mean, {@code alpha_internal[g] = alpha[g] + sum_p beta_p * mean(x_p)} (likewise
 * {@code group_mean}); thresholds are unchanged. The style intercepts move the same way, and
 * also by the effect of each categorical covariate's reference level, since indicators are
 * measured from it. The derived truths of section 6 ({@code intended_mean.<label>} and the like)
 * are unweighted means over the group's generated respondents at the true parameters.
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

    /** A survey whose respondents (covariates, latent errors, classes, reports) come from {@code seed}. */
    public static SimulatedSurvey simulate(Scenario scenario, long seed) {
        int groupCount = scenario.groupCount();
        UniformRandomProvider parameterRng = RandomSource.XO_RO_SHI_RO_128_PP.create(scenario.seed() ^ PARAMETER_STREAM);
        double[] alpha = intercepts(scenario.groupLevels(), groupCount, parameterRng);
        double[][] deviations = thresholdDeviations(scenario, parameterRng);
        Scenario.StyleClasses.Coarse style = scenario.styleClasses() instanceof Scenario.StyleClasses.Coarse coarse ? coarse : null;
        double[] gamma = style == null ? new double[groupCount] : intercepts(style.intercepts(), groupCount, parameterRng);
        int[] attractionSet = scenario.attractionSet();
        double[][] attraction = attraction(scenario, attractionSet, parameterRng);
        double[] common = scenario.thresholds();
        double[][] groupThresholds = new double[groupCount][common.length];
        for (int g = 0; g < groupCount; g++) {
            for (int k = 0; k < common.length; k++) {
                groupThresholds[g][k] = common[k] + deviations[g][k];
            }
        }
        int lowest = scenario.scale().lowest();
        int categories = scenario.scale().categories();
        int[][] channel = roundingChannel(lowest, categories, scenario.coarsePoints());
        double[][] attractionOdds = new double[groupCount][categories];
        for (int g = 0; g < groupCount; g++) {
            for (int k = 0; k < categories; k++) {
                attractionOdds[g][k] = Math.exp(attraction[g][k]);
            }
        }

        List<Scenario.LevelCovariate> covariates = scenario.levelCovariates();
        List<Scenario.StyleCovariate> styleCovariates = style == null ? List.of() : style.covariates();
        int n = scenario.respondents();
        int p = covariates.size();
        int styleCount = styleCovariates.size();
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
        // Style columns: a numeric one shares a level column of its name or has its own sampler;
        // a categorical one is drawn by inversion of its cumulative shares.
        int[] sharedLevel = new int[styleCount];
        ContinuousSampler[] styleDraw = new ContinuousSampler[styleCount];
        double[] styleEffect = new double[styleCount];
        double[] styleUnit = new double[styleCount];
        double[][] cumulativeShares = new double[styleCount][];
        double[][] categoryEffects = new double[styleCount][];
        double[][] w = new double[styleCount][];
        int[][] codes = new int[styleCount][];
        List<String> levelNames = covariates.stream().map(Scenario.LevelCovariate::name).toList();
        double[][] x = new double[p][n];
        for (int s = 0; s < styleCount; s++) {
            Scenario.StyleCovariate covariate = styleCovariates.get(s);
            sharedLevel[s] = levelNames.indexOf(covariate.name());
            if (covariate instanceof Scenario.StyleCovariate.Numeric numeric) {
                styleEffect[s] = numeric.perUnitEffect();
                styleUnit[s] = Math.pow(10, numeric.decimals());
                w[s] = sharedLevel[s] >= 0 ? x[sharedLevel[s]] : new double[n];
                styleDraw[s] = sharedLevel[s] >= 0 ? null : numeric.distribution().sampler(rng);
            } else {
                List<Scenario.StyleCovariate.Category> levels = ((Scenario.StyleCovariate.Categorical) covariate).categories();
                cumulativeShares[s] = new double[levels.size()];
                categoryEffects[s] = new double[levels.size()];
                double sum = 0;
                for (int level = 0; level < levels.size(); level++) {
                    sum += levels.get(level).share();
                    cumulativeShares[s][level] = sum;
                    categoryEffects[s][level] = levels.get(level).effect();
                }
                codes[s] = new int[n];
            }
        }

        int[] group = new int[n];
        int[] rating = new int[n];
        boolean[] coarse = new boolean[n];
        double[] coarseProbability = new double[n];
        double[] pi = new double[categories];
        double[] harmonised = new double[categories];
        // Per group sums of q_i, the intended and harmonised expected ratings, and the reports (MODEL.md 6).
        double[] coarseShareSum = new double[groupCount];
        double[] intendedSum = new double[groupCount];
        double[] harmonisedSum = new double[groupCount];
        double[] reportedSum = new double[groupCount];
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
                double styleIndex = gamma[g];
                for (int s = 0; s < styleCount; s++) {
                    if (codes[s] != null) {
                        int level = pick(cumulativeShares[s], rng.nextDouble());
                        codes[s][row] = level;
                        styleIndex += categoryEffects[s][level];
                    } else {
                        if (styleDraw[s] != null) {
                            w[s][row] = Math.round(styleDraw[s].sample() * styleUnit[s]) / styleUnit[s];
                        }
                        styleIndex += styleEffect[s] * w[s][row];
                    }
                }
                double latent = eta + error.sample();
                categoryProbabilities(c, eta, pi);
                categoryProbabilities(common, eta, harmonised);
                intendedSum[g] += expectedRating(pi, lowest);
                harmonisedSum[g] += expectedRating(harmonised, lowest);
                if (style != null) {
                    coarseProbability[row] = phi(styleIndex);
                    coarseShareSum[g] += coarseProbability[row];
                    coarse[row] = rng.nextDouble() < coarseProbability[row];
                }
                int position;
                if (coarse[row]) {
                    int[] nearest = channel[category(c, latent)];
                    position = nearest.length == 1 || rng.nextBoolean() ? nearest[0] : nearest[1];
                } else if (attractionSet.length > 0) {
                    position = attracted(pi, attractionOdds[g], rng.nextDouble());
                } else {
                    position = category(c, latent);
                }
                group[row] = g;
                rating[row] = lowest + position;
                reportedSum[g] += rating[row];
            }
        }
        Map<String, Double> truth = new LinkedHashMap<>();
        levelTruth(truth, scenario, alpha, groupThresholds, deviations, x);
        Map<String, String> references = new LinkedHashMap<>();
        if (style != null) {
            styleTruth(truth, scenario, style, gamma, w, codes, references);
        }
        attractionTruth(truth, scenario, attractionSet, attraction);
        List<Scenario.Group> groups = scenario.groups();
        for (int g = 0; g < groupCount; g++) {
            String label = groups.get(g).label();
            double size = groups.get(g).respondents();
            if (style != null) {
                put(truth, "coarse_share." + label, coarseShareSum[g] / size);
            }
            put(truth, "intended_mean." + label, intendedSum[g] / size);
            put(truth, "harmonised_mean." + label, harmonisedSum[g] / size);
            put(truth, "reported_mean." + label, reportedSum[g] / size);
        }
        Map<String, double[]> numericColumns = new LinkedHashMap<>();
        for (int j = 0; j < p; j++) {
            numericColumns.put(levelNames.get(j), x[j]);
        }
        Map<String, int[]> categoricalColumns = new LinkedHashMap<>();
        for (int s = 0; s < styleCount; s++) {
            if (codes[s] != null) {
                categoricalColumns.put(styleCovariates.get(s).name(), codes[s]);
            } else {
                numericColumns.putIfAbsent(styleCovariates.get(s).name(), w[s]);
            }
        }
        return new SimulatedSurvey(scenario, group, rating, numericColumns, categoricalColumns, references,
                coarse, coarseProbability, truth);
    }

    /**
     * Standard normal distribution function: the shared numerical kernel (Cody 1969), not model
     * code; the tests check the simulator against Commons Math's normal distribution instead.
     */
    private static double phi(double z) {
        return StandardNormal.cdf(z);
    }

    /** {@code pi[k](eta) = Phi(c[k] - eta) - Phi(c[k-1] - eta)} (MODEL.md section 3), into {@code pi}. */
    private static void categoryProbabilities(double[] thresholds, double eta, double[] pi) {
        double below = 0;
        for (int k = 0; k < thresholds.length; k++) {
            double upTo = phi(thresholds[k] - eta);
            pi[k] = upTo - below;
            below = upTo;
        }
        pi[thresholds.length] = 1 - below;
    }

    private static double expectedRating(double[] pi, int lowest) {
        double mean = 0;
        for (int k = 0; k < pi.length; k++) {
            mean += (lowest + k) * pi[k];
        }
        return mean;
    }

    /** Position of the category holding {@code latent}: the number of thresholds below it. */
    private static int category(double[] thresholds, double latent) {
        int above = 0;
        while (above < thresholds.length && thresholds[above] < latent) {
            above++;
        }
        return above;
    }

    /** MODEL.md 4b: position j with probability {@code pi[j] odds[j] / sum_k pi[k] odds[k]}, by inversion of {@code u}. */
    private static int attracted(double[] pi, double[] odds, double u) {
        double total = 0;
        for (int k = 0; k < pi.length; k++) {
            total += pi[k] * odds[k];
        }
        double target = u * total;
        double sum = 0;
        for (int k = 0; k < pi.length - 1; k++) {
            sum += pi[k] * odds[k];
            if (target < sum) {
                return k;
            }
        }
        return pi.length - 1;
    }

    /** Index of the first cumulative share above {@code u}. */
    private static int pick(double[] cumulative, double u) {
        for (int k = 0; k < cumulative.length - 1; k++) {
            if (u < cumulative[k]) {
                return k;
            }
        }
        return cumulative.length - 1;
    }

    /**
     * MODEL.md 4a: for each intended position, the positions of the nearest coarse points: one,
     * or two when the intended rating is equally far from both (each then taken with probability 1/2).
     */
    private static int[][] roundingChannel(int lowest, int categories, int[] coarsePoints) {
        int[][] channel = new int[categories][];
        for (int k = 0; k < categories; k++) {
            int intended = lowest + k;
            int best = Integer.MAX_VALUE;
            for (int point : coarsePoints) {
                best = Math.min(best, Math.abs(point - intended));
            }
            final int distance = best;
            channel[k] = IntStream.of(coarsePoints).filter(point -> Math.abs(point - intended) == distance)
                    .map(point -> point - lowest).toArray();
        }
        return channel;
    }

    /** {@code alpha[g]} or {@code gamma[g]}: stated, or {@code mean + sd * u[g]} drawn from {@code rng}. */
    private static double[] intercepts(Scenario.GroupLevels levels, int groupCount, UniformRandomProvider rng) {
        if (levels instanceof Scenario.GroupLevels.Fixed fixed) {
            return fixed.alpha();
        }
        Scenario.GroupLevels.Drawn drawn = (Scenario.GroupLevels.Drawn) levels;
        ContinuousSampler u = ZigguratSampler.NormalizedGaussian.of(rng);
        double[] intercept = new double[groupCount];
        for (int g = 0; g < groupCount; g++) {
            intercept[g] = drawn.mean() + drawn.sd() * u.sample();
        }
        return intercept;
    }

    /** {@code a[g,position]} over the whole scale: {@code abar[j] + t[g,j]} on A, 0 elsewhere (MODEL.md 4b). */
    private static double[][] attraction(Scenario scenario, int[] attractionSet, UniformRandomProvider rng) {
        int groupCount = scenario.groupCount();
        double[][] a = new double[groupCount][scenario.scale().categories()];
        if (!(scenario.attraction() instanceof Scenario.NumberAttraction.Active active)) {
            return a;
        }
        double[] mean = active.meanAttraction();
        double[][] t = new double[groupCount][attractionSet.length];
        if (active.deviations() instanceof Scenario.AttractionDeviations.Fixed fixed) {
            t = fixed.deviations();
        } else if (active.deviations() instanceof Scenario.AttractionDeviations.Drawn drawn) {
            ContinuousSampler normal = ZigguratSampler.NormalizedGaussian.of(rng);
            for (double[] row : t) {
                for (int j = 0; j < row.length; j++) {
                    row[j] = drawn.sd() * normal.sample();
                }
            }
        }
        int lowest = scenario.scale().lowest();
        for (int g = 0; g < groupCount; g++) {
            for (int j = 0; j < attractionSet.length; j++) {
                a[g][attractionSet[j] - lowest] = mean[j] + t[g][j];
            }
        }
        return a;
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

    private static void levelTruth(Map<String, Double> truth, Scenario scenario, double[] alpha,
                                   double[][] groupThresholds, double[][] deviations, double[][] x) {
        List<Scenario.LevelCovariate> covariates = scenario.levelCovariates();
        double shift = 0;
        for (int j = 0; j < covariates.size(); j++) {
            double beta = covariates.get(j).perUnitEffect();
            String name = covariates.get(j).name();
            shift += beta * mean(x[j]);
            put(truth, "level." + name, beta * sampleSd(x[j]));
            put(truth, "level." + name + ".per_unit", beta);
        }
        List<Scenario.Group> groups = scenario.groups();
        if (groups.size() == 1) {
            put(truth, "group_mean", alpha[0] + shift);
        } else if (scenario.groupLevels() instanceof Scenario.GroupLevels.Drawn drawn) {
            put(truth, "group_mean", drawn.mean() + shift);
            put(truth, "group_sd", drawn.sd());
        } else {
            // Stated intercepts have no hyperparameters; their own mean and sd stand in.
            put(truth, "group_mean", mean(alpha) + shift);
            put(truth, "group_sd", sampleSd(alpha));
        }
        if (groups.size() > 1) {
            for (int g = 0; g < groups.size(); g++) {
                put(truth, "group." + groups.get(g).label(), alpha[g] + shift);
            }
        }
        int lowest = scenario.scale().lowest();
        double[] common = scenario.thresholds();
        for (int k = 0; k < common.length; k++) {
            put(truth, "threshold." + (lowest + 1 + k), common[k]);
        }
        Scenario.ThresholdDeviations mode = scenario.thresholdDeviations();
        if (!(mode instanceof Scenario.ThresholdDeviations.Shared)) {
            for (int g = 0; g < groups.size(); g++) {
                for (int k = 0; k < common.length; k++) {
                    put(truth, "threshold." + groups.get(g).label() + "." + (lowest + 1 + k), groupThresholds[g][k]);
                }
            }
            put(truth, "threshold_sd", mode instanceof Scenario.ThresholdDeviations.Drawn drawn
                    ? drawn.sd() : deviationSd(deviations));
        }
    }

    /**
     * {@code style.<w>} (delta on the internal scale), {@code style.<w>.per_unit} for a numeric
     * w, {@code style.<column>=<level>} for an indicator, {@code style_mean}, {@code style_sd} and
     * {@code style.<label>}; records the reference level of each categorical column.
     */
    private static void styleTruth(Map<String, Double> truth, Scenario scenario, Scenario.StyleClasses.Coarse style,
                                   double[] gamma, double[][] w, int[][] codes, Map<String, String> references) {
        List<Scenario.StyleCovariate> covariates = style.covariates();
        double shift = 0;
        for (int s = 0; s < covariates.size(); s++) {
            Scenario.StyleCovariate covariate = covariates.get(s);
            if (covariate instanceof Scenario.StyleCovariate.Numeric numeric) {
                double delta = numeric.perUnitEffect();
                shift += delta * mean(w[s]);
                put(truth, "style." + numeric.name(), delta * sampleSd(w[s]));
                put(truth, "style." + numeric.name() + ".per_unit", delta);
            } else {
                Scenario.StyleCovariate.Categorical categorical = (Scenario.StyleCovariate.Categorical) covariate;
                List<Scenario.StyleCovariate.Category> levels = categorical.categories();
                List<Integer> order = byAppearance(codes[s], levels.size());
                int reference = referenceLevel(categorical, codes[s], order);
                references.put(categorical.name(), levels.get(reference).label());
                double referenceEffect = levels.get(reference).effect();
                // Indicators are not centred: the intercept moves by the reference level's effect only.
                shift += referenceEffect;
                for (int level : order) {
                    if (level != reference) {
                        put(truth, "style." + categorical.name() + "=" + levels.get(level).label(),
                                levels.get(level).effect() - referenceEffect);
                    }
                }
            }
        }
        List<Scenario.Group> groups = scenario.groups();
        if (groups.size() == 1) {
            put(truth, "style_mean", gamma[0] + shift);
            return;
        }
        if (style.intercepts() instanceof Scenario.GroupLevels.Drawn drawn) {
            put(truth, "style_mean", drawn.mean() + shift);
            put(truth, "style_sd", drawn.sd());
        } else {
            // Stated intercepts have no hyperparameters; their own mean and sd stand in.
            put(truth, "style_mean", mean(gamma) + shift);
            put(truth, "style_sd", sampleSd(gamma));
        }
        for (int g = 0; g < groups.size(); g++) {
            put(truth, "style_group." + groups.get(g).label(), gamma[g] + shift);
        }
    }

    /** Levels that occur, in order of first appearance. */
    private static List<Integer> byAppearance(int[] codes, int levelCount) {
        boolean[] seen = new boolean[levelCount];
        List<Integer> order = new ArrayList<>();
        for (int code : codes) {
            if (!seen[code]) {
                seen[code] = true;
                order.add(code);
            }
        }
        return order;
    }

    /** The stated reference, else the most frequent level, ties to the first to appear (as MODEL.md section 1). */
    private static int referenceLevel(Scenario.StyleCovariate.Categorical covariate, int[] codes, List<Integer> order) {
        List<Scenario.StyleCovariate.Category> levels = covariate.categories();
        if (covariate.reference() != null) {
            int stated = levels.stream().map(Scenario.StyleCovariate.Category::label).toList().indexOf(covariate.reference());
            if (!order.contains(stated)) {
                throw new IllegalArgumentException("the reference level " + covariate.reference() + " of "
                        + covariate.name() + " was never drawn; use more respondents or a larger share");
            }
            return stated;
        }
        int[] counts = new int[levels.size()];
        for (int code : codes) {
            counts[code]++;
        }
        int reference = order.get(0);
        for (int level : order) {
            if (counts[level] > counts[reference]) {
                reference = level;
            }
        }
        return reference;
    }

    /** {@code attraction.<j>}, and with several groups {@code attraction_sd} and {@code attraction.<label>.<j>}. */
    private static void attractionTruth(Map<String, Double> truth, Scenario scenario, int[] attractionSet, double[][] a) {
        if (!(scenario.attraction() instanceof Scenario.NumberAttraction.Active active)) {
            return;
        }
        double[] mean = active.meanAttraction();
        for (int j = 0; j < attractionSet.length; j++) {
            put(truth, "attraction." + attractionSet[j], mean[j]);
        }
        List<Scenario.Group> groups = scenario.groups();
        if (groups.size() == 1) {
            return;
        }
        double sd = 0;
        if (active.deviations() instanceof Scenario.AttractionDeviations.Drawn drawn) {
            sd = drawn.sd();
        } else if (active.deviations() instanceof Scenario.AttractionDeviations.Fixed fixed) {
            // Moment estimate: t ~ Normal(0, tau_a) is not centred, so E t^2 = tau_a^2.
            double sum = 0;
            for (double[] row : fixed.deviations()) {
                for (double t : row) {
                    sum += t * t;
                }
            }
            sd = Math.sqrt(sum / (groups.size() * attractionSet.length));
        }
        put(truth, "attraction_sd", sd);
        int lowest = scenario.scale().lowest();
        for (int g = 0; g < groups.size(); g++) {
            for (int j : attractionSet) {
                put(truth, "attraction." + groups.get(g).label() + "." + j, a[g][j - lowest]);
            }
        }
    }

    /** Adds a truth, refusing a name given twice (e.g. a group label equal to a covariate name). */
    private static void put(Map<String, Double> truth, String name, double value) {
        if (truth.put(name, value) != null) {
            throw new IllegalArgumentException("the true value " + name + " is named twice; rename a group or covariate");
        }
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
