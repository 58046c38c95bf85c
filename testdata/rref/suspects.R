# Reference figures for the choice of the leading suspect rule
# (stats/suspects_lead_test.go), computed with R 4.2.2 (Debian r-base-core,
# base R only). Data: testdata/suspects/torque-tied-n60.txt (invented, see
# its README), as typed ("t01"), and torque-step002-n60.txt, the same
# readings rounded to 0.02 by R ("t02").
# Regenerate from the repository root with
#   Rscript testdata/rref/suspects.R > testdata/rref/suspects.tsv
# Output: set, statistic, value (17 significant digits).
cat("set\tstat\tvalue\n")
source("testdata/rref/common.R") # out(), mc_naive()

# Each run of k equal values spread over its rounding interval: the j-th
# (j = 0..k-1) becomes v + step*((j + 1/2)/k - 1/2).
spread <- function(x, step) {
  x <- sort(x); y <- x
  for (v in unique(x)) {
    i <- which(x == v); k <- length(i)
    if (k > 1) y[i] <- v + step * (((0:(k - 1)) + 0.5) / k - 0.5)
  }
  y
}

x <- scan("testdata/suspects/torque-tied-n60.txt", quiet = TRUE)
sets <- list(t01 = list(x = round(x, 2), step = 0.01),
             t02 = list(x = scan("testdata/suspects/torque-step002-n60.txt", quiet = TRUE), step = 0.02))
for (s in names(sets)) {
  y <- sets[[s]]$x; st <- sets[[s]]$step
  n <- length(y)
  out(s, "n", n)
  out(s, "distinct", length(unique(y)))
  M <- mc_naive(y)
  out(s, "mc", M)
  out(s, "mcSpread", mc_naive(spread(y, st)))
  q <- quantile(y, c(0.25, 0.75), type = 7, names = FALSE)
  iqr <- q[2] - q[1]
  # a small allowance so that readings on a fence (binary noise) count as inside
  e <- 1e-9
  inner <- y < q[1] - 1.5 * iqr - e | y > q[2] + 1.5 * iqr + e
  out(s, "tukeyInner", sum(inner))
  if (M >= 0) {
    lo <- q[1] - 1.5 * exp(-4 * M) * iqr; hi <- q[2] + 1.5 * exp(3 * M) * iqr
  } else {
    lo <- q[1] - 1.5 * exp(-3 * M) * iqr; hi <- q[2] + 1.5 * exp(4 * M) * iqr
  }
  out(s, "adjCount", sum(y < lo - e | y > hi + e))
  # the readings inside the outer fences (3 IQR), whose normality decides
  # whether the generalized ESD leads
  rest <- y[!(y < q[1] - 3 * iqr - e | y > q[2] + 3 * iqr + e)]
  out(s, "restN", length(rest))
  out(s, "restSWp", shapiro.test(rest)$p.value)
}
# the as-typed set without the two planted outliers (rows 21 and 42)
y <- x[-c(21, 42)]
out("t01-out", "mc", mc_naive(y))
q <- quantile(y, c(0.25, 0.75), type = 7, names = FALSE)
iqr <- q[2] - q[1]
out("t01-out", "tukeyInner", sum(y < q[1] - 1.5 * iqr - 1e-9 | y > q[2] + 1.5 * iqr + 1e-9))
# the as-typed set with row 21 moved to 23.90 (20 SD below, row 42 stays at
# 24.74): G1 (Joanes and Gill 1998) of all readings and of those inside
# Tukey's outer fences (type-7 quartiles)
G1 <- function(x) {
  n <- length(x); d <- x - mean(x)
  g1 <- mean(d^3) / mean(d^2)^1.5
  g1 * sqrt(n * (n - 1)) / (n - 2)
}
y <- x; y[21] <- 23.90
q <- quantile(y, c(0.25, 0.75), type = 7, names = FALSE)
iqr <- q[2] - q[1]
far <- y < q[1] - 3 * iqr - 1e-9 | y > q[2] + 3 * iqr + 1e-9
out("t01-far", "G1all", G1(y))
out("t01-far", "farBelow", sum(y < q[1] - 3 * iqr - 1e-9))
out("t01-far", "farAbove", sum(y > q[2] + 3 * iqr + 1e-9))
out("t01-far", "G1rest", G1(y[!far]))
# Readings beyond each quartile-based rule's fences, below and above, under
# quantile types 1 to 9 (Hyndman and Fan 1996), on two invented sets
for (f in c("15-small-n8.txt", "26-coarse-tenths-n50.txt", "02-fill-normal-n250.txt")) {
  y <- scan(file.path("testdata/sets", f), quiet = TRUE)
  M <- mc_naive(y); e <- 1e-9
  for (t in 1:9) {
    q <- quantile(y, c(0.25, 0.75), type = t, names = FALSE)
    iqr <- q[2] - q[1]
    if (M >= 0) {
      lo <- q[1] - 1.5 * exp(-4 * M) * iqr; hi <- q[2] + 1.5 * exp(3 * M) * iqr
    } else {
      lo <- q[1] - 1.5 * exp(-3 * M) * iqr; hi <- q[2] + 1.5 * exp(4 * M) * iqr
    }
    s <- paste0(f, "@hf", t)
    out(s, "innerLo", sum(y < q[1] - 1.5 * iqr - e)); out(s, "innerHi", sum(y > q[2] + 1.5 * iqr + e))
    out(s, "outerLo", sum(y < q[1] - 3 * iqr - e)); out(s, "outerHi", sum(y > q[2] + 3 * iqr + e))
    out(s, "adjLo", sum(y < lo - e)); out(s, "adjHi", sum(y > hi + e))
  }
}
