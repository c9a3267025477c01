package org.rungs.sampler;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;

/**
 * The distinct rows of a survey's style covariates (categorical ones take few), numbered in order
 * of first appearance. Respondents sharing a row share the coarse class's probit in every group's
 * terms, so a pass can compute its normal cdf once per row ({@link SurveyOrder}), read one table
 * per row ({@link CollapsedPosterior}) or count the row's respondents instead of visiting them
 * ({@link StyleClassUpdate}).
 *
 * @param number per respondent, the number of its row
 * @param values per row, its covariate values, [row][covariate]
 */
record StyleRows(int[] number, double[][] values) {

    /** The rows of {@code columns} (n respondents each), or null when there are more than {@code limit}. */
    static StyleRows of(double[][] columns, int n, int limit) {
        Map<Row, Integer> seen = new HashMap<>();
        int[] number = new int[n];
        double[][] values = new double[limit][];
        double[] row = new double[columns.length];
        Row key = new Row(row);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < columns.length; j++) {
                row[j] = columns[j][i];
            }
            Integer id = seen.get(key);
            if (id == null) {
                if (seen.size() == limit) {
                    return null;
                }
                id = seen.size();
                values[id] = row.clone();
                seen.put(new Row(values[id]), id);
            }
            number[i] = id;
        }
        return new StyleRows(number, Arrays.copyOf(values, seen.size()));
    }

    /** Number of distinct rows. */
    int count() {
        return values.length;
    }

    /** A row of style covariates as a map key, equal when its doubles are equal bit for bit. */
    private record Row(double[] values) {
        @Override
        public boolean equals(Object other) {
            return other instanceof Row && Arrays.equals(values, ((Row) other).values);
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(values);
        }
    }
}
