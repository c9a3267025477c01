package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.SurveyInputException;
import org.rungs.models.survey.SurveySpec;
import org.rungs.priors.Priors;
import org.rungs.sampler.SamplerSettings;

/** What a fit from a file writes and prints about number attraction, with attraction on and off. */
class FitJobAttractionTest {
    private static final Scale SCALE = new Scale(0, 6);

    /** Three invented regions of 60 answers on 0..6 with a covariate; many 4s. */
    private static Path survey(Path dir) throws IOException {
        Random random = new Random(8);
        StringBuilder csv = new StringBuilder("region,rating,age\n");
        for (String region : List.of("Fernholt", "Moorgate", "Lindcross")) {
            for (int i = 0; i < 60; i++) {
                int rating = random.nextDouble() < 0.3 ? 4 : random.nextInt(7);
                csv.append(region).append(',').append(rating).append(',').append(20 + random.nextInt(50)).append('\n');
            }
        }
        Path file = dir.resolve("survey.csv");
        Files.writeString(file, csv);
        return file;
    }

    private static String fit(Path file, Path out, NumberAttraction attraction) throws SurveyInputException {
        SurveySpec spec = SurveySpec.builder("rating", SCALE).group("region").level("age").build();
        ModelSpec model = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.none(), attraction);
        FitRequest request = new FitRequest(file, spec, model, new SamplerSettings(2, 10, 10, 5, 2), out, false, Map.of());
        ByteArrayOutputStream stdout = new ByteArrayOutputStream();
        ByteArrayOutputStream stderr = new ByteArrayOutputStream();
        FitJob.run(request, new PrintStream(stdout, true, StandardCharsets.UTF_8), new PrintStream(stderr, true, StandardCharsets.UTF_8),
                new AtomicBoolean());
        return stdout.toString(StandardCharsets.UTF_8) + "\n--- stderr ---\n" + stderr.toString(StandardCharsets.UTF_8);
    }

    @Test
    void attractionOnWritesItsTableColumnsRecordAndWords(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("on");
        String printed = fit(survey(dir), out, NumberAttraction.of(4, 2));
        List<String> attraction = Files.readAllLines(out.resolve("attraction.csv"));
        assertEquals("group,rating,a_mean,a_q5,a_q95,exp_a_mean,exp_a_q5,exp_a_q95,p_positive,sd_ratio", attraction.get(0));
        assertEquals(1 + 2 * 4, attraction.size(), "the common terms and three regions, two numbers each");
        assertTrue(attraction.get(1).startsWith("all,2,") && attraction.get(4).startsWith("Fernholt,4,"), attraction.toString());
        assertTrue(Files.readAllLines(out.resolve("groups.csv")).get(0).contains(
                ",attracted_mean_mean,attracted_mean_q5,attracted_mean_q95,mean_bias_mean,"));
        assertTrue(Files.readAllLines(out.resolve("groups.csv")).get(0).contains(
                ",mean_bias_attraction_mean,mean_bias_attraction_q5,mean_bias_attraction_q95,mean_bias_rounding_mean,"));
        assertTrue(Files.readAllLines(out.resolve("distributions.csv")).get(0).contains(
                ",harmonised_share_q95,attracted_share_mean,attracted_share_q5,attracted_share_q95,replicated_mean,"));
        String run = Files.readString(out.resolve("run.json"));
        assertTrue(run.contains("\"attraction\": \"[4, 2]\""), run);
        assertTrue(run.replaceAll("\\s", "").contains("\"attraction_set\":[2,4]"), run);
        assertTrue(run.contains("\"attraction_mean\": \"" + Priors.defaults().attractionMean() + "\""), run);
        assertTrue(run.contains("\"latent_steps_skipped_per_chain\": \"0.000, 0.000\""), run);
        // no spread to move: under attraction tau_d sits in the thresholds' coordinates, and no coarse class
        assertFalse(run.contains("spread_moves_per_chain"), run);
        assertFalse(printed.contains("were skipped there"), printed);
        assertTrue(printed.contains("Numbers liked or avoided"), printed);
        for (String region : List.of("Fernholt", "Moorgate", "Lindcross")) {
            assertTrue(printed.contains("\n  " + region + ": "), printed);
        }
        assertTrue(printed.contains("summary.csv, attraction.csv, derived_draws.csv"), printed);
        assertTrue(printed.contains("plain ordered probit (style classes and attraction off)"), printed);
        // the comparison fit's own chains are judged too: 2 x 10 draws cannot reach an ESS of 100 per chain
        String compact = run.replaceAll("\\s", "");
        assertTrue(compact.contains("\"comparison_fit\":{\"chains\":2,\"warmup\":10,\"draws\":10,\"thin\":1,\"verdict\":\"Notconverged:"),
                run);
        assertTrue(printed.contains("warning: the plain ordered probit of coefficients.csv's comparison: Not converged: "),
                printed);
        assertTrue(compact.contains("\"theplainorderedprobitofcoefficients.csv'scomparison:Notconverged:"), run);
    }

    /**
     * A named attraction on a coarse point is fitted (MODEL.md 4b names no exclusion) but warned
     * about; the default set, which leaves the coarse points out, and the set without the coarse
     * class are not.
     */
    @Test
    void attractionOnACoarsePointIsWarnedAbout() {
        StyleClasses coarse = StyleClasses.coarse(null);
        List<String> named = SurveyWarnings.model(SCALE, new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), coarse,
                NumberAttraction.of(2, 3, 6)));
        assertEquals(2, named.size(), named.toString());
        assertTrue(named.get(0).startsWith("attraction on 3, a coarse point: the coarse class also explains an excess of 3s"),
                named.toString());
        assertTrue(named.get(1).startsWith("attraction on 6, a coarse point"), named.toString());
        assertEquals(List.of(), SurveyWarnings.model(SCALE, new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), coarse,
                NumberAttraction.besidesCoarsePoints())));
        assertEquals(List.of(), SurveyWarnings.model(SCALE, new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(),
                StyleClasses.none(), NumberAttraction.of(3))));
        assertEquals(List.of(), SurveyWarnings.model(SCALE, new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), coarse,
                NumberAttraction.none())));
    }

    /** The warning names the largest share of any chain, and there is none when no chain skipped. */
    @Test
    void skippedLatentStepsAreWarnedAbout() {
        assertEquals(null, FitJob.skippedStepsWarning(new double[] {0, 0}));
        String w = FitJob.skippedStepsWarning(new double[] {0.0125, 0, 0.5});
        assertTrue(w.startsWith("in up to 50.0% of a chain's sampling sweeps"), w);
        assertTrue(FitJob.skippedStepsWarning(new double[] {0.001}).startsWith("in up to 0.1%"));
    }

    @Test
    void attractionOffWritesNoneOfIt(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("off");
        String printed = fit(survey(dir), out, NumberAttraction.none());
        assertFalse(Files.exists(out.resolve("attraction.csv")));
        assertFalse(Files.readString(out.resolve("groups.csv")).contains("attract"));
        assertFalse(Files.readString(out.resolve("distributions.csv")).contains("attract"));
        String run = Files.readString(out.resolve("run.json"));
        assertTrue(run.contains("\"attraction\": \"none\""), run);
        assertFalse(run.contains("attraction_set") || run.contains("attraction_mean") || run.contains("latent_steps_skipped")
                || run.contains("comparison_fit"), run);
        // the plain model's tau_d moves, which 10 warm-up sweeps are too few to start
        assertTrue(run.contains("\"spread_moves_per_chain\": \"none; none\""), run);
        assertFalse(printed.contains("liked or avoided") || printed.contains("attraction.csv")
                || printed.contains("plain ordered probit"), printed);
    }
}
