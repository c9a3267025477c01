package org.rungs.cli;

import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.List;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.priors.Priors;
import org.rungs.sampler.SamplerSettings;
import picocli.CommandLine.Option;

/** Options shared by every command that fits: the model's switches, priors and the sampler. */
final class SamplingOptions {
    /**
     * The demo keeps every second iteration: from 4 x 1000 consecutive ones its slowest parameters
     * (the end thresholds) reach a bulk ESS of about 300, from every second one 550 to 640 on
     * seeds 1 to 5 (SAMPLER-RESEARCH.md, eleventh session). Under number attraction too: with the
     * ridge move of the attraction spread every parameter reached 486 to 634 on seeds 1 to 4 in
     * 107 to 114 s; every fourth had been needed before that move (SAMPLER-RESEARCH.md,
     * twenty-ninth session).
     */
    static final int DEMO_THIN = 2;

    @Option(names = "--thresholds", paramLabel = "MODE", defaultValue = "by-group",
            description = "Threshold mode: by-group (common thresholds plus group spacing deviations) or shared. Default: ${DEFAULT-VALUE}.")
    String thresholds;

    @Option(names = "--style-classes", paramLabel = "MODE", defaultValue = "coarse",
            description = "Response-style classes: coarse (a latent class of respondents who report only the coarse points) or none (the plain ordered probit). Default: ${DEFAULT-VALUE}.")
    String styleClasses;

    @Option(names = "--coarse-points", split = ",", paramLabel = "RATING",
            description = "The coarse points of the coarse class. Default: the two ends and the middle of the scale (0,5,10 on 0..10).")
    int[] coarsePoints;

    @Option(names = "--attraction", paramLabel = "SET", defaultValue = "none",
            description = "Number attraction: none, default (every number but the coarse points, which are the reference), or the numbers to test (e.g. 3,7). Off by default: its sampler mixes slowly (see the README). Default: ${DEFAULT-VALUE}.")
    String attraction;

    @Option(names = "--prior", paramLabel = "NAME=DIST",
            description = "Replace a default prior, e.g. level=normal(0,2.5) or group_sd=half-normal(0.5); a mean in -100..100, an sd in "
                    + "1e-6..1e6. Names: " + Priors.NAMES + ".")
    List<String> priors = new ArrayList<>();

    @Option(names = "--cross-validate",
            description = "Also estimate each respondent's leave-one-out predictive density by Pareto-smoothed importance "
                    + "sampling (PSIS-LOO) and write cross_validation.csv, so that fits of different models to the same "
                    + "rows can be compared with 'rungs compare'. Takes some seconds per 10,000 respondents.")
    boolean crossValidate;

    @Option(names = "--chains", paramLabel = "N", defaultValue = "4", description = "Number of chains. Default: ${DEFAULT-VALUE}.")
    int chains;

    @Option(names = "--warmup", paramLabel = "N", defaultValue = "1000", description = "Warm-up iterations per chain. Default: ${DEFAULT-VALUE}.")
    int warmup;

    @Option(names = "--draws", paramLabel = "N", defaultValue = "1000", description = "Kept draws per chain. Default: ${DEFAULT-VALUE}.")
    int draws;

    @Option(names = "--thin", paramLabel = "K",
            description = "Keep every K-th iteration after warm-up: a chain runs warm-up + K x draws iterations, so slow "
                    + "parameters gain effective draws without K times the files and the time to summarise them. "
                    + "Default: 1 (the demo: " + DEMO_THIN + ").")
    Integer thin;

    @Option(names = "--seed", paramLabel = "SEED", description = "Random seed; with none, one is chosen, printed and recorded in run.json (the demo: 1).")
    Long seed;

    @Option(names = "--threads", paramLabel = "N", description = "Worker threads (never changes the draws); they take turns on the chains, so that the chains end "
                    + "together. Default: the number of cores, at most the chains.")
    Integer threads;

    ModelSpec model() {
        Priors p = Priors.defaults();
        for (String assignment : priors) {
            p = p.with(assignment);
        }
        StyleClasses classes;
        switch (styleClasses) {
            case "coarse": classes = StyleClasses.coarse(coarsePoints); break;
            case "none":
                if (coarsePoints != null) {
                    throw new IllegalArgumentException("--coarse-points belongs to the coarse class, and with --style-classes none"
                            + " there is none; leave --coarse-points out or use --style-classes coarse");
                }
                classes = StyleClasses.none();
                break;
            default: throw new IllegalArgumentException("--style-classes must be 'coarse' or 'none', got '" + styleClasses + "'");
        }
        return new ModelSpec(ThresholdMode.parse(thresholds), p, classes, NumberAttraction.parse(attraction));
    }

    /** The sampler's settings; an option out of its range is refused by its name (IllegalArgumentException). */
    SamplerSettings settings() {
        atLeast("--chains", chains, 1);
        atLeast("--warmup", warmup, 0);
        atLeast("--draws", draws, 1);
        if (thin != null) {
            atLeast("--thin", thin, 1);
        }
        if (threads != null) {
            atLeast("--threads", threads, 1);
        }
        long s = seed != null ? seed : new SecureRandom().nextLong() >>> 1;
        int t = threads != null ? threads : Math.max(1, Math.min(chains, Runtime.getRuntime().availableProcessors()));
        return new SamplerSettings(chains, warmup, draws, s, t, thin != null ? thin : 1);
    }

    private static void atLeast(String option, int value, int least) {
        if (value < least) {
            throw new IllegalArgumentException(option + " must be at least " + least + ", got " + value);
        }
    }
}
