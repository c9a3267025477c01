package org.rungs.priors;

import java.math.BigDecimal;

/**
 * The standard normal distribution: density, distribution function {@code Phi}, its tails on
 * the natural and the log scale, quantile, and the log-probability of an interval. Static,
 * allocation-free, accurate to a few ulp (about ten where the table below serves); the
 * log-scale functions stay finite wherever the value is representable ({@code |x| < 1.89e154},
 * far beyond where the natural scale underflows at 38.5).
 *
 * <p>Within 6 sd, {@code Phi}, its tails and {@code phi} are interpolated from a table of
 * Cody's values with their first two derivatives (quintic Hermite, nodes 1/256 apart, relative
 * error at most 3e-15; {@code StandardNormalTest} holds them to 1e-14 against R), which costs a
 * few multiplications instead of an exponential and a rational function; beyond, and on the
 * log scale everywhere, the functions below are used directly.
 *
 * <p>{@code Phi} uses the rational Chebyshev approximations of W. J. Cody (1969), "Rational
 * Chebyshev approximations for the error function", Math. Comp. 23, 631-637, with the
 * coefficients for {@code Phi} of Cody's routine ANORM (W. J. Cody (1993), "Algorithm 715:
 * SPECFUN", ACM Trans. Math. Software 19, 22-32). For {@code |x| > 0.674} they give the tail as
 * {@code exp(-x^2/2) R(|x|)}, so its log is {@code -x^2/2 + log R(|x|)} and never underflows;
 * {@code x^2} is carried as an exact sum of two doubles so that {@code exp(-x^2/2)} keeps full
 * relative accuracy 38 sd out. The quantile is M. J. Wichura (1988), "Algorithm
 * AS 241: the percentage points of the normal distribution", Applied Statistics 37, 477-484
 * (PPND16).
 */
public final class StandardNormal {

    private static final double ONE_OVER_SQRT_2PI = 0.398942280401432677939946059934;
    private static final double LN_2 = 0.693147180559945309417232121458;
    /** Below this |x| Phi(x) - 1/2 is a rational function of x^2 (near quantile(3/4), ANORM). */
    private static final double CENTRAL = 0.67448975;
    /** ANORM switches to the asymptotic form in 1/x^2 beyond sqrt(32). */
    private static final double SQRT_32 = 5.656854249492380195206754896838;
    /** 2^27 + 1, splits a double into two halves whose products are exact. */
    private static final double DEKKER_SPLITTER = 134217729;
    /** Q(x) < 1e-349 beyond this, below the least subnormal. */
    private static final double TAIL_UNDERFLOW = 40;
    /** log Q(x) < -x^2/2 < -Double.MAX_VALUE beyond this. */
    private static final double LOG_TAIL_OVERFLOW = 1.9e154;
    /** The table's nodes per unit of |x| and its end (see {@link #tableTail}). */
    private static final int PER_UNIT = 256;
    public static final double TABLE_END = 6;
    /** The largest double below {@link #TABLE_END}: {@link #smallerTailInTable} clamps |x| to it. */
    private static final double LAST_IN_TABLE = Math.nextDown(TABLE_END);

    private static final double[] A = {
        2.2352520354606839287, 161.02823106855587881, 1067.6894854603709582,
        18154.981253343561249, 0.065682337918207449113};
    private static final double[] B = {
        47.20258190468824187, 976.09855173777669322, 10260.932208618978205,
        45507.789335026729956};
    private static final double[] C = {
        0.39894151208813466764, 8.8831497943883759412, 93.506656132177855979,
        597.27027639480026226, 2494.5375852903726711, 6848.1904505362823326,
        11602.651437647350124, 9842.7148383839780218, 1.0765576773720192317e-8};
    private static final double[] D = {
        22.266688044328115691, 235.38790178262499861, 1519.377599407554805,
        6485.558298266760755, 18615.571640885098091, 34900.952721145977266,
        38912.003286093271411, 19685.429676859990727};
    private static final double[] P = {
        0.21589853405795699, 0.1274011611602473639, 0.022235277870649807,
        0.001421619193227893466, 2.9112874951168792e-5, 0.02307344176494017303};
    private static final double[] Q = {
        1.28426009614491121, 0.468238212480865118, 0.0659881378689285515,
        0.00378239633202758244, 7.29751555083966205e-5};

