package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;

/**
 * The joint step's metric for a survey of many groups: a precision with the posterior's own
 * sparsity. A group's own coordinates touch only its respondents and prior terms
 * ({@link CollapsedPosterior#negativeHessian}), so given the survey-wide coordinates the groups
 * are independent and minus the Hessian has no entry between two groups. Ordered group by group
 * with the survey-wide coordinates last it is an arrow matrix, whose Cholesky factor has the same
 * pattern (eliminating the groups first creates no fill-in; George & Liu 1981, Computer Solution
 * of Large Sparse Positive Definite Systems, from memory): a leapfrog step costs O(G b^2 + G b k + k^2) for G groups of b
 * own coordinates and k survey-wide ones, against O(d^2) for the dense factor, and a refit
 * O(G (b + k)^3) against O(d^3).
 *
 * <p>The refit keeps the pattern: the warm-up states' covariance is shrunk towards the current
 * metric's on each clique (a group's coordinates with the survey-wide ones), and the precision
 * with the arrow pattern that has exactly those clique covariances is
 * K = sum_g [S_g^-1]^0 - (G - 1) [S_0^-1]^0, S_0 the survey-wide block they share (the maximum
 * likelihood precision of a decomposable Gaussian graphical model; Lauritzen 1996, Graphical
 * Models, proposition 5.9, from memory). It is positive definite whenever every S_g is.
 *
 * <p>The factor L is lower: K = L L', in blocks L_g (a group's, lower), C_g (survey-wide rows,
 * the group's columns) and L_0 (survey-wide, lower) with L_g L_g' = K_g, C_g = K_0g L_g'^-1 and
 * L_0 L_0' = K_00 - sum_g C_g C_g'.
 */
final class ArrowMetric {
    private final int groups;
    /** A group's own coordinates (b) and the survey-wide ones (k). */
    private final int own;
    private final int wide;
    /** Coordinate of group g's a-th own coordinate at [g * own + a]; of the r-th survey-wide one at [r]. */
    private final int[] groupCoordinate;
    private final int[] wideCoordinate;
    /** Position of each coordinate: its group (-1 if survey-wide) and its index within the group or the survey-wide list. */
    private final int[] groupOf;
    private final int[] indexOf;
    /** The factor: L_g at [g * b * b], C_g at [g * k * b] (row r, column a), L_0. */
    private final double[] blocks;
    private final double[] cross;
    private final double[] last;
    /** The matrix to factor, in the same blocks: K_g, K_0g, K_00. */
    private final double[] hBlocks;
    private final double[] hCross;
    private final double[] hLast;
    /** Minus the Hessian as measured, before symmetrising: entries (row, column) with whether they were measured. */
    private final double[] rawBlocks;
    private final double[] rawOwnRows;
    private final double[] rawWideRows;
    private final double[] rawLast;
    private final boolean[] knownBlocks;
    private final boolean[] knownOwnRows;
    private final boolean[] knownWideRows;
    private final boolean[] knownLast;
    /** Scratch of the solves. */
    private final double[] local;
    private final double[] wideLocal;

    /**
     * @param groupOf per coordinate, its group or -1 for a survey-wide coordinate
     * @param slotOf per coordinate of a group, its position among that group's own coordinates
     * @param groups number of groups, each with {@code own} coordinates
     */
    ArrowMetric(int[] groupOf, int[] slotOf, int groups, int own) {
        int d = groupOf.length;
        this.groups = groups;
        this.own = own;
        this.wide = d - groups * own;
        this.groupCoordinate = new int[groups * own];
        this.wideCoordinate = new int[wide];
        this.groupOf = groupOf.clone();
        this.indexOf = new int[d];
        int r = 0;
        for (int j = 0; j < d; j++) {
            if (groupOf[j] >= 0) {
                groupCoordinate[groupOf[j] * own + slotOf[j]] = j;
                indexOf[j] = slotOf[j];
            } else {
                wideCoordinate[r] = j;
                indexOf[j] = r++;
            }
        }
        if (r != wide) {
            throw new IllegalArgumentException("groups of unequal size: " + r + " survey-wide coordinates, " + wide + " expected");
        }
        int b = own;
        int k = wide;
        blocks = new double[groups * b * b];
        cross = new double[groups * k * b];
        last = new double[k * k];
        hBlocks = new double[blocks.length];
        hCross = new double[cross.length];
        hLast = new double[last.length];
        rawBlocks = new double[blocks.length];
        rawOwnRows = new double[cross.length];
        rawWideRows = new double[cross.length];
        rawLast = new double[last.length];
        knownBlocks = new boolean[blocks.length];
        knownOwnRows = new boolean[cross.length];
        knownWideRows = new boolean[cross.length];
        knownLast = new boolean[last.length];
        local = new double[b];
        wideLocal = new double[k];
    }

