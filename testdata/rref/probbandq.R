# Ends of the order-statistic band of the normal probability plot in
# standard units, qnorm(qbeta(a/2, i, n+1-i)) and qnorm(qbeta(1-a/2, i,
# n+1-i)) (the upper end via -qnorm(qbeta(a/2, n+1-i, i)), exact in the
# tail), in base R 4.2.2 (Debian r-base-core), for
# stats/method/probplot_test.go and stats/normalplot_test.go.
# Regenerate from the repository root:
#   Rscript testdata/rref/probbandq.R > testdata/rref/probbandq.tsv
# Output: set "n/i/a" (a = 1 - pointwise level), statistic zlo or zhi,
# value (17 significant digits).
cat("set\tstat\tvalue\n")
out <- function(n, i, a) {
  set <- sprintf("%.0f/%.0f/%g", n, i, a)
  cat(sprintf("%s\tzlo\t%.17g\n", set, qnorm(qbeta(a / 2, i, n + 1 - i))))
  cat(sprintf("%s\tzhi\t%.17g\n", set, -qnorm(qbeta(a / 2, n + 1 - i, i))))
}
# n = 5 at the old pointwise 95 % and at eta = 0.250853 (the 95 % row of
# testdata/rref/probband.tsv for n = 5)
for (i in 1:5) out(5, i, 0.05)
for (i in 1:5) out(5, i, 0.250853)
# large n, extreme and middle ranks, a small local level
for (n in c(1e5, 1e7, 1e8)) for (i in c(1, 2, 10, n / 2, n)) out(n, i, 1e-4)
