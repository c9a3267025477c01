package org.rungs.cli;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.SurveySpec;
import org.rungs.sampler.SamplerSettings;
import org.rungs.sampler.run.FitRequest;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code rungs fit}: fits the model to a survey file and writes draws, summaries and the run record. */
@Command(name = "fit", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Fit the model to a survey file (CSV or TSV, optionally gzip-compressed, with a header row).",
                "Writes draws.csv, summary.csv and run.json to the output folder and prints the summary."})
final class FitCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "FILE", description = "The survey file.")
    Path file;

    @Option(names = "--rating", required = true, paramLabel = "COL", description = "Column holding the rating.")
    String rating;

    @Option(names = "--scale", defaultValue = "0..10", paramLabel = "L..U", description = "The rating scale, e.g. 0..10, 1..7. Default: ${DEFAULT-VALUE}.")
    String scale;

    @Option(names = "--group", paramLabel = "COL", description = "Column holding the group (country, region, wave); none means one group.")
    String group;

    @Option(names = "--level", split = ",", paramLabel = "COL", description = "Covariates of the latent level, comma-separated.")
    List<String> level = new ArrayList<>();

    @Option(names = "--style", split = ",", paramLabel = "COL", description = "Covariates of the response style (the probability of being a coarse responder), e.g. education.")
    List<String> style = new ArrayList<>();

    @Option(names = "--categorical", split = ",", paramLabel = "COL", description = "Covariates to read as categories even if numeric.")
    List<String> categorical = new ArrayList<>();

    @Option(names = "--reference", split = ",", paramLabel = "COL=LEVEL", description = "Reference level of a categorical covariate (default: its most frequent level).")
    Map<String, String> reference = new LinkedHashMap<>();

    @Option(names = "--weight", paramLabel = "COL", description = "Survey weights; used in population summaries only, never in the likelihood.")
    String weight;

    @Option(names = "--missing", split = ",", paramLabel = "CODE", description = "Codes meaning missing in every used column (e.g. 88,98,99), besides empty cells and NA.")
    List<String> missing = new ArrayList<>();

    @Option(names = "--missing-in", paramLabel = "COL=CODES", description = "Missing codes of one column, e.g. income=-1,999999. Repeatable.")
    List<String> missingIn = new ArrayList<>();

    @Mixin
    SamplingOptions sampling;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Output folder.")
    Path out;

    @Option(names = "--overwrite", description = "Replace the files of an earlier run in the output folder.")
    boolean overwrite;

    @Option(names = "--report", description = "Also write report.html, a self-contained page of charts (same as 'rungs report DIR').")
    boolean report;

    @Override
    public Integer call() {
        PrintStream err = System.err;
        FitRequest request;
        try {
            SurveySpec.Builder spec = SurveySpec.builder(rating, Scale.parse(scale)).group(group)
                    .level(level.toArray(new String[0])).style(style.toArray(new String[0])).categorical(categorical.toArray(new String[0]))
                    .missingCodes(missing.toArray(new String[0]));
            reference.forEach(spec::reference);
            for (String m : missingIn) {
                int eq = m.indexOf('=');
                if (eq <= 0) {
                    throw new IllegalArgumentException("--missing-in takes COL=CODE[,CODE...], got '" + m + "'");
                }
                spec.missingCodesFor(m.substring(0, eq), m.substring(eq + 1).split(","));
            }
            if (weight != null) {
                spec.weight(weight);
            }
            SamplerSettings settings = sampling.settings();
            request = new FitRequest(file, spec.build(), sampling.model(), settings, out, overwrite, options(settings));
        } catch (IllegalArgumentException e) {
            err.println("rungs fit: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        return Runs.fit(request, report);
    }

    private Map<String, Object> options(SamplerSettings settings) {
        Map<String, Object> o = new LinkedHashMap<>();
        o.put("rating", rating);
        o.put("scale", scale);
        o.put("group", group);
        o.put("level", List.copyOf(level));
        o.put("style", List.copyOf(style));
        o.put("categorical", List.copyOf(categorical));
        o.put("reference", new LinkedHashMap<>(reference));
        o.put("weight", weight);
        o.put("missing", List.copyOf(missing));
        o.put("missing_in", List.copyOf(missingIn));
        o.put("thresholds", sampling.thresholds);
        o.put("style_classes", sampling.styleClasses);
        o.put("coarse_points", sampling.coarsePoints == null ? "default" : java.util.Arrays.toString(sampling.coarsePoints));
        o.put("prior", List.copyOf(sampling.priors));
        o.put("chains", settings.chains());
        o.put("warmup", settings.warmup());
        o.put("draws", settings.draws());
        o.put("seed", settings.seed());
        o.put("threads", settings.threads());
        o.put("out", out.toString());
        o.put("overwrite", overwrite);
        return o;
    }
}
