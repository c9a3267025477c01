package org.rungs.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.EnumSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.concurrent.Callable;
import org.rungs.examples.Benchmark;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code rungs benchmark}: times the sampler and measures its memory on invented surveys. */
@Command(name = "benchmark", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Time the sampler and measure its memory on invented surveys.",
                "Surveys of 50 groups, 4 covariates, scale 0..10, by-group thresholds: ns per respondent per sweep on "
                        + "one core, bulk ESS per second with 2 chains, and heap bytes per respondent.",
                "Prints a Markdown table. Give the JVM a heap large enough for the largest size (about -Xmx4g for 1,000,000)."})
final class BenchmarkCommand implements Callable<Integer> {
    @Option(names = "--sizes", split = ",", defaultValue = "10000,100000,1000000", paramLabel = "N",
            description = "Numbers of respondents to time. Default: ${DEFAULT-VALUE}.")
    int[] sizes;

    @Option(names = "--sweeps", paramLabel = "N", defaultValue = "200",
            description = "Sweeps (half warm-up) at the largest size; smaller sizes run proportionally more. Default: ${DEFAULT-VALUE}.")
    int sweeps;

    @Option(names = "--seed", paramLabel = "SEED", defaultValue = "20261202", description = "Seed of the data and the sampler. Default: ${DEFAULT-VALUE}.")
    long seed;

    @Option(names = "--ess-sizes", split = ",", defaultValue = "10000,100000", paramLabel = "N",
            description = "Numbers of respondents of the bulk-ESS fits (2 chains, 2 threads). Default: ${DEFAULT-VALUE}.")
    int[] essSizes;

    @Option(names = "--ess-warmup", paramLabel = "N", defaultValue = "500", description = "Warm-up per chain of the ESS fits. Default: ${DEFAULT-VALUE}.")
    int essWarmup;

    @Option(names = "--ess-draws", paramLabel = "N", defaultValue = "1000", description = "Kept draws per chain of the ESS fits. Default: ${DEFAULT-VALUE}.")
    int essDraws;

    @Option(names = "--models", split = ",", defaultValue = "plain,coarse,complete,education", paramLabel = "MODEL",
            description = "Models whose speed is timed: plain (style classes off), coarse (the coarse class on, half the sweeps), "
                    + "complete (attraction too, a quarter of the sweeps), education (the complete model with education "
                    + "as the coarse class's covariate, a quarter of the sweeps). Default: ${DEFAULT-VALUE}.")
    List<String> models;

    @Option(names = "--out", paramLabel = "FILE", description = "Also write the Markdown report to this file.")
    Path out;

    @Override
    public Integer call() throws IOException {
        Benchmark.Settings settings;
        try {
            Set<Benchmark.Model> timed = EnumSet.noneOf(Benchmark.Model.class);
            for (String m : models) {
                try {
                    timed.add(Benchmark.Model.valueOf(m.trim().toUpperCase(Locale.ROOT)));
                } catch (IllegalArgumentException unknown) {
                    throw new IllegalArgumentException("--models takes plain, coarse, complete and education, got '" + m + "'");
                }
            }
            settings = new Benchmark.Settings(sizes, sweeps, seed, essSizes, essWarmup, essDraws, timed);
        } catch (IllegalArgumentException e) {
            System.err.println("rungs benchmark: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        String report = Benchmark.run(settings, System.err);
        System.out.print(report);
        if (out != null) {
            Benchmark.write(out, report);
        }
        return 0;
    }
}
