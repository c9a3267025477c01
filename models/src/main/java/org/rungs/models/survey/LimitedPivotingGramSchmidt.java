package org.rungs.models.survey;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Rank check of the design {@code [1, X]} by modified Gram-Schmidt with limited column pivoting:
 * columns are orthogonalised in order, and a column whose residual norm falls below
 * {@link #TOLERANCE} times its norm after centring is linearly dependent on the intercept and the
 * columns kept before it (the strategy of LINPACK {@code dqrdc2}, which R's {@code qr()} uses).
 * Centring a column is its projection off the intercept, so the intercept is never stored.
 */
final class LimitedPivotingGramSchmidt {

    /**
     * Relative residual norm below which a column counts as an exact linear combination. Source:
     * the default {@code tol} of R's {@code qr()} (R 4.2.2, {@code formals(qr.default)$tol} = 1e-07).
     * Rounding leaves exact dependencies near 1e-13 here, far below it.
     */
    static final double TOLERANCE = 1e-7;

    /** Smallest share of the dependent column's norm for which an earlier column is named in it. */
    private static final double NAMED_SHARE = 1e-6;

    private LimitedPivotingGramSchmidt() {
    }

    /**
     * The first column that depends linearly on the intercept and earlier columns, followed by the
     * earlier columns that take part in the combination; an empty array when {@code [1, X]} has full
     * column rank. A column that is constant is returned alone.
     */
    static int[] firstDependence(double[][] columns) {
        int p = columns.length;
        List<double[]> basis = new ArrayList<>();
        int[] basisColumn = new int[p];
        double[] centredNorm = new double[p];
        // r[k][m]: coefficient of kept column m on basis vector k (upper triangular)
        double[][] r = new double[p][p];
        for (int j = 0; j < p; j++) {
            double[] v = centred(columns[j]);
            double norm0 = norm(v);
            centredNorm[j] = norm0;
            if (norm0 == 0) {
                return new int[] {j};
            }
            int kept = basis.size();
            double[] coefficients = new double[kept];
            // two passes: the second removes what rounding left of the first (Kahan's "twice is
            // enough", Parlett 1980, The Symmetric Eigenvalue Problem)
            for (int pass = 0; pass < 2; pass++) {
                for (int k = 0; k < kept; k++) {
                    double[] q = basis.get(k);
                    double c = dot(q, v);
                    coefficients[k] += c;
                    for (int i = 0; i < v.length; i++) {
                        v[i] -= c * q[i];
                    }
                }
            }
            double residual = norm(v);
            if (residual < TOLERANCE * norm0) {
                return involved(j, coefficients, r, kept, basisColumn, centredNorm, norm0);
            }
            for (int i = 0; i < v.length; i++) {
                v[i] /= residual;
            }
            for (int k = 0; k < kept; k++) {
                r[k][kept] = coefficients[k];
            }
            r[kept][kept] = residual;
            basisColumn[kept] = j;
            basis.add(v);
        }
        return new int[0];
    }

    private static int[] involved(int dependent, double[] coefficients, double[][] r, int kept,
            int[] basisColumn, double[] centredNorm, double norm0) {
        // back substitution R b = coefficients gives the combination over the kept columns
        double[] b = new double[kept];
        for (int m = kept - 1; m >= 0; m--) {
            double s = coefficients[m];
            for (int l = m + 1; l < kept; l++) {
                s -= r[m][l] * b[l];
            }
            b[m] = s / r[m][m];
        }
        int[] out = new int[kept + 1];
        int count = 0;
        out[count++] = dependent;
        for (int m = 0; m < kept; m++) {
            if (Math.abs(b[m]) * centredNorm[basisColumn[m]] > NAMED_SHARE * norm0) {
                out[count++] = basisColumn[m];
            }
        }
        return Arrays.copyOf(out, count);
    }

    private static double[] centred(double[] x) {
        int n = x.length;
        double sum = 0;
        for (double v : x) {
            sum += v;
        }
        double mean = sum / n;
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = x[i] - mean;
        }
        return v;
    }

    private static double dot(double[] a, double[] b) {
        double s = 0;
        for (int i = 0; i < a.length; i++) {
            s += a[i] * b[i];
        }
        return s;
    }

    private static double norm(double[] a) {
        return Math.sqrt(dot(a, a));
    }
}
