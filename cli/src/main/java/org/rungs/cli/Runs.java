package org.rungs.cli;

import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.BiFunction;
import java.util.function.Consumer;
import java.util.function.ToIntFunction;
import org.rungs.models.survey.SurveyInputException;
import org.rungs.sampler.run.CheckpointPolicy;
import org.rungs.sampler.run.FitJob;
import org.rungs.sampler.run.FitOutcome;
import org.rungs.sampler.run.FitRequest;

/** Runs a fit request and maps its outcome to an exit code and a sentence. */
final class Runs {
    private Runs() {
    }

    /**
     * Runs or resumes the fit, saving its chains as {@code policy} says; on Ctrl-C the chains are
     * saved, what was kept is written and summarised, and the exit code is 130. With
     * {@code report}, also writes report.html into the output folder. {@code epilogue} prints what
     * follows the fit's own output when it kept draws.
     */
    static int fit(FitRequest request, boolean report, CheckpointPolicy policy, Consumer<FitOutcome> epilogue) {
        try (Interruption interruption = new Interruption()) {
            FitOutcome outcome = FitJob.run(request, System.out, System.err, interruption.flag(), policy);
            if (!outcome.summaries().isEmpty()) {
                epilogue.accept(outcome);
            }
            if (report) {
                writeReport(request.out());
            }
            return outcome.interrupted() ? Main.INTERRUPTED : 0;
        } catch (SurveyInputException e) {
            System.err.println("rungs: " + e.getMessage());
            return Main.INPUT_ERROR;
        } catch (IllegalArgumentException | UncheckedIOException e) {
            System.err.println("rungs: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }

    /** Writes report.html beside the fit's files and says where it is. */
    static void writeReport(Path dir) {
        try {
            System.err.println("rungs: report written to " + org.rungs.posteriors.report.Report.write(dir));
        } catch (java.io.IOException e) {
            throw new UncheckedIOException("could not write the report in " + dir + ": " + e.getMessage(), e);
        }
    }

    /**
     * Runs a study of replications (calibrate, recover) on {@code threads} threads (all cores
     * when null) with Ctrl-C handling: {@code run} returns null when stopped, which is exit 130
     * with a sentence saying how to resume; otherwise {@code done} gives the exit code.
     */
    static <S> int replications(String command, Path out, Integer threads, BiFunction<Integer, AtomicBoolean, S> run,
                                ToIntFunction<S> done) {
        int t = Math.max(1, threads != null ? threads : Runtime.getRuntime().availableProcessors());
        try (Interruption interruption = new Interruption()) {
            S summary = run.apply(t, interruption.flag());
            if (summary == null) {
                System.err.println("rungs " + command + ": stopped; finished replications are kept in " + out
                        + "; rerun the same command to resume");
                return Main.INTERRUPTED;
            }
            return done.applyAsInt(summary);
        } catch (IllegalArgumentException | UncheckedIOException e) {
            System.err.println("rungs " + command + ": " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }
}
