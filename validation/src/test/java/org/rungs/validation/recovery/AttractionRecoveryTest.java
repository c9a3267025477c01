package org.rungs.validation.recovery;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.rungs.examples.CovariateDistribution;
import org.rungs.examples.Scenario;
import org.rungs.examples.SimulatedSurvey;
import org.rungs.examples.Simulator;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.ParameterLayout;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.Draws;
import org.rungs.priors.Priors;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * Recovery of number attraction (MODEL.md 4b): six invented groups of 1,500 on 0..10; Ashgrove
 * likes 7 and avoids 3, Brindlemere likes 3 and avoids 8, the other four have no attraction.
 * Attraction is fitted on {2, 3, 7, 8}; the common terms abar are 0 in the truth, so what is
 * planted is each group's deviation t[g,j] = a[g,j] - abar[j] (MODEL.md 4b).
 *
 * <p>What the data identify is that deviation: how much more a group likes a number than the
 * groups together do. The common term abar[j] trades off against the width of category j (a
 * narrow category and an avoided number give nearly the same answers at every level), so it
 * stays near its prior (sd 0.5) and a[g,j] itself inherits that spread: in this scenario the
 * posterior means of a[g,j] land near the planted values while P(a[g,j] > 0) for a planted -0.6
 * stays near 0.1 (measured). The groups share their thresholds, in the truth and in the fit;
 * with by-group thresholds a group's narrower category would take up its deviation as well
 * (README, identifying assumptions).
 */
final class AttractionRecoveryTest {
    private static final int[] NUMBERS = {2, 3, 7, 8};
    private static final List<String> LABELS = List.of("Ashgrove", "Brindlemere", "Corrowfen", "Dunmarsh", "Elderwick",
            "Fallowby");
    private static final double[][] PLANTED = {
        {0, -0.6, 0.7, 0},
        {0, 0.6, 0, -0.6},
        {0, 0, 0, 0},
        {0, 0, 0, 0},
        {0, 0, 0, 0},
        {0, 0, 0, 0},
    };
    private static Draws draws;
    private static Map<String, Double> truth;

    @BeforeAll
    static void fit() {
        List<Scenario.Group> groups = new ArrayList<>();
        for (String label : LABELS) {
            groups.add(new Scenario.Group(label, 1500));
        }
        Scenario scenario = new Scenario(new Scenario.Scale(0, 10), groups,
                List.of(new Scenario.LevelCovariate("hours", new CovariateDistribution.Uniform(0, 10), 0.35, 1)),
                new Scenario.GroupLevels.Fixed(new double[] {-0.3, -0.2, -0.1, 0.1, 0.2, 0.3}),
                Scenario.centred(-2.2, -1.7, -1.2, -0.7, -0.25, 0.25, 0.7, 1.2, 1.7, 2.2),
                Scenario.ThresholdDeviations.shared(), Scenario.StyleClasses.none(),
                new Scenario.NumberAttraction.Active(NUMBERS, new double[4], new Scenario.AttractionDeviations.Fixed(PLANTED)),
                23L);
        SimulatedSurvey data = Simulator.simulate(scenario, 23L);
        truth = data.truth();
        Survey survey = EngineSurvey.of(data);
        ModelSpec model = new ModelSpec(ThresholdMode.SHARED, Priors.defaults()).withAttraction(NumberAttraction.of(NUMBERS));
        FitResult result = Fitter.fit(survey, model, new SamplerSettings(2, 1000, 1000, 5L, 2), ProgressListener.NONE,
                new AtomicBoolean());
        draws = result.draws();
        assertTrue(ParameterLayout.of(survey, model).names().contains("attraction.Ashgrove.7"));
    }

    /** P(t[g,j] > 0), t[g,j] = a[g,j] - abar[j], from the draws of both. */
    private static double positive(int g, int j) {
        int group = draws.indexOf(name(g, j));
        int common = draws.indexOf("attraction." + NUMBERS[j]);
        long above = 0;
        long all = 0;
        for (int c = 0; c < draws.chains(); c++) {
            for (int t = 0; t < draws.iterations(); t++) {
                all++;
                if (draws.get(group, c, t) - draws.get(common, c, t) > 0) {
                    above++;
                }
            }
        }
        return (double) above / all;
    }

    private static String name(int g, int j) {
        return "attraction." + LABELS.get(g) + "." + NUMBERS[j];
    }

    /** Truth, posterior mean and P(a > 0) of every group term, for failure messages. */
    private static String table() {
        StringBuilder sb = new StringBuilder();
        for (int g = 0; g < LABELS.size(); g++) {
            for (int j = 0; j < NUMBERS.length; j++) {
                int column = draws.indexOf(name(g, j));
                double sum = 0;
                for (int c = 0; c < draws.chains(); c++) {
                    for (int t = 0; t < draws.iterations(); t++) {
                        sum += draws.get(column, c, t);
                    }
                }
                sb.append(String.format(java.util.Locale.ROOT, "%n%s truth %.2f mean of a %.3f P(t>0) %.3f", name(g, j),
                        PLANTED[g][j], sum / (draws.chains() * draws.iterations()), positive(g, j)));
            }
        }
        return sb.toString();
    }

    /** Every planted deviation has the right sign with posterior probability above 0.95. */
    @Test
    void plantedAttractionsAreFound() {
        String table = table();
        for (int g = 0; g < LABELS.size(); g++) {
            for (int j = 0; j < NUMBERS.length; j++) {
                String name = name(g, j);
                assertTrue(Math.abs(truth.get(name) - PLANTED[g][j]) < 1e-12, name + " in the simulator's truth");
                double p = positive(g, j);
                if (PLANTED[g][j] > 0) {
                    assertTrue(p > 0.95, name + " planted " + PLANTED[g][j] + ", P(a > 0) = " + p + table);
                } else if (PLANTED[g][j] < 0) {
                    assertTrue(p < 0.05, name + " planted " + PLANTED[g][j] + ", P(a > 0) = " + p + table);
                }
            }
        }
    }

    /**
     * Of the 20 deviations not planted, few are flagged (P(t > 0) above 0.95 or below 0.05). With exact posteriors a null term is flagged with probability well below 0.1 (the
     * pooling pulls the terms towards their common value), so 3 or more of 12 would happen with
     * probability below 0.11 even at 0.1 each; the seed is fixed, so the outcome is deterministic.
     */
    @Test
    void numbersWithoutAttractionAreRarelyFlagged() {
        int flagged = 0;
        List<String> which = new ArrayList<>();
        for (int g = 0; g < LABELS.size(); g++) {
            for (int j = 0; j < NUMBERS.length; j++) {
                if (PLANTED[g][j] == 0) {
                    double p = positive(g, j);
                    if (p > 0.95 || p < 0.05) {
                        flagged++;
                        which.add(name(g, j) + " " + p);
                    }
                }
            }
        }
        assertTrue(flagged <= 3, flagged + " of 20 flagged: " + which + table());
    }
}
