package org.rungs.priors;

/** Half-normal prior on a spread, Half-Normal(0, sd), parameterised by sd (MODEL.md section 1). */
public record HalfNormal(double sd) {
    private static final double LOG_HALF_NORMALISER = 0.5 * Math.log(2 / Math.PI);

    public HalfNormal {
        if (!(sd > 0) || !Double.isFinite(sd)) {
            throw new IllegalArgumentException("a half-normal prior needs a positive sd, got half-normal(" + sd + ")");
        }
    }

    /** Log density for x >= 0; minus infinity below zero. */
    public double logDensity(double x) {
        if (x < 0) {
            return Double.NEGATIVE_INFINITY;
        }
        double z = x / sd;
        return -0.5 * z * z - Math.log(sd) + LOG_HALF_NORMALISER;
    }

    @Override
    public String toString() {
        return "half-normal(" + sd + ")";
    }
}
