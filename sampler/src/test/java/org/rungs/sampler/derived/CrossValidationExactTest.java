package org.rungs.sampler.derived;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.ParameterLayout;
import org.rungs.models.ResponseLikelihood;
import org.rungs.models.RoundingChannel;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Covariates;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.Priors;
import org.rungs.priors.StandardNormal;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * PSIS-LOO of a few respondents against leave-one-out cross-validation by its definition
 * (Vehtari, Gelman & Gabry 2017, eq. 4): the model refitted without the respondent, and
 * log p(y_i | y_-i) as the log of the mean of p(y_i | theta) over that fit's draws. Three invented
 * regions of 40 on 0..4 with a coarse class (coarse points 0, 2, 4), so the likelihood is the
 * mixture of MODEL.md 4c; no covariates, so that leaving a respondent out changes nothing but the
 * data.
 *
 * <p>Tolerance: 4 times the combined Monte Carlo standard error of the two estimates (PSIS's
 * own, and the refit's from the sd of p(y_i | theta) over its 2 x 1,000 draws taken as
 * independent, an optimistic figure, so a further 0.02 for their autocorrelation: common
 * practice, no source). With 120 respondents one of them moves the posterior little, and the
 * importance sampling stays reliable (Pareto k below 0.7, checked). When written, the four
 * differences were 0.009 to 0.019 against tolerances of 0.046 to 0.087, and Pareto k 0.02 to 0.17.
 */
class CrossValidationExactTest {
    private static final Scale SCALE = new Scale(0, 4);
    private static final int[] LEFT_OUT = {0, 41, 87, 119};

    private static ModelSpec spec() {
        return new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null), NumberAttraction.none());
    }

    private static Survey survey(int without) {
        Random random = new Random(55);
        double[] cuts = {-1.3, -0.4, 0.5, 1.4};
        int n = 120;
        byte[] category = new byte[n - (without >= 0 ? 1 : 0)];
        int[] group = new int[category.length];
        int at = 0;
        for (int i = 0; i < n; i++) {
            int g = i / 40;
            double level = 0.4 * (g - 1) + random.nextGaussian();
            int k = 0;
            while (k < cuts.length && level > cuts[k]) {
                k++;
            }
            if (random.nextDouble() < 0.25) {
                k = k < 1 ? 0 : k < 4 ? 2 : 4;
            }
            if (i == without) {
                continue;
            }
            category[at] = (byte) k;
            group[at++] = g;
        }
        return Survey.of(SCALE, category, group, List.of("Wexmoor", "Harrowdene", "Tillbrook"), Covariates.none(),
                Covariates.none(), null);
    }

    private static FitResult fit(Survey survey) {
        return Fitter.fit(survey, spec(), new SamplerSettings(2, 1000, 1000, 17, 2), ProgressListener.NONE,
                new AtomicBoolean());
    }

    @Test
    void smoothedImportanceSamplingMatchesRefitting() {
        Survey all = survey(-1);
        FitResult full = fit(all);
        CrossValidation cv = CrossValidation.compute(all, full.draws(), full.layout(), spec(), 2000, 2);
        assertEquals(2000, cv.draws());
        RoundingChannel channel = RoundingChannel.of(SCALE, spec().styleClasses().points(SCALE));
        for (int i : LEFT_OUT) {
            FitResult without = fit(survey(i));
            Draws draws = without.draws();
            ParameterLayout layout = without.layout();
            DrawParameters p = new DrawParameters(layout, 3, SCALE.categories(), SCALE.lowest(), true);
            int g = all.group()[i];
            int r = all.category()[i];
            int s = draws.chains() * draws.iterations();
            double sum = 0;
            double sumSquares = 0;
            for (int c = 0; c < draws.chains(); c++) {
                for (int t = 0; t < draws.iterations(); t++) {
                    p.read(draws, c, t);
                    double q = StandardNormal.cdf(p.gamma[g]);
                    double likelihood = Math.exp(ResponseLikelihood.logRespondent(channel, p.thresholds,
                            g * (SCALE.categories() + 1), r, p.alpha[g], q));
                    sum += likelihood;
                    sumSquares += likelihood * likelihood;
                }
            }
            double mean = sum / s;
            double exact = Math.log(mean);
            double exactMcse = Math.sqrt((sumSquares / s - mean * mean) / s) / mean;
            assertTrue(cv.paretoK(i) < 0.7, "respondent " + i + ": Pareto k " + cv.paretoK(i));
            double tolerance = 4 * Math.sqrt(exactMcse * exactMcse + cv.mcse(i) * cv.mcse(i)) + 0.02;
            assertEquals(exact, cv.elpd(i), tolerance, "respondent " + i + " (group " + g + ", answer " + r + ")");
        }
    }
}
