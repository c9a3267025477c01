package org.rungs.validation.calibration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.concurrent.atomic.AtomicBoolean;
import org.apache.commons.rng.UniformRandomProvider;
import org.apache.commons.rng.simple.RandomSource;
import org.junit.jupiter.api.Test;
import org.rungs.models.survey.Covariates;
import org.rungs.priors.Priors;

class PriorSamplerTest {

    @Test
    void thresholdsSumToZeroAndIncreaseInEveryGroup() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {1, 2});
        for (int i = 0; i < 2000; i++) {
            TrueParameters t = PriorSampler.draw(Priors.defaults(), 2, 4, 6, true, rng);
            double sum = 0;
            for (double c : t.common()) {
                sum += c;
            }
            assertEquals(0, sum, 1e-12);
            for (double[] group : t.groupThresholds()) {
                double deviationSum = 0;
                for (int k = 0; k < group.length; k++) {
                    deviationSum += group[k] - t.common()[k];
                    assertTrue(k == 0 || group[k] > group[k - 1], "group thresholds increase");
                }
                assertEquals(0, deviationSum, 1e-12, "d[g,.] sums to zero");
            }
        }
    }

    /**
     * With one group the threshold prior is iid b[k] ~ N(0,3) restricted to increasing order, so
     * c[1] = b_(1) - mean(b) has mean 3 E[Z_(1:4)] = 3 x (-1.02938) = -3.0881 for 4 thresholds.
     * Reference: the expected smallest of 4 standard normals, -1.029375 (tables of normal order
     * statistics, e.g. Harter 1961, Biometrika 48; value from memory). The sd of c[1] is about
     * 2.1, so with 40,000 draws the Monte Carlo sd of the mean is 0.011; tolerance 0.05 (4.5 sd).
     */
    @Test
    void smallestCommonThresholdHasTheMeanOfTheSmallestOrderStatistic() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {3, 4});
        int n = 40_000;
        double sum = 0;
        for (int i = 0; i < n; i++) {
            sum += PriorSampler.draw(Priors.defaults(), 0, 1, 5, false, rng).common()[0];
        }
        assertEquals(3 * -1.029375, sum / n, 0.05);
    }

    /**
     * The whole draw is rejected unless every group is ordered. Were only s rejected given b, the
     * common thresholds would keep the distribution of sorted iid normals whatever tau_d is;
     * drawn jointly, wide deviations favour widely spaced b. With threshold_sd = half-normal(3)
     * and 4 groups, the mean spread c[4] - c[1] on scale 0..4 exceeds that of sorted normals
     * (3 x 2.0588 = 6.18, the expected range of 4 standard normals; value from memory) clearly:
     * it exceeds 7 here, far beyond the Monte Carlo sd of 0.03 over 20,000 draws.
     */
    @Test
    void rejectionIsJointSoWideDeviationsWidenTheCommonThresholds() {
        UniformRandomProvider rng = RandomSource.XO_RO_SHI_RO_128_PP.create(new long[] {5, 6});
        Priors wide = Priors.defaults().with("threshold_sd=half-normal(3)");
        int n = 20_000;
        double joint = 0;
        double alone = 0;
        for (int i = 0; i < n; i++) {
            double[] c = PriorSampler.draw(wide, 0, 4, 5, true, rng).common();
            joint += c[3] - c[0];
            double[] d = PriorSampler.draw(wide, 0, 1, 5, true, rng).common();
            alone += d[3] - d[0];
        }
        assertEquals(3 * 2.058751, alone / n, 0.1, "one group: sorted normals");
        assertTrue(joint / n > 7, "joint rejection widens the spread: " + joint / n);
    }

    @Test
    void covariatesAreStandardisedAsTheEngineDoes() {
        CalibrationConfig config = CalibrationConfig.small(9, 1).withDesign(2, 25, 2);
        SimulatedData data = SimulatedData.draw(config, ReplicationSeeds.stream(9, 0));
        Covariates engine = data.survey().level();
        for (int j = 0; j < 2; j++) {
            for (int i = 0; i < 50; i++) {
                assertEquals(engine.column(j)[i], data.standardised()[j][i], 1e-12);
            }
        }
    }

    @Test
    void aReplicationDependsOnSeedAndIndexAlone() {
        CalibrationConfig config = CalibrationConfig.small(5, 3).withSampler(1, 20, 30, 9);
        ReplicationResult first = Replication.run(config, 2, new AtomicBoolean());
        ReplicationResult again = Replication.run(config, 2, new AtomicBoolean());
        assertEquals(first, again);
        assertTrue(!first.equals(Replication.run(config, 1, new AtomicBoolean())));
    }
}
