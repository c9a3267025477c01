package org.rungs.models;

import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.LinearSolverFactory_DDRM;
import org.ejml.interfaces.linsol.LinearSolverDense;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Survey;

/**
 * The naive analysis the corrections are set against (MODEL.md 6): ordinary least squares of the
 * raw ratings on the level covariates and group indicators, unweighted, solved by Householder QR.
 * Coefficients are per unit of each covariate's original column (per indicator for categories).
 */
public final class NaiveRegression {
    private NaiveRegression() {
    }

    /** One coefficient per level covariate, in rating points per user unit. */
    public static double[] coefficients(Survey survey) {
        Covariates level = survey.level();
        int n = survey.size();
        int p = level.count();
        int groups = survey.groupCount();
        int columns = groups + p;
        DMatrixRMaj x = new DMatrixRMaj(n, columns);
        DMatrixRMaj y = new DMatrixRMaj(n, 1);
        byte[] category = survey.category();
        int[] group = survey.group();
        int lowest = survey.scale().lowest();
        for (int i = 0; i < n; i++) {
            x.unsafe_set(i, group[i], 1);
            for (int j = 0; j < p; j++) {
                x.unsafe_set(i, groups + j, level.column(j)[i]);
            }
            y.unsafe_set(i, 0, lowest + category[i]);
        }
        LinearSolverDense<DMatrixRMaj> solver = LinearSolverFactory_DDRM.leastSquaresQrPivot(true, false);
        if (!solver.setA(x)) {
            throw new IllegalStateException("the naive regression's design is singular");
        }
        DMatrixRMaj b = new DMatrixRMaj(columns, 1);
        solver.solve(y, b);
        double[] out = new double[p];
        for (int j = 0; j < p; j++) {
            out[j] = b.get(groups + j, 0) / level.scale(j);
        }
        return out;
    }
}
