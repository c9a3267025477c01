package org.rungs.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.rungs.posteriors.report.CrossValidationComparison;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code rungs compare DIR DIR...}: fits of different models to the same rows, by leave-one-out predictive accuracy. */
@Command(name = "compare",
        mixinStandardHelpOptions = true,
        description = {"Compare fits of different models to the same rows by leave-one-out predictive accuracy.",
                "The fits (say with and without --attraction) must have been run with --cross-validate on the same "
                        + "file, --rating column and --scale. Prints per fit elpd_loo with its standard error, p_loo, "
                        + "and the difference from the best fit with the standard error of that difference, paired "
                        + "respondent by respondent."})
public final class CompareCommand implements Callable<Integer> {
    @Parameters(arity = "2..*", paramLabel = "DIR", description = "Fit folders written by 'rungs fit --cross-validate'.")
    List<Path> dirs;

    @Option(names = "--by-group", description = "Also give, per group, each fit's elpd_loo minus the best fit's and its "
            + "standard error: where a model predicts better or worse.")
    boolean byGroup;

    @Override
    public Integer call() {
        try {
            List<CrossValidationComparison.Fit> fits = CrossValidationComparison.compare(dirs);
            System.out.print(CrossValidationComparison.format(fits));
            if (byGroup) {
                System.out.println();
                System.out.print(CrossValidationComparison.formatByGroup(fits));
            }
            return 0;
        } catch (IOException e) {
            System.err.println("rungs compare: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }
}
