# Peer timing for tests/benchmarks/extremes_bench.cpp: R evd::fgev on the same annual maxima.
# Usage: Rscript tests/benchmarks/extremes_peer.R MAXIMA.csv REPETITIONS
# Prints one line (CPU seconds per fit): "fgev_seconds_per_fit <s> loc <mu> scale <sigma> shape <xi>".
args <- commandArgs(trailingOnly = TRUE)
if (length(args) != 2) stop("usage: extremes_peer.R MAXIMA.csv REPETITIONS")
suppressPackageStartupMessages(library(evd))
x <- read.csv(args[1])$level_m
reps <- as.integer(args[2])
fit <- fgev(x)  # warm-up
# CPU time (user + system), as Google Benchmark's CPU column: the machine is shared, so wall
# time would charge the peer for other people's work.
cpu <- function() { p <- proc.time(); p[["user.self"]] + p[["sys.self"]] }
t0 <- cpu()
for (i in seq_len(reps)) fit <- fgev(x)
t1 <- cpu()
cat(sprintf("fgev_seconds_per_fit %.9g loc %.9g scale %.9g shape %.9g\n", (t1 - t0) / reps,
            fit$estimate[["loc"]], fit$estimate[["scale"]], fit$estimate[["shape"]]))
