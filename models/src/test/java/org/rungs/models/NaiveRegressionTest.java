package org.rungs.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;

class NaiveRegressionTest {
    /**
     * Reference: Commons Math 3.6.1 OLSMultipleLinearRegression on the raw covariates with an
     * intercept and G-1 group dummies, the same model parametrised differently, so the covariate
     * coefficients must agree to rounding.
     */
    @Test
    void matchesCommonsMathLeastSquares() {
        Random random = new Random(42);
        int n = 500;
        int groups = 3;
        int[] group = new int[n];
        byte[] category = new byte[n];
        double[] income = new double[n];
        double[] age = new double[n];
        for (int i = 0; i < n; i++) {
            group[i] = i % groups;
            income[i] = 1 + 4 * random.nextDouble();
            age[i] = 20 + 60 * random.nextDouble();
            double y = 3 + group[i] + 0.8 * income[i] - 0.02 * age[i] + random.nextGaussian();
            category[i] = (byte) Math.max(0, Math.min(10, Math.round(y)));
        }
        Covariates level = Covariates.fromNumeric(List.of("income", "age"), List.of(income.clone(), age.clone()));
        Survey survey = Survey.of(new Scale(0, 10), category, group, List.of("a", "b", "c"), level, Covariates.none(), null);
        double[] ours = NaiveRegression.coefficients(survey);

        double[][] x = new double[n][4];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i][0] = group[i] == 1 ? 1 : 0;
            x[i][1] = group[i] == 2 ? 1 : 0;
            x[i][2] = income[i];
            x[i][3] = age[i];
            y[i] = category[i];
        }
        OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
        ols.newSampleData(y, x);
        double[] reference = ols.estimateRegressionParameters();
        assertEquals(reference[3], ours[0], 1e-10, "income");
        assertEquals(reference[4], ours[1], 1e-10, "age");
    }

    /**
     * A covariate constant within every group (a region's yes/no policy) is absorbed by the group
     * indicators, so it has no naive coefficient; the other covariate's coefficient is that of the
     * regression without it (Commons Math 3.6.1, as above).
     */
    @Test
    void aCovariateConstantWithinGroupsHasNoCoefficient() {
        Random random = new Random(7);
        int n = 300;
        int[] group = new int[n];
        byte[] category = new byte[n];
        double[] income = new double[n];
        double[] policy = new double[n];
        double[][] x = new double[n][3];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            group[i] = i % 3;
            income[i] = 1 + 4 * random.nextDouble();
            policy[i] = group[i] == 1 ? 1 : 0;
            category[i] = (byte) Math.max(0, Math.min(10, Math.round(4 + group[i] + 0.5 * income[i] + random.nextGaussian())));
            x[i][0] = group[i] == 1 ? 1 : 0;
            x[i][1] = group[i] == 2 ? 1 : 0;
            x[i][2] = income[i];
            y[i] = category[i];
        }
        Covariates level = Covariates.fromNumeric(List.of("income", "policy"), List.of(income.clone(), policy.clone()));
        Survey survey = Survey.of(new Scale(0, 10), category, group, List.of("a", "b", "c"), level, Covariates.none(), null);
        double[] ours = NaiveRegression.coefficients(survey);

        OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
        ols.newSampleData(y, x);
        assertEquals(ols.estimateRegressionParameters()[3], ours[0], 1e-10, "income");
        assertTrue(Double.isNaN(ours[1]), "policy: " + ours[1]);
    }
}