    /** Per node y = j / PER_UNIT: Q, h Q', h^2 Q''/2, phi, h phi', h^2 phi''/2 with h = 1 / PER_UNIT (Cody's values). */
    private static final double[] NODES = nodes();
    /** Per interval j (nodes j and j+1): the quintic of {@link #interpolate} as c_0 .. c_5 in t, for Q and for phi. */
    private static final double[] TAIL_COEFFICIENTS = coefficients(0);
    private static final double[] DENSITY_COEFFICIENTS = coefficients(3);

    private StandardNormal() {
    }

    private static double[] nodes() {
        int n = (int) (TABLE_END * PER_UNIT) + 2;
        double h = 1.0 / PER_UNIT;
        double[] nodes = new double[6 * n];
        for (int j = 0; j < n; j++) {
            double y = j * h;
            double phi = ONE_OVER_SQRT_2PI * halfSquareExp(y);
            int i = 6 * j;
            nodes[i] = y <= CENTRAL ? 0.5 + centralPhiMinusHalf(-y) : tailBeyondCentral(y);
            nodes[i + 1] = -h * phi;
            nodes[i + 2] = 0.5 * h * h * y * phi;
            nodes[i + 3] = phi;
            nodes[i + 4] = -h * y * phi;
            nodes[i + 5] = 0.5 * h * h * (y * y - 1) * phi;
        }
        return nodes;
    }

    /**
     * Q(y) for 0 <= y < TABLE_END, with phi(y) written to density[at] if density is not null:
     * {@link #interpolate}d between nodes 1/256 apart whose values and first two derivatives
     * come from Cody's functions (Q' = -phi, Q'' = y phi; phi' = -y phi, phi'' = (y^2 - 1) phi).
     * Relative error at most 3e-15 for both (the quintic's error is h^6 (t(1-t))^3 / 720 times
     * the sixth derivative; measured on steps of 1e-5), for a few multiplications instead of an
     * exponential and a rational function.
     */
    private static double tableTail(double y, double[] density, int at) {
        if (density != null) {
            density[at] = interpolate(y, 3);
        }
        return interpolate(y, 0);
    }

    /**
     * Quintic Hermite interpolation at y of the node column at {@code column} (0 for Q, 3 for phi),
     * evaluated by Horner's rule in t from {@link #coefficients}: half the operations of the
     * Hermite basis, and within 7e-16 of it relative (measured on steps of 1e-6 over [0, 6)).
     */
    private static double interpolate(double y, int column) {
        double s = y * PER_UNIT;
        int j = (int) s;
        double t = s - j;
        double[] c = column == 0 ? TAIL_COEFFICIENTS : DENSITY_COEFFICIENTS;
        int i = 6 * j;
        return c[i] + t * (c[i + 1] + t * (c[i + 2] + t * (c[i + 3] + t * (c[i + 4] + t * c[i + 5]))));
    }

