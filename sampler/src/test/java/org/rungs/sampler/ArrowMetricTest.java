package org.rungs.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.IOException;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * The arrow metric against dense linear algebra from EJML 0.46.1 (its inverse and products) on
 * small matrices whose coordinates interleave groups and survey-wide ones as the posterior's do.
 */
class ArrowMetricTest {
    private static final int GROUPS = 4;
    private static final int OWN = 3;
    private static final int WIDE = 2;
    private static final int D = GROUPS * OWN + WIDE;

    /** Coordinates: the survey-wide ones at 0 and 7, the groups' own spread over the rest, slot-major. */
    private static int[] groupOf() {
        int[] g = new int[D];
        int next = 0;
        for (int j = 0; j < D; j++) {
            g[j] = j == 0 || j == 7 ? -1 : next++ % GROUPS;
        }
        return g;
    }

    private static int[] slotOf(int[] groupOf) {
        int[] slot = new int[D];
        int[] seen = new int[GROUPS];
        for (int j = 0; j < D; j++) {
            if (groupOf[j] >= 0) {
                slot[j] = seen[groupOf[j]]++;
            }
        }
        return slot;
    }

    /** A random symmetric positive definite matrix with no entry between two groups, plus {@code shift} on the diagonal. */
    private static double[] arrowMatrix(int[] groupOf, long seed, double shift) {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(seed);
        double[] a = new double[D * D];
        for (int i = 0; i < D; i++) {
            for (int j = 0; j < i; j++) {
                boolean apart = groupOf[i] >= 0 && groupOf[j] >= 0 && groupOf[i] != groupOf[j];
                double v = apart ? 0 : rng.nextDouble() - 0.5;
                a[i * D + j] = v;
                a[j * D + i] = v;
            }
            a[i * D + i] = D / 2.0 + rng.nextDouble() + shift;
        }
        return a;
    }

    private static ArrowMetric measuredFrom(double[] a, int[] groupOf) {
        ArrowMetric metric = new ArrowMetric(groupOf, slotOf(groupOf), GROUPS, OWN);
        metric.clearMeasured();
        for (int i = 0; i < D; i++) {
            for (int j = 0; j < D; j++) {
                metric.measured(i, j, a[i * D + j]);
            }
        }
        return metric;
    }

    private static double[] inverse(double[] a) {
        DMatrixRMaj m = new DMatrixRMaj(D, D, true, a);
        assertTrue(CommonOps_DDRM.invert(m));
        return m.data;
    }

    /** The factor reproduces the matrix, and the two solves give K^-1 v = L'^-1 L^-1 v and |L^-1 v|^2 = v' K^-1 v. */
    @Test
    void theFactorAndItsSolvesMatchTheDenseInverse() {
        int[] groupOf = groupOf();
        double[] a = arrowMatrix(groupOf, 3L, 0);
        ArrowMetric metric = measuredFrom(a, groupOf);
        assertTrue(metric.factorMeasured());
        double[] k = metric.densePrecision();
        for (int i = 0; i < D * D; i++) {
            assertEquals(a[i], k[i], 1e-12, "entry " + i);
        }
        double[] inv = inverse(a);
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(4L);
        for (int trial = 0; trial < 5; trial++) {
            double[] v = new double[D];
            for (int i = 0; i < D; i++) {
                v[i] = rng.nextDouble() - 0.5;
            }
            double[] expected = new double[D];
            double quadratic = 0;
            for (int i = 0; i < D; i++) {
                for (int j = 0; j < D; j++) {
                    expected[i] += inv[i * D + j] * v[j];
                }
                quadratic += v[i] * expected[i];
            }
            double[] y = v.clone();
            metric.solveLower(y);
            double squared = 0;
            for (double x : y) {
                squared += x * x;
            }
            assertEquals(quadratic, squared, 1e-12);
            metric.solveUpper(y);
            assertArrayEquals(expected, y, 1e-12);
        }
    }

    /**
     * Where the measured matrix is not positive definite, a multiple of its largest diagonal entry
     * is added to the diagonal, and nothing else changes.
     */
    @Test
    void anIndefiniteMatrixGainsARidgeOnItsDiagonalOnly() {
        int[] groupOf = groupOf();
        double[] a = arrowMatrix(groupOf, 5L, -D / 2.0 - 0.9);
        ArrowMetric metric = measuredFrom(a, groupOf);
        assertTrue(metric.factorMeasured());
        double[] k = metric.densePrecision();
        double ridge = k[0] - a[0];
        assertTrue(ridge > 0, "a ridge was added: " + ridge);
        for (int i = 0; i < D; i++) {
            for (int j = 0; j < D; j++) {
                assertEquals(a[i * D + j] + (i == j ? ridge : 0), k[i * D + j], 1e-9, "entry " + i + "," + j);
            }
        }
    }

