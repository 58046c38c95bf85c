# Interpolated order-statistic interval for the median (Hettmansperger and
# Sheather 1986), written out in base R 4.2.2 (Debian r-base-core), for
# stats/method/interval_hs_test.go. Regenerate from the repository root:
#   Rscript testdata/rref/medianci.R > testdata/rref/medianci.tsv
# Output: set, statistic, value (17 significant digits); sets are the
# invented files of testdata/sets named below, at levels 0.90, 0.95, 0.99.
cat("set\tstat\tvalue\n")
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v))
hs <- function(x, conf) {
  x <- sort(x); n <- length(x)
  # exact interval: largest k with 1 - 2 P(B <= k-1) >= conf
  k <- 1
  while (k + 1 <= n %/% 2 && 1 - 2 * pbinom(k, n, 0.5) >= conf) k <- k + 1
  gk <- 1 - 2 * pbinom(k - 1, n, 0.5)
  gk1 <- 1 - 2 * pbinom(k, n, 0.5)
  I <- (gk - conf) / (gk - gk1)
  lambda <- (n - k) * I / (k + (n - 2 * k) * I)
  c(k = k, level = gk, exactLo = x[k], exactHi = x[n - k + 1],
    lo = (1 - lambda) * x[k] + lambda * x[k + 1],
    hi = (1 - lambda) * x[n - k + 1] + lambda * x[n - k])
}
for (f in c("01-bore-normal-n30.txt", "03-torque-lognormal-n60.txt", "15-small-n8.txt", "17-n20-two-outliers.txt", "02-fill-normal-n250.txt")) {
  x <- scan(file.path("testdata/sets", f), quiet = TRUE)
  for (conf in c(0.90, 0.95, 0.99)) {
    r <- hs(x, conf)
    for (nm in names(r)) out(paste0(f, "@", conf), nm, r[[nm]])
  }
}
