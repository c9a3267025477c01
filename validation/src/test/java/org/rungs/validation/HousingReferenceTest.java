package org.rungs.validation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.models.survey.SurveyReader;
import org.rungs.models.survey.SurveySpec;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.priors.Priors;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * The one-group ordered probit against maximum likelihood on the housing survey (1,681
 * respondents; see src/test/resources/housing/README.md for the data, the mapping of polr's
 * parameters to ours and how the reference is regenerated).
 */
class HousingReferenceTest {

    /** The categorical covariates with R's reference levels (first factor level). */
    private static final String[][] COVARIATES = {{"infl", "Infl", "Low"}, {"type", "Type", "Tower"}, {"cont", "Cont", "Low"}};

    /** A maximum-likelihood estimate and its standard error under the engine's parameter name. */
    private record Reference(double estimate, double stdError) {
    }

    @Test
    void posteriorMatchesMaximumLikelihood() throws Exception {
        SurveySpec.Builder spec = SurveySpec.builder("sat", new Scale(1, 3));
        for (String[] covariate : COVARIATES) {
            spec.level(covariate[0]).reference(covariate[0], covariate[2]);
        }
        Survey survey = SurveyReader.read(resource("housing.csv"), spec.build());
        Priors weak = Priors.defaults().with("level=normal(0,10)").with("group_mean=normal(0,10)").with("threshold=normal(0,10)");
        FitResult fit = Fitter.fit(survey, new ModelSpec(ThresholdMode.SHARED, weak),
                new SamplerSettings(4, 500, 1000, 20240611L, 2), ProgressListener.NONE, new AtomicBoolean());
        Map<String, ParameterSummary> posterior = new LinkedHashMap<>();
        for (ParameterSummary s : Summaries.of(fit.draws())) {
            posterior.put(s.name(), s);
        }

        // reference: R 4.2.2, MASS 7.3-58.2, MASS::polr(..., method = "probit"), file reference-polr-probit.csv
        Map<String, Reference> reference = readReference();
        assertEquals(9, reference.size(), "6 coefficients, group_mean and two thresholds: " + reference.keySet());
        List<String> failures = new ArrayList<>();
        StringBuilder table = new StringBuilder();
        for (Map.Entry<String, Reference> entry : reference.entrySet()) {
            String name = entry.getKey();
            Reference ml = entry.getValue();
            ParameterSummary s = posterior.get(name);
            assertTrue(s != null, "no draws named " + name + " among " + posterior.keySet());
            // With n = 1681 the posterior mean differs from the MLE by O(1/n) relative to the sd
            // (Bernstein-von Mises with a first-order bias term), far below 0.2 sd; the N(0, 10)
            // priors shift the mean by about sd^2 / 10^2 * |value| < 1e-4. 4 MCSE covers the chain's
            // own error with a one-sided chance below 1e-4 per parameter (normal approximation).
            double tolerance = 0.2 * ml.stdError() + 4 * s.mcseMean();
            double sdRatio = s.sd() / ml.stdError();
            table.append(String.format(Locale.ROOT, "%-22s mle %8.4f mean %8.4f |diff| %.4f tol %.4f  sd/se %.3f  mcse %.5f%n",
                    name, ml.estimate(), s.mean(), Math.abs(s.mean() - ml.estimate()), tolerance, sdRatio, s.mcseMean()));
            if (!(Math.abs(s.mean() - ml.estimate()) <= tolerance)) {
                failures.add(name + " mean");
            }
            // Posterior sd and inverse-Hessian standard error agree to O(1/sqrt(n)) relatively;
            // 15% also covers the Monte Carlo error of an sd from >= 400 effective draws (~3.5%).
            if (!(Math.abs(sdRatio - 1) <= 0.15)) {
                failures.add(name + " sd");
            }
        }
        System.out.print(table);
        assertTrue(failures.isEmpty(), failures + "\n" + table);
    }

    /** Reads the rows with an engine name: the coefficients (renamed) and the engine_* rows. */
    private static Map<String, Reference> readReference() throws IOException, URISyntaxException {
        Map<String, Reference> rows = new LinkedHashMap<>();
        List<String> lines = Files.readAllLines(resource("reference-polr-probit.csv"), StandardCharsets.UTF_8);
        boolean header = true;
        for (String line : lines) {
            if (line.isBlank() || line.startsWith("#")) {
                continue;
            }
            if (header) {
                assertEquals("term,kind,estimate,std_error", line.trim());
                header = false;
                continue;
            }
            String[] f = line.split(",");
            String name = switch (f[1]) {
                case "coefficient" -> engineName(f[0]);
                case "engine_group_mean", "engine_threshold" -> f[0];
                default -> null;
            };
            if (name != null) {
                rows.put(name, new Reference(Double.parseDouble(f[2]), Double.parseDouble(f[3])));
            }
        }
        return rows;
    }

    /** R's treatment-contrast term, e.g. {@code InflMedium}, as the engine's {@code level.infl=Medium}. */
    private static String engineName(String term) {
        for (String[] covariate : COVARIATES) {
            if (term.startsWith(covariate[1])) {
                return "level." + covariate[0] + "=" + term.substring(covariate[1].length());
            }
        }
        throw new IllegalArgumentException("unknown term " + term);
    }

    private static Path resource(String file) throws URISyntaxException {
        return Path.of(HousingReferenceTest.class.getResource("/housing/" + file).toURI());
    }
}
