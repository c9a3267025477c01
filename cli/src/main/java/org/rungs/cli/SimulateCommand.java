package org.rungs.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.rungs.examples.DemoScenario;
import org.rungs.examples.SimulatedSurvey;
import org.rungs.examples.Simulator;
import org.rungs.sampler.run.OutputFolder;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code rungs simulate}: writes a simulated survey and its true parameter values. */
@Command(name = "simulate", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Write an invented survey and the true values it was drawn from.",
                "Writes survey.csv (region, rating, income, age, education) and truth.csv (parameter, value), drawn "
                        + "from the demo scenario, for anyone to fit."})
final class SimulateCommand implements Callable<Integer> {
    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Output folder.")
    Path out;

    @Option(names = "--seed", paramLabel = "SEED", defaultValue = "" + DemoScenario.SEED, description = "Seed of the respondents drawn. Default: ${DEFAULT-VALUE}.")
    long seed;

    @Option(names = "--overwrite", description = "Replace files in a non-empty output folder.")
    boolean overwrite;

    @Override
    public Integer call() throws IOException {
        OutputFolder folder;
        try {
            folder = OutputFolder.check(out, overwrite);
        } catch (IllegalArgumentException e) {
            System.err.println("rungs simulate: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        SimulatedSurvey data = Simulator.simulate(DemoScenario.scenario(), seed);
        folder.write("survey.csv", data::writeCsv);
        folder.write("truth.csv", data::writeTruth);
        System.out.println("Wrote " + data.size() + " respondents in " + data.groupLabels().size() + " regions to "
                + folder.resolve("survey.csv") + " and the true values to " + folder.resolve("truth.csv"));
        String style = data.styleCovariateNames().isEmpty() ? "" : " --style " + String.join(",", data.styleCovariateNames());
        System.out.println("Fit it with: ./rungs fit " + folder.resolve("survey.csv") + " --rating rating --group region --level "
                + String.join(",", data.covariateNames()) + style + " --out DIR");
        return 0;
    }
}
