# Reference values for StandardNormalTest.
#
# Run from this directory with R 4.2.2 and the R package Rmpfr 0.9-1 (Debian: r-cran-rmpfr):
#   Rscript standard-normal-reference.R
# It rewrites standard-normal.csv, quantile.csv and interval.csv beside it. Every number is
# printed with sprintf("%.17g"), which round-trips a double exactly; infinities as Infinity.
#
# standard-normal.csv: stats::dnorm and stats::pnorm in double precision (lower and upper
#   tail, natural and log scale).
# quantile.csv: stats::qnorm in double precision.
# interval.csv: log(Phi(upper) - Phi(lower)) in 256-bit floating point (Rmpfr::pnorm, built
#   on MPFR's erfc), then rounded to double; the bounds are doubles, taken exactly. An
#   interval with lower >= 0 is mirrored to (-upper, -lower) first, and one holding 0 is
#   computed as log1p(-(Phi(lower) + Phi(-upper))), as 1 - Phi(40) would round to 0 even at
#   256 bits.

suppressPackageStartupMessages(library(Rmpfr))

fmt <- function(v) {
  s <- sprintf("%.17g", v)
  s[v == Inf] <- "Infinity"
  s[v == -Inf] <- "-Infinity"
  s
}

# Grid: region boundaries of the approximations, far tails, and pseudo-random points.
set.seed(20240611)
magnitudes <- c(0, 1e-300, 1e-10, 1e-3, 0.1, 0.5, 0.67448975, 0.6745, 0.7, 1, 1.5, 2, 2.5,
                3, 4, 5, sqrt(32), 5.7, 6, 7, 8, 8.2924, 9, 10, 12, 15, 20, 26, 30, 35,
                37.5, 37.5193, 38, 38.4, 38.5, 39, 40, 50, 100, 1e3, 1e5, 1e10, 1e100,
                1e150, Inf)
x <- c(-magnitudes, magnitudes[-1], round(runif(120, -40, 40), 6), round(runif(40, -6, 6), 6))
x <- sort(unique(x))
write.csv(data.frame(
  x = fmt(x),
  density = fmt(stats::dnorm(x)),
  cdf = fmt(stats::pnorm(x)),
  upper_tail = fmt(stats::pnorm(x, lower.tail = FALSE)),
  log_cdf = fmt(stats::pnorm(x, log.p = TRUE)),
  log_upper_tail = fmt(stats::pnorm(x, lower.tail = FALSE, log.p = TRUE))),
  "standard-normal.csv", row.names = FALSE, quote = FALSE)

small <- c(1e-320, 1e-300, 1e-200, 1e-100, 1e-50, 1e-20, 1e-10, 1e-5, 1e-3, 0.01, 0.02425,
           0.05, 0.075, 0.07501, 0.1, 0.2, 0.3, 0.4, 0.45, 0.49, 0.499999)
p <- sort(unique(c(0, small, 0.5, 1 - small[small > 1e-16], 1, runif(40))))
write.csv(data.frame(p = fmt(p), quantile = fmt(stats::qnorm(p))),
          "quantile.csv", row.names = FALSE, quote = FALSE)

bounds <- matrix(c(
  -Inf, Inf,   -Inf, 0,     0, Inf,      -Inf, -40,   40, Inf,     -Inf, 40,
  -40, Inf,    5, Inf,      10, Inf,     -Inf, -10,   10, 10.5,    -10.5, -10,
  40, 40.001,  -40.001, -40, 37.5, 38,   38, 40,      100, 101,    -101, -100,
  1e3, Inf,    -Inf, -1e3,  1e3, 1e3 + 1e-6, -1, 1,   -10, 10,     -40, 40,
  -1e-10, 1e-10, 1e-10, 2e-10, 0.2, 0.2001, 0.6, 0.7, 0.6, 5,     0.7, 0.8,
  3, 8,        -3, 8,       -0.5, 0.5,   -0.5, 8,     -8, 0.5,     8, 9,
  5, 6,        -6, -5,      1, 1.001,    -2, -1.5,    0.674, 0.675, -0.675, -0.674,
  -0.1, Inf,   -Inf, 0.1,   -30, 30,     2, 2 + 1e-7, -37.5, 37.5, 0.67448975, Inf),
  ncol = 2, byrow = TRUE)
lower <- bounds[, 1]
upper <- bounds[, 2]
logp <- sapply(seq_along(lower), function(i) {
  lo <- mpfr(lower[i], 256)
  hi <- mpfr(upper[i], 256)
  if (lower[i] >= 0) {
    mirrored <- -hi
    hi <- -lo
    lo <- mirrored
  }
  if (upper[i] <= 0 || lower[i] >= 0) {
    as.numeric(log(Rmpfr::pnorm(hi) - Rmpfr::pnorm(lo)))
  } else {
    as.numeric(log1p(-(Rmpfr::pnorm(lo) + Rmpfr::pnorm(-hi))))
  }
})
write.csv(data.frame(lower = fmt(lower), upper = fmt(upper), log_probability = fmt(logp)),
          "interval.csv", row.names = FALSE, quote = FALSE)
