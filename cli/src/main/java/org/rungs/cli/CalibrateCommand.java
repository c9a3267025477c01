package org.rungs.cli;

import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.rungs.models.ModelSpec;
import org.rungs.models.NumberAttraction;
import org.rungs.models.StyleClasses;
import org.rungs.models.ThresholdMode;
import org.rungs.models.survey.Scale;
import org.rungs.priors.Priors;
import org.rungs.validation.calibration.Calibration;
import org.rungs.validation.calibration.CalibrationConfig;
import org.rungs.validation.calibration.CalibrationFolder;
import org.rungs.validation.calibration.CalibrationSummary;
import org.rungs.validation.calibration.ReplicationResult;
import org.rungs.validation.calibration.Shard;
import org.rungs.validation.calibration.Verdict;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/** {@code rungs calibrate}: simulation-based calibration of the engine, and {@code calibrate merge} of shards. */
@Command(name = "calibrate", mixinStandardHelpOptions = true, sortOptions = false,
        subcommands = CalibrateCommand.Merge.class,
        description = {"Check the sampler by simulation-based calibration (Talts et al. 2018).",
                "Each replication draws parameters from the prior, simulates a survey, fits it and ranks every true "
                        + "value among thinned posterior draws. Writes ranks.csv, fits.csv, verdicts.csv and plots/*.svg "
                        + "to the output folder; a rerun with the same folder skips finished replications. Exit code 1 "
                        + "when a quantity fails the uniformity verdict. See VALIDATION.md."})
final class CalibrateCommand implements Callable<Integer> {
    /** Exit code when some quantity's ranks are judged not uniform. */
    static final int CALIBRATION_FAILED = 1;

    @Option(names = "--scale", defaultValue = "0..4", paramLabel = "L..U", description = "The rating scale. Default: ${DEFAULT-VALUE}.")
    String scale;

    @Option(names = "--groups", paramLabel = "G", defaultValue = "3", description = "Number of groups. Default: ${DEFAULT-VALUE}.")
    int groups;

    @Option(names = "--respondents", paramLabel = "N", defaultValue = "40", description = "Respondents per group. Default: ${DEFAULT-VALUE}.")
    int respondents;

    @Option(names = "--covariates", paramLabel = "N", defaultValue = "1", description = "Numeric level covariates (standard normal before standardising). Default: ${DEFAULT-VALUE}.")
    int covariates;

    @Option(names = "--thresholds", paramLabel = "MODE", defaultValue = "by-group",
            description = "Threshold mode of simulation and fit: by-group or shared. Default: ${DEFAULT-VALUE}.")
    String thresholds;

    @Option(names = "--style-classes", paramLabel = "MODE", defaultValue = "none",
            description = "Response-style classes of simulation and fit (MODEL.md 4): none or coarse. Default: ${DEFAULT-VALUE}.")
    String styleClasses;

    @Option(names = "--coarse-points", paramLabel = "RATING", split = ",",
            description = "Coarse points as ratings, with --style-classes coarse. Default: {L, floor((L+U)/2), U}.")
    int[] coarsePoints;

    @Option(names = "--style-covariates", paramLabel = "Q",
            description = "Numeric style covariates (standard normal before standardising), with --style-classes coarse. Default: 1 with the coarse class.")
    Integer styleCovariates;

    @Option(names = "--style-levels", paramLabel = "K", defaultValue = "0",
            description = "Draw each style covariate as 0..K-1 with equal chances (a categorical covariate coded in numbers) "
                    + "instead of standard normal; 0: normal. Default: ${DEFAULT-VALUE}.")
    int styleLevels;

    @Option(names = "--attraction", paramLabel = "SET", defaultValue = "none",
            description = "Number attraction of simulation and fit (MODEL.md 4b): none, default (every number but the coarse points) or ratings such as 1,3. Default: ${DEFAULT-VALUE}.")
    String attraction;

    @Option(names = "--prior", paramLabel = "NAME=DIST",
            description = "Replace a default prior of both simulation and fit, e.g. level=normal(0,2). Names: " + Priors.NAMES + ".")
    List<String> priors = new ArrayList<>();

    @Option(names = "--fit-prior", paramLabel = "NAME=DIST",
            description = "Replace a prior of the fit only: a deliberately wrong component the calibration should flag.")
    List<String> fitPriors = new ArrayList<>();

    @Option(names = "--rank-draws", defaultValue = "99", paramLabel = "L",
            description = "Draws kept at equal spacing for the ranks; a rank lies in 0..L. Default: ${DEFAULT-VALUE}.")
    int rankDraws;

    @Option(names = "--alpha", paramLabel = "A", defaultValue = "0.01",
            description = "False-alarm rate of the verdicts over all quantities together (Bonferroni). Default: ${DEFAULT-VALUE}.")
    double alpha;

    @Option(names = "--shard", paramLabel = "I/N", description = "Run only shard I of N (replication r belongs to shard (r mod N) + 1), e.g. a job array index.")
    String shard;

    @Mixin
    StudyOptions study;

