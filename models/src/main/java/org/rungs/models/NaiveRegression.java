package org.rungs.models;

import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.LinearSolverFactory_DDRM;
import org.ejml.interfaces.linsol.LinearSolverDense;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;

/**
 * The naive analysis the corrections are set against (MODEL.md 6): ordinary least squares of the
 * raw ratings on the level covariates and group indicators, unweighted. The group indicators are
 * swept out by centring the ratings and covariates within each group (Frisch and Waugh 1933;
 * Lovell 1963), which gives the same coefficients as the regression with the indicators and
 * needs n x p numbers instead of n x (groups + p); the centred columns are solved by Householder
 * QR. Coefficients are per unit of each covariate's original column (per indicator for categories).
 */
public final class NaiveRegression {
    /**
     * A centred column whose norm is below this share of its norm before the within-group
     * centring is taken as constant within every group (our rule, no source: far above the
     * rounding of a sum of n products, far below any real within-group variation).
     */
    static final double CONFOUNDED = 1e-9;

    private NaiveRegression() {
    }

    /**
     * One coefficient per level covariate, in rating points per user unit; NaN for a covariate the
     * group indicators absorb (constant within every group).
     */
    public static double[] coefficients(Survey survey) {
        Covariates level = survey.level();
        int n = survey.size();
        int p = level.count();
        int groups = survey.groupCount();
        int[] group = survey.group();
        byte[] category = survey.category();
        double[] count = new double[groups];
        double[] ySum = new double[groups];
        double[][] xSum = new double[p][groups];
        for (int i = 0; i < n; i++) {
            int g = group[i];
            count[g]++;
            ySum[g] += category[i];
            for (int j = 0; j < p; j++) {
                xSum[j][g] += level.column(j)[i];
            }
        }
        boolean[] absorbed = confounded(survey, count, xSum);
        int kept = 0;
        for (boolean a : absorbed) {
            kept += a ? 0 : 1;
        }
        double[] out = new double[p];
        Arrays.fill(out, Double.NaN);
        if (kept == 0) {
            return out;
        }
        DMatrixRMaj x = new DMatrixRMaj(n, kept);
        DMatrixRMaj y = new DMatrixRMaj(n, 1);
        for (int i = 0; i < n; i++) {
            int g = group[i];
            int c = 0;
            for (int j = 0; j < p; j++) {
                if (!absorbed[j]) {
                    x.unsafe_set(i, c++, level.column(j)[i] - xSum[j][g] / count[g]);
                }
            }
            // the scale's lowest point shifts every rating alike, so the group means absorb it
            y.unsafe_set(i, 0, category[i] - ySum[g] / count[g]);
        }
        LinearSolverDense<DMatrixRMaj> solver = LinearSolverFactory_DDRM.leastSquaresQrPivot(true, false);
        if (!solver.setA(x)) {
            throw new IllegalStateException("the naive regression's design is singular");
        }
        DMatrixRMaj b = new DMatrixRMaj(kept, 1);
        solver.solve(y, b);
        int c = 0;
        for (int j = 0; j < p; j++) {
            if (!absorbed[j]) {
                out[j] = b.get(c++, 0) / level.scale(j);
            }
        }
        return out;
    }

    /**
     * Per level covariate, whether it is constant within every group (a country's GDP, a region's
     * yes/no policy), so that the group indicators absorb it and its naive coefficient is not
     * defined. The covariate columns are centred (MODEL.md section 1), so their sum of squares is
     * their variation about the survey mean.
     */
    private static boolean[] confounded(Survey survey, double[] count, double[][] xSum) {
        Covariates level = survey.level();
        int[] group = survey.group();
        boolean[] out = new boolean[level.count()];
        for (int j = 0; j < out.length; j++) {
            double[] x = level.column(j);
            double within = 0;
            double total = 0;
            for (int i = 0; i < survey.size(); i++) {
                double d = x[i] - xSum[j][group[i]] / count[group[i]];
                within += d * d;
                total += x[i] * x[i];
            }
            out[j] = !(within > CONFOUNDED * CONFOUNDED * total);
        }
        return out;
    }
}