    /**
     * The quintic Hermite interpolant on each interval of the node column at {@code column}, in
     * powers of t: with value v, h f' = d and h^2 f''/2 = s at the two ends, the basis
     * (1 - b5, b1, b2; b5, b4, b3) with b5 = t^3 (10 - 15 t + 6 t^2), b1 = t (1-t)^3 (1 + 3t),
     * b2 = t^2 (1-t)^3, b4 = -t^3 (1-t) (4 - 3t), b3 = t^3 (1-t)^2 expands to v0 + d0 t + s0 t^2
     * + c3 t^3 + c4 t^4 + c5 t^5. The last three are sums of terms that nearly cancel, so each is
     * computed exactly from the node doubles and rounded once.
     */
    private static double[] coefficients(int column) {
        int intervals = NODES.length / 6 - 1;
        double[] c = new double[6 * intervals];
        for (int j = 0; j < intervals; j++) {
            int i = 6 * j + column;
            BigDecimal v0 = new BigDecimal(NODES[i]);
            BigDecimal d0 = new BigDecimal(NODES[i + 1]);
            BigDecimal s0 = new BigDecimal(NODES[i + 2]);
            BigDecimal dv = new BigDecimal(NODES[i + 6]).subtract(v0);
            BigDecimal d1 = new BigDecimal(NODES[i + 7]);
            BigDecimal s1 = new BigDecimal(NODES[i + 8]);
            c[6 * j] = NODES[i];
            c[6 * j + 1] = NODES[i + 1];
            c[6 * j + 2] = NODES[i + 2];
            c[6 * j + 3] = combine(dv, d0, s0, d1, s1, 10, -6, -3, -4, 1);
            c[6 * j + 4] = combine(dv, d0, s0, d1, s1, -15, 8, 3, 7, -2);
            c[6 * j + 5] = combine(dv, d0, s0, d1, s1, 6, -3, -1, -3, 1);
        }
        return c;
    }

    /** a dv + b d0 + c s0 + d d1 + e s1, exactly, rounded once to a double. */
    private static double combine(BigDecimal dv, BigDecimal d0, BigDecimal s0,
                                  BigDecimal d1, BigDecimal s1, int a, int b, int c, int d, int e) {
        return dv.multiply(BigDecimal.valueOf(a)).add(d0.multiply(BigDecimal.valueOf(b)))
                .add(s0.multiply(BigDecimal.valueOf(c))).add(d1.multiply(BigDecimal.valueOf(d)))
                .add(s1.multiply(BigDecimal.valueOf(e))).doubleValue();
    }

    /** phi(x) = exp(-x^2/2) / sqrt(2 pi) (from the table within 6 sd). */
    public static double density(double x) {
        double y = Math.abs(x);
        if (y < TABLE_END) {
            return interpolate(y, 3);
        }
        if (y > TAIL_UNDERFLOW) {
            return 0;
        }
        return ONE_OVER_SQRT_2PI * halfSquareExp(y);
    }

    /** Phi(x) = P(Z <= x). */
    public static double cdf(double x) {
        double y = Math.abs(x);
        double tail = y < TABLE_END ? tableTail(y, null, 0) : tailBeyondCentral(y);
        return x > 0 ? 1 - tail : tail;
    }

    /** Q(x) = 1 - Phi(x) = Phi(-x), without cancellation for large x. */
    public static double upperTail(double x) {
        return cdf(-x);
    }

    /** log Phi(x); finite for x > -1.89e154. */
    public static double logCdf(double x) {
        double y = Math.abs(x);
        if (y <= CENTRAL) {
            return Math.log(0.5 + centralPhiMinusHalf(x));
        }
        return x > 0 ? Math.log1p(-tailBeyondCentral(y)) : logTailBeyondCentral(y);
    }

    /** log Q(x) = log(1 - Phi(x)); finite for x < 1.89e154. */
    public static double logUpperTail(double x) {
        return logCdf(-x);
    }