    /** Entries measured in one orientation only count on both sides; in both, their mean. */
    @Test
    void entriesAreSymmetrisedAsTheDenseHessianIs() {
        int[] groupOf = groupOf();
        double[] a = arrowMatrix(groupOf, 6L, 0);
        ArrowMetric metric = new ArrowMetric(groupOf, slotOf(groupOf), GROUPS, OWN);
        metric.clearMeasured();
        for (int i = 0; i < D; i++) {
            for (int j = 0; j < D; j++) {
                if (groupOf[i] >= 0 && groupOf[j] < 0) {
                    continue; // a group's row of a survey-wide column: measured from the other side only
                }
                metric.measured(i, j, a[i * D + j] + (i == 1 && j == 5 ? 0.02 : 0));
            }
        }
        assertTrue(metric.factorMeasured());
        double[] k = metric.densePrecision();
        for (int i = 0; i < D; i++) {
            for (int j = 0; j < D; j++) {
                boolean skewed = (i == 1 && j == 5) || (i == 5 && j == 1);
                assertEquals(a[i * D + j] + (skewed ? 0.01 : 0), k[i * D + j], 1e-12, "entry " + i + "," + j);
            }
        }
    }

    /**
     * A refit's precision has, on every clique (a group's coordinates with the survey-wide ones),
     * exactly the covariance asked for: the draws' covariance shrunk towards the metric's with
     * weight n / (n + d), the old one divided by the slopes (Lauritzen 1996, proposition 5.9, from
     * memory); and it keeps the arrow pattern.
     */
    @Test
    void aRefitMatchesTheShrunkCovarianceOnEveryClique() {
        int[] groupOf = groupOf();
        double[] a = arrowMatrix(groupOf, 7L, 0);
        ArrowMetric metric = measuredFrom(a, groupOf);
        assertTrue(metric.factorMeasured());
        double[] old = inverse(metric.densePrecision());
        int n = 40;
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(8L);
        double[] draws = new double[n * D];
        for (int t = 0; t < n; t++) {
            double common = rng.nextDouble();
            for (int i = 0; i < D; i++) {
                draws[t * D + i] = rng.nextDouble() + (i % 3 == 0 ? common : 0); // correlated across groups too
            }
        }
        double[] slope = new double[D];
        for (int i = 0; i < D; i++) {
            slope[i] = 0.5 + 0.1 * i;
        }
        assertTrue(metric.refit(draws, n, D, j -> slope[j]));
        double[] k = metric.densePrecision();
        double[] cov = inverse(k);
        double weight = (double) n / (n + D);
        for (int i = 0; i < D; i++) {
            for (int j = 0; j < D; j++) {
                boolean apart = groupOf[i] >= 0 && groupOf[j] >= 0 && groupOf[i] != groupOf[j];
                if (apart) {
                    assertEquals(0, k[i * D + j], 1e-12, "precision between two groups, " + i + "," + j);
                    continue;
                }
                double mi = 0;
                double mj = 0;
                for (int t = 0; t < n; t++) {
                    mi += draws[t * D + i] / n;
                    mj += draws[t * D + j] / n;
                }
                double sample = 0;
                for (int t = 0; t < n; t++) {
                    sample += (draws[t * D + i] - mi) * (draws[t * D + j] - mj) / (n - 1);
                }
                double expected = weight * sample + (1 - weight) * old[i * D + j] / (slope[i] * slope[j]);
                assertEquals(expected, cov[i * D + j], 1e-10 * Math.max(1, Math.abs(expected)), "covariance " + i + "," + j);
            }
        }
    }

    /** A checkpoint restores the factor bit for bit. */
    @Test
    void aCheckpointRestoresTheFactor() throws IOException {
        int[] groupOf = groupOf();
        ArrowMetric metric = measuredFrom(arrowMatrix(groupOf, 9L, 0), groupOf);
        assertTrue(metric.factorMeasured());
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        metric.save(new DataOutputStream(bytes));
        ArrowMetric restored = new ArrowMetric(groupOf, slotOf(groupOf), GROUPS, OWN);
        restored.restore(new DataInputStream(new ByteArrayInputStream(bytes.toByteArray())));
        assertArrayEquals(metric.densePrecision(), restored.densePrecision(), 0.0);
    }
}
