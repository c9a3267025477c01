package org.rungs.validation.calibration;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.DoubleSupplier;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.priors.StandardNormal;

/**
 * One simulated data set: parameters drawn from the simulation prior and ratings drawn from them
 * by MODEL.md sections 2, 3 and 4 (4a, 4c with the coarse class), with covariates that are
 * standardised here exactly as the engine does (mean and sample sd with n-1), so the drawn
 * coefficients are the engine's parameters.
 *
 * @param survey            the survey handed to the fit (raw covariates; the engine standardises them)
 * @param truth             the drawn parameters
 * @param style             the drawn coarse-class parameters, or null without the coarse class
 * @param attraction        the drawn attraction, or null without number attraction
 * @param standardised      the level covariates on the internal scale, [covariate][respondent]
 * @param styleStandardised the style covariates on the internal scale, [covariate][respondent]
 */
record SimulatedData(Survey survey, TrueParameters truth, StyleParameters style, AttractionParameters attraction,
        double[][] standardised, double[][] styleStandardised) {

    static SimulatedData draw(CalibrationConfig config, UniformRandomProvider rng) {
        int groups = config.groups();
        int m = config.scale().categories();
        boolean byGroup = config.simulation().effectiveThresholdMode(groups) == ThresholdMode.BY_GROUP;
        StyleClasses classes = config.simulation().styleClasses();
        TrueParameters truth = PriorSampler.draw(config.simulation().priors(), config.covariates(), groups, m, byGroup, rng);
        StyleParameters style = classes.coarse()
                ? PriorSampler.drawStyle(config.simulation().priors(), config.styleCovariates(), groups, rng) : null;
        int[] numbers = config.simulation().attraction().resolve(config.scale(), classes);
        AttractionParameters attraction = numbers.length > 0
                ? PriorSampler.drawAttraction(config.simulation().priors(), numbers, groups, rng) : null;
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        int n = groups * config.respondents();
        List<double[]> raw = new ArrayList<>();
        double[][] x = columns(config.covariates(), n, normal::sample, raw);
        List<double[]> rawStyle = new ArrayList<>();
        double[][] w = columns(config.styleCovariates(), n,
                config.styleLevels() > 0 ? () -> rng.nextInt(config.styleLevels()) : normal::sample, rawStyle);
        int[] points = classes.coarse() ? coarsePoints(config.scale(), classes) : null;
        int lowest = config.scale().lowest();
        int[] group = new int[n];
        byte[] category = new byte[n];
        for (int i = 0; i < n; i++) {
            int g = i / config.respondents();
            group[i] = g;
            double latent = eta(truth, x, g, i) + normal.sample();
            double[] c = truth.groupThresholds()[g];
            int k = 0;
            while (k < c.length && c[k] < latent) {
                k++;
            }
            // MODEL.md 4: coarse with probability q_i = Phi(gamma[g] + w_i' delta); 4a: report the nearest coarse point
            if (style != null
                    && rng.nextDouble() < StandardNormal.cdf(StyleParameters.linear(style.gamma(), style.delta(), w, g, i))) {
                k = nearest(points, lowest + k, rng) - lowest;
            } else if (attraction != null) {
                k = attracted(c, eta(truth, x, g, i), attraction, g, lowest, rng.nextDouble());
            }
            category[i] = (byte) k;
        }
        Covariates level = x.length == 0 ? Covariates.none() : Covariates.fromNumeric(config.covariateNames(), raw);
        Covariates styleCovariates = w.length == 0 ? Covariates.none()
                : Covariates.fromNumeric(config.styleCovariateNames(), rawStyle);
        Survey survey = Survey.of(config.scale(), category, group, config.groupLabels(), level, styleCovariates, null);
        return new SimulatedData(survey, truth, style, attraction, x, w);
    }

    /**
     * A full-scale answer under attraction (MODEL.md 4b), by inversion of u over the weights
     * pi[k](eta) exp(a[k]) / sum: the latent draw's own category is not reused, since the
     * tilt changes which category is reported.
     */
    static int attracted(double[] c, double eta, AttractionParameters attraction, int g, int lowest, double u) {
        int m = c.length + 1;
        double[] weight = new double[m];
        double total = 0;
        for (int k = 0; k < m; k++) {
            double upper = k == m - 1 ? 1 : StandardNormal.cdf(c[k] - eta);
            double lower = k == 0 ? 0 : StandardNormal.cdf(c[k - 1] - eta);
            double odds = 1;
            for (int j = 0; j < attraction.numbers().length; j++) {
                if (attraction.numbers()[j] == lowest + k) {
                    odds = Math.exp(attraction.attraction()[g][j]);
                }
            }
            weight[k] = (upper - lower) * odds;
            total += weight[k];
        }
        double target = u * total;
        for (int k = 0; k < m - 1; k++) {
            target -= weight[k];
            if (target < 0) {
                return k;
            }
        }
        return m - 1;
    }

    /** Raw columns of draws (added to {@code raw}), returned standardised. */
    private static double[][] columns(int count, int n, DoubleSupplier draw, List<double[]> raw) {
        double[][] z = new double[count][];
        for (int j = 0; j < count; j++) {
            double[] column = new double[n];
            for (int i = 0; i < n; i++) {
                column[i] = draw.getAsDouble();
            }
            raw.add(column);
            z[j] = standardise(column);
        }
        return z;
    }

    /** The coarse points as ratings, increasing: the user's, or {L, floor((L+U)/2), U} (MODEL.md 4a). */
    static int[] coarsePoints(Scale scale, StyleClasses classes) {
        int[] points = classes.coarsePoints() != null ? classes.coarsePoints().clone()
                : new int[] {scale.lowest(), Math.floorDiv(scale.lowest() + scale.highest(), 2), scale.highest()};
        Arrays.sort(points);
        return points;
    }

    /** The coarse point nearest to rating k; a k equally near two points goes to each with probability 1/2 (MODEL.md 4a). */
    static int nearest(int[] points, int k, UniformRandomProvider rng) {
        int best = points[0];
        for (int p : points) {
            int d = Math.abs(p - k) - Math.abs(best - k);
            if (d < 0 || d == 0 && p != best && rng.nextBoolean()) {
                best = p;
            }
        }
        return best;
    }

    /** eta_i = alpha[g] + x_i' beta (MODEL.md section 2). */
    static double eta(TrueParameters truth, double[][] x, int g, int i) {
        double e = truth.alpha()[g];
        for (int j = 0; j < x.length; j++) {
            e += x[j][i] * truth.beta()[j];
        }
        return e;
    }

    /** (v - mean) / sd with the sample sd (n-1), as MODEL.md section 1 defines the internal scale. */
    static double[] standardise(double[] raw) {
        double mean = Arrays.stream(raw).sum() / raw.length;
        double squares = 0;
        for (double v : raw) {
            squares += (v - mean) * (v - mean);
        }
        double sd = Math.sqrt(squares / (raw.length - 1));
        double[] z = new double[raw.length];
        for (int i = 0; i < raw.length; i++) {
            z[i] = (raw[i] - mean) / sd;
        }
        return z;
    }
}