    /**
     * The inverse of Phi (AS 241, PPND16, relative accuracy about 1e-16).
     *
     * @return minus infinity at 0, plus infinity at 1, NaN outside [0, 1]
     */
    public static double quantile(double p) {
        if (!(p > 0 && p < 1)) {
            return p == 0 ? Double.NEGATIVE_INFINITY : p == 1 ? Double.POSITIVE_INFINITY : Double.NaN;
        }
        double q = p - 0.5;
        if (Math.abs(q) <= 0.425) {
            double r = 0.180625 - q * q;
            return q * (((((((r * 2509.0809287301226727 + 33430.575583588128105) * r
                    + 67265.770927008700853) * r + 45921.953931549871457) * r
                    + 13731.693765509461125) * r + 1971.5909503065514427) * r
                    + 133.14166789178437745) * r + 3.387132872796366608)
                    / (((((((r * 5226.495278852545925 + 28729.085735721942674) * r
                    + 39307.89580009271061) * r + 21213.794301586595867) * r
                    + 5394.1960214247511077) * r + 687.1870074920579083) * r
                    + 42.313330701600911252) * r + 1);
        }
        // 1 - p is exact for p > 1/2 (Sterbenz).
        double r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
        double z;
        if (r <= 5) {
            r -= 1.6;
            z = (((((((r * 7.7454501427834140764e-4 + 0.0227238449892691845833) * r
                    + 0.24178072517745061177) * r + 1.27045825245236838258) * r
                    + 3.64784832476320460504) * r + 5.7694972214606914055) * r
                    + 4.6303378461565452959) * r + 1.42343711074968357734)
                    / (((((((r * 1.05075007164441684324e-9 + 5.475938084995344946e-4) * r
                    + 0.0151986665636164571966) * r + 0.14810397642748007459) * r
                    + 0.68976733498510000455) * r + 1.6763848301838038494) * r
                    + 2.05319162663775882187) * r + 1);
        } else {
            r -= 5;
            z = (((((((r * 2.01033439929228813265e-7 + 2.71155556874348757815e-5) * r
                    + 0.0012426609473880784386) * r + 0.026532189526576123093) * r
                    + 0.29656057182850489123) * r + 1.7848265399172913358) * r
                    + 5.4637849111641143699) * r + 6.6579046435011037772)
                    / (((((((r * 2.04426310338993978564e-15 + 1.4215117583164458887e-7) * r
                    + 1.8463183175100546818e-5) * r + 7.868691311456132591e-4) * r
                    + 0.0148753612908506148525) * r + 0.13692988092273580531) * r
                    + 0.59983220655588793769) * r + 1);
        }
        return q < 0 ? -z : z;
    }

    /**
     * Phi(upper) - Phi(lower) for lower <= upper, taken on the side where the interval lies so that
     * nothing cancels: upper tails when lower > 0, lower tails when upper < 0. Underflows to 0
     * beyond about 38 sd; use {@link #logIntervalProbability} where that matters.
     */
    public static double intervalProbability(double lower, double upper) {
        // Both tails first, then one branch on the side: the same doubles as taking each tail inside
        // its branch, with fewer branches that depend on the data (the density pass of the coarse
        // model at a million respondents: 45 against 34 ns per respondent).
        return intervalFromTails(lower, upper, smallerTail(lower), smallerTail(upper));
    }

    /** Q(|x|), the mass beyond x on its own side, as {@link #cdf(double)} computes Phi(-|x|). */
    public static double smallerTail(double x) {
        double y = Math.abs(x);
        return y < TABLE_END ? tableTail(y, null, 0) : tailBeyondCentral(y);
    }

    /**
     * {@link #density(double)}, bit for bit, for |x| < {@link #TABLE_END}; beyond it a finite value
     * of no meaning, as {@link #smallerTailInTable}, which this accompanies.
     */
    public static double densityInTable(double x) {
        return interpolate(Math.min(Math.abs(x), LAST_IN_TABLE), 3);
    }

    /**
     * {@link #smallerTail(double)}, bit for bit, for |x| < {@link #TABLE_END}; beyond it a finite
     * value of no meaning (|x| is clamped to the table), so the caller checks |x| and takes
     * {@link #smallerTail(double)} there. It neither branches nor calls: a loop over a
     * respondent's thresholds that reads it stays free of calls, which HotSpot's C2 needs to
     * schedule the loop well. Through {@link #smallerTail(double)}, whose far branch C2 inlined
     * or left a call depending on the profile, the exact density pass of the benchmark's complete
     * model at a million respondents cost 52 or 68 to 100 ns per respondent from one process to
     * the next.
     */
    public static double smallerTailInTable(double x) {
        return interpolate(Math.min(Math.abs(x), LAST_IN_TABLE), 0);
    }

