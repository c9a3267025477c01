package org.rungs.cli;

import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;
import org.rungs.examples.Demo;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.SurveyInputException;
import org.rungs.models.survey.SurveySpec;
import org.rungs.sampler.run.CheckpointPolicy;
import org.rungs.sampler.run.FitJob;
import org.rungs.sampler.run.FitOutcome;
import org.rungs.sampler.run.FitRequest;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** {@code rungs demo}: fits the built-in invented survey and compares the estimates with the truth. */
@Command(name = "demo", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Fit the built-in demo: an invented 0..10 survey of 12 fictional regions with income and age.",
                "Writes the demo data, its true parameters and the fit's files to the output folder. A demo that "
                        + "is stopped, or ends without converging, keeps its chains: 'rungs fit --resume DIR' continues it "
                        + "(with --thin K to run unconverged chains on)."})
final class DemoCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--out", defaultValue = "rungs-demo", paramLabel = "DIR", description = "Output folder. Default: ${DEFAULT-VALUE}.")
    Path out;

    // fallbackValue: without it picocli sets a negatable option that is true by default to false when given
    @Option(names = "--overwrite", defaultValue = "true", fallbackValue = "true", negatable = true,
            description = "Replace the files of an earlier demo run in the output folder. Default: ${DEFAULT-VALUE}.")
    boolean overwrite;

    @Mixin
    SamplingOptions sampling;

    @Override
    public Integer call() {
        if (sampling.seed == null) {
            sampling.seed = 1L;
        }
        ModelSpec model;
        Demo.Prepared demo;
        try {
            model = sampling.model();
            if (sampling.thin == null) {
                sampling.thin = SamplingOptions.DEMO_THIN;
            }
            demo = Demo.prepare(out, overwrite, model, sampling.settings(), sampling.crossValidate);
        } catch (IllegalArgumentException e) {
            System.err.println("rungs demo: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        System.err.println("rungs: demo data written to " + out.resolve(Demo.SURVEY_FILE) + " (true values in "
                + Demo.TRUTH_FILE + ")");
        try (Interruption interruption = new Interruption()) {
            FitOutcome outcome = FitJob.run(demo.request(), System.out, System.err, interruption.flag(),
                    CheckpointPolicy.start(fitArguments(demo.request()), CheckpointPolicy.DEFAULT_SECONDS));
            if (outcome.summaries().isEmpty()) {
                System.err.println("rungs demo: stopped before any draw was kept; 'rungs fit --resume " + out
                        + "' continues it, or run the demo again");
                return Main.INTERRUPTED;
            }
            printAgainstTruth(outcome, demo.truth(), model.attraction().on());
            Runs.writeReport(out);
            if (outcome.interrupted()) {
                System.err.println("rungs demo: stopped early; the files hold the draws kept so far; 'rungs fit --resume "
                        + out + "' finishes the fit");
            }
            return outcome.interrupted() ? Main.INTERRUPTED : 0;
        } catch (SurveyInputException | IllegalArgumentException | UncheckedIOException e) {
            System.err.println("rungs demo: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }

    /** The demo's closing table of estimates against the true values, then the fit's advice, if any. */
    static void printAgainstTruth(FitOutcome outcome, Map<String, Double> truth, boolean attractionFitted) {
        System.out.println();
        System.out.println("Estimates against the values the demo data were drawn from:");
        System.out.print(Demo.compare(outcome, truth, attractionFitted));
        if (outcome.advice() != null) {
            // said after the summary too, but a newcomer reads the end of the demo's output
            System.out.println();
            System.out.println(outcome.advice());
        }
    }

    /**
     * The 'rungs fit' arguments that fit the demo's survey file as the demo does: its columns,
     * this command's own model and sampler options (the demo's seed and thin included), and
     * --report, as the demo writes one. Kept with the checkpoint, so that 'rungs fit --resume'
     * continues a demo that was interrupted or has not converged.
     */
    private List<String> fitArguments(FitRequest request) {
        SurveySpec survey = request.survey();
        List<String> args = new ArrayList<>(List.of(request.file().toString(), "--rating", survey.ratingColumn(),
                "--group", survey.groupColumn(), "--out", out.toString(), "--report"));
        if (!survey.levelColumns().isEmpty()) {
            args.addAll(List.of("--level", String.join(",", survey.levelColumns())));
        }
        if (!survey.styleColumns().isEmpty()) {
            args.addAll(List.of("--style", String.join(",", survey.styleColumns())));
        }
        // the demo's own options, its output folder, seed and thin given anew below
        args.addAll(Arguments.without(spec.commandLine().getParseResult().expandedArgs(),
                Set.of("--out", "--seed", "--thin"), Set.of("--overwrite", "--no-overwrite")));
        args.add("--seed=" + request.settings().seed());
        args.add("--thin=" + request.settings().thin());
        return args;
    }
}