    /** Forgets the measured entries before a new Hessian. */
    void clearMeasured() {
        java.util.Arrays.fill(knownBlocks, false);
        java.util.Arrays.fill(knownOwnRows, false);
        java.util.Arrays.fill(knownWideRows, false);
        java.util.Arrays.fill(knownLast, false);
    }

    /** Records entry (i, j) of minus the Hessian, measured from column j; entries outside the pattern (two groups) are ignored. */
    void measured(int i, int j, double value) {
        int gi = groupOf[i];
        int gj = groupOf[j];
        int b = own;
        int k = wide;
        if (gi >= 0 && gj >= 0) {
            if (gi == gj) {
                int at = gi * b * b + indexOf[i] * b + indexOf[j];
                rawBlocks[at] = value;
                knownBlocks[at] = true;
            }
        } else if (gi >= 0) {
            int at = gi * k * b + indexOf[j] * b + indexOf[i];
            rawOwnRows[at] = value;
            knownOwnRows[at] = true;
        } else if (gj >= 0) {
            int at = gj * k * b + indexOf[i] * b + indexOf[j];
            rawWideRows[at] = value;
            knownWideRows[at] = true;
        } else {
            int at = indexOf[i] * k + indexOf[j];
            rawLast[at] = value;
            knownLast[at] = true;
        }
    }

    /**
     * Symmetrises the measured entries as the dense Hessian is (the mean where both (i, j) and
     * (j, i) were measured, else the one that was, else 0) and factors them; where that is not
     * positive definite (away from the mode), adds a multiple of the largest diagonal entry to the
     * diagonal, from 1e-8 up by tens (a modified Newton step; Nocedal & Wright 2006, Numerical
     * Optimization, section 3.4, from memory). False if nothing up to 100 times it works.
     */
    boolean factorMeasured() {
        int b = own;
        int k = wide;
        for (int g = 0; g < groups; g++) {
            int at = g * b * b;
            for (int a = 0; a < b; a++) {
                for (int c = 0; c <= a; c++) {
                    double v = combine(rawBlocks, knownBlocks, at + a * b + c, rawBlocks, knownBlocks, at + c * b + a);
                    hBlocks[at + a * b + c] = v;
                    hBlocks[at + c * b + a] = v;
                }
            }
            for (int x = g * k * b; x < (g + 1) * k * b; x++) {
                hCross[x] = combine(rawWideRows, knownWideRows, x, rawOwnRows, knownOwnRows, x);
            }
        }
        for (int r = 0; r < k; r++) {
            for (int s = 0; s <= r; s++) {
                double v = combine(rawLast, knownLast, r * k + s, rawLast, knownLast, s * k + r);
                hLast[r * k + s] = v;
                hLast[s * k + r] = v;
            }
        }
        if (factor(0)) {
            return true;
        }
        double largest = 0;
        for (int g = 0; g < groups; g++) {
            for (int a = 0; a < b; a++) {
                largest = Math.max(largest, Math.abs(hBlocks[g * b * b + a * b + a]));
            }
        }
        for (int r = 0; r < k; r++) {
            largest = Math.max(largest, Math.abs(hLast[r * k + r]));
        }
        for (double ridge = 1e-8; ridge <= 100; ridge *= 10) {
            if (factor(ridge * largest)) {
                return true;
            }
        }
        return false;
    }

    private static double combine(double[] x, boolean[] xKnown, int i, double[] y, boolean[] yKnown, int j) {
        boolean a = xKnown[i];
        boolean c = yKnown[j];
        return a && c ? 0.5 * (x[i] + y[j]) : a ? x[i] : c ? y[j] : 0;
    }

