package org.rungs.sampler.run;

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

    /** The advice for a fit with these summaries of parameters and derived quantities, chains and thinning. */
    static String advice(List<ParameterSummary> parameters, List<ParameterSummary> derived, int chains, int thin) {
        List<ParameterSummary> all = new ArrayList<>(parameters);
        all.addAll(derived);
        return advice(all, chains, thin);
    }

    /** The advice for a fit with these summaries, chains and thinning. */
    static String advice(List<ParameterSummary> summaries, int chains, int thin) {
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
        return sb.toString();
    }
}
