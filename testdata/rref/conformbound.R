# Reference values for stats/method ConformNormalUpperBound (R 4.2.2, base R).
# Upper confidence bound of the fraction beyond one limit of a normal
# population: find delta_L with pt(sqrt(n)*k, df, ncp = delta_L) = level,
# bound = pnorm(-delta_L/sqrt(n)).
# Run from the repository root: Rscript testdata/rref/conformbound.R > testdata/rref/conformbound.tsv
cases <- rbind(
  c(3.0, 30, 29, 0.95), c(3.0, 30, 17.5, 0.95), c(1.5, 10, 9, 0.95),
  c(4.0, 125, 124, 0.99), c(2.2, 50, 30.1, 0.90), c(0.5, 8, 7, 0.95),
  c(-0.5, 20, 19, 0.95), c(5.0, 1000, 999, 0.95), c(3.3, 200, 120.4, 0.95)
)
cat("k\tn\tdf\tlevel\tbound\n")
for (i in seq_len(nrow(cases))) {
  k <- cases[i, 1]; n <- cases[i, 2]; df <- cases[i, 3]; lev <- cases[i, 4]
  t <- sqrt(n) * k
  f <- function(d) pt(t, df, ncp = d) - lev
  d <- uniroot(f, c(t - 40, t + 40), tol = 1e-13)$root
  cat(sprintf("%.17g\t%d\t%.17g\t%.17g\t%.17g\n", k, n, df, lev, pnorm(-d / sqrt(n))))
}
