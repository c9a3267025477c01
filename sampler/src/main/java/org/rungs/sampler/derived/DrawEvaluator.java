package org.rungs.sampler.derived;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.rng.UniformRandomProvider;
import org.rungs.models.ParameterLayout;
import org.rungs.models.RoundingChannel;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.StandardNormal;

/**
 * The derived scalars of MODEL.md section 6 for one posterior draw, with the workspace of one
 * worker: every buffer is allocated here once, so the loop over respondents allocates nothing.
 * Not thread-safe; one instance per worker.
 */
final class DrawEvaluator {
    private final DerivedColumns columns;
    private final int[] group;
    private final double[] weight;
    private final int size;
    private final int groups;
    private final int categories;
    private final int lowest;
    private final boolean byGroup;
    private final boolean coarse;
    private final boolean attraction;
    private final double[][] levelColumns;
    private final double[][] styleColumns;
    private final double[] levelScale;
    private final boolean[] numeric;
    private final boolean anyNumeric;
    /** Indicator columns of each categorical level covariate, for the discrete change against its reference. */
    private final int[][] levelFactors;
    /** Nearest coarse point(s) of each intended position; they differ where it is equally near two. */
    private final int[] roundLow;
    private final int[] roundHigh;
    private final StylePartition partition;
    private final double[] groupWeight;
    private final double totalWeight;
    private final double[] reportedMeans;

    private final DrawParameters parameters;
    private final double[] alpha;
    private final double[] gamma;
    private final double[] beta;
    private final double[] delta;
    /** Group thresholds with sentinels, G rows of M+1 (the layout of the sampler's chain state). */
    private final double[] thresholds;
    private final double[] common;
    private final double[] eta;
    private final double[] styleIndex;
    /** Phi(c[g,t] - eta) for t = 0..M, the latent distribution function at the group's thresholds. */
    private final double[] own;
    /** phi(c[g,t] - eta) beside own[t], from the same call. */
    private final double[] ownDensity;
    private final double[] harmonised;
    private final double[] intendedSum;
    private final double[] harmonisedSum;
    /** exp(a[g,k]) in G rows of M, 1 outside the attraction set (MODEL.md 4b). */
    private final double[] tilt;
    /** One respondent's pi[g,k](eta) exp(a[g,k]) for k = 0..M-1. */
    private final double[] tilted;
    private final double[] attractedSum;
    private final int[] replicated;
    private final double[] coarseSum;
    private final double[] slotSum;
    private final double[] changeSum;
    /** Sum over respondents of w_i dE[k]/deta_i, for the numeric covariates' effects. */
    private double slopeSum;
    private final double[] intendedMeans;
    private final double[] harmonisedMeans;

