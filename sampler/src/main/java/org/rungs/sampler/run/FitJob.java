package org.rungs.sampler.run;

import java.io.PrintStream;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.concurrent.atomic.AtomicBoolean;
import org.rungs.models.ModelSpec;
import org.rungs.models.NaiveRegression;
import org.rungs.models.NumberAttraction;
import org.rungs.models.ParameterLayout;
import org.rungs.models.StyleClasses;
import org.rungs.sampler.derived.AttractionProfile;
import org.rungs.sampler.derived.CrossValidation;
import org.rungs.sampler.derived.DerivedQuantities;
import org.rungs.sampler.derived.DerivedResult;
import org.rungs.models.survey.Exclusions;
import org.rungs.models.survey.Survey;
import org.rungs.models.survey.SurveyInputException;
import org.rungs.models.survey.SurveyReader;
import org.rungs.posteriors.AttractionWords;
import org.rungs.posteriors.ConvergenceVerdict;
import org.rungs.posteriors.Draws;
import org.rungs.posteriors.DrawsCsv;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.posteriors.SummaryTable;
import org.rungs.posteriors.Summaries;
import org.rungs.sampler.Checkpoints;
import org.rungs.sampler.ConsoleProgress;
import org.rungs.sampler.FitResult;
import org.rungs.sampler.Fitter;
import org.rungs.sampler.SamplerSettings;

/**
 * A fit from a survey file to an output folder: read, fit, summarise, write {@code draws.csv},
 * {@code summary.csv}, {@code attraction.csv} (number attraction on), the derived quantities and
 * {@code run.json}. Input errors surface before anything is written.
 * While it runs, the chains are saved in {@code .checkpoint} (see {@link SavedFit}), which is
 * removed once every output of a finished fit is written, and kept when the fit was interrupted
 * (also after the chains ended) or has not converged (so that more thinning continues the chains);
 * a fit started without the arguments of a 'rungs fit' command (the demo passes its equivalent
 * ones) has no command to resume with and keeps none. The earlier run's results in the folder are removed
 * before the first file is written ({@link OutputFolder#clearResults}).
 */
public final class FitJob {
    /**
     * Draws used for the derived quantities (spread evenly over the chains): every draw of the
     * default 4 x 1,000. Each costs about a sweep (~35 normal-function calls per respondent), so
     * longer runs are thinned to this. With 1,000 the demo's derived verdict was noise on some
     * seeds (a few shares at R-hat 1.011 to 1.015 that all 4,000 draws put at 1.00x; BENCHMARKS.md,
     * forty-second session) for about 5 s less on 2 cores.
     */
    static final int DERIVED_DRAWS = 4000;
    /**
     * The most numbers in the table of derived draws (24 MB, derived_draws.csv about 50 MB): the
     * demo's 475 quantities, or 643 with attraction, keep 4,000 draws; 150 groups (5,850) keep
     * {@link #DERIVED_DRAWS_LEAST}, where 4,000 wrote 346 MB.
     */
    static final long DERIVED_VALUES = 3_000_000;
    /** The fewest draws of the derived quantities, however many they are. */
    static final int DERIVED_DRAWS_LEAST = 1000;
    /**
     * Draws of the leave-one-out cross-validation (PSIS-LOO), every fourth of the default 4 x 1,000:
     * its cost per draw is that of a derived draw, and it is summed over respondents, not read for R-hat.
     */
    static final int CROSS_VALIDATION_DRAWS = 1000;
    /** Fewer kept iterations than this (an early interruption) leave no derived quantities. */
    private static final int MIN_DERIVED_ITERATIONS = 4;
    /** How the verdict on the derived quantities names them: they are not parameters. */
    private static final String DERIVED_NOUN = "derived quantities";

    private FitJob() {
    }

