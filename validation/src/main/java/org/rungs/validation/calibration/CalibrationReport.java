package org.rungs.validation.calibration;

import java.util.Locale;

/**
 * Writes a summary into a calibration folder: {@code ranks.csv}, {@code fits.csv},
 * {@code verdicts.csv} and one SVG per quantity under {@code plots/}. The files depend only on
 * the replication records, so shards merged give the same bytes as one run.
 */
final class CalibrationReport {
    private CalibrationReport() {
    }

    static void write(CalibrationFolder folder, CalibrationSummary summary) {
        StringBuilder ranks = new StringBuilder("replication,parameter,rank,draws,truth\n");
        StringBuilder fits = new StringBuilder("replication,non_converged,flagged_quantities,max_rhat,min_ess_bulk,min_ess_tail,"
                + "chains_moving_threshold_sd,chains_moving_style_sd\n");
        for (ReplicationResult r : summary.results()) {
            int flagged = 0;
            double maxRhat = Double.NEGATIVE_INFINITY;
            double minBulk = Double.POSITIVE_INFINITY;
            double minTail = Double.POSITIVE_INFINITY;
            for (ParameterRank p : r.ranks()) {
                ranks.append(r.replication()).append(',').append(p.parameter()).append(',').append(p.rank())
                        .append(',').append(p.draws()).append(',').append(p.truth()).append('\n');
                flagged += p.flagged() ? 1 : 0;
                maxRhat = Math.max(maxRhat, p.rhat());
                minBulk = Math.min(minBulk, p.essBulk());
                minTail = Math.min(minTail, p.essTail());
            }
            fits.append(r.replication()).append(',').append(r.nonConverged()).append(',').append(flagged).append(',')
                    .append(format("%.4f", maxRhat)).append(',').append(format("%.1f", minBulk)).append(',')
                    .append(format("%.1f", minTail)).append(',').append(count(r.chainsMoving(ReplicationResult.THRESHOLD_SD))).append(',')
                    .append(count(r.chainsMoving(ReplicationResult.STYLE_SD))).append('\n');
        }
        StringBuilder verdicts = new StringBuilder(
                "parameter,replications,chi_square,df,p,ecdf_max_deviation,band_exceeded,level,verdict\n");
        for (Verdict v : summary.verdicts()) {
            verdicts.append(v.parameter()).append(',').append(v.replications()).append(',')
                    .append(format("%.4f", v.chiSquare().statistic())).append(',').append(v.chiSquare().df()).append(',')
                    .append(format("%.4g", v.chiSquare().p())).append(',').append(format("%.4f", v.ecdfMaxDeviation()))
                    .append(',').append(v.bandExceeded()).append(',').append(format("%.4g", v.level())).append(',')
                    .append(v.word()).append('\n');
        }
        folder.write("ranks.csv", ranks.toString());
        folder.write("fits.csv", fits.toString());
        folder.write("verdicts.csv", verdicts.toString());
        for (Verdict v : summary.verdicts()) {
            folder.write("plots/" + fileName(v.parameter()) + ".svg",
                    RankPlots.svg(v, summary.histograms().get(v.parameter()), summary.band()));
        }
    }

    /** A count, or empty when not recorded (-1). */
    private static String count(int chains) {
        return chains < 0 ? "" : Integer.toString(chains);
    }

    /** A file name for a quantity: characters other than letters, digits, '.', '_' and '-' become '_'. */
    static String fileName(String parameter) {
        return parameter.replaceAll("[^A-Za-z0-9._-]", "_");
    }

    static String format(String pattern, double value) {
        return String.format(Locale.ROOT, pattern, value);
    }
}