    /** Factors K = {@link #hBlocks}, {@link #hCross}, {@link #hLast} plus {@code ridge} on the diagonal into the factor; false if not positive definite. */
    private boolean factor(double ridge) {
        int b = own;
        int k = wide;
        System.arraycopy(hLast, 0, last, 0, k * k);
        for (int r = 0; r < k; r++) {
            last[r * k + r] += ridge;
        }
        for (int g = 0; g < groups; g++) {
            int at = g * b * b;
            System.arraycopy(hBlocks, at, blocks, at, b * b);
            for (int a = 0; a < b; a++) {
                blocks[at + a * b + a] += ridge;
            }
            if (!Cholesky.factor(blocks, at, blocks, at, b)) {
                return false;
            }
            // C_g: row r solves L_g c = (K_0g row r)'
            int x = g * k * b;
            for (int r = 0; r < k; r++) {
                System.arraycopy(hCross, x + r * b, local, 0, b);
                Cholesky.solveLower(blocks, at, b, local);
                System.arraycopy(local, 0, cross, x + r * b, b);
            }
            // the survey-wide block's Schur complement: K_00 - sum_g C_g C_g'
            for (int r = 0; r < k; r++) {
                for (int s = 0; s <= r; s++) {
                    double sum = 0;
                    for (int a = 0; a < b; a++) {
                        sum += cross[x + r * b + a] * cross[x + s * b + a];
                    }
                    last[r * k + s] -= sum;
                }
            }
        }
        for (int r = 0; r < k; r++) {
            for (int s = 0; s < r; s++) {
                last[s * k + r] = last[r * k + s];
            }
        }
        return Cholesky.factor(last, 0, last, 0, k);
    }

    /** Solves L y = v in place (v in the posterior's coordinate order). */
    void solveLower(double[] v) {
        int b = own;
        int k = wide;
        for (int r = 0; r < k; r++) {
            wideLocal[r] = v[wideCoordinate[r]];
        }
        for (int g = 0; g < groups; g++) {
            int first = g * b;
            for (int a = 0; a < b; a++) {
                local[a] = v[groupCoordinate[first + a]];
            }
            Cholesky.solveLower(blocks, g * b * b, b, local);
            for (int a = 0; a < b; a++) {
                v[groupCoordinate[first + a]] = local[a];
            }
            int x = g * k * b;
            for (int r = 0; r < k; r++) {
                double s = 0;
                for (int a = 0; a < b; a++) {
                    s += cross[x + r * b + a] * local[a];
                }
                wideLocal[r] -= s;
            }
        }
        Cholesky.solveLower(last, 0, k, wideLocal);
        for (int r = 0; r < k; r++) {
            v[wideCoordinate[r]] = wideLocal[r];
        }
    }

    /** Solves L' y = v in place. */
    void solveUpper(double[] v) {
        int b = own;
        int k = wide;
        for (int r = 0; r < k; r++) {
            wideLocal[r] = v[wideCoordinate[r]];
        }
        Cholesky.solveUpper(last, 0, k, wideLocal);
        for (int r = 0; r < k; r++) {
            v[wideCoordinate[r]] = wideLocal[r];
        }
        for (int g = 0; g < groups; g++) {
            int first = g * b;
            int x = g * k * b;
            for (int a = 0; a < b; a++) {
                local[a] = v[groupCoordinate[first + a]];
            }
            for (int r = 0; r < k; r++) {
                double y = wideLocal[r];
                for (int a = 0; a < b; a++) {
                    local[a] -= cross[x + r * b + a] * y;
                }
            }
            Cholesky.solveUpper(blocks, g * b * b, b, local);
            for (int a = 0; a < b; a++) {
                v[groupCoordinate[first + a]] = local[a];
            }
        }
    }