    DrawEvaluator(Survey survey, ParameterLayout layout, DerivedColumns columns, RoundingChannel channel,
            StylePartition partition, double[] groupWeight, double[] reportedMeans) {
        this.columns = columns;
        this.group = survey.group();
        this.weight = survey.weight();
        this.size = survey.size();
        this.groups = survey.groupCount();
        this.categories = survey.scale().categories();
        this.lowest = survey.scale().lowest();
        this.byGroup = layout.groupThresholdOffset() >= 0;
        this.coarse = channel != null;
        this.attraction = layout.attractionSet().length > 0;
        this.partition = partition;
        this.groupWeight = groupWeight;
        double total = 0;
        for (double w : groupWeight) {
            total += w;
        }
        this.totalWeight = total;
        this.reportedMeans = reportedMeans;

        Covariates level = survey.level();
        int p = layout.levelCount();
        levelColumns = new double[p][];
        levelScale = new double[p];
        numeric = new boolean[p];
        boolean someNumeric = false;
        Map<String, List<Integer>> factors = new LinkedHashMap<>();
        for (int j = 0; j < p; j++) {
            levelColumns[j] = level.column(j);
            levelScale[j] = level.scale(j);
            numeric[j] = !level.isIndicator(j);
            someNumeric |= numeric[j];
            if (!numeric[j]) {
                factors.computeIfAbsent(level.sourceColumn(j), c -> new ArrayList<>()).add(j);
            }
        }
        anyNumeric = someNumeric;
        levelFactors = factors.values().stream().map(l -> l.stream().mapToInt(Integer::intValue).toArray())
                .toArray(int[][]::new);
        int q = layout.styleCount();
        styleColumns = new double[q][];
        for (int j = 0; j < q; j++) {
            styleColumns[j] = survey.style().column(j);
        }
        if (coarse) {
            roundLow = new int[categories];
            roundHigh = new int[categories];
            for (int k = 0; k < categories; k++) {
                roundLow[k] = -1;
                for (int j = 0; j < categories; j++) {
                    if (channel.probability(j, k) > 0) {
                        if (roundLow[k] < 0) {
                            roundLow[k] = j;
                        }
                        roundHigh[k] = j;
                    }
                }
            }
        } else {
            roundLow = null;
            roundHigh = null;
        }

        parameters = new DrawParameters(layout, groups, categories, lowest, coarse);
        alpha = parameters.alpha;
        gamma = parameters.gamma;
        beta = parameters.beta;
        delta = parameters.delta;
        thresholds = parameters.thresholds;
        common = parameters.common;
        tilt = parameters.tilt;
        eta = new double[size];
        styleIndex = new double[size];
        own = new double[categories + 1];
        ownDensity = new double[categories + 1];
        harmonised = new double[categories + 1];
        own[categories] = 1;
        harmonised[categories] = 1;
        intendedSum = new double[groups * categories];
        harmonisedSum = new double[groups * categories];
        tilted = new double[categories];
        attractedSum = new double[groups * categories];
        replicated = new int[groups * categories];
        coarseSum = new double[groups];
        slotSum = new double[partition.levels.size()];
        changeSum = new double[p];
        intendedMeans = new double[groups];
        harmonisedMeans = new double[groups];
    }

    /** Fills {@code row} (in the order of {@link DerivedColumns}) from draw (chain, iteration). */
    void evaluate(Draws draws, int chain, int iteration, UniformRandomProvider rng, double[] row) {
        parameters.read(draws, chain, iteration);
        linearPredictors();
        Arrays.fill(changeSum, 0);
        slopeSum = 0;
        int m = categories;
        if (columns.effectsOnly) {
            for (int i = 0; i < size; i++) {
                int base = group[i] * (m + 1);
                ownDistribution(base, eta[i]);
                addEffects(i, base, weight == null ? 1 : weight[i]);
            }
            writeEffects(row);
            return;
        }
        Arrays.fill(intendedSum, 0);
        Arrays.fill(harmonisedSum, 0);
        Arrays.fill(attractedSum, 0);
        Arrays.fill(replicated, 0);
        Arrays.fill(coarseSum, 0);
        Arrays.fill(slotSum, 0);
        for (int i = 0; i < size; i++) {
            int g = group[i];
            double w = weight == null ? 1 : weight[i];
            double e = eta[i];
            int base = g * (m + 1);
            int cell = g * m;
            ownDistribution(base, e);
            for (int k = 0; k < m; k++) {
                intendedSum[cell + k] += w * (own[k + 1] - own[k]);
            }
            if (byGroup) {
                for (int t = 1; t < m; t++) {
                    harmonised[t] = StandardNormal.cdf(common[t] - e);
                }
                for (int k = 0; k < m; k++) {
                    harmonisedSum[cell + k] += w * (harmonised[k + 1] - harmonised[k]);
                }
            }
            double normaliser = 1;
            if (attraction) {
                // MODEL.md 4b: P(r = k | full, eta) = pi[g,k](eta) exp(a[g,k]) / sum_k pi[g,k](eta) exp(a[g,k]);
                // the sum is at least min(1, exp(min a)), so the plain sum is accurate in absolute terms
                normaliser = 0;
                for (int k = 0; k < m; k++) {
                    tilted[k] = (own[k + 1] - own[k]) * tilt[cell + k];
                    normaliser += tilted[k];
                }
                for (int k = 0; k < m; k++) {
                    attractedSum[cell + k] += w * tilted[k] / normaliser;
                }
            }
            addEffects(i, base, w);
            double q = 0;
            if (coarse) {
                q = StandardNormal.cdf(gamma[g] + styleIndex[i]);
                coarseSum[g] += w * q;
                for (int[] slot : partition.slotOf) {
                    slotSum[slot[i]] += w * q;
                }
            }
            // posterior predictive (MODEL.md 4c): class, then a full-scale answer (attracted, MODEL.md
            // 4b) or an intended answer rounded to the nearest coarse point (MODEL.md 4a)
            boolean coarseResponder = coarse && rng.nextDouble() < q;
            double u = rng.nextDouble();
            int k = 0;
            if (attraction && !coarseResponder) {
                // inverse of the tilted distribution function; the running sum adds the terms in the
                // order the normaliser did, so it reaches the normaliser exactly at the last position
                double target = u * normaliser;
                double cumulative = tilted[0];
                while (k < m - 1 && target >= cumulative) {
                    k++;
                    cumulative += tilted[k];
                }
            } else {
                while (k < m - 1 && u >= own[k + 1]) {
                    k++;
                }
                if (coarseResponder) {
                    k = roundLow[k] != roundHigh[k] && rng.nextDouble() < 0.5 ? roundHigh[k] : roundLow[k];
                }
            }
            replicated[cell + k]++;
        }
        write(row);
    }

