package org.rungs.priors;

/** Normal prior parameterised by its standard deviation, as in MODEL.md section 1. */
public record Normal(double mean, double sd) {
    private static final double LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

    public Normal {
        if (!(sd > 0) || !Double.isFinite(sd) || !Double.isFinite(mean)) {
            throw new IllegalArgumentException("a normal prior needs a finite mean and a positive sd, got normal(" + mean + ", " + sd + ")");
        }
    }

    public double logDensity(double x) {
        double z = (x - mean) / sd;
        return -0.5 * z * z - Math.log(sd) - LOG_SQRT_2PI;
    }

    /** Precision 1/sd^2, the weight of this prior in a conjugate Gaussian update. */
    public double precision() {
        return 1.0 / (sd * sd);
    }

    @Override
    public String toString() {
        return "normal(" + mean + ", " + sd + ")";
    }
}
