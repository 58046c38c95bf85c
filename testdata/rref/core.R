# Reference values for the engine core (stats/rref_test.go), computed with
# R 4.2.2 (Debian r-base-core). Regenerate from the repository root with
#   Rscript testdata/rref/core.R > testdata/rref/core.tsv
# Output: one line per statistic: set, statistic, value (17 significant digits).
files <- sort(list.files("testdata/sets", pattern = "\\.txt$", full.names = TRUE))
probs <- c(0.25, 0.5, 0.75, 0.00135, 0.01, 0.05, 0.95, 0.99, 0.99865)
cat("set\tstat\tvalue\n")
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v))
for (f in files) {
  x <- scan(f, quiet = TRUE)
  s <- basename(f)
  n <- length(x)
  out(s, "n", n)
  out(s, "mean", mean(x))
  out(s, "sd", sd(x))
  out(s, "var", var(x))
  out(s, "sem", sd(x) / sqrt(n))
  out(s, "median", median(x))
  out(s, "trim10", mean(x, trim = 0.1))
  out(s, "mad", mad(x))
  out(s, "min", min(x))
  out(s, "max", max(x))
  out(s, "distinct", length(unique(x)))
  out(s, "maxcount", max(table(x)))
  for (t in 1:9) {
    q <- quantile(x, probs, type = t, names = FALSE)
    for (i in seq_along(probs)) out(s, sprintf("q%d_%g", t, probs[i]), q[i])
  }
  fv <- fivenum(x)
  out(s, "hinge_lo", fv[2]); out(s, "hinge_hi", fv[4])
  tt <- t.test(x, conf.level = 0.95)
  out(s, "tci_lo", tt$conf.int[1]); out(s, "tci_hi", tt$conf.int[2])
  # chi-square interval for the SD, by formula
  k <- n - 1
  out(s, "sdci_lo", sd(x) * sqrt(k / qchisq(0.975, k)))
  out(s, "sdci_hi", sd(x) * sqrt(k / qchisq(0.025, k)))
  # distribution-free median interval from order statistics, by formula:
  # largest k with 2*pbinom(k-1, n, 0.5) <= 0.05
  xs <- sort(x)
  kk <- 0
  for (j in 1:floor(n / 2)) if (2 * pbinom(j - 1, n, 0.5) <= 0.05) kk <- j
  if (kk > 0) {
    out(s, "medci_lo", xs[kk]); out(s, "medci_hi", xs[n - kk + 1])
    out(s, "medci_level", 1 - 2 * pbinom(kk - 1, n, 0.5))
  }
  # 90% intervals too
  tt <- t.test(x, conf.level = 0.90)
  out(s, "tci90_lo", tt$conf.int[1]); out(s, "tci90_hi", tt$conf.int[2])
  out(s, "sdci90_lo", sd(x) * sqrt(k / qchisq(0.95, k)))
  out(s, "sdci90_hi", sd(x) * sqrt(k / qchisq(0.05, k)))
}
