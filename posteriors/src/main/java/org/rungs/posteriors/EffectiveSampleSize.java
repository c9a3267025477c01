package org.rungs.posteriors;

import java.util.Arrays;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Multi-chain effective sample size of Vehtari et al. (2021), eqs. 10-11: autocorrelations
 * combined over chains through the between-chain variance, summed with Geyer's (1992) initial
 * monotone sequence, capped at S log10 S, following package posterior 1.4.0 ({@code .ess}).
 *
 * <p>Autocovariances are computed lag by lag by direct sums, which is cheaper while few lags
 * are needed (well-mixed chains); past {@link #directLagLimit} lags the remaining ones come from
 * one zero-padded FFT per chain. Both give the same numbers up to rounding.
 */
final class EffectiveSampleSize {
    /**
     * The FFTs cost about as much as 25 log2(padded length) direct lags (measured with Commons
     * Math 3.6.1 for 500 and 5000 draws per chain); switching there costs at most twice the
     * cheaper of the two ways.
     */
    private static final int DIRECT_LAGS_PER_FFT_STAGE = 24;

    private final int chains;
    private final int length;
    private final int directLagLimit;
    private final int paddedLength;
    private final double[] centred;
    private final double[] chainMean;
    private final double[] meanAutocovariance;
    private final double[] rho;
    private int knownLags;
    private double[][] fftWork;

    /** For {@code chains} chains of {@code length} draws each. */
    EffectiveSampleSize(int chains, int length) {
        this(chains, length, -1);
    }

    /** As above with the number of lags summed directly before switching to FFT (-1: default). */
    EffectiveSampleSize(int chains, int length, int directLagLimit) {
        this.chains = chains;
        this.length = length;
        this.paddedLength = Integer.highestOneBit(Math.max(1, 2 * length - 1)) << 1;
        this.directLagLimit = directLagLimit >= 0 ? directLagLimit
                : DIRECT_LAGS_PER_FFT_STAGE * Integer.numberOfTrailingZeros(paddedLength);
        this.centred = new double[chains * length];
        this.chainMean = new double[chains];
        this.meanAutocovariance = new double[length];
        this.rho = new double[length];
    }

    /** ESS of {@code x}, chain after chain; NaN as posterior's NA (short, non-finite or constant). */
    double of(double[] x) {
        return of(x, true);
    }

    /**
     * The ESS that the chains' autocorrelations alone imply, as if each chain were run by
     * itself: the autocorrelations relative to the mean within-chain variance, not to var+, so
     * that chains that disagree do not lower it (NaN as above).
     */
    double withinChains(double[] x) {
        return of(x, false);
    }

    private double of(double[] x, boolean between) {
        int n = length;
        if (n < 3 || DrawStatistics.shouldReturnNaN(x, chains * n)) {
            return Double.NaN;
        }
        centre(x);
        double meanVar = autocovariance(0) * n / (n - 1);
        double varPlus = meanVar;
        if (between) {
            varPlus = meanVar * (n - 1) / n;
            if (chains > 1) {
                varPlus += DrawStatistics.sampleVariance(chainMean, chains);
            }
        }
        // Geyer's initial positive sequence over pairs of lags (eq. 11 and posterior's loop)
        int t = 0;
        double rhoEven = 1;
        double rhoOdd = 1 - (meanVar - autocovariance(1)) / varPlus;
        rho[0] = rhoEven;
        rho[1] = rhoOdd;
        while (t < n - 5 && !Double.isNaN(rhoEven + rhoOdd) && rhoEven + rhoOdd > 0) {
            t += 2;
            rhoEven = 1 - (meanVar - autocovariance(t)) / varPlus;
            rhoOdd = 1 - (meanVar - autocovariance(t + 1)) / varPlus;
            // posterior's rho_hat_t starts as zeros; a negative pair keeps them
            boolean keep = rhoEven + rhoOdd >= 0;
            rho[t] = keep ? rhoEven : 0;
            rho[t + 1] = keep ? rhoOdd : 0;
        }
        int maxT = t;
        if (rhoEven > 0) {
            rho[maxT] = rhoEven;
        }
        // initial monotone sequence: pair sums must not increase
        t = 0;
        while (t <= maxT - 4) {
            t += 2;
            if (rho[t] + rho[t + 1] > rho[t - 2] + rho[t - 1]) {
                rho[t] = (rho[t - 2] + rho[t - 1]) / 2;
                rho[t + 1] = rho[t];
            }
        }
        // posterior sums rho_hat_t[1:max_t]; in R 1:0 selects the first element only
        double sum = 0;
        for (int k = 0; k < Math.max(maxT, 1); k++) {
            sum += rho[k];
        }
        double tau = -1 + 2 * sum + rho[maxT];
        double draws = (double) chains * n;
        tau = Math.max(tau, 1 / Math.log10(draws));
        return draws / tau;
    }

    private void centre(double[] x) {
        int n = length;
        for (int c = 0; c < chains; c++) {
            int base = c * n;
            double first = x[base];
            boolean constant = true;
            double sum = 0;
            for (int i = base; i < base + n; i++) {
                sum += x[i];
                constant &= x[i] == first;
            }
            double mean = sum / n;
            double correction = 0;
            for (int i = base; i < base + n; i++) {
                correction += x[i] - mean;
            }
            mean += correction / n;
            chainMean[c] = constant ? first : mean;
            // posterior's autocovariance is exactly zero for a chain with zero variance
            for (int i = base; i < base + n; i++) {
                centred[i] = constant ? 0 : x[i] - mean;
            }
        }
        knownLags = 0;
    }

    /** Autocovariance at {@code lag} (divisor n), averaged over chains. */
    private double autocovariance(int lag) {
        while (knownLags <= lag) {
            if (knownLags >= directLagLimit) {
                autocovariancesByFft();
            } else {
                meanAutocovariance[knownLags] = directAutocovariance(knownLags);
                knownLags++;
            }
        }
        return meanAutocovariance[lag];
    }

    private double directAutocovariance(int lag) {
        int n = length;
        double total = 0;
        for (int c = 0; c < chains; c++) {
            int base = c * n;
            double sum = 0;
            for (int i = base, end = base + n - lag; i < end; i++) {
                sum += centred[i] * centred[i + lag];
            }
            total += sum / n;
        }
        return total / chains;
    }

    /** Remaining lags from |FFT|^2 of each zero-padded chain (Wiener-Khinchin), padded to >= 2n. */
    private void autocovariancesByFft() {
        int n = length;
        int p = paddedLength;
        if (fftWork == null) {
            fftWork = new double[2][p];
        }
        double[] re = fftWork[0];
        double[] im = fftWork[1];
        for (int k = knownLags; k < n; k++) {
            meanAutocovariance[k] = 0;
        }
        for (int c = 0; c < chains; c++) {
            System.arraycopy(centred, c * n, re, 0, n);
            Arrays.fill(re, n, p, 0);
            Arrays.fill(im, 0);
            FastFourierTransformer.transformInPlace(fftWork, DftNormalization.STANDARD, TransformType.FORWARD);
            for (int j = 0; j < p; j++) {
                re[j] = re[j] * re[j] + im[j] * im[j];
                im[j] = 0;
            }
            // the power spectrum is real and even, so a forward transform is p times the inverse
            FastFourierTransformer.transformInPlace(fftWork, DftNormalization.STANDARD, TransformType.FORWARD);
            for (int k = knownLags; k < n; k++) {
                meanAutocovariance[k] += re[k] / p / n;
            }
        }
        for (int k = knownLags; k < n; k++) {
            meanAutocovariance[k] /= chains;
        }
        knownLags = n;
    }
}
