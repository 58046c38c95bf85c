# Simultaneous envelope of the normal probability plot: the tail-sensitive
# band of Aldor-Noiman, Brown, Buja, Rolke and Stine (2013, The American
# Statistician 67(4), "The power to see: a new graphical test of normality").
# Every order statistic gets the same pointwise level eta: the i-th smallest
# of n standardised values z_(i) is inside when
#   qbeta(eta/2, i, n+1-i) <= pnorm(z_(i)) <= qbeta(1-eta/2, i, n+1-i),
# and eta(n, level) is chosen so that ALL n points are inside with
# probability `level`. Found here by simulation, in base R 4.2.2 (Debian
# r-base-core), for stats/method/probband_table.go (generated from this
# output by stats/method/gen_probband.go) and its tests.
#
# Estimated parameters: as the plot draws its line at mean + SD * z from the
# sample itself, each simulated normal sample is standardised by its own mean
# and SD (divisor n - 1) before pnorm, so eta is calibrated for what the plot
# shows.
#
# One replicate gives M = min over i of 2 * min(P(B_i <= u_(i)), P(B_i >= u_(i)))
# with B_i ~ Beta(i, n+1-i) (both tails computed directly, without 1 - p);
# the sample lies wholly inside the band at eta exactly when M >= eta, so
# eta(level) is the (1 - level) quantile of M (type 7), one simulation
# serving every level.
#
# Monte Carlo error: se is the standard error of eta from the binomial
# spread of the quantile's rank, (M_(k+d) - M_(k-d)) / 2 with k = R (1 - level),
# d = sqrt(R level (1 - level)); coverSE = sqrt(level (1 - level) / R) is the
# standard error of the coverage the tabled eta achieves.
#
# Two parts, each with its own seed, so either can be rerun alone:
#   part 1: every n from 3 to 30, then 40 log-spaced n from 34 to 10,000;
#     20,000 samples for n <= 300, then 6e6/n, at least 6,000;
#   part 2: 5 log-spaced n above 10,000 up to 100,000; 5e7/n samples,
#     between 1,000 and 2,000.
# Regenerate from the repository root (about 20 minutes on one core):
#   Rscript testdata/rref/probband.R > testdata/rref/probband.tsv
# (`Rscript testdata/rref/probband.R large` writes part 2 alone, without the
# header), then: go generate ./stats/method/
args <- commandArgs(trailingOnly = TRUE)
levels <- c(0.50, 0.80, 0.90, 0.95, 0.99)
run <- function(ns, reps) for (n in ns) {
  R <- reps(n)
  i <- seq_len(n); j <- n + 1 - i
  m <- numeric(R)
  for (r in seq_len(R)) {
    x <- rnorm(n)
    z <- (sort(x) - mean(x)) / sd(x)
    lo <- pbeta(pnorm(z), i, j)
    hi <- pbeta(pnorm(-z), j, i)
    m[r] <- 2 * min(lo, hi)
  }
  ms <- sort(m)
  for (lv in levels) {
    p <- 1 - lv
    eta <- quantile(m, p, type = 7, names = FALSE)
    k <- R * p; d <- sqrt(R * p * (1 - p))
    se <- (ms[min(R, ceiling(k + d))] - ms[max(1, floor(k - d))]) / 2
    cat(sprintf("%d\t%d\t%.2f\t%.6g\t%.3g\t%.3g\n", n, R, lv, eta, se, sqrt(lv * (1 - lv) / R)))
  }
}
if (!("large" %in% args)) {
  cat("n\treps\tlevel\teta\tse\tcoverSE\n")
  set.seed(20261203)
  run(c(3:30, unique(round(exp(seq(log(34), log(10000), length.out = 40))))),
      function(n) if (n <= 300) 20000 else max(6000, round(6e6 / n)))
}
set.seed(20261204)
run(round(exp(seq(log(10000), log(100000), length.out = 6)))[-1],
    function(n) max(1000, min(2000, round(5e7 / n))))
