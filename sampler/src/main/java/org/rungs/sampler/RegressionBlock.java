package org.rungs.sampler;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.rungs.models.survey.Covariates;

/**
 * A probit regression with partially pooled group intercepts on a latent of unit variance
 * (MODEL.md 2 for the level, 4 for the coarse class): intercept[g] ~ Normal(mean, sd),
 * coefficients on the internal covariate scale, and the sufficient statistics of its latent
 * values, which the latent draws fill and the conjugate update reads.
 */
final class RegressionBlock implements Checkpointed {
    final double[][] columns;
    final int count;
    final int groups;
    final double[] intercept;
    final double[] coefficient;
    double mean;
    double sd;
    final double[] latentSum;
    final double[] latentCross;
    final DesignSums sums;
    /**
     * Latent values beyond one per respondent (the rejected draws under number attraction, see
     * {@link LatentLevelUpdate}): their count per group, their covariate sums per group and their
     * covariate cross-products, added to {@link #sums} by the conjugate update.
     */
    final double[] extraCount;
    final double[][] extraGroupCovariate;
    final double[][] extraGram;

    RegressionBlock(Covariates covariates, int[] group, int groups) {
        this.count = covariates.count();
        this.groups = groups;
        this.columns = new double[count][];
        for (int j = 0; j < count; j++) {
            columns[j] = covariates.column(j);
        }
        this.intercept = new double[groups];
        this.coefficient = new double[count];
        this.latentSum = new double[groups];
        this.latentCross = new double[count];
        this.sums = DesignSums.of(group, groups, columns);
        this.extraCount = new double[groups];
        this.extraGroupCovariate = new double[groups][count];
        this.extraGram = new double[count][count];
    }

    /** x_i' coefficient, respondent i's level without its group's intercept. */
    double covariatePart(int i) {
        double e = 0;
        for (int j = 0; j < count; j++) {
            e += columns[j][i] * coefficient[j];
        }
        return e;
    }

    /** intercept[g] + x_i' coefficient for respondent i of group g. */
    double linear(int i, int g) {
        double e = intercept[g];
        for (int j = 0; j < count; j++) {
            e += columns[j][i] * coefficient[j];
        }
        return e;
    }

    /** Forgets the extra latent values. */
    void clearExtra() {
        java.util.Arrays.fill(extraCount, 0);
        for (double[] row : extraGroupCovariate) {
            java.util.Arrays.fill(row, 0);
        }
        for (double[] row : extraGram) {
            java.util.Arrays.fill(row, 0);
        }
    }

    /** Adds {@code times} more latent values of respondent i in group g to the design. */
    void addExtra(int i, int g, int times) {
        if (times == 0) {
            return;
        }
        extraCount[g] += times;
        double[] groupRow = extraGroupCovariate[g];
        for (int j = 0; j < count; j++) {
            double xj = times * columns[j][i];
            groupRow[j] += xj;
            double[] gramRow = extraGram[j];
            for (int k = 0; k < count; k++) {
                gramRow[k] += xj * columns[k][i];
            }
        }
    }

    /**
     * Adds to group g's design the rejected draws of a run of respondents with one to four
     * covariates: their number, and per covariate the count-weighted sums {@code x} of its values
     * and {@code gram} (row-major, count x count) of the products of two.
     */
    void addExtraRun(int g, double n, double[] x, double[] gram) {
        extraCount[g] += n;
        double[] groupRow = extraGroupCovariate[g];
        for (int j = 0; j < count; j++) {
            groupRow[j] += x[j];
            double[] gramRow = extraGram[j];
            for (int k = 0; k < count; k++) {
                gramRow[k] += gram[j * count + k];
            }
        }
    }

    /** Moves the intercepts and their mean together (with one group the intercept is the mean). */
    void shiftIntercepts(double amount) {
        mean += amount;
        for (int g = 0; g < groups; g++) {
            intercept[g] += amount;
        }
    }

    /** Intercepts, coefficients, mean and sd; the latent sums are refilled every sweep. */
    @Override
    public void save(DataOutput out) throws IOException {
        Checkpointed.writeDoubles(out, intercept);
        Checkpointed.writeDoubles(out, coefficient);
        Checkpointed.writeDouble(out, mean);
        Checkpointed.writeDouble(out, sd);
    }

    @Override
    public void restore(DataInput in) throws IOException {
        Checkpointed.readDoubles(in, intercept);
        Checkpointed.readDoubles(in, coefficient);
        mean = Checkpointed.readDouble(in);
        sd = Checkpointed.readDouble(in);
    }
}
