package org.rungs.posteriors;

import java.util.Arrays;
import org.apache.commons.math3.special.Erf;

/**
 * Rank normalisation of Vehtari et al. (2021), eq. 14: average (fractional) ranks r over all
 * draws mapped to normal scores {@code z = Phi^-1((r - 3/8) / (S + 1/4))}. Tied ranks are
 * half-integers, so the scores for one draw count S are kept in a table indexed by 2r and
 * reused for every parameter. The draws are ordered by an LSD radix sort carrying their positions, which keeps ranking
 * linear in S and free of unpredictable branches.
 */
final class RankNormalization {
    private static final double BLOM_OFFSET = 3.0 / 8.0;
    private static final int BYTES = Long.BYTES;

    private double[] scoreByDoubledRank = new double[0];
    private int tabulatedDraws = -1;
    private long[] keys = new long[0];
    private long[] keysSwap = new long[0];
    private int[] order = new int[0];
    private int[] orderSwap = new int[0];
    private int[] foldedOrder = new int[0];
    private double[] folded = new double[0];
    private final int[][] counts = new int[BYTES][256];

    /**
     * Writes the normal score of each of {@code values[0..size)} to {@code scores}, and the
     * values in ascending order to {@code sorted}. The values must not be NaN.
     */
    void scores(double[] values, int size, double[] sorted, double[] scores) {
        tabulate(size);
        sortPositions(values, size);
        for (int k = 0; k < size; k++) {
            sorted[k] = values[order[k]];
        }
        assign(sorted, order, size, scores);
    }

    /**
     * Scores of the folded values {@code |v - center|}, for the values last passed to
     * {@link #scores} (whose ascending order is {@code sorted}). Folding turns the ascending
     * values into two ascending runs, below and above the center, which merge in linear time.
     * The center must be finite.
     */
    void foldedScores(double[] sorted, int size, double center, double[] scores) {
        tabulate(size);
        if (foldedOrder.length < size) {
            foldedOrder = new int[size];
            folded = new double[size];
        }
        int below = 0;
        while (below < size && sorted[below] < center) {
            below++;
        }
        int left = below - 1;
        int right = below;
        for (int k = 0; k < size; k++) {
            double leftDistance = left >= 0 ? Math.abs(sorted[left] - center) : Double.NaN;
            double rightDistance = right < size ? Math.abs(sorted[right] - center) : Double.NaN;
            if (right >= size || leftDistance < rightDistance) {
                folded[k] = leftDistance;
                foldedOrder[k] = order[left--];
            } else {
                folded[k] = rightDistance;
                foldedOrder[k] = order[right++];
            }
        }
        assign(folded, foldedOrder, size, scores);
    }

    /** Gives each position the score of its average rank; equal values share one. */
    private void assign(double[] ascending, int[] positions, int size, double[] scores) {
        int start = 0;
        while (start < size) {
            double value = ascending[start];
            int end = start + 1;
            // primitive comparison, so -0.0 ties with 0.0 as in R
            while (end < size && ascending[end] == value) {
                end++;
            }
            // ranks start+1 .. end share the average rank r = (start + 1 + end) / 2
            double score = score(start + end - 1);
            for (int k = start; k < end; k++) {
                scores[positions[k]] = score;
            }
            start = end;
        }
    }

    /** Starts an empty table for {@code draws} draws; entries are computed when first needed. */
    private void tabulate(int draws) {
        if (draws != tabulatedDraws) {
            scoreByDoubledRank = new double[Math.max(2 * draws - 1, 0)];
            Arrays.fill(scoreByDoubledRank, Double.NaN);
            tabulatedDraws = draws;
        }
    }

    /** Phi^-1((r - 3/8) / (S - 2 * 3/8 + 1)) for r = (index + 2) / 2, as posterior's backtransform_ranks. */
    private double score(int index) {
        double score = scoreByDoubledRank[index];
        if (Double.isNaN(score)) {
            double rank = 0.5 * (index + 2);
            double p = (rank - BLOM_OFFSET) / (tabulatedDraws - 2 * BLOM_OFFSET + 1);
            score = Math.sqrt(2.0) * Erf.erfInv(2 * p - 1);
            scoreByDoubledRank[index] = score;
        }
        return score;
    }

    /** Leaves in {@code order[0..size)} the positions of the values in ascending order (stable). */
    private void sortPositions(double[] values, int size) {
        if (keys.length < size) {
            keys = new long[size];
            keysSwap = new long[size];
            order = new int[size];
            orderSwap = new int[size];
        }
        for (int[] count : counts) {
            Arrays.fill(count, 0);
        }
        for (int i = 0; i < size; i++) {
            long bits = Double.doubleToRawLongBits(values[i]);
            // flips negatives entirely and positives' sign bit: unsigned order = numeric order
            long key = bits ^ ((bits >> 63) | Long.MIN_VALUE);
            keys[i] = key;
            order[i] = i;
            for (int b = 0; b < BYTES; b++) {
                counts[b][(int) (key >>> (8 * b)) & 0xFF]++;
            }
        }
        for (int b = 0; b < BYTES && size > 0; b++) {
            int[] count = counts[b];
            int shift = 8 * b;
            if (count[(int) (keys[0] >>> shift) & 0xFF] == size) {
                continue;
            }
            int offset = 0;
            for (int d = 0; d < 256; d++) {
                int c = count[d];
                count[d] = offset;
                offset += c;
            }
            for (int i = 0; i < size; i++) {
                long key = keys[i];
                int target = count[(int) (key >>> shift) & 0xFF]++;
                keysSwap[target] = key;
                orderSwap[target] = order[i];
            }
            long[] k = keys;
            keys = keysSwap;
            keysSwap = k;
            int[] o = order;
            order = orderSwap;
            orderSwap = o;
        }
    }
}
