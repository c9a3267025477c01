# Regenerates the draw fixtures and the reference diagnostics used by ConvergenceReferenceTest.
# Run from this folder:  Rscript make-fixtures.R
# Needs R 4.2.2 and package posterior 1.4.0 (the versions the committed values come from).
# Each fixture is written in the DrawsCsv format (chain,iteration,x; chain-major, 1-based) with
# 17 significant digits, so Java reads exactly the doubles R used. reference.csv holds one
# value per line: fixture,quantity,value (NA where posterior returns NA).
suppressPackageStartupMessages(library(posterior))
stopifnot(packageVersion("posterior") == "1.4.0")
set.seed(20240517)

ar1 <- function(n, phi) {
  x <- numeric(n)
  x[1] <- rnorm(1)
  for (t in 2:n) x[t] <- phi * x[t - 1] + sqrt(1 - phi^2) * rnorm(1)
  x
}
# iterations x chains, the layout posterior's functions take for a matrix
chains_of <- function(m, n, f) sapply(seq_len(m), function(c) f(n))

fixtures <- list()
fixtures$ar05 <- chains_of(4, 1000, function(n) ar1(n, 0.5))
fixtures$ar09 <- chains_of(4, 1000, function(n) ar1(n, 0.9))
fixtures$student_t15 <- chains_of(4, 1000, function(n) rt(n, df = 1.5))
shifted <- chains_of(4, 500, function(n) rnorm(n))
shifted[, 3:4] <- shifted[, 3:4] + 1
fixtures$shifted <- shifted
fixtures$short <- chains_of(2, 50, function(n) ar1(n, 0.3))
# odd length: split R-hat and ESS drop the middle iteration of each chain
fixtures$odd <- chains_of(3, 101, function(n) ar1(n, 0.5))
# many ties: exercises average ranks and quantiles that fall on repeated values
fixtures$discrete <- chains_of(4, 300, function(n) as.numeric(rpois(n, 2)))
# one infinite draw: posterior keeps rank-based R-hat/bulk ESS but returns NA for the rest
infinite <- chains_of(4, 100, function(n) rnorm(n))
infinite[17, 2] <- Inf
fixtures$infinite <- infinite

java_number <- function(v) {
  ifelse(is.na(v), "NA",
    ifelse(is.infinite(v), ifelse(v > 0, "Infinity", "-Infinity"), sprintf("%.17g", v)))
}

# posterior 1.4.0 exports only the larger R-hat; its two parts are built from the same internal
# functions that rhat() itself calls
internal <- asNamespace("posterior")
rhat_bulk <- function(x) internal$.rhat(internal$z_scale(internal$.split_chains(x)))
rhat_tail <- function(x) internal$.rhat(internal$z_scale(internal$.split_chains(internal$fold_draws(x))))

reference <- character()
for (name in names(fixtures)) {
  x <- fixtures[[name]]
  m <- ncol(x)
  n <- nrow(x)
  rows <- sprintf("%d,%d,%s", rep(seq_len(m), each = n), rep(seq_len(n), times = m),
                  java_number(as.vector(x)))
  writeLines(c("chain,iteration,x", rows), paste0(name, ".csv"))

  q <- quantile2(x, probs = c(0.05, 0.5, 0.95))
  values <- c(
    mean = mean(x), sd = sd(x), q5 = q[[1]], q50 = q[[2]], q95 = q[[3]],
    rhat = rhat(x), rhat_bulk = rhat_bulk(x), rhat_tail = rhat_tail(x),
    ess_bulk = ess_bulk(x), ess_tail = ess_tail(x), ess_mean = ess_mean(x),
    ess_q5 = ess_quantile(x, 0.05, names = FALSE), ess_q95 = ess_quantile(x, 0.95, names = FALSE),
    mcse_mean = mcse_mean(x), mcse_sd = mcse_sd(x),
    mcse_q5 = mcse_quantile(x, 0.05, names = FALSE), mcse_q50 = mcse_quantile(x, 0.5, names = FALSE),
    mcse_q95 = mcse_quantile(x, 0.95, names = FALSE))
  reference <- c(reference, sprintf("%s,%s,%s", name, names(values), java_number(values)))
}
writeLines(c(
  sprintf("# %s; package posterior %s; make-fixtures.R, set.seed(20240517)",
          R.version.string, packageVersion("posterior")),
  "fixture,quantity,value", reference), "reference.csv")
