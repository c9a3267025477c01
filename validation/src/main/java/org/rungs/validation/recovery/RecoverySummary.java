package org.rungs.validation.recovery;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.rungs.posteriors.MonteCarloMean;

/**
 * A recovery study summarised: the figures of every quantity, and the coverage over all
 * quantities together. The overall coverage is the mean over replications of the share of
 * quantities each covered; its MCSE is the sd of those shares over sqrt(R), because
 * replications are independent while the quantities of one replication are not.
 *
 * @param replications     the replications, by index
 * @param quantities       one per quantity estimated in some replication, in the truth's order
 * @param coverage50       overall coverage of the central 50% intervals
 * @param coverage50Mcse   its Monte Carlo standard error (NaN with one replication)
 * @param coverage90       overall coverage of the central 90% intervals
 * @param coverage90Mcse   its Monte Carlo standard error
 * @param nonConverged     replications whose fit failed the rule of MODEL.md section 7
 * @param unmatched        true values that no fit estimated, in the truth's order
 */
public record RecoverySummary(List<ReplicationEstimates> replications, List<QuantityRecovery> quantities,
        double coverage50, double coverage50Mcse, double coverage90, double coverage90Mcse, int nonConverged,
        List<String> unmatched) {

    public RecoverySummary {
        replications = List.copyOf(replications);
        quantities = List.copyOf(quantities);
        unmatched = List.copyOf(unmatched);
    }

    /** Summarises replications given in index order. */
    public static RecoverySummary of(List<ReplicationEstimates> replications) {
        if (replications.isEmpty()) {
            throw new IllegalArgumentException("no replication to summarise");
        }
        Map<String, List<QuantityEstimate>> byQuantity = new LinkedHashMap<>();
        Set<String> unmatched = new LinkedHashSet<>();
        int r = replications.size();
        double[] share50 = new double[r];
        double[] share90 = new double[r];
        int nonConverged = 0;
        for (int i = 0; i < r; i++) {
            ReplicationEstimates rep = replications.get(i);
            int covered50 = 0;
            int covered90 = 0;
            for (QuantityEstimate e : rep.estimates()) {
                byQuantity.computeIfAbsent(e.quantity(), q -> new ArrayList<>()).add(e);
                covered50 += e.covered50() ? 1 : 0;
                covered90 += e.covered90() ? 1 : 0;
            }
            int k = rep.estimates().size();
            share50[i] = k == 0 ? Double.NaN : (double) covered50 / k;
            share90[i] = k == 0 ? Double.NaN : (double) covered90 / k;
            nonConverged += rep.nonConverged() ? 1 : 0;
            unmatched.addAll(rep.unmatched());
        }
        unmatched.removeAll(byQuantity.keySet());
        List<QuantityRecovery> quantities = new ArrayList<>();
        for (List<QuantityEstimate> estimates : byQuantity.values()) {
            quantities.add(QuantityRecovery.of(estimates));
        }
        return new RecoverySummary(replications, quantities, MonteCarloMean.mean(share50),
                MonteCarloMean.standardError(share50), MonteCarloMean.mean(share90),
                MonteCarloMean.standardError(share90), nonConverged, new ArrayList<>(unmatched));
    }

    /** The quantities whose 50% coverage lies outside the band of {@link QuantityRecovery#BAND_LEVEL}. */
    public List<QuantityRecovery> outside50() {
        return quantities.stream().filter(QuantityRecovery::outside50).toList();
    }

    /** The quantities whose 90% coverage lies outside the band. */
    public List<QuantityRecovery> outside90() {
        return quantities.stream().filter(QuantityRecovery::outside90).toList();
    }
}