    @Override
    public Integer call() {
        if (!study.hasOut("calibrate")) {
            return Main.INPUT_ERROR;
        }
        Path out = study.out;
        CalibrationConfig config;
        Shard slice;
        try {
            Priors simulation = Priors.defaults();
            for (String p : priors) {
                simulation = simulation.with(p);
            }
            Priors fit = simulation;
            for (String p : fitPriors) {
                fit = fit.with(p);
            }
            ThresholdMode mode = ThresholdMode.parse(thresholds);
            StyleClasses classes = styleClasses(styleClasses, coarsePoints);
            Scale ratings = Scale.parse(scale);
            int q = styleCovariates != null ? styleCovariates : classes.coarse() ? 1 : 0;
            NumberAttraction numbers = NumberAttraction.parse(attraction);
            ModelSpec fitted = new ModelSpec(mode, fit, classes, numbers);
            fitted.checkRatings(ratings); // rejects bad coarse points or attraction set before any replication runs
            config = new CalibrationConfig(ratings, groups, respondents, covariates, q, styleLevels,
                    new ModelSpec(mode, simulation, classes, numbers), fitted, study.chains, study.warmup,
                    study.draws, rankDraws, study.seed, study.replications, alpha);
            slice = shard == null ? Shard.ALL : Shard.parse(shard);
        } catch (IllegalArgumentException e) {
            System.err.println("rungs calibrate: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
        CalibrationConfig calibration = config;
        Shard part = slice;
        return Runs.replications("calibrate", out, study.threads,
                (t, stop) -> Calibration.run(calibration, out, part, t, System.err, stop),
                summary -> {
                    if (part.count() > 1) {
                        System.out.println("Shard " + part + " done in " + out + ". When every shard is done: ./rungs calibrate merge "
                                + "--out DIR SHARD_FOLDERS...");
                        return 0;
                    }
                    return report(summary, out, System.out);
                });
    }

    /** The style classes named on the command line; coarse points only with the coarse class. */
    static StyleClasses styleClasses(String mode, int[] points) {
        switch (mode.trim().toLowerCase(Locale.ROOT)) {
            case "none":
                if (points != null) {
                    throw new IllegalArgumentException("--coarse-points needs --style-classes coarse");
                }
                return StyleClasses.none();
            case "coarse":
                return StyleClasses.coarse(points);
            default:
                throw new IllegalArgumentException("--style-classes is none or coarse, got '" + mode + "'");
        }
    }

    /** Prints the verdicts; exit code 1 when a quantity fails. */
    static int report(CalibrationSummary summary, Path out, PrintStream print) {
        print.printf(Locale.ROOT, "%-28s %10s %4s %10s %9s %6s %s%n", "quantity", "chi-square", "df", "p", "ECDF dev", "band", "verdict");
        for (Verdict v : summary.verdicts()) {
            print.printf(Locale.ROOT, "%-28s %10.2f %4d %10.3g %9.3f %6s %s%n", v.parameter(), v.chiSquare().statistic(),
                    v.chiSquare().df(), v.chiSquare().p(), v.ecdfMaxDeviation(), v.bandExceeded() ? "out" : "in", v.word());
        }
        print.printf(Locale.ROOT, "%d replications; %d non-converged fits; %d fits with bulk ESS below the rank draws; "
                + "false-alarm rate over all %d quantities at most %s.%n", summary.results().size(), summary.nonConverged(),
                summary.thinnedTooLittle(), summary.verdicts().size(), summary.alpha());
        long recorded = summary.chainsRecordingSpreadMoves();
        if (recorded > 0) {
            print.printf(Locale.ROOT, "The spreads' non-centred moves ran in %d of %d chains for threshold_sd and %d for style_sd "
                    + "(fits.csv has them per fit).%n", summary.chainsMoving(ReplicationResult.THRESHOLD_SD), recorded,
                    summary.chainsMoving(ReplicationResult.STYLE_SD));
        }
        List<String> failed = summary.failed();
        print.println(failed.isEmpty() ? "Calibrated: no quantity fails. Files in " + out
                : "NOT calibrated: " + String.join(", ", failed) + " fail. Plots in " + out.resolve("plots"));
        return failed.isEmpty() ? 0 : CALIBRATION_FAILED;
    }

    /** {@code rungs calibrate merge}: combines shard folders into one calibration. */
    @Command(name = "merge", mixinStandardHelpOptions = true, sortOptions = false,
            description = {"Combine the folders of calibration shards (same configuration) into one folder and write the verdicts.",
                    "The files equal those of a single run over the same replications."})
    static final class Merge implements Callable<Integer> {
        @Parameters(arity = "1..*", paramLabel = "SHARD_DIR", description = "Folders written by calibrate --shard.")
        List<Path> inputs;

        @Option(names = "--out", required = true, paramLabel = "DIR", description = "Folder of the merged calibration (may be one of the shard folders).")
        Path out;

        @Override
        public Integer call() {
            try {
                CalibrationSummary summary = Calibration.merge(inputs, out);
                List<Integer> missing = Calibration.missing(CalibrationFolder.existing(out));
                if (!missing.isEmpty()) {
                    System.err.println("rungs calibrate merge: " + missing.size() + " replications are missing (first: "
                            + missing.get(0) + "); rerun their shards, then merge again");
                }
                return report(summary, out, System.out);
            } catch (IllegalArgumentException | UncheckedIOException e) {
                System.err.println("rungs calibrate merge: " + e.getMessage());
                return Main.INPUT_ERROR;
            }
        }
    }
}