    /**
     * @param out  receives the summary table and the verdict
     * @param err  receives the exclusions, progress and warnings
     * @param stop set to end the chains early; what was kept is written
     * @throws SurveyInputException     when the file cannot be used (nothing is written)
     * @throws IllegalArgumentException when the output folder may not be written
     */
    public static FitOutcome run(FitRequest request, PrintStream out, PrintStream err, AtomicBoolean stop)
            throws SurveyInputException {
        return run(request, out, err, stop, CheckpointPolicy.start(List.of(), CheckpointPolicy.DEFAULT_SECONDS));
    }

    /**
     * As {@link #run(FitRequest, PrintStream, PrintStream, AtomicBoolean)}, keeping the checkpoint
     * as {@code policy} says. When resuming, {@code request} must be the one that started the fit,
     * with its seed; the draws are then identical, bit for bit, to an uninterrupted fit's.
     *
     * @throws IllegalArgumentException also when resuming a folder with no checkpoint, or when the
     *                                  input file changed since the fit started
     */
    public static FitOutcome run(FitRequest request, PrintStream out, PrintStream err, AtomicBoolean stop,
                                 CheckpointPolicy policy) throws SurveyInputException {
        request.model().checkRatings(request.survey().scale());
        OutputFolder folder = policy.resume() ? OutputFolder.resuming(request.out())
                : OutputFolder.check(request.out(), request.overwrite(), request.file());
        long readStart = System.nanoTime();
        // Sorted once here, so the chains share these columns instead of a second sorted copy.
        Survey survey = Fitter.sorted(SurveyReader.read(request.file(), request.survey()));
        double readSeconds = (System.nanoTime() - readStart) / 1e9;
        Exclusions exclusions = survey.exclusions();
        err.println(exclusions.describe());
        String sha256 = RunRecord.sha256(request.file());
        Path checkpointDir = folder.resolve(SavedFit.FOLDER);
        // a fit given no 'rungs fit' arguments has no command to resume with, so it keeps no checkpoint
        boolean resumable = policy.resume() || !policy.arguments().isEmpty();
        Checkpoints checkpoints;
        if (policy.resume()) {
            SavedFit saved = SavedFit.read(folder.dir());
            if (!saved.sha256().equals(sha256)) {
                throw new IllegalArgumentException("the input file " + request.file() + " has changed since the fit in "
                        + folder.dir() + " started (SHA-256 " + sha256 + ", was " + saved.sha256() + "); it cannot be resumed");
            }
            if (saved.seed() != request.settings().seed()) {
                throw new IllegalArgumentException("the fit in " + folder.dir() + " was started with seed " + saved.seed()
                        + ", not " + request.settings().seed());
            }
            if (!policy.arguments().isEmpty()) {
                // saved before any chain keeps fewer draws, so that a resume after a kill thins as this one
                new SavedFit(saved.file(), saved.sha256(), saved.seed(), policy.arguments()).write(folder.dir());
                err.println("rungs: continuing the fit in " + folder.dir() + " to " + request.settings().draws()
                        + " draws per chain, one iteration in " + request.settings().thin() + " kept");
            } else {
                err.println("rungs: resuming the fit in " + folder.dir());
            }
            checkpoints = Checkpoints.resume(checkpointDir, policy.seconds());
        } else {
            SavedFit.delete(folder.dir());
            folder.clearResults();
            if (resumable) {
                new SavedFit(request.file().toAbsolutePath(), sha256, request.settings().seed(), policy.arguments())
                        .write(folder.dir());
                checkpoints = Checkpoints.start(checkpointDir, policy.seconds());
            } else {
                checkpoints = Checkpoints.none();
            }
        }

        err.println("rungs: seed " + request.settings().seed() + ", " + request.settings().chains() + (request.settings().chains() == 1 ? " chain of " : " chains of ")
                + request.settings().warmup() + " warm-up + " + request.settings().draws() + " kept iterations"
                + (request.settings().thin() > 1 ? " (one in " + request.settings().thin() + " of "
                        + request.settings().draws() * request.settings().thin() + " iterations)" : ""));
        RunRecord record = new RunRecord();
        for (String w : SurveyWarnings.of(survey, request.model())) {
            record.warn(w);
            err.println("warning: " + w);
        }
        FitResult result = Fitter.fit(survey, request.model(), request.settings(),
                new ConsoleProgress(err, request.settings().chains(), 2.0), stop, checkpoints);
        String whereSaved = resumable ? "the chains are saved in " + checkpointDir.toAbsolutePath()
                + "; continue with: rungs fit --resume " + folder.dir() : "nothing is saved to continue from";
        if (result.interrupted() && result.draws().iterations() == 0) {
            err.println("rungs: interrupted before every chain kept a draw; nothing to summarise; " + whereSaved);
            return new FitOutcome(survey, result, List.of(), "interrupted before any draw was kept", record.warnings(),
                    List.of(), true, null);
        }
        List<ParameterSummary> summaries = Summaries.of(result.draws());
        String verdict = SummaryTable.verdict(summaries);
        if (result.interrupted()) {
            record.warn("interrupted: " + result.draws().iterations() + " of " + request.settings().draws()
                    + " kept draws per chain were made");
        }
        if (summaries.stream().anyMatch(ParameterSummary::flagged)) {
            record.warn(verdict);
        }
        String skipped = skippedStepsWarning(result.latentStepsSkipped());
        if (skipped != null) {
            record.warn(skipped);
            err.println("warning: " + skipped);
        }

        folder.clearResults();
        folder.write("draws.csv", tmp -> DrawsCsv.write(result.draws(), tmp));
        folder.write("summary.csv", tmp -> SummaryTable.writeCsv(summaries, tmp));
        boolean attraction = result.layout().attractionSet().length > 0;
        List<AttractionProfile.Row> profile = attraction
                ? AttractionProfile.of(result.draws(), result.layout(), request.model().priors(), survey.groupLabels())
                : List.of();
        if (attraction) {
            folder.write("attraction.csv", tmp -> AttractionProfile.write(profile, tmp));
        }

        List<ParameterSummary> derivedSummaries = List.of();
        DerivedResult derived = null;
        Comparison comparison = null;
        if (result.draws().iterations() >= MIN_DERIVED_ITERATIONS) {
            int derivedDraws = DerivedQuantities.drawsWithin(survey, result.layout(), request.model(), DERIVED_DRAWS,
                    DERIVED_DRAWS_LEAST, DERIVED_VALUES);
            err.println(String.format(Locale.ROOT, "rungs: computing the corrected quantities from up to %,d draws...",
                    derivedDraws));
            derived = DerivedQuantities.compute(survey, result.draws(), result.layout(), request.model(),
                    derivedDraws, request.settings().seed(), request.settings().threads(),
                    new StepProgress(err, "corrected quantities, draws"));
            derivedSummaries = Summaries.of(derived.draws());
            comparison = writeDerived(request, survey, folder, derived, derivedSummaries, record, err, stop);
        } else {
            String warning = "fewer than " + MIN_DERIVED_ITERATIONS + " kept draws per chain: no corrected quantities"
                    + " (groups.csv, distributions.csv, coefficients.csv and the others) were written";
            record.warn(warning);
            err.println("warning: " + warning);
        }
        CrossValidation crossValidation = null;
        if (request.crossValidate() && result.draws().iterations() >= MIN_DERIVED_ITERATIONS) {
            err.println(String.format(Locale.ROOT, "rungs: cross-validating %,d respondents (PSIS-LOO)...", survey.size()));
            long started = System.nanoTime();
            CrossValidation cv = CrossValidation.compute(survey, result.draws(), result.layout(), request.model(),
                    CROSS_VALIDATION_DRAWS, request.settings().threads(), new StepProgress(err, "cross-validation, respondents"));
            folder.write("cross_validation.csv", cv::write);
            err.println(String.format(Locale.ROOT, "rungs: cross-validated at %,d draws in %.1f s", cv.draws(),
                    (System.nanoTime() - started) / 1e9));
            crossValidation = cv;
        }
        // Ctrl-C after the chains ended cuts the corrected quantities short: the fit counts as interrupted
        boolean interrupted = result.interrupted() || stop.get();
        if (interrupted && !result.interrupted()) {
            record.warn("interrupted after sampling, while the corrected quantities were written: some files may be"
                    + " missing or incomplete" + (resumable ? "; 'rungs fit --resume " + folder.dir() + "' completes them" : ""));
        }
        record.put("input", input(request, survey, exclusions, sha256, readSeconds));
        record.put("options", request.options());
        record.put("model", model(request, survey, result.layout()));
        record.put("sampler", sampler(result, interrupted));
        record.put("derived_draws", derived == null ? 0 : derived.draws().iterations() * derived.draws().chains());
        if (comparison != null) {
            String line = comparison.verdict().line("quantities");
            Map<String, Object> c = new LinkedHashMap<>();
            c.put("chains", comparison.settings().chains());
            c.put("warmup", comparison.settings().warmup());
            c.put("draws", comparison.settings().draws());
            c.put("thin", comparison.settings().thin());
            c.put("verdict", line);
            record.put("comparison_fit", c);
            if (!comparison.verdict().readable()) {
                String warning = "the plain ordered probit of coefficients.csv's comparison: " + line;
                record.warn(warning);
                err.println("warning: " + warning);
            }
        }
        if (crossValidation != null) {
            record.put("cross_validation", crossValidation.record());
        }
        String derivedVerdict = ConvergenceVerdict.of(derivedSummaries).line(DERIVED_NOUN);
        if (!derivedSummaries.isEmpty()) {
            // the report shows it either way: the page's corrected figures are derived quantities
            record.put("derived_verdict", derivedVerdict);
        }
        if (derivedSummaries.stream().anyMatch(ParameterSummary::flagged)) {
            record.warn("derived quantities: " + derivedVerdict);
        }
        // flags within chance (ConvergenceVerdict) leave the estimates readable: no advice to run longer
        boolean converged = FitOutcome.converged(summaries, derivedSummaries);
        // a fit that has not converged keeps its chains, so that more thinning continues them
        boolean continuable = resumable && !interrupted && !converged;
        record.put("finished", Instant.now().toString());
        record.put("resumed", policy.resume());
        record.put("continuable", continuable);
        folder.writeText(OutputFolder.RUN_RECORD, record.toJson());
        if (!resumable || !interrupted && converged) {
            SavedFit.delete(folder.dir());
        }

        out.print(SummaryTable.format(summaries));
        out.println(verdict);
        if (derived != null) {
            out.println("Derived quantities: " + derivedVerdict);
            out.println();
            out.print(GroupTable.format(derived, derivedSummaries));
        }
        if (attraction) {
            out.println();
            out.print(AttractionWords.format(profile.stream().map(AttractionProfile.Row::term).toList(), survey.groupLabels(),
                    Printable::of));
        }
        if (crossValidation != null) {
            out.println();
            out.println(crossValidation.describe());
        }
        String advice = converged || interrupted ? null : LongerChains.advice(summaries, derivedSummaries,
                request.settings().chains(), request.settings().thin(), request.settings().draws(),
                continuable ? folder.dir() : null);
        if (advice != null) {
            out.println(advice);
        }
        out.println("Files written to " + folder.dir().toAbsolutePath() + ": " + String.join(", ", folder.written()));
        if (interrupted) {
            err.println("rungs: interrupted; " + whereSaved);
        }
        return new FitOutcome(survey, result, summaries, verdict, record.warnings(), derivedSummaries, interrupted, advice);
    }

