package org.rungs.validation.calibration;

/**
 * The uniformity verdict on one calibrated quantity.
 *
 * @param parameter         the quantity's name
 * @param replications      N, ranks tested
 * @param chiSquare         the binned chi-square test
 * @param ecdfMaxDeviation  max_k |ECDF(z_k) - z_k|
 * @param bandExceeded      whether the ECDF leaves the simultaneous band
 * @param level             the per-quantity false-alarm rate: alpha divided by the number of quantities
 * @param fail              chi-square p below level/2, or the band (simultaneous 1 - level/2) exceeded
 */
public record Verdict(String parameter, int replications, ChiSquareUniformity chiSquare, double ecdfMaxDeviation,
        boolean bandExceeded, double level, boolean fail) {

    public String word() {
        return fail ? "fail" : "ok";
    }
}