    /**
     * The metric's covariance K^-1 on group g's clique, (b + k) x (b + k) row-major with the
     * group's coordinates first: with W = L_g'^-1 C_g' and S = K^-1's survey-wide block
     * (L_0 L_0')^-1, the cross block is -W S and the group's block K_g^-1 + W S W'.
     */
    private DMatrixRMaj cliqueCovariance(int g, DMatrixRMaj wideCovariance) {
        int b = own;
        int k = wide;
        int c = b + k;
        DMatrixRMaj w = new DMatrixRMaj(b, k);
        for (int r = 0; r < k; r++) {
            System.arraycopy(cross, g * k * b + r * b, local, 0, b);
            Cholesky.solveUpper(blocks, g * b * b, b, local);
            for (int a = 0; a < b; a++) {
                w.set(a, r, local[a]);
            }
        }
        DMatrixRMaj ws = new DMatrixRMaj(b, k);
        CommonOps_DDRM.mult(w, wideCovariance, ws);
        DMatrixRMaj wsw = new DMatrixRMaj(b, b);
        CommonOps_DDRM.multTransB(ws, w, wsw);
        DMatrixRMaj out = new DMatrixRMaj(c, c);
        for (int a = 0; a < b; a++) {
            java.util.Arrays.fill(local, 0);
            local[a] = 1;
            Cholesky.solveLower(blocks, g * b * b, b, local);
            Cholesky.solveUpper(blocks, g * b * b, b, local);
            for (int e = 0; e < b; e++) {
                out.set(e, a, local[e] + wsw.get(e, a));
            }
            for (int r = 0; r < k; r++) {
                out.set(a, b + r, -ws.get(a, r));
                out.set(b + r, a, -ws.get(a, r));
            }
        }
        for (int r = 0; r < k; r++) {
            for (int s = 0; s < k; s++) {
                out.set(b + r, b + s, wideCovariance.get(r, s));
            }
        }
        return out;
    }

    /** The survey-wide block of K^-1: (L_0 L_0')^-1. */
    private DMatrixRMaj wideCovariance() {
        int k = wide;
        DMatrixRMaj s = new DMatrixRMaj(k, k);
        double[] column = new double[k];
        for (int r = 0; r < k; r++) {
            java.util.Arrays.fill(column, 0);
            column[r] = 1;
            Cholesky.solveLower(last, 0, k, column);
            Cholesky.solveUpper(last, 0, k, column);
            for (int s2 = 0; s2 < k; s2++) {
                s.set(s2, r, column[s2]);
            }
        }
        return s;
    }

    /**
     * Replaces the metric by the arrow precision whose clique covariances are the warm-up states'
     * (n rows of d in {@code draws}), each shrunk towards the current metric's with the dense
     * metric's weight d / (n + d) on the current one (common practice for a covariance from few
     * draws, no source). The clique's own size b + k in place of d trusted the warm-up states too
     * far: on 150 groups of 15 with the coarse class (seed 7, 4 x (1,000 + 1,000)) the smallest
     * bulk ESS of the thresholds was 10 against 197 with d. The current metric's covariance is divided by
     * slope_i slope_j when {@code slopes} is given (it was fitted in other coordinates). Keeps the
     * current metric and returns false if the result is not positive definite.
     */
    boolean refit(double[] draws, int n, int d, java.util.function.IntToDoubleFunction slopes) {
        int b = own;
        int k = wide;
        int c = b + k;
        double weight = (double) n / (n + d);
        double[] mean = new double[d];
        for (int t = 0; t < n; t++) {
            for (int i = 0; i < d; i++) {
                mean[i] += draws[t * d + i];
            }
        }
        for (int i = 0; i < d; i++) {
            mean[i] /= n;
        }
        DMatrixRMaj old = wideCovariance();
        DMatrixRMaj wideShrunk = shrunk(wideCoordinate, 0, k, old, draws, n, d, mean, weight, slopes);
        double[] keptBlocks = blocks.clone();
        double[] keptCross = cross.clone();
        double[] keptLast = last.clone();
        java.util.Arrays.fill(hLast, 0);
        int[] clique = new int[c];
        System.arraycopy(wideCoordinate, 0, clique, b, k);
        DMatrixRMaj[] cliques = new DMatrixRMaj[groups];
        for (int g = 0; g < groups; g++) {
            System.arraycopy(groupCoordinate, g * b, clique, 0, b);
            cliques[g] = shrunk(clique, 0, c, cliqueCovariance(g, old), draws, n, d, mean, weight, slopes);
        }
        boolean positive = CommonOps_DDRM.invert(wideShrunk);
        for (int g = 0; g < groups && positive; g++) {
            DMatrixRMaj p = cliques[g];
            positive = CommonOps_DDRM.invert(p);
            for (int a = 0; a < b && positive; a++) {
                for (int e = 0; e < b; e++) {
                    hBlocks[g * b * b + a * b + e] = 0.5 * (p.get(a, e) + p.get(e, a));
                }
                for (int r = 0; r < k; r++) {
                    hCross[g * k * b + r * b + a] = 0.5 * (p.get(b + r, a) + p.get(a, b + r));
                }
            }
            for (int r = 0; r < k && positive; r++) {
                for (int s = 0; s < k; s++) {
                    hLast[r * k + s] += 0.5 * (p.get(b + r, b + s) + p.get(b + s, b + r));
                }
            }
        }
        if (positive) {
            for (int r = 0; r < k; r++) {
                for (int s = 0; s < k; s++) {
                    hLast[r * k + s] -= (groups - 1) * 0.5 * (wideShrunk.get(r, s) + wideShrunk.get(s, r));
                }
            }
            positive = factor(0);
        }
        if (!positive) {
            System.arraycopy(keptBlocks, 0, blocks, 0, blocks.length);
            System.arraycopy(keptCross, 0, cross, 0, cross.length);
            System.arraycopy(keptLast, 0, last, 0, last.length);
        }
        return positive;
    }

