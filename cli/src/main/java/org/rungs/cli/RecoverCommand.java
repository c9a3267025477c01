package org.rungs.cli;

import java.io.PrintStream;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.validation.recovery.DemoTruth;
import org.rungs.validation.recovery.Recovery;
import org.rungs.validation.recovery.RecoveryConfig;
import org.rungs.validation.recovery.RecoveryReport;
import org.rungs.validation.recovery.RecoverySummary;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/** {@code rungs recover}: a recovery and coverage study of the engine on the demo's fixed truth. */
@Command(name = "recover", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Measure how well the engine recovers a fixed truth.",
                "Each replication draws a survey from the demo scenario (or a smaller version of it), fits it and sets "
                        + "every posterior summary beside the true value. Writes recovery.csv (bias, RMSE and the coverage "
                        + "of the 50%% and 90%% intervals per quantity, with Monte Carlo standard errors), replications.csv "
                        + "and summary.txt to the output folder; a rerun with the same folder skips finished replications. "
                        + "See VALIDATION.md."})
final class RecoverCommand implements Callable<Integer> {
    @Option(names = "--truth", paramLabel = "WHICH",
            description = "The demo's truth: demo (coarse class and number attraction), no-attraction (coarse class only) "
                    + "or plain (neither). Default: demo with --attraction, else no-attraction with --style-classes coarse, "
                    + "plain with none.")
    String truth;

    @Option(names = "--attraction", paramLabel = "SET", defaultValue = "none",
            description = "Number attraction of the fitted model (MODEL.md 4b): none, default (every number but the coarse points) "
                    + "or ratings such as 3,7. Default: ${DEFAULT-VALUE}.")
    String attraction;

    @Option(names = "--style-classes", paramLabel = "MODE", defaultValue = "coarse",
            description = "Response-style classes of the fitted model (MODEL.md 4): coarse or none. Default: ${DEFAULT-VALUE}.")
    String styleClasses;

    @Option(names = "--groups", paramLabel = "G", defaultValue = "" + DemoTruth.DEMO_GROUPS,
            description = "Regions kept from the demo's twelve, 2 to 12. Default: ${DEFAULT-VALUE}.")
    int groups;

    @Option(names = "--respondents", paramLabel = "N", defaultValue = "" + DemoTruth.DEMO_RESPONDENTS,
            description = "Respondents per region. Default: ${DEFAULT-VALUE}, as in the demo.")
    int respondents;

    @Mixin
    StudyOptions study;

    @Option(names = "--overwrite", description = "Start afresh in a folder that holds another study or other files.")
    boolean overwrite;

    @Override
    public Integer call() {
        if (!study.hasOut("recover")) {
            return Main.INPUT_ERROR;
        }
        Path out = study.out;
        RecoveryConfig config;
        try {
            StyleClasses classes = CalibrateCommand.styleClasses(styleClasses, null);
            NumberAttraction numbers = NumberAttraction.parse(attraction);
            DemoTruth.Variant variant = truth != null ? DemoTruth.Variant.parse(truth)
                    : numbers.on() ? DemoTruth.Variant.DEMO
                    : classes.coarse() ? DemoTruth.Variant.NO_ATTRACTION : DemoTruth.Variant.PLAIN;
            config = RecoveryConfig.of(new DemoTruth(variant, groups, respondents),
                    ModelSpec.defaults().withStyleClasses(classes).withAttraction(numbers), study.chains, study.warmup, study.draws,
                    study.seed, study.replications);
        } catch (IllegalArgumentException e) {
            System.err.println("rungs recover: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        RecoveryConfig recovery = config;
        return Runs.replications("recover", out, study.threads,
                (t, stop) -> Recovery.run(recovery, out, overwrite, t, System.err, stop),
                summary -> {
                    print(recovery, summary, out, System.out);
                    return 0;
                });
    }

    private static void print(RecoveryConfig config, RecoverySummary summary, Path out, PrintStream print) {
        print.print(RecoveryReport.text(config, summary));
        print.printf(Locale.ROOT, "Files in %s: %s, %s, %s.%n", out, RecoveryReport.RECOVERY, RecoveryReport.REPLICATIONS,
                RecoveryReport.SUMMARY);
    }
}
