# Reference fits for tests/reference/extremes_cross_check_test.cpp with R package evd.
# Usage: Rscript tests/reference/scripts/extremes_evd.R OUTDIR
# Writes to OUTDIR:
#   data_<name>.csv   the datasets (portpirie, dover from sealevel with its NA years as "NA",
#                     venice_r1 the annual maxima of venice, venice the r-largest table, and
#                     seeded samples from known parameters), column "level" (venice: r1..r10)
#   evd_results.csv   name, model, loc, scale, shape, loglik, se_loc, se_scale, se_shape
# Exits with status 3 and a message naming the Debian package when evd is missing.
args <- commandArgs(trailingOnly = TRUE)
if (length(args) != 1) stop("usage: extremes_evd.R OUTDIR")
if (!requireNamespace("evd", quietly = TRUE)) {
  message("R package evd is missing (Debian package r-cran-evd)")
  quit(status = 3)
}
suppressPackageStartupMessages(library(evd))
out <- args[1]
# Tight optimiser settings so that evd's optimum is found to the digits compared: optim's
# BFGS takes finite-difference gradients with step ndeps = 1e-3 by default, whose bias stops
# it about 1e-4 (relative) short of the maximum in the shape; steps of 1e-6 on parameters
# scaled by the data's spread (parscale) and reltol 1e-14 remove that. The default-settings
# fit of portpirie is kept as "portpirie_default" to show the difference.
ctl <- function(x, k) {
  s <- sd(x)
  list(reltol = 1e-14, maxit = 10000, ndeps = rep(1e-6, k),
       parscale = if (k == 3) c(s, s, 1) else c(s, s))
}
# fpot: the same with steps of 1e-4 and no parscale (with 1e-6 its finite-difference Hessian
# becomes singular: "observed information matrix is singular").
ctl_pot <- list(reltol = 1e-14, maxit = 10000, ndeps = rep(1e-4, 2))

write_level <- function(name, x) {
  write.csv(data.frame(level = x), file.path(out, paste0("data_", name, ".csv")),
            row.names = FALSE, quote = FALSE)
}
rows <- list()
add <- function(name, model, fit) {
  est <- fit$estimate
  se <- fit$std.err
  get <- function(v, k) if (k %in% names(v)) unname(v[[k]]) else NA
  rows[[length(rows) + 1]] <<- data.frame(
    name = name, model = model, loc = get(est, "loc"), scale = get(est, "scale"),
    shape = if ("shape" %in% names(est)) unname(est[["shape"]]) else 0,
    loglik = -fit$deviance / 2, se_loc = get(se, "loc"), se_scale = get(se, "scale"),
    se_shape = get(se, "shape"))
}
fit_both <- function(name, x) {
  write_level(name, x)
  add(name, "gev", fgev(x, control = ctl(x, 3)))
  add(name, "gumbel", fgev(x, shape = 0, control = ctl(x, 2)))
}

data(portpirie)
fit_both("portpirie", as.numeric(portpirie))
add("portpirie", "gev_default", fgev(as.numeric(portpirie)))
data(sealevel)
dover <- sealevel$dover[!is.na(sealevel$dover)]  # the NA years are dropped for the fits
fit_both("dover", dover)
write_level("dover", sealevel$dover)  # the data file keeps the NA years: readers drop them
data(venice)
v <- as.matrix(venice)
write.csv(data.frame(year = rownames(venice), v), file.path(out, "data_venice.csv"),
          row.names = FALSE, quote = FALSE, na = "NA")
fit_both("venice_r1", v[, 1])

# Seeded samples from known parameters (Coles' sign convention; evd::rgev uses it too).
set.seed(20261201)
fit_both("sim_gev_pos", rgev(80, loc = 10, scale = 2, shape = 0.2))
fit_both("sim_gev_neg", rgev(50, loc = 3, scale = 0.3, shape = -0.25))
fit_both("sim_gumbel", rgev(100, loc = 1, scale = 0.1, shape = 0))
# GPD exceedances of threshold 2 (levels, not excesses).
gpd <- 2 + rgpd(150, loc = 0, scale = 0.25, shape = 0.1)
write_level("sim_gpd", gpd)
add("sim_gpd", "gpd", fpot(gpd, threshold = 2, control = ctl_pot))
gpdn <- 2 + rgpd(120, loc = 0, scale = 0.4, shape = -0.2)
write_level("sim_gpd_neg", gpdn)
add("sim_gpd_neg", "gpd", fpot(gpdn, threshold = 2, control = ctl_pot))

write.csv(do.call(rbind, rows), file.path(out, "evd_results.csv"), row.names = FALSE,
          quote = FALSE)