    /**
     * weight * (sample covariance of the coordinates {@code at[from..from+c)}) + (1 - weight) *
     * {@code old} (divided by the slopes when given).
     */
    private static DMatrixRMaj shrunk(int[] at, int from, int c, DMatrixRMaj old, double[] draws, int n, int d,
            double[] mean, double weight, java.util.function.IntToDoubleFunction slopes) {
        DMatrixRMaj out = new DMatrixRMaj(c, c);
        for (int i = 0; i < c; i++) {
            int ci = at[from + i];
            for (int j = 0; j <= i; j++) {
                int cj = at[from + j];
                double cross = 0;
                for (int t = 0; t < n; t++) {
                    cross += (draws[t * d + ci] - mean[ci]) * (draws[t * d + cj] - mean[cj]);
                }
                double before = old.get(i, j);
                if (slopes != null) {
                    before /= slopes.applyAsDouble(ci) * slopes.applyAsDouble(cj);
                }
                double v = weight * cross / (n - 1) + (1 - weight) * before;
                out.set(i, j, v);
                out.set(j, i, v);
            }
        }
        return out;
    }

    /** For tests: K = L L' as a dense d x d row-major matrix in the posterior's coordinate order. */
    double[] densePrecision() {
        int d = groupOf.length;
        double[] l = new double[d * d];
        int b = own;
        int k = wide;
        for (int g = 0; g < groups; g++) {
            for (int a = 0; a < b; a++) {
                for (int e = 0; e <= a; e++) {
                    l[groupCoordinate[g * b + a] * d + groupCoordinate[g * b + e]] = blocks[g * b * b + a * b + e];
                }
                for (int r = 0; r < k; r++) {
                    l[wideCoordinate[r] * d + groupCoordinate[g * b + a]] = cross[g * k * b + r * b + a];
                }
            }
        }
        for (int r = 0; r < k; r++) {
            for (int s = 0; s <= r; s++) {
                l[wideCoordinate[r] * d + wideCoordinate[s]] = last[r * k + s];
            }
        }
        double[] out = new double[d * d];
        for (int i = 0; i < d; i++) {
            for (int j = 0; j < d; j++) {
                double s = 0;
                for (int m = 0; m < d; m++) {
                    s += l[i * d + m] * l[j * d + m];
                }
                out[i * d + j] = s;
            }
        }
        return out;
    }

    void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, blocks);
        Checkpointed.writeDoubles(out, cross);
        Checkpointed.writeDoubles(out, last);
    }

    void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, blocks);
        Checkpointed.readDoubles(in, cross);
        Checkpointed.readDoubles(in, last);
    }
}
