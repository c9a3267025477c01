package org.rungs.validation.calibration;

import java.util.List;

/**
 * The ranks of one finished replication.
 *
 * @param replication 0-based index
 * @param ranks       one per calibrated quantity, in a fixed order
 * @param spreadMoves per chain, the spreads whose non-centred moves ran in the fit (the sampler's
 *                    words, as in run.json's {@code spread_moves_per_chain}), or null: a fit
 *                    without those moves, or a record written before they were kept
 */
public record ReplicationResult(int replication, List<ParameterRank> ranks, List<String> spreadMoves) {
    /** The spreads that {@link #spreadMoves} names. */
    public static final String THRESHOLD_SD = "threshold_sd";
    public static final String STYLE_SD = "style_sd";

    public ReplicationResult {
        ranks = List.copyOf(ranks);
        spreadMoves = spreadMoves == null ? null : List.copyOf(spreadMoves);
    }

    public ReplicationResult(int replication, List<ParameterRank> ranks) {
        this(replication, ranks, null);
    }

    /** Whether any quantity failed the convergence rule of MODEL.md section 7. */
    public boolean nonConverged() {
        return ranks.stream().anyMatch(ParameterRank::flagged);
    }

    /** Whether the smallest bulk ESS is below the L draws kept: the thinned draws are then autocorrelated. */
    public boolean thinnedTooLittle() {
        return ranks.stream().anyMatch(r -> r.essBulk() < r.draws());
    }

    /** The chains whose moves of {@code spread} (e.g. {@code threshold_sd}) ran, or -1 when not recorded. */
    public int chainsMoving(String spread) {
        return spreadMoves == null ? -1 : (int) spreadMoves.stream().filter(moved -> List.of(moved.split(", ")).contains(spread)).count();
    }
}
