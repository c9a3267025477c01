package org.rungs.sampler.run;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.rungs.posteriors.ParameterSummary;

/**
 * The advice a fit that has not converged ends with: how many more iterations the slowest
 * parameter or derived quantity needs. For one that mixes slowly the effective sample size grows
 * at most in proportion to the iterations after warm-up (common practice, no source), so the ESS
 * needed (MODEL.md 7: 100 per chain) over the smallest one reached is a lower bound on the factor:
 * a short slow chain also overstates its ESS (on the demo, 10 times the iterations raised the
 * smallest ESS from 30 to 134). --thin keeps the files and summaries the size of --draws while the
 * iterations grow.
 */
final class LongerChains {
    private LongerChains() {
    }

    /**
     * The advice for a fit with these summaries of parameters and derived quantities, chains,
     * thinning and kept draws per chain; {@code kept} is the output folder whose checkpoint keeps
     * the chains (null when none does), for the command that continues them.
     */
    static String advice(List<ParameterSummary> parameters, List<ParameterSummary> derived, int chains, int thin, int draws,
                         Path kept) {
        List<ParameterSummary> all = new ArrayList<>(parameters);
        all.addAll(derived);
        return advice(all, chains, thin, draws, kept);
    }

    /**
     * The advice for a fit with these summaries, chains, thinning and kept draws per chain. Below
     * 100 kept draws per chain it asks for more draws, not more thinning: a chain's effective
     * sample size rarely exceeds its draws, so no --thin reaches the 100 per chain the rule needs
     * (our rule, after an audit where --draws 1 was told to thin by 2). Kept chains continue with
     * a multiple of their thin ({@code ChainCheckpoint}), the smallest at least the one suggested,
     * or with more draws.
     */
    static String advice(List<ParameterSummary> summaries, int chains, int thin, int draws, Path kept) {
        if (draws < ParameterSummary.MIN_ESS_PER_CHAIN) {
            int more = (int) ParameterSummary.MIN_ESS_PER_CHAIN;
            return String.format(Locale.ROOT, "The chains have not converged: read no estimate yet. Keep more draws: %d per"
                    + " chain cannot reach the effective sample size of %d per chain that convergence needs; run"
                    + " --draws %d or more (the default is 1000), then check R-hat and ESS again.", draws, more, more)
                    + continuation(kept, "--draws " + more);
        }
        double smallest = Double.POSITIVE_INFINITY;
        String slowest = null;
        for (ParameterSummary s : summaries) {
            double ess = Math.min(s.essBulk(), s.essTail());
            if (Double.isFinite(ess) && ess < smallest) {
                smallest = ess;
                slowest = s.name();
            }
        }
        double needed = ParameterSummary.MIN_ESS_PER_CHAIN * chains;
        // R-hat alone (every ESS sufficient) or no finite ESS: twice the iterations
        double factor = slowest != null && smallest > 0 && smallest < needed ? needed / smallest : 2;
        int suggested = Math.max(thin + 1, (int) Math.ceil(thin * factor));
        StringBuilder sb = new StringBuilder("The chains have not converged: read no estimate yet. Run longer chains: ");
        if (slowest != null && smallest < needed) {
            sb.append(String.format(Locale.ROOT, "the smallest effective sample size is %.0f (%s) where %.0f are needed; ",
                    smallest, slowest, needed));
        }
        sb.append(String.format(Locale.ROOT, "at least %.1f times the iterations after warm-up, for example with --thin %d "
                + "(one iteration in %d kept, so the files stay the size of --draws), then check R-hat and ESS again "
                + "(README, known limits).", (double) suggested / thin, suggested, suggested));
        int multiple = thin * ((suggested + thin - 1) / thin);
        return sb.append(continuation(kept, "--thin " + multiple)).toString();
    }

    /** The sentence naming the command that continues chains kept in {@code kept} with {@code option}; empty when none are kept. */
    private static String continuation(Path kept, String option) {
        return kept == null ? "" : " These chains are kept: 'rungs fit --resume " + kept + " " + option + "' continues"
                + " them without a new warm-up, and gives the draws a fit started with " + option + " would.";
    }
}