    /** The plain ordered probit fitted for the comparison of effects: its settings and verdict. */
    private record Comparison(SamplerSettings settings, ConvergenceVerdict verdict) {
    }

    /**
     * Writes the corrected quantities, and the comparison of effects (which may fit the plain model).
     *
     * @return the plain fit's settings and verdict, or null when none was made or it kept too few draws
     */
    private static Comparison writeDerived(FitRequest request, Survey survey, OutputFolder folder, DerivedResult derived,
                                           List<ParameterSummary> derivedSummaries, RunRecord record, PrintStream err,
                                           AtomicBoolean stop) {
        folder.write("derived_draws.csv", tmp -> DerivedQuantities.writeDraws(derived, tmp));
        folder.write("derived_summary.csv", tmp -> SummaryTable.writeCsv(derivedSummaries, tmp));
        folder.write("groups.csv", tmp -> DerivedQuantities.writeGroups(derived, derivedSummaries, tmp));
        folder.write("distributions.csv", tmp -> DerivedQuantities.writeDistributions(derived, derivedSummaries, tmp));
        if (request.model().styleClasses().coarse()) {
            folder.write("coarse_shares.csv", tmp -> DerivedQuantities.writeCoarseShares(derived, derivedSummaries, tmp));
        }
        List<ParameterSummary> plain = null;
        Comparison comparison = null;
        boolean attraction = request.model().attraction().on();
        boolean compared = (request.model().styleClasses().coarse() || attraction) && survey.level().count() > 0;
        if (compared && stop.get()) {
            plain = List.of();
        } else if (compared) {
            err.println("rungs: fitting the plain ordered probit (style classes " + (attraction ? "and attraction " : "")
                    + "off) for the comparison of effects...");
            ModelSpec plainSpec = request.model().withStyleClasses(StyleClasses.none()).withAttraction(NumberAttraction.none());
            // the fit's own settings, thinning included: without it the demo's default seed once
            // left two of its thresholds just short of the convergence rule (SAMPLER-RESEARCH.md,
            // fifteenth session)
            SamplerSettings settings = request.settings();
            FitResult plainFit = Fitter.fit(survey, plainSpec, settings,
                    new ConsoleProgress(err, settings.chains(), 2.0), stop);
            if (plainFit.interrupted()) {
                plain = List.of();
            } else if (plainFit.draws().iterations() >= MIN_DERIVED_ITERATIONS) {
                Draws effects = DerivedQuantities.effects(survey, plainFit.draws(), plainFit.layout(), DERIVED_DRAWS,
                        settings.threads());
                plain = Summaries.of(effects);
                List<ParameterSummary> checked = new ArrayList<>(Summaries.of(plainFit.draws()));
                checked.addAll(plain);
                comparison = new Comparison(settings, ConvergenceVerdict.of(checked));
            } else {
                plain = List.of();
            }
        }
        if (survey.level().count() > 0) {
            double[] naive = NaiveRegression.coefficients(survey);
            for (int j = 0; j < naive.length; j++) {
                if (Double.isNaN(naive[j])) {
                    String warning = "the naive least squares of coefficients.csv cannot estimate the effect of "
                            + survey.level().name(j) + ": it is constant within every group, so the group indicators"
                            + " absorb it (its naive cells are empty; the corrected effect rests on the model alone)";
                    record.warn(warning);
                    err.println("warning: " + warning);
                }
            }
            List<ParameterSummary> plainSummaries = plain;
            folder.write("coefficients.csv", tmp -> CoefficientTable.write(survey.level(), derivedSummaries, naive, plainSummaries, tmp));
        }
        return comparison;
    }

