package org.rungs.cli;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import org.rungs.examples.Demo;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.Scale;
import org.rungs.models.survey.SurveySpec;
import org.rungs.sampler.SamplerSettings;
import org.rungs.sampler.run.CheckpointPolicy;
import org.rungs.sampler.run.FitOutcome;
import org.rungs.sampler.run.FitRequest;
import org.rungs.sampler.run.SavedFit;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.ParameterException;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** {@code rungs fit}: fits the model to a survey file and writes draws, summaries and the run record. */
@Command(name = "fit", mixinStandardHelpOptions = true, sortOptions = false,
        customSynopsis = {"rungs fit [OPTIONS] FILE --rating=COL --out=DIR",
                "       rungs fit --resume=DIR [--thin=K] [--draws=N] [--report] [--threads=N]"},
        description = {"Fit the model to a survey file (CSV or TSV, optionally gzip-compressed, with a header row).",
                "Writes draws.csv, summary.csv, the corrected quantities (derived_draws.csv, derived_summary.csv, "
                        + "groups.csv, distributions.csv, coarse_shares.csv, attraction.csv with --attraction, "
                        + "coefficients.csv) and run.json to the output folder, and prints the summary.",
                "While it runs, the chains are saved every few seconds in DIR/.checkpoint; a fit that was killed or "
                        + "interrupted (Ctrl-C, exit code 130) continues with 'rungs fit --resume DIR' and then gives the "
                        + "same draws, bit for bit, as if it had never stopped. A fit that ends without converging keeps "
                        + "them too: 'rungs fit --resume DIR --thin K' (or --draws N) continues its chains without a new "
                        + "warm-up."})
final class FitCommand implements Callable<Integer> {
    /**
     * The options that may accompany --resume: they change neither the model nor the chains
     * (--thin and --draws only how long they run and which of their iterations are kept: a
     * multiple of the saved fit's thin, at least its draws).
     */
    private static final java.util.Set<String> RESUME_OPTIONS = java.util.Set.of("--resume", "--thin", "--draws", "--report",
            "--threads", "--checkpoint-seconds");

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", arity = "0..1", paramLabel = "FILE", description = "The survey file.")
    Path file;

    @Option(names = "--rating", paramLabel = "COL", description = "Column holding the rating (required unless --resume).")
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
    List<String> reference = new ArrayList<>();

    @Option(names = "--weight", paramLabel = "COL", description = "Survey weights; used in population summaries only, never in the likelihood. A row whose weight is missing is excluded from the whole fit (and counted), as the summaries need every used row's weight.")
    String weight;

    @Option(names = "--missing", split = ",", paramLabel = "CODE", description = "Codes meaning missing in every used column (e.g. 88,98,99), besides empty cells and NA; a rating of the scale is refused (say --missing-in RATINGCOL=CODE if it is meant).")
    List<String> missing = new ArrayList<>();

    @Option(names = "--missing-in", paramLabel = "COL=CODES", description = "Missing codes of one column, e.g. income=-1,999999. Repeatable.")
    List<String> missingIn = new ArrayList<>();

    @Mixin
    SamplingOptions sampling;

    @Option(names = "--out", paramLabel = "DIR", description = "Output folder (required unless --resume).")
    Path out;

    @Option(names = "--resume", paramLabel = "DIR", description = "Continue the fit in output folder DIR from its checkpoint (one "
            + "that was interrupted, or ended without converging), with the file, options and seed it was started with "
            + "(give no others; --report and --threads are allowed, and, to run its chains on, --thin K, a multiple "
            + "of the fit's, and --draws N, at least the fit's). Refused if the file has changed.")
    Path resume;

    @Option(names = "--checkpoint-seconds", hidden = true, defaultValue = "5", paramLabel = "S",
            description = "Seconds between checkpoint saves of each chain.")
    double checkpointSeconds;

    @Option(names = "--overwrite", description = "Replace the files of an earlier run in the output folder.")
    boolean overwrite;

    @Option(names = "--report", description = "Also write report.html, a self-contained page of charts (same as 'rungs report DIR').")
    boolean report;

