package org.rungs.sampler.run;

import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.models.survey.Covariates;
import org.rungs.posteriors.CsvField;
import org.rungs.posteriors.ParameterSummary;

/**
 * {@code coefficients.csv}: per level covariate, the corrected average marginal effect on the
 * intended expected rating (MODEL.md 6) beside the naive least-squares coefficient of the raw
 * ratings and the same effect in a plain ordered probit; the naive bias is their difference.
 * Effects are per unit of the user's column (per indicator for categories).
 */
final class CoefficientTable {
    private CoefficientTable() {
    }

    /**
     * @param naive per covariate the naive coefficient, NaN (an empty cell) where it is not defined
     * @param plain summaries of the plain ordered probit's derived quantities, or null when the
     *              fitted model is itself the plain one; an effect missing from them (a comparison
     *              fit interrupted, or not run because the fit was) leaves its three cells empty
     */
    static void write(Covariates level, List<ParameterSummary> derived, double[] naive, List<ParameterSummary> plain,
                      Path file) throws IOException {
        Map<String, ParameterSummary> main = index(derived);
        Map<String, ParameterSummary> plainIndex = plain == null ? main : index(plain);
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            w.write("covariate,kind,ame_mean,ame_q5,ame_q95,ame_per_unit_mean,ame_per_unit_q5,ame_per_unit_q95,"
                    + "naive_ols_per_unit,plain_probit_per_unit_mean,plain_probit_per_unit_q5,plain_probit_per_unit_q95,naive_bias\n");
            for (int j = 0; j < level.count(); j++) {
                String name = level.name(j);
                boolean indicator = level.isIndicator(j);
                ParameterSummary ame = main.get("ame." + name);
                ParameterSummary perUnit = indicator ? ame : main.get("ame." + name + ".per_unit");
                ParameterSummary plainPerUnit = plainIndex.get(indicator ? "ame." + name : "ame." + name + ".per_unit");
                w.write(CsvField.quote(name) + "," + (indicator ? "indicator" : "numeric") + ","
                        + triple(ame) + "," + triple(perUnit) + "," + number(naive[j]) + "," + triple(plainPerUnit) + ","
                        + number(naive[j] - perUnit.mean()) + "\n");
            }
        }
    }

    private static Map<String, ParameterSummary> index(List<ParameterSummary> summaries) {
        Map<String, ParameterSummary> m = new HashMap<>();
        for (ParameterSummary s : summaries) {
            m.put(s.name(), s);
        }
        return m;
    }

    private static String triple(ParameterSummary s) {
        if (s == null) {
            return ",,";
        }
        return number(s.mean()) + "," + number(s.q05()) + "," + number(s.q95());
    }

    /** Empty for NaN: a naive coefficient the group indicators absorb ({@link org.rungs.models.NaiveRegression}). */
    private static String number(double v) {
        return Double.isNaN(v) ? "" : String.format(Locale.ROOT, "%.6g", v);
    }
}