    private static Map<String, Object> input(FitRequest request, Survey survey, Exclusions exclusions, String sha256,
                                             double seconds) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("file", request.file().toAbsolutePath().toString());
        m.put("sha256", sha256);
        m.put("rows_read", exclusions.rowsRead());
        m.put("rows_used", exclusions.rowsUsed());
        m.put("rows_excluded", exclusions.rowsRead() - exclusions.rowsUsed());
        m.put("missing_by_column", new LinkedHashMap<>(exclusions.missingByColumn()));
        m.put("groups", survey.groupCount());
        m.put("scale", survey.scale().toString());
        m.put("read_seconds", seconds);
        return m;
    }

    private static Map<String, Object> model(FitRequest request, Survey survey, ParameterLayout layout) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("thresholds", request.model().effectiveThresholdMode(survey.groupCount()).label());
        m.put("style_classes", request.model().styleClasses().label());
        m.put("attraction", request.model().attraction().label());
        int[] set = layout.attractionSet();
        if (set.length > 0) {
            m.put("attraction_set", Arrays.stream(set).boxed().toList());
        }
        Map<String, Object> priors = new LinkedHashMap<>();
        var p = request.model().priors();
        priors.put("level", p.level().toString());
        priors.put("group_mean", p.groupMean().toString());
        priors.put("group_sd", p.groupSd().toString());
        priors.put("threshold", p.threshold().toString());
        priors.put("threshold_sd", p.thresholdSd().toString());
        if (request.model().styleClasses().coarse()) {
            priors.put("style", p.style().toString());
            priors.put("style_mean", p.styleMean().toString());
            priors.put("style_sd", p.styleSd().toString());
        }
        if (set.length > 0) {
            priors.put("attraction_mean", p.attractionMean().toString());
            priors.put("attraction_sd", p.attractionSd().toString());
        }
        m.put("priors", priors);
        Map<String, Object> covariates = new LinkedHashMap<>();
        for (int j = 0; j < survey.level().count(); j++) {
            Map<String, Object> c = new LinkedHashMap<>();
            c.put("source_column", survey.level().sourceColumn(j));
            c.put("kind", survey.level().isIndicator(j) ? "indicator" : "numeric");
            c.put("centre", survey.level().centre(j));
            c.put("scale", survey.level().scale(j));
            if (survey.level().isIndicator(j)) {
                c.put("reference_level", survey.level().referenceLevel(j));
            }
            covariates.put(survey.level().name(j), c);
        }
        m.put("level_covariates", covariates);
        m.put("parameters", layout.size());
        return m;
    }

    /**
     * The warning when some chain skipped the latent-level steps in a share of its sampling sweeps
     * ({@code FitResult.latentStepsSkipped}); null when none did.
     */
    static String skippedStepsWarning(double[] shares) {
        double largest = java.util.Arrays.stream(shares).max().orElse(0);
        if (!(largest > 0)) {
            return null;
        }
        return String.format(Locale.ROOT, "in up to %.1f%% of a chain's sampling sweeps the attractions of a group "
                + "spanned more than log(1000), so the latent levels, the threshold rescaling and the level "
                + "regression were skipped there (exact, but slower mixing); such attractions are rarely "
                + "plausible: check the attraction set and the scale", 100 * largest);
    }

    private static Map<String, Object> sampler(FitResult result, boolean interrupted) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("chains", result.settings().chains());
        m.put("warmup", result.settings().warmup());
        m.put("draws", result.settings().draws());
        m.put("thin", result.settings().thin());
        m.put("kept_draws", result.draws().iterations());
        m.put("seed", result.settings().seed());
        m.put("threads", result.settings().threads());
        m.put("seconds", result.seconds());
        m.put("interrupted", interrupted);
        m.put("threshold_acceptance_per_chain", perChain(result.thresholdAcceptance()));
        if (Arrays.stream(result.jointAcceptance()).anyMatch(Double::isFinite)) {
            m.put("joint_step_acceptance_per_chain", perChain(result.jointAcceptance()));
            m.put("joint_step_leapfrog_steps_per_chain", perChain(result.jointLeapfrogSteps()));
            m.put("joint_step_walls_per_chain", perChain(result.jointWallShare()));
        }
        if (Arrays.stream(result.spreadMoves()).anyMatch(Objects::nonNull)) {
            m.put("spread_moves_per_chain", String.join("; ", Arrays.stream(result.spreadMoves())
                    .map(moved -> moved == null ? "none" : moved).toList()));
        }
        if (result.layout().attractionSet().length > 0) {
            m.put("latent_steps_skipped_per_chain", perChain(result.latentStepsSkipped()));
        }
        return m;
    }

    /** "0.712, 0.698, ..." */
    private static String perChain(double[] values) {
        StringBuilder sb = new StringBuilder();
        for (double v : values) {
            sb.append(sb.length() == 0 ? "" : ", ").append(String.format(Locale.ROOT, "%.3f", v));
        }
        return sb.toString();
    }
}
