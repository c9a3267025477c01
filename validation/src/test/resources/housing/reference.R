# Regenerates housing.csv and reference-polr-probit.csv in this directory.
#
# Run from this directory:
#   cd validation/src/test/resources/housing && Rscript reference.R
# Written with R 4.2.2 and MASS 7.3-58.2 (the versions in use are printed into
# reference-polr-probit.csv as comment lines).
#
# housing.csv: MASS's `housing` frequency table expanded to one row per respondent.
# reference-polr-probit.csv: maximum-likelihood ordered probit fit by MASS::polr, with
# treatment contrasts (reference levels Infl = Low, Type = Tower, Cont = Low, the first
# factor level in R), plus the same values mapped to the engine's parameterisation.

suppressPackageStartupMessages(library(MASS))
options(contrasts = c("contr.treatment", "contr.poly"))

versions <- c(
  sprintf("# %s", R.version.string),
  sprintf("# MASS %s", packageDescription("MASS")$Version))

# One row per respondent, in the order of the table's rows.
rows <- rep(seq_len(nrow(housing)), housing$Freq)
expanded <- data.frame(
  sat = as.integer(housing$Sat[rows]),        # Low = 1, Medium = 2, High = 3
  infl = as.character(housing$Infl[rows]),
  type = as.character(housing$Type[rows]),
  cont = as.character(housing$Cont[rows]))
stopifnot(nrow(expanded) == 1681, identical(levels(housing$Sat), c("Low", "Medium", "High")))
write.csv(expanded, "housing.csv", row.names = FALSE, quote = FALSE)

# The call of the brief; reltol tightened from optim's default (about 1.5e-8) so the
# estimates are accurate to about 1e-8 instead of 1e-6.
fit <- polr(Sat ~ Infl + Type + Cont, data = housing, weights = Freq,
            method = "probit", Hess = TRUE,
            control = list(reltol = 1e-14, maxit = 1000))
stopifnot(fit$convergence == 0)

# Cross-check: the expanded file, read back and fitted unweighted, gives the same fit.
back <- read.csv("housing.csv")
back$sat <- factor(back$sat, levels = 1:3, ordered = TRUE)
back$infl <- factor(back$infl, levels = levels(housing$Infl))
back$type <- factor(back$type, levels = levels(housing$Type))
back$cont <- factor(back$cont, levels = levels(housing$Cont))
refit <- polr(sat ~ infl + type + cont, data = back, method = "probit", Hess = TRUE,
              control = list(reltol = 1e-14, maxit = 1000))
stopifnot(max(abs(c(coef(refit), refit$zeta) - c(coef(fit), fit$zeta))) < 1e-6)

v <- vcov(fit)
se <- sqrt(diag(v))
beta <- coef(fit)
zeta <- fit$zeta

# Engine parameterisation (MODEL.md sections 2-3, one group):
#   P(Y <= k) = Phi(c_k - mu_alpha - x'beta), sum_k c_k = 0,
# so beta = b, mu_alpha = -mean(zeta), c_k = zeta_k - mean(zeta); standard errors of the
# derived values by the delta method (they are linear in zeta).
nz <- length(zeta)
zi <- names(zeta)
a_mu <- rep(-1 / nz, nz)
mu_alpha <- sum(a_mu * zeta)
mu_alpha_se <- sqrt(drop(t(a_mu) %*% v[zi, zi] %*% a_mu))
centre <- diag(nz) - matrix(1 / nz, nz, nz)
c_k <- drop(centre %*% zeta)
c_se <- sqrt(diag(centre %*% v[zi, zi] %*% t(centre)))

out <- data.frame(
  term = c(names(beta), names(zeta), "group_mean", sprintf("threshold.%d", 2:3)),
  kind = c(rep("coefficient", length(beta)), rep("polr_zeta", nz),
           "engine_group_mean", rep("engine_threshold", nz)),
  estimate = c(beta, zeta, mu_alpha, c_k),
  std_error = c(se[names(beta)], se[zi], mu_alpha_se, c_se))

con <- file("reference-polr-probit.csv", "w")
writeLines(c(
  versions,
  "# MASS::polr(Sat ~ Infl + Type + Cont, data = housing, weights = Freq, method = \"probit\", Hess = TRUE, control = list(reltol = 1e-14, maxit = 1000))",
  "# reference levels (treatment contrasts): Infl = Low, Type = Tower, Cont = Low",
  "# std_error: square root of the diagonal of vcov(fit), the inverse of the Hessian at the MLE",
  "# engine rows: group_mean = mu_alpha = -mean(zeta), threshold.k = zeta_(k-1) - mean(zeta) (the value above which Sat >= k)",
  sprintf("# log-likelihood %.10f", as.numeric(logLik(fit)))), con)
write.csv(transform(out,
                    estimate = sprintf("%.10g", estimate),
                    std_error = sprintf("%.10g", std_error)),
          con, row.names = FALSE, quote = FALSE)
close(con)