    @Override
    public Integer call() {
        if (resume != null) {
            return resume();
        }
        if (file == null) {
            throw new ParameterException(spec.commandLine(), "Missing required parameter: 'FILE'");
        }
        if (rating == null) {
            throw new ParameterException(spec.commandLine(), "Missing required option: '--rating=COL'");
        }
        if (out == null) {
            throw new ParameterException(spec.commandLine(), "Missing required option: '--out=DIR'");
        }
        FitRequest request;
        try {
            request = request(sampling.settings());
        } catch (IllegalArgumentException e) {
            System.err.println("rungs fit: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        List<String> arguments = spec.commandLine().getParseResult().expandedArgs();
        return Runs.fit(request, report, CheckpointPolicy.start(arguments, checkpointSeconds), outcome -> { });
    }

    /** Rebuilds the saved fit's command from its arguments, with its file, seed and this folder. */
    private Integer resume() {
        CommandLine.ParseResult given = spec.commandLine().getParseResult();
        for (CommandLine.Model.OptionSpec o : given.matchedOptions()) {
            if (!RESUME_OPTIONS.contains(o.longestName())) {
                throw new ParameterException(spec.commandLine(), "--resume takes no " + o.longestName()
                        + ": the fit continues with the file, options and seed it was started with");
            }
        }
        if (file != null) {
            throw new ParameterException(spec.commandLine(), "--resume takes no FILE: the fit continues with the file it was started with");
        }
        FitRequest request;
        List<String> arguments = List.of();
        try {
            SavedFit saved = SavedFit.read(resume);
            if (saved.arguments().isEmpty()) {
                throw new IllegalArgumentException("the fit in " + resume + " was not started by 'rungs fit'; start it again");
            }
            FitCommand started = new FitCommand();
            new CommandLine(started).parseArgs(saved.arguments().toArray(new String[0]));
            started.file = saved.file();
            started.out = resume;
            started.sampling.seed = saved.seed();
            if (sampling.threads != null) {
                started.sampling.threads = sampling.threads;
            }
            List<String> changed = saved.arguments();
            if (sampling.thin != null) {
                int was = started.sampling.thin != null ? started.sampling.thin : 1;
                if (sampling.thin < was || sampling.thin % was != 0) {
                    throw new IllegalArgumentException("--thin " + sampling.thin + " is not a multiple of the fit's --thin "
                            + was + ": continued chains keep every r-th of the iterations they kept, so give "
                            + was + ", " + 2 * was + ", " + 3 * was + " or another multiple");
                }
                started.sampling.thin = sampling.thin;
                changed = with(changed, "--thin", sampling.thin);
            }
            if (given.hasMatchedOption("--draws")) {
                if (sampling.draws < started.sampling.draws) {
                    throw new IllegalArgumentException("--draws " + sampling.draws + " is fewer than the fit's --draws "
                            + started.sampling.draws + ": continued chains keep the draws they made, so give "
                            + started.sampling.draws + " or more");
                }
                started.sampling.draws = sampling.draws;
                changed = with(changed, "--draws", sampling.draws);
            }
            if (changed != saved.arguments()) {
                arguments = changed;
            }
            report = report || started.report;
            request = started.request(started.sampling.settings());
        } catch (IllegalArgumentException e) {
            System.err.println("rungs fit: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        boolean attraction = request.model().attraction().on();
        Path demoFile = request.file();
        return Runs.fit(request, report, CheckpointPolicy.resume(checkpointSeconds, arguments),
                outcome -> compareWithDemoTruth(outcome, demoFile, attraction));
    }

    /** A continued demo ends as the demo does, with its estimates against the true values (none for other fits). */
    private void compareWithDemoTruth(FitOutcome outcome, Path surveyFile, boolean attraction) {
        Map<String, Double> truth;
        try {
            truth = Demo.readTruth(resume, surveyFile);
        } catch (IllegalArgumentException | java.io.UncheckedIOException e) {
            System.err.println("rungs fit: the demo's true values are not compared: " + e.getMessage());
            return;
        }
        if (!truth.isEmpty()) {
            DemoCommand.printAgainstTruth(outcome, truth, attraction);
        }
    }

    /** {@code arguments} with their {@code option} (if any) replaced by {@code option=value}. */
    private static List<String> with(List<String> arguments, String option, int value) {
        List<String> out = Arguments.without(arguments, java.util.Set.of(option), java.util.Set.of());
        out.add(option + "=" + value);
        return out;
    }

    private FitRequest request(SamplerSettings settings) {
        SurveySpec.Builder survey = SurveySpec.builder(rating, Scale.parse(scale)).group(group)
                .level(level.toArray(new String[0])).style(style.toArray(new String[0])).categorical(categorical.toArray(new String[0]))
                .missingCodes(missing.toArray(new String[0]));
        referenceLevels().forEach(survey::reference);
        for (String m : missingIn) {
            int eq = m.indexOf('=');
            if (eq <= 0) {
                throw new IllegalArgumentException("--missing-in takes COL=CODE[,CODE...], got '" + m + "'");
            }
            survey.missingCodesFor(m.substring(0, eq), m.substring(eq + 1).split(","));
        }
        if (weight != null) {
            survey.weight(weight);
        }
        ModelSpec model = sampling.model();
        if (!model.styleClasses().coarse() && !style.isEmpty()) {
            // unused, the column would still exclude its rows with missing values
            throw new IllegalArgumentException("--style names covariates of the coarse class " + style
                    + ", and with --style-classes none there is none; leave --style out or use --style-classes coarse");
        }
        return new FitRequest(file, survey.build(), model, settings, out, overwrite, options(settings), sampling.crossValidate);
    }

    /** {@code --reference} as column to level; a column named twice is refused, not decided by order. */
    private Map<String, String> referenceLevels() {
        Map<String, String> levels = new LinkedHashMap<>();
        for (String r : reference) {
            int eq = r.indexOf('=');
            if (eq <= 0) {
                throw new IllegalArgumentException("--reference takes COL=LEVEL, got '" + r + "'");
            }
            String column = r.substring(0, eq);
            String earlier = levels.putIfAbsent(column, r.substring(eq + 1));
            if (earlier != null) {
                throw new IllegalArgumentException("--reference names the column " + column + " twice (" + earlier
                        + " and " + r.substring(eq + 1) + "); give it one reference level");
            }
        }
        return levels;
    }

    private Map<String, Object> options(SamplerSettings settings) {
        Map<String, Object> o = new LinkedHashMap<>();
        o.put("rating", rating);
        o.put("scale", scale);
        o.put("group", group);
        o.put("level", List.copyOf(level));
        o.put("style", List.copyOf(style));
        o.put("categorical", List.copyOf(categorical));
        o.put("reference", referenceLevels());
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
        o.put("thin", settings.thin());
        o.put("seed", settings.seed());
        o.put("threads", settings.threads());
        o.put("cross_validate", sampling.crossValidate);
        o.put("out", out.toString());
        o.put("overwrite", overwrite);
        return o;
    }
}
