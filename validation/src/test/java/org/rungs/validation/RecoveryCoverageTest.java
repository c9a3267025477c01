package org.rungs.validation;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.examples.CovariateDistribution;
import org.rungs.examples.Scenario;
import org.rungs.examples.SimulatedSurvey;
import org.rungs.examples.Simulator;
import org.rungs.models.ModelSpec;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.Survey;
import org.rungs.models.survey.SurveyReader;
import org.rungs.models.survey.SurveySpec;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.Summaries;
import org.rungs.priors.Priors;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.ProgressListener;
import org.rungs.sampler.SamplerSettings;

/**
 * Frequency coverage of 90% posterior intervals over repeated simulated surveys: the data are
 * written by the simulator (independent of the fitting code), read back as a file and fitted.
 */
class RecoveryCoverageTest {

    private static final int REPLICATES = 20;
    private static final String[] GROUPS = {"Ashgrove", "Brindlemere", "Corrowfen", "Duskwater"};
    private static final String COVARIATE = "hours";

    /**
     * 4 invented groups of 300, scale 0..6, one numeric covariate, by-group thresholds. The group
     * levels and threshold deviations are drawn with {@code parameterSeed}, so every replicate has
     * its own truth and coverage averages over them, as the hierarchical prior assumes.
     */
    private static Scenario scenario(long parameterSeed) {
        List<Scenario.Group> groups = new ArrayList<>();
        for (String label : GROUPS) {
            groups.add(new Scenario.Group(label, 300));
        }
        return new Scenario(new Scenario.Scale(0, 6), groups,
                List.of(new Scenario.LevelCovariate(COVARIATE, new CovariateDistribution.Uniform(0, 10), 0.08, 1)),
                new Scenario.GroupLevels.Drawn(0.4, 0.4), Scenario.centred(-1.5, -0.9, -0.3, 0.3, 0.9, 1.5),
                new Scenario.ThresholdDeviations.Drawn(0.15), parameterSeed);
    }

    @Test
    void ninetyPercentIntervalsCoverAboutNinetyPercent(@TempDir Path dir) throws Exception {
        SurveySpec spec = SurveySpec.builder(SimulatedSurvey.RATING_COLUMN, new Scale(0, 6))
                .group(SimulatedSurvey.GROUP_COLUMN).level(COVARIATE).build();
        ModelSpec model = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults());
        List<String> checked = new ArrayList<>();
        checked.add("level." + COVARIATE);
        for (String label : GROUPS) {
            checked.add("group." + label);
        }
        for (int k = 1; k <= 6; k++) {
            checked.add("threshold." + k);
        }
        int trials = 0;
        int covered = 0;
        Map<String, Integer> misses = new LinkedHashMap<>();
        for (int r = 0; r < REPLICATES; r++) {
            SimulatedSurvey data = Simulator.simulate(scenario(7000L + r), 9100L + r);
            Path file = dir.resolve("survey-" + r + ".csv");
            data.writeCsv(file);
            Survey survey = SurveyReader.read(file, spec);
            List<ParameterSummary> summaries = Summaries.of(Fitter.fit(survey, model,
                    new SamplerSettings(2, 300, 300, 500L + r, 2), ProgressListener.NONE, new AtomicBoolean()).draws());
            for (ParameterSummary s : summaries) {
                if (!checked.contains(s.name())) {
                    continue;
                }
                double truth = data.truth().get(s.name());
                trials++;
                if (s.q05() <= truth && truth <= s.q95()) {
                    covered++;
                } else {
                    misses.merge(s.name(), 1, Integer::sum);
                }
            }
        }
        assertTrue(trials == REPLICATES * checked.size(), "every checked parameter has draws: " + trials);
        double coverage = (double) covered / trials;
        // Binomial band around 0.9 for N = 220 trials: 0.9 +- 3 sqrt(0.09 / N) = 0.9 +- 0.061 if the
        // trials were independent. They are not: the 6 thresholds of one data set share its drawn
        // deviations and tend to be covered together. Counting them as one trial leaves 6
        // effective trials per data set, a variance factor of 11/6 < 2; we double the variance,
        // giving 0.9 +- 3 sqrt(2 * 0.09 / N) = 0.9 +- 0.086 (3 sd: common practice, no source).
        // The interval ends are quantiles of 600 draws, whose Monte Carlo error moves single
        // coverage decisions only near the ends and is absorbed by this band. Seeds are fixed.
        double halfWidth = 3 * Math.sqrt(2 * 0.09 / trials);
        String report = String.format(Locale.ROOT, "%d of %d covered (%.3f), band 0.9 +- %.3f, misses %s",
                covered, trials, coverage, halfWidth, misses);
        System.out.println(report);
        assertTrue(Math.abs(coverage - 0.9) <= halfWidth, report);
    }
}
