package org.rungs.sampler.run;

import java.util.List;
import org.rungs.models.survey.Survey;
import org.rungs.posteriors.ConvergenceVerdict;
import org.rungs.posteriors.ParameterSummary;
import org.rungs.sampler.FitResult;

/**
 * What a fit from a file left behind.
 *
 * @param survey    the survey as read
 * @param result    the draws and sampler facts
 * @param summaries one row per parameter, as in {@code summary.csv}
 * @param verdict   the one-line convergence verdict
 * @param warnings  every warning, as in {@code run.json}
 * @param derived   one row per derived quantity (MODEL.md 6), as in {@code derived_summary.csv}
 * @param interrupted whether a stop request cut the fit short: while the chains ran, or after,
 *                  while the corrected quantities were made
 * @param advice    what the console said to do about a fit that ended without converging (run
 *                  longer chains, and how to continue them where they are kept); null otherwise
 */
public record FitOutcome(Survey survey, FitResult result, List<ParameterSummary> summaries, String verdict,
                         List<String> warnings, List<ParameterSummary> derived, boolean interrupted, String advice) {
    /** Whether the estimates are readable: both verdicts converged, or flagged within chance ({@link ConvergenceVerdict}). */
    public boolean converged() {
        return converged(summaries, derived);
    }

    static boolean converged(List<ParameterSummary> parameters, List<ParameterSummary> derived) {
        return ConvergenceVerdict.of(parameters).readable() && (derived.isEmpty() || ConvergenceVerdict.of(derived).readable());
    }
}
