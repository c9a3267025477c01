package org.rungs.sampler.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
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
import org.rungs.models.survey.SurveySpec;
import org.rungs.priors.Priors;
import org.rungs.sampler.SamplerSettings;

/**
 * What a fit leaves in its output folder when it replaces an earlier run, when its input lies in
 * that folder, when Ctrl-C comes after the chains ended, and when a covariate is constant within
 * the groups: never one run's files beside another's, and never a figure that is not what its
 * column says.
 */
class FitJobFolderTest {
    private static final Scale SCALE = new Scale(0, 10);
    private static final List<String> NO_ARGUMENTS = List.of();

    /**
     * Three invented regions of 150: level = region effect + 0.5 income + N(0, 1), cut at fixed
     * thresholds; one in five respondents rounds to 0, 5 or 10; {@code policy} is 1 in the second
     * region and 0 elsewhere (constant within each region).
     */
    private static Path survey(Path file) throws IOException {
        Random random = new Random(5);
        double[] cuts = {-2.2, -1.6, -1.1, -0.6, -0.2, 0.2, 0.6, 1.1, 1.6, 2.2};
        StringBuilder csv = new StringBuilder("region,rating,income,policy\n");
        String[] regions = {"Ashgrove", "Bellmoor", "Cindervale"};
        for (int g = 0; g < regions.length; g++) {
            for (int i = 0; i < 150; i++) {
                double income = random.nextGaussian();
                double level = 0.3 * (g - 1) + 0.5 * income + random.nextGaussian();
                int k = 0;
                while (k < cuts.length && level > cuts[k]) {
                    k++;
                }
                if (random.nextDouble() < 0.2) {
                    k = k < 3 ? 0 : k < 8 ? 5 : 10;
                }
                csv.append(regions[g]).append(',').append(k).append(',').append(income).append(',')
                        .append(g == 1 ? 1 : 0).append('\n');
            }
        }
        Files.createDirectories(file.getParent());
        Files.writeString(file, csv);
        return file;
    }

    private static FitRequest request(Path file, Path out, boolean overwrite, boolean crossValidate, String... level) {
        return request(file, out, overwrite, crossValidate, 1, level);
    }

