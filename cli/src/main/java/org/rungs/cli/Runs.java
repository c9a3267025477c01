package org.rungs.cli;

import java.io.UncheckedIOException;
import org.rungs.models.survey.SurveyInputException;
import org.rungs.sampler.run.FitJob;
import org.rungs.sampler.run.FitOutcome;
import org.rungs.sampler.run.FitRequest;

/** Runs a fit request and maps its outcome to an exit code and a sentence. */
final class Runs {
    private Runs() {
    }

    static int fit(FitRequest request) {
        try (Interruption interruption = new Interruption()) {
            FitOutcome outcome = FitJob.run(request, System.out, System.err, interruption.flag());
            return outcome.result().interrupted() ? Main.INTERRUPTED : 0;
        } catch (SurveyInputException e) {
            System.err.println("rungs: " + e.getMessage());
            return Main.INPUT_ERROR;
        } catch (IllegalArgumentException | UncheckedIOException e) {
            System.err.println("rungs: " + e.getMessage());
            return Main.INPUT_ERROR;
        }
    }
}
