# Reference values for the engine's methods (shape, suspects, medcouple,
# target tests; stats/methods_rref_test.go), computed with R 4.2.2 (Debian
# r-base-core, r-cran-nortest 1.0-4, r-cran-robustbase 0.95-0).
# Regenerate from the repository root with
#   Rscript testdata/rref/methods.R > testdata/rref/methods.tsv
# Output: one line per statistic: set, statistic, value (17 significant digits).
suppressPackageStartupMessages({ library(nortest); library(robustbase) })
options(mc_doScale_quiet = TRUE)
files <- sort(list.files("testdata/sets", pattern = "\\.txt$", full.names = TRUE))
# 25-offset-milli (values near 1,000,000.5 typed to 0.001) is checked against
# exact rational arithmetic instead (testdata/rref/exact.py): R's moments on
# doubles lose about 9 digits there.
files <- files[!grepl("25-offset-milli", files)]
cat("set\tstat\tvalue\n")
source("testdata/rref/common.R") # out(), mc_naive()

for (f in files) {
  x <- scan(f, quiet = TRUE)
  s <- basename(f)
  n <- length(x)
  xbar <- mean(x); sdx <- sd(x)
  out(s, "n", n)
  # Moments (Joanes and Gill 1998): g1, b2 from the central moments.
  d <- x - xbar
  m2 <- mean(d^2); m3 <- mean(d^3); m4 <- mean(d^4)
  g1 <- m3 / m2^1.5; b2 <- m4 / m2^2; g2 <- b2 - 3
  G1 <- g1 * sqrt(n * (n - 1)) / (n - 2)
  ses <- sqrt(6 * n * (n - 1) / ((n - 2) * (n + 1) * (n + 3)))
  out(s, "G1", G1); out(s, "SES", ses)
  if (n >= 4) {
    G2 <- (n - 1) / ((n - 2) * (n - 3)) * ((n + 1) * g2 + 6)
    sek <- 2 * ses * sqrt((n^2 - 1) / ((n - 3) * (n + 5)))
    out(s, "G2", G2); out(s, "SEK", sek)
  }
  # D'Agostino, Belanger and D'Agostino (1990), eq. for sqrt(b1) and b2.
  if (n >= 8) {
    Y <- g1 * sqrt((n + 1) * (n + 3) / (6 * (n - 2)))
    beta2 <- 3 * (n^2 + 27 * n - 70) * (n + 1) * (n + 3) / ((n - 2) * (n + 5) * (n + 7) * (n + 9))
    W2 <- -1 + sqrt(2 * (beta2 - 1))
    delta <- 1 / sqrt(log(sqrt(W2)))
    alpha <- sqrt(2 / (W2 - 1))
    Zs <- delta * log(Y / alpha + sqrt((Y / alpha)^2 + 1))
    out(s, "skewZ", Zs); out(s, "skewP", 2 * pnorm(-abs(Zs)))
  }
  if (n >= 20) {
    Eb2 <- 3 * (n - 1) / (n + 1)
    Vb2 <- 24 * n * (n - 2) * (n - 3) / ((n + 1)^2 * (n + 3) * (n + 5))
    xk <- (b2 - Eb2) / sqrt(Vb2)
    sb1 <- 6 * (n^2 - 5 * n + 2) / ((n + 7) * (n + 9)) * sqrt(6 * (n + 3) * (n + 5) / (n * (n - 2) * (n - 3)))
    A <- 6 + 8 / sb1 * (2 / sb1 + sqrt(1 + 4 / sb1^2))
    den <- 1 + xk * sqrt(2 / (A - 4))
    r <- (1 - 2 / A) / den
    Zk <- ((1 - 2 / (9 * A)) - sign(r) * abs(r)^(1 / 3)) / sqrt(2 / (9 * A))
    out(s, "kurtZ", Zk); out(s, "kurtP", 2 * pnorm(-abs(Zk)))
    K2 <- Zs^2 + Zk^2
    out(s, "K2", K2); out(s, "K2P", pchisq(K2, 2, lower.tail = FALSE))
  }
  if (n >= 3 && n <= 5000) {
    sw <- shapiro.test(x)
    out(s, "swW", sw$statistic); out(s, "swP", sw$p.value)
  }
  if (n >= 8) {
    ad <- ad.test(x)
    out(s, "adA", ad$statistic); out(s, "adP", ad$p.value)
  }
  # Medcouple: the O(n^2) definition above, and robustbase::mc, which
  # (with doReflect = FALSE) gives the lower of the two middle kernel
  # values when their number is even.
  out(s, "mcLow", mc(x, doReflect = FALSE))
  out(s, "mcNaive", mc_naive(x))
  # Suspect-reading rules on quartiles of type 7 (R's default).
  q <- quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE)
  iqr <- q[3] - q[1]
  out(s, "tukeyInner", sum(x < q[1] - 1.5 * iqr | x > q[3] + 1.5 * iqr))
  out(s, "tukeyOuter", sum(x < q[1] - 3 * iqr | x > q[3] + 3 * iqr))
  # Adjusted box plot (Hubert and Vandervieren 2008).
  M <- mc_naive(x)
  if (M >= 0) {
    lo <- q[1] - 1.5 * exp(-4 * M) * iqr; hi <- q[3] + 1.5 * exp(3 * M) * iqr
  } else {
    lo <- q[1] - 1.5 * exp(-3 * M) * iqr; hi <- q[3] + 1.5 * exp(4 * M) * iqr
  }
  out(s, "adjLo", lo); out(s, "adjHi", hi)
  out(s, "adjCount", sum(x < lo | x > hi))
  # Modified z-scores (Iglewicz and Hoaglin 1993).
  madraw <- median(abs(x - median(x)))
  if (madraw > 0) {
    Mz <- 0.6745 * (x - median(x)) / madraw
    out(s, "modzCount", sum(abs(Mz) > 3.5)); out(s, "modzMax", max(abs(Mz)))
  }
  # Generalized ESD (Rosner 1983), alpha = 0.05, at most r suspects.
  r <- min(10, max(1, floor(n / 10)))
  if (n >= 3 && sdx > 0) {
    y <- x; nout <- 0
    for (i in 1:r) {
      if (length(y) < 3 || sd(y) == 0) break
      dev <- abs(y - mean(y)) / sd(y)
      j <- which.max(dev); Ri <- dev[j]
      nn <- n - i + 1
      p <- 1 - 0.05 / (2 * nn)
      tq <- qt(p, nn - 2)
      lam <- (nn - 1) * tq / sqrt((nn - 2 + tq^2) * nn)
      out(s, sprintf("gesdR%d", i), Ri); out(s, sprintf("gesdLambda%d", i), lam)
      if (Ri > lam) nout <- i
      y <- y[-j]
    }
    out(s, "gesdCount", nout)
  }
  # Against a target: the median rounded to 2 significant digits plus a
  # quarter SD (so the sets give targets both inside and outside the
  # intervals).
  mu <- signif(median(x), 2) + sdx / 4
  out(s, "target", mu)
  if (n >= 2 && sdx > 0) {
    tt <- t.test(x, mu = mu)
    out(s, "tT", tt$statistic); out(s, "tDF", tt$parameter); out(s, "tP", tt$p.value)
    out(s, "tLo", tt$conf.int[1]); out(s, "tHi", tt$conf.int[2])
    wt <- suppressWarnings(wilcox.test(x, mu = mu, conf.int = TRUE))
    out(s, "wV", wt$statistic); out(s, "wP", wt$p.value)
    out(s, "wExact", as.numeric(!grepl("continuity", wt$method) && !grepl("approx", wt$method)))
    out(s, "wEst", wt$estimate)
    out(s, "wLo", wt$conf.int[1]); out(s, "wHi", wt$conf.int[2])
    # Hodges-Lehmann pseudo-median by definition (median of the Walsh
    # averages of the non-zero differences, shifted back).
    z <- x[x != mu]
    if (length(z) > 0 && length(z) <= 6000) {
      w <- outer(z, z, "+") / 2
      out(s, "hl", median(w[!lower.tri(w)]))
    }
  }
}
