# Regenerates the log-likelihood fixtures and the reference values of LeaveOneOutReferenceTest.
# Run from this folder:  Rscript make-fixtures.R
# Needs R 4.2.2 and package loo 2.5.1 (Debian bookworm's r-cran-loo; the versions the committed
# values come from). Each fixture is a matrix of log-likelihoods, draws by observations, chain
# after chain (4 chains), written with 17 significant digits so that Java reads the doubles R
# used: one row per draw, no header. reference-<fixture>.csv holds per observation loo's
# pointwise elpd_loo, mcse_elpd_loo, p_loo and influence_pareto_k, and the r_eff passed to loo
# (relative_eff of exp(ll) by chain).
suppressPackageStartupMessages(library(loo))
stopifnot(packageVersion("loo") == "2.5.1")
set.seed(20261205)

chains <- 4
per_chain <- 250
S <- chains * per_chain
chain_id <- rep(seq_len(chains), each = per_chain)

# a normal model's draws of (mu, sigma), independent ("iid") or with AR(1) chains ("ar"); data
# with two outliers, so that some observations have Pareto k above 0.7
y <- c(rnorm(17, 1, 1), 4.2, 5, -3.2)
draws_of <- function(ar) {
  n <- length(y)
  z <- numeric(S)
  for (c in seq_len(chains)) {
    e <- rnorm(per_chain)
    if (ar > 0) for (t in 2:per_chain) e[t] <- ar * e[t - 1] + sqrt(1 - ar^2) * e[t]
    z[chain_id == c] <- e
  }
  sigma <- sqrt((n - 1) * var(y) / rchisq(S, n - 1)) * 0.8
  mu <- mean(y) + sigma / sqrt(n) * z
  sapply(y, function(yi) dnorm(yi, mu, sigma, log = TRUE))
}

write_fixture <- function(name, ll) {
  write.table(formatC(ll, digits = 17, format = "g"), paste0(name, ".csv"), sep = ",",
              quote = FALSE, row.names = FALSE, col.names = FALSE)
  r_eff <- relative_eff(exp(ll), chain_id = chain_id)
  fit <- suppressWarnings(loo(ll, r_eff = r_eff))
  p <- fit$pointwise
  out <- data.frame(elpd_loo = p[, "elpd_loo"], mcse_elpd_loo = p[, "mcse_elpd_loo"],
                    p_loo = p[, "p_loo"], pareto_k = p[, "influence_pareto_k"], r_eff = r_eff)
  out[] <- lapply(out, function(v) formatC(v, digits = 17, format = "g"))
  write.csv(out, paste0("reference-", name, ".csv"), quote = FALSE, row.names = FALSE)
  print(fit)
}

write_fixture("iid", draws_of(0))
write_fixture("ar", draws_of(0.7))
