package org.rungs.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.EnumSet;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Survey;

/** The benchmark times the models it is asked for, and only those. */
class BenchmarkTest {
    @Test
    void timesOnlyTheModelsAskedFor() {
        ByteArrayOutputStream log = new ByteArrayOutputStream();
        Benchmark.Settings settings = new Benchmark.Settings(new int[] {500}, 8, 3, new int[0], 0, 10,
                EnumSet.of(Benchmark.Model.COARSE));
        String report = Benchmark.run(settings, new PrintStream(log, true, StandardCharsets.UTF_8));
        assertTrue(report.contains("Speed with the coarse class on"), report);
        assertFalse(report.contains("Speed of the plain ordered probit"), report);
        assertFalse(report.contains("Speed of the complete model"), report);
        // the coarse model runs half the sweeps: 8 / 2 = 4 at the largest (and only) size
        assertTrue(report.contains("| 500 | 4 |"), report);
        String row = report.lines().filter(l -> l.startsWith("| 500 | 4 |")).findFirst().orElseThrow();
        assertTrue(report.contains("| its leapfrog steps | its walls |"), report);
        assertEquals(10, row.chars().filter(c -> c == '|').count(), "nine cells: " + row);
        String text = log.toString(StandardCharsets.UTF_8);
        assertEquals(1, text.lines().filter(l -> l.contains("respondents,") && l.contains("sweeps")).count(), text);
    }

    /**
     * The education model's survey carries education as two indicators against the reference,
     * and about 23% coarse responders: 0.25 Phi(-0.2) + 0.45 Phi(-0.8) + 0.30 Phi(-1.25) = 0.232
     * (normal cdf values from memory), near 0.236 with the group intercepts' sd of 0.2. Tolerance
     * 0.04: about four standard errors of the share over 50 drawn group intercepts (0.008) and
     * 20,000 respondents (0.003).
     */
    @Test
    void theEducationModelsSurveyCarriesEducation() {
        Scenario scenario = Benchmark.educationScenario(20_000, 3);
        Survey survey = Benchmark.survey(scenario, 3);
        assertEquals(2, survey.style().count());
        assertTrue(survey.style().isIndicator(0) && survey.style().isIndicator(1));
        assertEquals(0, Benchmark.survey(20_000, 3).style().count(), "the other models' surveys have no style covariates");
        boolean[] coarse = Simulator.simulate(scenario, 3).coarse();
        double share = 0;
        for (boolean c : coarse) {
            share += c ? 1.0 / coarse.length : 0;
        }
        assertEquals(0.234, share, 0.04);
    }
}
