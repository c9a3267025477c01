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
import org.rungs.models.survey.SurveySpec;
import org.rungs.posteriors.report.CrossValidationComparison;
import org.rungs.priors.Priors;
import org.rungs.sampler.SamplerSettings;

/**
 * A fit with {@code --cross-validate}: what cross_validation.csv and run.json hold, that the
 * threads do not change them, and that leave-one-out cross-validation prefers the model that made
 * the data: on ratings where three respondents in ten answer only 0, 5 or 10, the coarse class
 * against the plain ordered probit.
 */
class FitJobCrossValidationTest {
    private static final Scale SCALE = new Scale(0, 10);
    private static final double[] CUTS = {-2.2, -1.6, -1.1, -0.6, -0.2, 0.2, 0.6, 1.1, 1.6, 2.2};

    /**
     * Three invented regions of 300, level = region effect + 0.6 income + N(0, 1); three in five
     * respondents with basic schooling (two in five have it) and one in ten of the others round
     * their answer to the nearest of 0, 5, 10; rows 2, 50 and 51 lack their income, so the fit
     * leaves them out.
     */
    private static Path survey(Path dir) throws IOException {
        Random random = new Random(20261205);
        StringBuilder csv = new StringBuilder("region,rating,income,schooling\n");
        int row = 1;
        String[] regions = {"Ashgrove", "Bellmoor", "Cindervale"};
        for (int g = 0; g < regions.length; g++) {
            for (int i = 0; i < 300; i++) {
                row++;
                double income = random.nextGaussian();
                boolean basic = random.nextDouble() < 0.4;
                double level = 0.3 * (g - 1) + 0.6 * income + random.nextGaussian();
                int k = 0;
                while (k < CUTS.length && level > CUTS[k]) {
                    k++;
                }
                if (random.nextDouble() < (basic ? 0.6 : 0.1)) {
                    k = k < 3 ? 0 : k < 8 ? 5 : 10;
                }
                String incomeText = row == 2 || row == 50 || row == 51 ? "NA" : Double.toString(income);
                csv.append(regions[g]).append(',').append(k).append(',').append(incomeText).append(',')
                        .append(basic ? "basic" : "more").append('\n');
            }
        }
        Path file = dir.resolve("survey.csv");
        Files.writeString(file, csv);
        return file;
    }

    private static String fit(Path file, Path out, boolean coarse, int threads) throws Exception {
        return fit(file, out, coarse, threads, 300, 250);
    }

    private static String fit(Path file, Path out, boolean coarse, int threads, int warmup, int draws) throws Exception {
        SurveySpec.Builder spec = SurveySpec.builder("rating", SCALE).group("region").level("income");
        if (coarse) {
            spec.style("schooling");
        }
        ModelSpec model = new ModelSpec(ThresholdMode.BY_GROUP, Priors.defaults(),
                coarse ? StyleClasses.coarse(null) : StyleClasses.none(), NumberAttraction.none());
        FitRequest request = new FitRequest(file, spec.build(), model, new SamplerSettings(2, warmup, draws, 11, threads), out,
                false, Map.of(), true);
        ByteArrayOutputStream stdout = new ByteArrayOutputStream();
        FitJob.run(request, new PrintStream(stdout, true, StandardCharsets.UTF_8),
                new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8), new AtomicBoolean());
        return stdout.toString(StandardCharsets.UTF_8);
    }

    @Test
    void writesEveryUsedRowAndPrefersTheModelThatMadeTheData(@TempDir Path dir) throws Exception {
        Path file = survey(dir);
        Path plain = dir.resolve("plain");
        Path coarse = dir.resolve("coarse");
        String console = fit(file, plain, false, 2);
        fit(file, coarse, true, 2);
        assertTrue(console.contains("Leave-one-out cross-validation (PSIS, 500 draws): elpd_loo "), console);
        assertTrue(console.contains("cross_validation.csv"), console);

        List<String> lines = Files.readAllLines(plain.resolve("cross_validation.csv"));
        assertEquals("row,rating,elpd_loo,p_loo,pareto_k,mcse_elpd_loo,group", lines.get(0));
        assertEquals(900 - 3 + 1, lines.size());
        // the file's rows in order, the three without income left out
        assertEquals("3", lines.get(1).split(",")[0]);
        assertEquals("52", lines.get(48).split(",")[0]);
        assertEquals("Ashgrove", lines.get(1).split(",")[6]);
        double sum = 0;
        for (String line : lines.subList(1, lines.size())) {
            String[] field = line.split(",");
            double elpd = Double.parseDouble(field[2]);
            // a rating's predictive probability is below 1, and no respondent is worse predicted than
            // a 1-in-10^6 chance in a model this close to the data (common practice, no source)
            assertTrue(elpd < 0 && elpd > Math.log(1e-6), line);
            sum += elpd;
        }
        String run = Files.readString(plain.resolve("run.json"));
        assertTrue(run.contains("\"cross_validation\""), run);
        assertTrue(run.contains("\"respondents\": 897"), run);
        double recorded = Double.parseDouble(run.replaceAll("(?s).*\"elpd_loo\": (-?[0-9.eE-]+).*", "$1"));
        assertEquals(sum, recorded, 1e-9 * Math.abs(sum));

        // about 270 of 900 answers moved to 0, 5 and 10, mostly by respondents with basic schooling:
        // the coarse class predicts them better than wider categories at 0, 5 and 10 can; the margin
        // asked is 4 standard errors of the paired difference (2 to 4 is the usual reading, common
        // practice, no source)
        List<CrossValidationComparison.Fit> compared = CrossValidationComparison.compare(List.of(plain, coarse));
        assertEquals(coarse, compared.get(0).dir());
        CrossValidationComparison.Fit worse = compared.get(1);
        assertTrue(-worse.difference() > 4 * worse.differenceSe(), worse.toString());
        assertFalse(CrossValidationComparison.format(compared).isEmpty());
    }

    /**
     * The derived quantities use every kept draw up to FitJob.DERIVED_DRAWS (4,000), the
     * cross-validation every second one here, to stay within its 1,000.
     */
    @Test
    void theDerivedQuantitiesUseEveryDrawAndTheCrossValidationAThousandAtMost(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("long");
        String console = fit(survey(dir), out, false, 2, 100, 600);
        String run = Files.readString(out.resolve("run.json"));
        assertTrue(run.contains("\"derived_draws\": 1200"), run);
        // the report reads the derived quantities' verdict from run.json, converged or not
        assertTrue(run.matches("(?s).*\"derived_verdict\": \"(All|Converged within|Not converged)[^\"]* derived quantities.*"), run);
        assertEquals(1 + 1200, Files.readAllLines(out.resolve("derived_draws.csv")).size());
        assertTrue(console.contains("Leave-one-out cross-validation (PSIS, 600 draws)"), console);
    }

    @Test
    void threadsDoNotChangeTheEstimates(@TempDir Path dir) throws Exception {
        Path file = survey(dir);
        fit(file, dir.resolve("one"), true, 1);
        fit(file, dir.resolve("two"), true, 2);
        assertEquals(Files.readString(dir.resolve("one").resolve("cross_validation.csv")),
                Files.readString(dir.resolve("two").resolve("cross_validation.csv")));
    }
}