    /**
     * own[t] = Phi(c[g,t] - eta) for the group whose thresholds start at {@code base}, with the
     * densities beside them when a numeric covariate needs the slope. MODEL.md 3: pi[g,k](eta) =
     * Phi(c[g,k] - eta) - Phi(c[g,k-1] - eta); differences of Phi are exact to a few eps in
     * absolute terms, which is what a share needs.
     */
    private void ownDistribution(int base, double e) {
        for (int t = 1; t < categories; t++) {
            own[t] = anyNumeric ? StandardNormal.cdf(thresholds[base + t] - e, ownDensity, t)
                    : StandardNormal.cdf(thresholds[base + t] - e);
        }
    }

    /** Respondent i's terms of the average marginal effects, from {@link #ownDistribution}'s values. */
    private void addEffects(int i, int base, double w) {
        int m = categories;
        if (anyNumeric) {
            // dE[k]/deta = sum_k phi(c[g,k] - eta) (MODEL.md 6)
            double slope = 0;
            for (int t = 1; t < m; t++) {
                slope += ownDensity[t];
            }
            slopeSum += w * slope;
        }
        if (levelFactors.length > 0) {
            // E[k | eta_i] at the respondent's own levels, from the Phi values above
            double expectedOwn = lowest + m - 1;
            for (int t = 1; t < m; t++) {
                expectedOwn -= own[t];
            }
            for (int[] factor : levelFactors) {
                // the factor's contrast: each level against the reference, other covariates as observed
                double atReference = eta[i];
                int ownLevel = -1;
                for (int j : factor) {
                    if (levelColumns[j][i] == 1) {
                        atReference -= beta[j];
                        ownLevel = j;
                    }
                }
                double expectedAtReference = ownLevel < 0 ? expectedOwn : expectedRating(base, atReference);
                for (int j : factor) {
                    double expectedAtLevel = j == ownLevel ? expectedOwn : expectedRating(base, atReference + beta[j]);
                    changeSum[j] += w * (expectedAtLevel - expectedAtReference);
                }
            }
        }
    }