    private static FitRequest request(Path file, Path out, boolean overwrite, boolean crossValidate, int thin, String... level) {
        SurveySpec spec = SurveySpec.builder("rating", SCALE).group("region").level(level).build();
        ModelSpec model = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(), StyleClasses.coarse(null),
                NumberAttraction.none());
        return new FitRequest(file, spec, model, new SamplerSettings(2, 150, 100, 3, 2, thin), out, overwrite, Map.of(),
                crossValidate);
    }

    private static PrintStream quiet() {
        return new PrintStream(OutputStream.nullOutputStream(), true, StandardCharsets.UTF_8);
    }

    @Test
    void aRunReplacingAnotherRemovesTheFilesItDoesNotWriteAndKeepsTheUsersOwn(@TempDir Path dir) throws Exception {
        Path file = survey(dir.resolve("survey.csv"));
        Path out = dir.resolve("out");
        FitJob.run(request(file, out, false, true, "income"), quiet(), quiet(), new AtomicBoolean());
        assertTrue(Files.exists(out.resolve("cross_validation.csv")));
        Files.writeString(out.resolve("report.html"), "an earlier report");
        Files.writeString(out.resolve("notes.txt"), "the user's own");
        // what a run killed while writing leaves (OutputFolder.write, AtomicFiles.write)
        Files.writeString(out.resolve(".groups.csv.4711-3.partial"), "half");
        Files.writeString(out.resolve("..groups.csv.4711-3.partial.4711-4.tmp"), "half");

        ByteArrayOutputStream console = new ByteArrayOutputStream();
        FitJob.run(request(file, out, true, false), new PrintStream(console, true, StandardCharsets.UTF_8), quiet(),
                new AtomicBoolean());

        try (var files = Files.list(out)) {
            List<String> names = files.map(p -> p.getFileName().toString()).sorted().toList();
            assertEquals(List.of("coarse_shares.csv", "derived_draws.csv", "derived_summary.csv", "distributions.csv",
                    "draws.csv", "groups.csv", "notes.txt", "run.json", "summary.csv"), names);
        }
        String printed = console.toString(StandardCharsets.UTF_8);
        assertTrue(printed.contains(": draws.csv, summary.csv, derived_draws.csv, derived_summary.csv, groups.csv,"
                + " distributions.csv, coarse_shares.csv, run.json\n"), printed);
    }

    @Test
    void anInputNamedLikeAResultInTheOutputFolderIsRefusedBeforeAnythingIsWritten(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("out");
        Path file = survey(out.resolve("groups.csv"));
        String before = Files.readString(file);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> FitJob.run(request(file, out, true, false), quiet(), quiet(), new AtomicBoolean()));
        assertTrue(e.getMessage().contains("has the name of a file the fit writes"), e.getMessage());
        assertEquals(before, Files.readString(file));
        try (var files = Files.list(out)) {
            assertEquals(1, files.count());
        }
    }

    /**
     * Ctrl-C while the plain ordered probit of coefficients.csv is fitted, after the chains ended:
     * the fit counts as interrupted, the plain columns stay empty instead of repeating the model's
     * own effects, the checkpoint is kept, and resuming gives the uninterrupted run's files.
     */
    @Test
    void ctrlCAfterSamplingLeavesAnInterruptedFitThatResumesToTheWholeOne(@TempDir Path dir) throws Exception {
        Path file = survey(dir.resolve("survey.csv"));
        Path whole = dir.resolve("whole");
        FitJob.run(request(file, whole, false, false, "income"), quiet(), quiet(), new AtomicBoolean());

        Path cut = dir.resolve("cut");
        AtomicBoolean stop = new AtomicBoolean();
        PrintStream stopsAtTheComparison = new PrintStream(new OutputStream() {
            private final StringBuilder line = new StringBuilder();

            @Override
            public void write(int b) {
                line.append((char) b);
                if (line.indexOf("fitting the plain ordered probit") >= 0) {
                    stop.set(true);
                }
                if (b == '\n') {
                    line.setLength(0);
                }
            }
        }, true, StandardCharsets.UTF_8);
        FitOutcome outcome = FitJob.run(request(file, cut, false, false, "income"), quiet(), stopsAtTheComparison, stop,
                CheckpointPolicy.start(List.of("fit"), 60));

        assertTrue(stop.get());
        assertFalse(outcome.result().interrupted(), "the chains ended before the stop");
        assertTrue(outcome.interrupted());
        assertTrue(Files.readString(cut.resolve("run.json")).contains("\"interrupted\": true"));
        assertTrue(SavedFit.existsIn(cut));
        String income = Files.readAllLines(cut.resolve("coefficients.csv")).get(1);
        assertTrue(income.matches("income,numeric,[^,]+,[^,]+,[^,]+,[^,]+,[^,]+,[^,]+,[^,]+,,,,[^,]+"), income);

        FitOutcome resumed = FitJob.run(request(file, cut, false, false, "income"), quiet(), quiet(), new AtomicBoolean(),
                CheckpointPolicy.resume(60));
        assertFalse(resumed.interrupted());
        // kept only when the short chains have not converged, for more thinning to continue them
        assertEquals(!resumed.converged(), SavedFit.existsIn(cut));
        for (String name : List.of("draws.csv", "derived_draws.csv", "coefficients.csv")) {
            assertEquals(Files.readString(whole.resolve(name)), Files.readString(cut.resolve(name)), name);
        }
    }

    /**
     * A fit that ends without converging keeps its chains; resumed with a multiple of its thin, it
     * runs them on without a new warm-up and writes the files of a fit started with that thin,
     * byte for byte (a chain's sweeps and random stream do not depend on which iterations are kept).
     */
    @Test
    void aFitThatHasNotConvergedContinuesWithMoreThinningToTheThinnedFit(@TempDir Path dir) throws Exception {
        Path file = survey(dir.resolve("survey.csv"));
        Path thinned = dir.resolve("thinned");
        FitJob.run(request(file, thinned, false, false, 3, "income"), quiet(), quiet(), new AtomicBoolean());

        Path continued = dir.resolve("continued");
        ByteArrayOutputStream console = new ByteArrayOutputStream();
        FitOutcome first = FitJob.run(request(file, continued, false, false, 1, "income"),
                new PrintStream(console, true, StandardCharsets.UTF_8), quiet(), new AtomicBoolean(),
                CheckpointPolicy.start(List.of("fit"), 60));
        assertFalse(first.converged(), "100 draws of short chains are meant to leave the fit unconverged");
        assertTrue(SavedFit.existsIn(continued), "an unconverged fit keeps its chains");
        assertTrue(console.toString(StandardCharsets.UTF_8).contains("'rungs fit --resume " + continued + " --thin "),
                console.toString(StandardCharsets.UTF_8));
        assertTrue(Files.readString(continued.resolve("run.json")).contains("\"continuable\": true"));

        FitJob.run(request(file, continued, false, false, 3, "income"), quiet(), quiet(), new AtomicBoolean(),
                CheckpointPolicy.resume(60, List.of("fit", "--thin=3")));
        for (String name : List.of("draws.csv", "summary.csv", "derived_draws.csv", "groups.csv", "coefficients.csv")) {
            assertEquals(Files.readString(thinned.resolve(name)), Files.readString(continued.resolve(name)), name);
        }
        if (SavedFit.existsIn(continued)) {
            assertEquals(List.of("fit", "--thin=3"), SavedFit.read(continued).arguments(), "a later resume keeps the new thin");
        }
    }

    @Test
    void aCovariateConstantWithinTheGroupsHasAnEmptyNaiveCellAndAWarning(@TempDir Path dir) throws Exception {
        Path file = survey(dir.resolve("survey.csv"));
        Path out = dir.resolve("out");
        FitOutcome outcome = FitJob.run(request(file, out, false, false, "income", "policy"), quiet(), quiet(),
                new AtomicBoolean());
        List<String> rows = Files.readAllLines(out.resolve("coefficients.csv"));
        assertFalse(rows.get(1).split(",", -1)[8].isEmpty(), rows.get(1));
        String[] policy = rows.get(2).split(",", -1);
        assertEquals("policy", policy[0]);
        assertTrue(policy[8].isEmpty() && policy[12].isEmpty(), rows.get(2));
        assertTrue(outcome.warnings().stream().anyMatch(w -> w.contains("cannot estimate the effect of policy")),
                outcome.warnings().toString());
    }
}