    /**
     * {@link #intervalProbability(double, double)}, bit for bit, also writing phi(lower) to
     * {@code density[at]} and phi(upper) to {@code density[at + 1]}: the tail and the density share
     * their table lookup, and beyond the table their exponential, exp(-x^2/2) R(|x|) and
     * exp(-x^2/2) / sqrt(2 pi).
     */
    public static double intervalProbability(double lower, double upper, double[] density, int at) {
        return intervalFromTails(lower, upper, smallerTail(lower, density, at), smallerTail(upper, density, at + 1));
    }

    /**
     * Phi(upper) - Phi(lower) from the smaller tails at both bounds ({@link #smallerTail}; 0 at an
     * infinite bound), as a difference on the side where the interval lies.
     */
    public static double intervalFromTails(double lower, double upper, double lowerTail, double upperTail) {
        if (lower > 0) {
            return lowerTail - upperTail;
        }
        if (upper < 0) {
            return upperTail - lowerTail;
        }
        return 1 - lowerTail - upperTail;
    }

    /** {@link #cdf(double)}, bit for bit, also writing phi(x) to {@code density[at]} (as {@link #density}, bit for bit). */
    public static double cdf(double x, double[] density, int at) {
        double tail = smallerTail(x, density, at);
        return x > 0 ? 1 - tail : tail;
    }

    /**
     * Q(|x|), the mass beyond x on its own side, computed as {@link #cdf(double)} computes Phi(-|x|),
     * with phi(x) written to {@code density[at]}: Phi(x) for x <= 0, 1 - Phi(x) for x > 0, with
     * full relative accuracy, so that an interval's probability is a difference taken on the side
     * where it lies, as {@link #intervalProbability(double, double, double[], int)} takes it.
     */
    public static double smallerTail(double x, double[] density, int at) {
        double y = Math.abs(x);
        if (y < TABLE_END) {
            return tableTail(y, density, at);
        }
        if (y > TAIL_UNDERFLOW) {
            density[at] = 0;
            return 0;
        }
        double e = halfSquareExp(y);
        density[at] = ONE_OVER_SQRT_2PI * e;
        return e * tailFactor(y);
    }

    /**
     * log(Phi(upper) - Phi(lower)) for lower < upper, either possibly infinite. An interval in one
     * tail is measured from that tail, log Q(l) + log(1 - Q(u)/Q(l)), so it keeps full relative
     * accuracy far out; an interval touching the centre is the difference of the two offsets
     * Phi(x) - 1/2, or, when it holds more than half the mass, log1p of minus the two tails it
     * leaves out. The relative error of the probability is a few eps, or, for an interval of
     * width w in the body, about eps |x| / w: the change that rounding a bound by eps |x| makes.
     *
     * @return minus infinity if lower == upper, NaN if lower > upper
     */
    public static double logIntervalProbability(double lower, double upper) {
        if (lower >= CENTRAL) {
            return logTailInterval(lower, upper);
        }
        if (upper <= -CENTRAL) {
            return logTailInterval(-upper, -lower);
        }
        double mass = phiMinusHalf(upper) - phiMinusHalf(lower);
        if (mass <= 0.5) {
            return Math.log(mass);
        }
        return Math.log1p(-(cdf(lower) + upperTail(upper)));
    }

    /**
     * log(Q(l) - Q(u)) for CENTRAL <= l <= u, as log Q(l) + log(1 - Q(u)/Q(l)). With Q = exp(-y^2/2) R,
     * log(Q(u)/Q(l)) = -(u - l)(u + l)/2 + log(R(u)/R(l)), which avoids subtracting two large logs.
     */
    private static double logTailInterval(double l, double u) {
        double factorLower = tailFactor(l);
        double logRatio = -0.5 * (u - l) * (u + l) + Math.log(tailFactor(u) / factorLower);
        return logTail(l, factorLower) + log1mExp(logRatio);
    }