    /** E[k | eta] = L + sum_{t=1}^{M-1} P(y* > c[g,t]) for the group whose thresholds start at {@code base}. */
    private double expectedRating(int base, double e) {
        double expected = lowest;
        for (int t = 1; t < categories; t++) {
            expected += StandardNormal.cdf(e - thresholds[base + t]);
        }
        return expected;
    }

    /** eta_i = alpha[g_i] + x_i' beta (MODEL.md 2) and w_i' delta (MODEL.md 4), column by column. */
    private void linearPredictors() {
        for (int i = 0; i < size; i++) {
            eta[i] = alpha[group[i]];
        }
        for (int j = 0; j < beta.length; j++) {
            double b = beta[j];
            double[] x = levelColumns[j];
            for (int i = 0; i < size; i++) {
                eta[i] += b * x[i];
            }
        }
        if (coarse) {
            Arrays.fill(styleIndex, 0);
            for (int j = 0; j < delta.length; j++) {
                double d = delta[j];
                double[] x = styleColumns[j];
                for (int i = 0; i < size; i++) {
                    styleIndex[i] += d * x[i];
                }
            }
        }
    }

    private void write(double[] row) {
        int m = categories;
        double[] harmonisedSource = byGroup ? harmonisedSum : intendedSum;
        for (int g = 0; g < groups; g++) {
            double intendedMean = 0;
            double harmonisedMean = 0;
            for (int k = 0; k < m; k++) {
                double intendedShare = intendedSum[g * m + k] / groupWeight[g];
                double harmonisedShare = harmonisedSource[g * m + k] / groupWeight[g];
                row[columns.intendedShare + g * m + k] = intendedShare;
                row[columns.harmonisedShare + g * m + k] = harmonisedShare;
                row[columns.replicated + g * m + k] = replicated[g * m + k];
                intendedMean += (lowest + k) * intendedShare;
                harmonisedMean += (lowest + k) * harmonisedShare;
            }
            intendedMeans[g] = intendedMean;
            harmonisedMeans[g] = harmonisedMean;
            row[columns.intendedMean + g] = intendedMean;
            row[columns.harmonisedMean + g] = harmonisedMean;
            row[columns.meanBias + g] = reportedMeans[g] - intendedMean;
            if (attraction) {
                double attractedMean = 0;
                for (int k = 0; k < m; k++) {
                    double attractedShare = attractedSum[g * m + k] / groupWeight[g];
                    row[columns.attractedShare + g * m + k] = attractedShare;
                    attractedMean += (lowest + k) * attractedShare;
                }
                // mean_bias = (reported - attracted) + (attracted - intended)
                row[columns.attractedMean + g] = attractedMean;
                row[columns.meanBiasAttraction + g] = attractedMean - intendedMean;
                row[columns.meanBiasRounding + g] = reportedMeans[g] - attractedMean;
            }
            if (coarse) {
                row[columns.coarseShare + g] = coarseSum[g] / groupWeight[g];
            }
        }
        for (int g = 0; g < groups; g++) {
            row[columns.rankIntended + g] = rank(intendedMeans, g);
            row[columns.rankHarmonised + g] = rank(harmonisedMeans, g);
        }
        for (int s = 0; s < slotSum.length; s++) {
            row[columns.coarseShareBy + s] = slotSum[s] / partition.slotWeight[s];
        }
        writeEffects(row);
    }

    private void writeEffects(double[] row) {
        for (int j = 0; j < beta.length; j++) {
            if (numeric[j]) {
                double effect = beta[j] * slopeSum / totalWeight;
                row[columns.ame[j]] = effect;
                row[columns.amePerUnit[j]] = effect / levelScale[j];
            } else {
                row[columns.ame[j]] = changeSum[j] / totalWeight;
            }
        }
    }

    /** 1 for the highest mean; equal means are ranked in group order. */
    static int rank(double[] means, int g) {
        int rank = 1;
        for (int h = 0; h < means.length; h++) {
            if (means[h] > means[g] || (means[h] == means[g] && h < g)) {
                rank++;
            }
        }
        return rank;
    }
}
