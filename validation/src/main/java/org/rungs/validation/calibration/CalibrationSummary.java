package org.rungs.validation.calibration;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Verdicts over finished replications. The decision rule controls the family-wise false-alarm
 * rate over all K quantities: each is tested at level a = alpha/K (Bonferroni), split equally
 * between the chi-square test (rejects when p < a/2) and the ECDF test (rejects when the ECDF
 * leaves the band of simultaneous level 1 - a/2). For a correct fit with independent ranks, a
 * quantity fails with probability at most a and any quantity fails with probability at most
 * alpha, whatever the dependence between quantities (union bound).
 *
 * @param results     the replications, ordered by index
 * @param rankDraws   L
 * @param alpha       family-wise false-alarm rate
 * @param parameters  calibrated quantities in the order of the first replication
 * @param histograms  rank counts 0..L per quantity
 * @param verdicts    one per quantity
 * @param band        the ECDF band used (null without replications)
 */
public record CalibrationSummary(List<ReplicationResult> results, int rankDraws, double alpha, List<String> parameters,
        Map<String, int[]> histograms, List<Verdict> verdicts, EcdfBand band) {

    public static CalibrationSummary of(List<ReplicationResult> results, int rankDraws, double alpha) {
        List<String> parameters = new ArrayList<>();
        Map<String, int[]> histograms = new LinkedHashMap<>();
        for (ReplicationResult r : results) {
            for (ParameterRank p : r.ranks()) {
                if (p.draws() != rankDraws) {
                    throw new IllegalArgumentException("replication " + r.replication() + " ranks " + p.parameter()
                            + " among " + p.draws() + " draws, not " + rankDraws);
                }
                histograms.computeIfAbsent(p.parameter(), name -> {
                    parameters.add(name);
                    return new int[rankDraws + 1];
                })[p.rank()]++;
            }
        }
        List<Verdict> verdicts = new ArrayList<>();
        EcdfBand band = null;
        if (!results.isEmpty()) {
            double level = alpha / parameters.size();
            int n = results.size();
            band = EcdfBand.of(n, rankDraws, level / 2);
            int bins = ChiSquareUniformity.bins(n, rankDraws);
            for (String name : parameters) {
                int[] h = histograms.get(name);
                int count = 0;
                for (int c : h) {
                    count += c;
                }
                if (count != n) {
                    throw new IllegalArgumentException(name + " has " + count + " ranks in " + n + " replications");
                }
                ChiSquareUniformity chi = ChiSquareUniformity.of(h, bins);
                boolean exceeded = band.exceeded(h);
                verdicts.add(new Verdict(name, n, chi, EcdfBand.maxDeviation(h), exceeded, level,
                        chi.p() < level / 2 || exceeded));
            }
        }
        return new CalibrationSummary(List.copyOf(results), rankDraws, alpha, List.copyOf(parameters), histograms,
                List.copyOf(verdicts), band);
    }

    /** Quantities that fail. */
    public List<String> failed() {
        return verdicts.stream().filter(Verdict::fail).map(Verdict::parameter).toList();
    }

    public long nonConverged() {
        return results.stream().filter(ReplicationResult::nonConverged).count();
    }

    public long thinnedTooLittle() {
        return results.stream().filter(ReplicationResult::thinnedTooLittle).count();
    }

    /** The chains of the fits that recorded their spread moves. */
    public long chainsRecordingSpreadMoves() {
        return results.stream().filter(r -> r.spreadMoves() != null).mapToLong(r -> r.spreadMoves().size()).sum();
    }

    /** Among those, the chains whose moves of {@code spread} (e.g. {@code threshold_sd}) ran. */
    public long chainsMoving(String spread) {
        return results.stream().mapToLong(r -> Math.max(r.chainsMoving(spread), 0)).sum();
    }
}
