package org.rungs.validation.recovery;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The files of a summarised study: {@value #RECOVERY} (one row per quantity),
 * {@value #REPLICATIONS} (one row per replication and quantity) and {@value #SUMMARY} (the text
 * printed at the end). Each depends on the replication records alone, so any thread count, order
 * or resumption gives the same bytes.
 */
public final class RecoveryReport {
    /** Per quantity: bias, RMSE, coverage and their MCSEs. */
    public static final String RECOVERY = "recovery.csv";
    /** Per replication and quantity: the truth and the posterior summary. */
    public static final String REPLICATIONS = "replications.csv";
    /** The summary in words. */
    public static final String SUMMARY = "summary.txt";

    private RecoveryReport() {
    }

    static void write(RecoveryFolder folder, RecoveryConfig config, RecoverySummary summary) {
        folder.write(RECOVERY, recoveryCsv(summary));
        folder.write(REPLICATIONS, replicationsCsv(summary));
        folder.write(SUMMARY, text(config, summary));
    }

    static String recoveryCsv(RecoverySummary summary) {
        StringBuilder sb = new StringBuilder("quantity,replications,truth_mean,bias,bias_mcse,rmse,rmse_mcse,"
                + "coverage50,coverage50_mcse,coverage90,coverage90_mcse,flagged,nonconverged_fits,outside50,outside90\n");
        for (QuantityRecovery q : summary.quantities()) {
            sb.append(q.quantity()).append(',').append(q.replications()).append(',').append(q.truthMean()).append(',')
                    .append(q.bias()).append(',').append(q.biasMcse()).append(',').append(q.rmse()).append(',')
                    .append(q.rmseMcse()).append(',').append(q.coverage50()).append(',').append(q.coverage50Mcse())
                    .append(',').append(q.coverage90()).append(',').append(q.coverage90Mcse()).append(',')
                    .append(q.flagged()).append(',').append(summary.nonConverged()).append(',').append(q.outside50())
                    .append(',').append(q.outside90()).append('\n');
        }
        return sb.toString();
    }

    static String replicationsCsv(RecoverySummary summary) {
        StringBuilder sb = new StringBuilder("replication,quantity,truth,mean,q5,q25,q75,q95,flagged\n");
        for (ReplicationEstimates r : summary.replications()) {
            for (QuantityEstimate e : r.estimates()) {
                sb.append(r.replication()).append(',').append(e.quantity()).append(',').append(e.truth()).append(',')
                        .append(e.mean()).append(',').append(e.q05()).append(',').append(e.q25()).append(',')
                        .append(e.q75()).append(',').append(e.q95()).append(',').append(e.flagged()).append('\n');
            }
        }
        return sb.toString();
    }

    /** The summary in words: overall coverage, the quantities outside the band, the truths never estimated. */
    public static String text(RecoveryConfig config, RecoverySummary summary) {
        int r = summary.replications().size();
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "Recovery of %s over %d replications; fit: %s, %d chains of %d warm-up + %d "
                + "kept iterations.%n", config.truthLabel(), r, model(config), config.chains(), config.warmup(),
                config.draws()));
        sb.append(String.format(Locale.ROOT, "%d quantities compared; %d of %d fits not converged by the rule of MODEL.md "
                + "section 7 (counted, not left out).%n", summary.quantities().size(), summary.nonConverged(), r));
        sb.append(String.format(Locale.ROOT, "Coverage of the central 50%% intervals: %s; of the 90%% intervals: %s "
                + "(MCSE from the spread of the replications' shares).%n", estimate(summary.coverage50(),
                summary.coverage50Mcse()), estimate(summary.coverage90(), summary.coverage90Mcse())));
        int[] band50 = QuantityRecovery.band(r, 0.5);
        int[] band90 = QuantityRecovery.band(r, 0.9);
        sb.append(String.format(Locale.ROOT, "Band: a quantity is listed when its count of covering intervals lies outside "
                + "the central %.0f%% range of Binomial(%d, p), %d..%d for p = 0.5 and %d..%d for p = 0.9; intervals of "
                + "exact coverage leave it for about one quantity in a hundred.%n", 100 * QuantityRecovery.BAND_LEVEL, r,
                band50[0], band50[1], band90[0], band90[1]));
        list(sb, "50%", summary.outside50(), true);
        list(sb, "90%", summary.outside90(), false);
        if (!summary.unmatched().isEmpty()) {
            sb.append("True values the fit does not estimate (not compared): ").append(compact(summary.unmatched()))
                    .append('\n');
        }
        return sb.toString();
    }

    private static String model(RecoveryConfig config) {
        return "ordered probit, " + config.fit().thresholdMode().label() + " thresholds"
                + (config.fit().styleClasses().coarse() ? ", coarse class " + config.fit().styleClasses().label() : "");
    }

    private static void list(StringBuilder sb, String interval, List<QuantityRecovery> outside, boolean fifty) {
        if (outside.isEmpty()) {
            sb.append("No quantity's ").append(interval).append(" coverage lies outside the band.\n");
            return;
        }
        sb.append(interval).append(" coverage outside the band (").append(outside.size()).append("):");
        for (QuantityRecovery q : outside) {
            sb.append(String.format(Locale.ROOT, " %s %.2f", q.quantity(), fifty ? q.coverage50() : q.coverage90()));
        }
        sb.append('\n');
    }

    private static String estimate(double value, double mcse) {
        return Double.isNaN(mcse) ? String.format(Locale.ROOT, "%.3f (MCSE needs two replications)", value)
                : String.format(Locale.ROOT, "%.3f (MCSE %.3f)", value, mcse);
    }

    /** Names, those sharing a prefix before the first dot with three or more others written as {@code prefix.* (n)}. */
    static String compact(List<String> names) {
        Map<String, List<String>> byPrefix = new LinkedHashMap<>();
        for (String name : names) {
            int dot = name.indexOf('.');
            byPrefix.computeIfAbsent(dot > 0 ? name.substring(0, dot) : name, p -> new ArrayList<>()).add(name);
        }
        List<String> parts = new ArrayList<>();
        for (Map.Entry<String, List<String>> e : byPrefix.entrySet()) {
            if (e.getValue().size() > 3) {
                parts.add(e.getKey() + ".* (" + e.getValue().size() + ")");
            } else {
                parts.addAll(e.getValue());
            }
        }
        return String.join(", ", parts);
    }
}
