package org.rungs.sampler;

/**
 * The collapsed steps multiply every respondent's likelihood ratio into a running product and
 * take its logarithm only when the product leaves [{@link #LOW}, {@link #HIGH}], so that one
 * logarithm serves many respondents without overflow. Where the likelihoods after and before a
 * move are kept in two products (their ratio is the ratio wanted), a respondent costs no
 * division; both are checked.
 */
final class RunningProducts {
    static final double LOW = 1e-150;
    static final double HIGH = 1e150;

    private RunningProducts() {
    }

    /** Whether either of the two running products has left the bounds, so that the caller takes the log of their ratio. */
    static boolean outside(double after, double before) {
        return after < LOW || after > HIGH || before < LOW || before > HIGH;
    }
}
