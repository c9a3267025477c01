package org.rungs.posteriors;

/** Plain statistics over the first {@code size} entries of a primitive array, computed as R does. */
final class DrawStatistics {
    /** posterior's tolerance for constant draws, R's .Machine$double.eps. */
    static final double CONSTANT_TOLERANCE = Math.ulp(1.0);

    private DrawStatistics() {
    }

    /** posterior's should_return_NA: any non-finite value, or a range below machine epsilon. */
    static boolean shouldReturnNaN(double[] x, int size) {
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < size; i++) {
            double v = x[i];
            if (!Double.isFinite(v)) {
                return true;
            }
            if (v < min) {
                min = v;
            }
            if (v > max) {
                max = v;
            }
        }
        return !(Math.abs(max - min) >= CONSTANT_TOLERANCE);
    }

    /** Mean with one refinement pass, as R's mean(); stays finite when the plain sum overflows. */
    static double mean(double[] x, int size) {
        double sum = 0;
        for (int i = 0; i < size; i++) {
            sum += x[i];
        }
        double mean = sum / size;
        if (Double.isInfinite(mean)) {
            mean = 0;
            for (int i = 0; i < size; i++) {
                mean += x[i] / size;
            }
        }
        if (!Double.isFinite(mean)) {
            return mean;
        }
        double correction = 0;
        for (int i = 0; i < size; i++) {
            correction += x[i] - mean;
        }
        return mean + correction / size;
    }

    /** Sample variance (divisor size - 1) around a given mean. */
    static double sampleVariance(double[] x, int size, double mean) {
        double sum = 0;
        for (int i = 0; i < size; i++) {
            double d = x[i] - mean;
            sum += d * d;
        }
        return sum / (size - 1);
    }

    static double sampleVariance(double[] x, int size) {
        return sampleVariance(x, size, mean(x, size));
    }

    /** R's quantile type 7 (the default of quantile() and of posterior's quantile2) on sorted data. */
    static double quantileType7(double[] sorted, int size, double prob) {
        double index = 1 + (size - 1) * prob;
        int lo = (int) Math.floor(index);
        int hi = (int) Math.ceil(index);
        double q = sorted[lo - 1];
        double above = sorted[hi - 1];
        if (index > lo && above != q) {
            double h = index - lo;
            q = (1 - h) * q + h * above;
        }
        return q;
    }

    /** R's median(): the middle value, or the mean of the middle two. */
    static double median(double[] sorted, int size) {
        int half = (size + 1) / 2;
        return size % 2 == 1 ? sorted[half - 1] : 0.5 * sorted[half - 1] + 0.5 * sorted[half];
    }
}
