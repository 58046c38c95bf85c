# Wilcoxon signed-rank test on decimals as typed, for stats/exact_test.go:
# R 4.2.2 (Debian r-base-core). R's wilcox.test works on doubles, where
# 7.9 - 8 and 8.1 - 8 are not tied; the reference therefore runs on the
# data scaled to whole numbers (tenths: round(10 x), target 80), where
# every difference, tie and zero is exact. V and the p-value do not depend
# on the scale; the estimate and the interval are divided by 10. The
# Hodges-Lehmann estimate by its definition (median of the Walsh averages
# of the non-zero differences, exact on whole numbers) is written out too.
# Regenerate from the repository root with
#   Rscript testdata/rref/signrank.R > testdata/rref/signrank.tsv
x <- scan("testdata/sets/26-coarse-tenths-n50.txt", quiet = TRUE)
xi <- round(10 * x)
mu <- 80
w <- suppressWarnings(wilcox.test(xi, mu = mu, exact = FALSE, correct = TRUE, conf.int = TRUE))
wb <- suppressWarnings(wilcox.test(x, mu = 8, exact = FALSE, correct = TRUE))
d <- xi[xi != mu] - mu
wa <- outer(d, d, "+") / 2
hl <- median(wa[upper.tri(wa, diag = TRUE)])
out <- function(k, v) cat(sprintf("26-coarse-tenths-n50.txt\t%s\t%.17g\n", k, v))
cat("set\tstatistic\tvalue\n")
out("target", 8)
out("V", w$statistic)
out("p", w$p.value)
out("estimate", w$estimate / 10 + 0)
out("lo", w$conf.int[1] / 10)
out("hi", w$conf.int[2] / 10)
out("hl", (hl + mu) / 10)
out("binaryV", wb$statistic)
out("binaryP", wb$p.value)