    /** Phi(x) - 1/2, with full relative accuracy near 0. */
    private static double phiMinusHalf(double x) {
        double y = Math.abs(x);
        if (y <= CENTRAL) {
            return centralPhiMinusHalf(x);
        }
        double tail = tailBeyondCentral(y);
        return x > 0 ? 0.5 - tail : tail - 0.5;
    }

    /** Phi(x) - 1/2 = x A(x^2) / B(x^2) for |x| <= CENTRAL (ANORM). */
    private static double centralPhiMinusHalf(double x) {
        double xsq = x * x;
        double num = A[4] * xsq;
        double den = xsq;
        for (int i = 0; i < 3; i++) {
            num = (num + A[i]) * xsq;
            den = (den + B[i]) * xsq;
        }
        return x * (num + A[3]) / (den + B[3]);
    }

    /** Q(y) for y > CENTRAL. */
    private static double tailBeyondCentral(double y) {
        if (y > TAIL_UNDERFLOW) {
            return 0;
        }
        return halfSquareExp(y) * tailFactor(y);
    }

    /** log Q(y) for y > CENTRAL. */
    private static double logTailBeyondCentral(double y) {
        return logTail(y, tailFactor(y));
    }

    /**
     * log Q(y) = -y^2/2 + log R(y) for y > CENTRAL, given R(y). y = head + rest with head a
     * multiple of 1/16, so head^2 is exact (to y = 5e6) and y^2 = head^2 + (y - head)(y + head)
     * keeps full accuracy (ANORM).
     */
    private static double logTail(double y, double factor) {
        if (y > LOG_TAIL_OVERFLOW) {
            return Double.NEGATIVE_INFINITY;
        }
        double head = Math.floor(y * 16) / 16;
        double correction = (y - head) * (y + head);
        return -head * (0.5 * head) - 0.5 * correction + Math.log(factor);
    }

    /**
     * exp(-y^2/2) for 0 <= y <= TAIL_UNDERFLOW, to full relative accuracy: y^2 = square + error
     * exactly (Dekker's product, T. J. Dekker (1971), Numer. Math. 18, 224-242), and
     * exp(-error/2) = 1 - error/2 as |error| <= 2e-13 here.
     */
    private static double halfSquareExp(double y) {
        double split = DEKKER_SPLITTER * y;
        double high = split - (split - y);
        double low = y - high;
        double square = y * y;
        double error = ((high * high - square) + 2 * high * low) + low * low;
        return Math.exp(-0.5 * square) * (1 - 0.5 * error);
    }

    /** R(y) = Q(y) exp(y^2/2) for y > CENTRAL (ANORM). */
    private static double tailFactor(double y) {
        if (y <= SQRT_32) {
            double num = C[8] * y;
            double den = y;
            for (int i = 0; i < 7; i++) {
                num = (num + C[i]) * y;
                den = (den + D[i]) * y;
            }
            return (num + C[7]) / (den + D[7]);
        }
        double r = 1 / (y * y);
        double num = P[5] * r;
        double den = r;
        for (int i = 0; i < 4; i++) {
            num = (num + P[i]) * r;
            den = (den + Q[i]) * r;
        }
        double correction = r * (num + P[4]) / (den + Q[4]);
        return (ONE_OVER_SQRT_2PI - correction) / y;
    }

    /**
     * log(1 - exp(a)) for a <= 0, choosing expm1 or log1p by the side of -log 2 as in
     * M. Maechler (2012), "Accurately computing log(1 - exp(-|a|))", Rmpfr package vignette.
     */
    private static double log1mExp(double a) {
        return a > -LN_2 ? Math.log(-Math.expm1(a)) : Math.log1p(-Math.exp(a));
    }
}
