package org.rungs.cli;

import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.rungs.examples.Demo;
import org.rungs.models.ModelSpec;
import org.rungs.models.survey.SurveyInputException;
import org.rungs.sampler.run.FitJob;
import org.rungs.sampler.run.FitOutcome;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code rungs demo}: fits the built-in invented survey and compares the estimates with the truth. */
@Command(name = "demo", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Fit the built-in demo: an invented 0..10 survey of 12 fictional regions with income and age.",
                "Writes the demo data, its true parameters and the fit's files to the output folder."})
final class DemoCommand implements Callable<Integer> {
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
            FitOutcome outcome = FitJob.run(demo.request(), System.out, System.err, interruption.flag());
            if (outcome.summaries().isEmpty()) {
                System.err.println("rungs demo: stopped before any draw was kept; run the demo again");
                return Main.INTERRUPTED;
            }
            System.out.println();
            System.out.println("Estimates against the values the demo data were drawn from:");
            System.out.print(Demo.compare(outcome, demo.truth(), model.attraction().on()));
            Runs.writeReport(out);
            if (outcome.interrupted()) {
                System.err.println("rungs demo: stopped early; the files hold the draws kept so far; run the demo again"
                        + " for the whole fit");
            }
            return outcome.interrupted() ? Main.INTERRUPTED : 0;
        } catch (SurveyInputException | IllegalArgumentException | UncheckedIOException e) {
            System.err.println("rungs demo: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }
}
