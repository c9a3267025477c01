package org.rungs.examples;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.SurveySpec;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.sampler.SamplerSettings;
import org.rungs.sampler.run.FitOutcome;
import org.rungs.sampler.run.FitRequest;
import org.rungs.sampler.run.OutputFolder;

/**
 * The built-in demo: draws the invented survey of {@link DemoScenario}, writes it and its true
 * parameters into the output folder, and prepares the fit of that file, so the demo exercises
 * the same path as a user's own file.
 */
public final class Demo {
    /** Name of the demo's survey file in the output folder. */
    public static final String SURVEY_FILE = "demo-survey.csv";
    /** Name of the file of the demo's true parameter values. */
    public static final String TRUTH_FILE = "demo-truth.csv";

    private static final Scale SCALE = new Scale(0, 10);

    /** A prepared demo fit and the values it should recover. */
    public record Prepared(FitRequest request, Map<String, Double> truth) {
    }

    private Demo() {
    }

    /**
     * Writes the demo survey and truth to {@code out} and returns the fit request, with the
     * leave-one-out cross-validation if {@code crossValidate}.
     *
     * @throws IllegalArgumentException if {@code out} holds another run and overwriting was not asked for
     */
    public static Prepared prepare(Path out, boolean overwrite, ModelSpec model, SamplerSettings settings,
            boolean crossValidate) {
        model.checkRatings(SCALE);
        OutputFolder folder = OutputFolder.check(out, overwrite);
        SimulatedSurvey data = Simulator.simulate(DemoScenario.scenario(), DemoScenario.SEED);
        Path file = folder.write(SURVEY_FILE, data::writeCsv);
        folder.write(TRUTH_FILE, data::writeTruth);
        SurveySpec spec = SurveySpec.builder(SimulatedSurvey.RATING_COLUMN, SCALE)
                .group(SimulatedSurvey.GROUP_COLUMN)
                .level(data.covariateNames().toArray(new String[0]))
                .style(data.styleCovariateNames().toArray(new String[0]))
                .build();
        Map<String, Object> options = new LinkedHashMap<>();
        options.put("demo", "invented survey of " + data.groupLabels().size() + " fictional regions, seed " + DemoScenario.SEED);
        options.put("thresholds", model.thresholdMode().label());
        options.put("chains", settings.chains());
        options.put("warmup", settings.warmup());
        options.put("draws", settings.draws());
        options.put("thin", settings.thin());
        options.put("seed", settings.seed());
        options.put("threads", settings.threads());
        options.put("cross_validate", crossValidate);
        return new Prepared(new FitRequest(file, spec, model, settings, out, true, options, crossValidate), data.truth());
    }

    /**
     * The true values of the demo whose files are in {@code folder}, as {@link #prepare} wrote
     * them ({@link SimulatedSurvey#writeTruth}), or an empty map when the folder holds no demo: a
     * fit continued there by 'rungs fit --resume' compares its estimates with them as the demo does.
     *
     * @throws IllegalArgumentException naming the row of a line that is not 'parameter,value'
     */
    public static Map<String, Double> readTruth(Path folder, Path surveyFile) {
        Path file = folder.resolve(TRUTH_FILE);
        if (!surveyFile.getFileName().toString().equals(SURVEY_FILE) || !Files.isRegularFile(file)) {
            return Map.of();
        }
        Map<String, Double> truth = new LinkedHashMap<>();
        try (BufferedReader in = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            String line = in.readLine();
            int row = 1;
            if (!"parameter,value".equals(line)) {
                throw new IllegalArgumentException(file + ", row 1: expected the header 'parameter,value', found '" + line + "'");
            }
            while ((line = in.readLine()) != null) {
                row++;
                int comma = line.indexOf(',');
                Double value = comma > 0 ? number(line.substring(comma + 1)) : null;
                if (value == null) {
                    throw new IllegalArgumentException(file + ", row " + row + ": expected a parameter's name and its true"
                            + " value, found '" + line + "'");
                }
                truth.put(line.substring(0, comma), value);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + file + ": " + e.getMessage(), e);
        }
        return truth;
    }

    /** The number {@code text} holds, or null. */
    private static Double number(String text) {
        try {
            return Double.parseDouble(text);
        } catch (NumberFormatException e) {
            return null;
        }
    }

    /** Common parameters and the per-group corrected means; group thresholds are counted, not shown. */
    private static boolean shown(String name) {
        if (name.startsWith("threshold.")) {
            return name.chars().filter(c -> c == '.').count() == 1;
        }
        return !name.startsWith("style_group.") && !name.startsWith("harmonised_mean.");
    }

    /**
     * A table of the true values beside the posterior of the main parameters, and how many true
     * values fall inside their 90% intervals.
     */
    public static String compare(FitOutcome outcome, Map<String, Double> truth, boolean attractionFitted) {
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "%-34s %9s %9s %20s%n", "parameter", "true", "mean", "90% interval"));
        int inside = 0;
        int total = 0;
        List<ParameterSummary> rows = new java.util.ArrayList<>(outcome.summaries());
        rows.addAll(outcome.derived());
        for (ParameterSummary s : rows) {
            Double t = truth.get(s.name());
            if (t == null) {
                continue;
            }
            total++;
            boolean covered = s.q05() <= t && t <= s.q95();
            if (covered) {
                inside++;
            }
            if (shown(s.name())) {
                sb.append(row(s.name(), t, s.mean(), s.q05(), s.q95(), covered));
            }
        }
        sb.append(coverage(inside, total, attractionFitted));
        return sb.toString();
    }

    /**
     * One line of the table, with three decimals, or as many as show the row's largest value to
     * three significant digits (an effect per year of age, -0.004, would read -0.004 against an
     * interval of [-0.003, -0.002] and not show why it lies outside).
     */
    static String row(String name, double truth, double mean, double q05, double q95, boolean covered) {
        double largest = Math.max(Math.max(Math.abs(truth), Math.abs(mean)), Math.max(Math.abs(q05), Math.abs(q95)));
        int decimals = largest >= 0.1 || largest == 0 || !Double.isFinite(largest)
                ? 3 : Math.min(9, 2 - (int) Math.floor(Math.log10(largest)));
        String number = "%9." + decimals + "f";
        String interval = "%8." + decimals + "f";
        return String.format(Locale.ROOT, "%-34s " + number + " " + number + " [" + interval + ", " + interval + "]%s%n",
                name, truth, mean, q05, q95, covered ? "" : "  outside");
    }

    /** The coverage line under the table; whether the fit left out the number attraction that the demo data carry changes what to expect. */
    static String coverage(int inside, int total, boolean attractionFitted) {
        String expected = attractionFitted
                ? "expected of a converged fit of the model that made the data, which this fit is (number attraction included).%n"
                : "expected of a converged fit of the model that made the data; the demo data also carry number attraction,%n"
                        + "which the demo's fit leaves out (--attraction default fits it), so the thresholds and coarse shares absorb%n"
                        + "it and fewer intervals cover.%n";
        return String.format(Locale.ROOT,
                "%d of %d true values lie inside their 90%% intervals (group thresholds counted, not all shown). About 90%% would be%n"
                        + expected, inside, total);
    }
}
