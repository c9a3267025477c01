package org.rungs.validation.calibration;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.sampling.distribution.ZigguratSampler;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;

/**
 * One simulated data set: parameters drawn from the simulation prior and ratings drawn from them
 * by MODEL.md sections 2 and 3, with covariates that are standardised here exactly as the engine
 * does (mean and sample sd with n-1), so the drawn coefficients are the engine's parameters.
 *
 * @param survey       the survey handed to the fit (raw covariates; the engine standardises them)
 * @param truth        the drawn parameters
 * @param standardised the covariates on the internal scale, [covariate][respondent]
 */
record SimulatedData(Survey survey, TrueParameters truth, double[][] standardised) {

    static SimulatedData draw(CalibrationConfig config, UniformRandomProvider rng) {
        int groups = config.groups();
        int m = config.scale().categories();
        boolean byGroup = config.simulation().effectiveThresholdMode(groups) == ThresholdMode.BY_GROUP;
        TrueParameters truth = PriorSampler.draw(config.simulation().priors(), config.covariates(), groups, m, byGroup, rng);
        ZigguratSampler.NormalizedGaussian normal = ZigguratSampler.NormalizedGaussian.of(rng);
        int n = groups * config.respondents();
        int p = config.covariates();
        List<double[]> raw = new ArrayList<>(p);
        double[][] x = new double[p][];
        for (int j = 0; j < p; j++) {
            double[] column = new double[n];
            for (int i = 0; i < n; i++) {
                column[i] = normal.sample();
            }
            raw.add(column);
            x[j] = standardise(column);
        }
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
            category[i] = (byte) k;
        }
        Covariates level = p == 0 ? Covariates.none() : Covariates.fromNumeric(config.covariateNames(), raw);
        Survey survey = Survey.of(config.scale(), category, group, config.groupLabels(), level, Covariates.none(), null);
        return new SimulatedData(survey, truth, x);
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
