# Reference values for the control chart and drift methods
# (stats/method/*_test.go), computed with R 4.2.2 (Debian r-base-core),
# base R only: every method is written out below as its formula.
# Regenerate from the repository root with
#   Rscript testdata/rref/control.R > testdata/rref/control.tsv
# Output: set, statistic, value (17 significant digits). The data sets are
# invented, generated here from fixed seeds and rounded to the decimals a
# gauge would show; their values are written too (statistic "x:i",
# 1-based; subgroups as "g:i:j"), so the Go tests read the same numbers.
options(warn = 1)
cat("set\tstat\tvalue\n")
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v))

## Constants by integration of the range distribution (Tippett 1925).
rangecdf <- function(w, n) {
  if (w <= 0) return(0)
  f <- function(x) dnorm(x) * (pnorm(x + w) - pnorm(x))^(n - 1)
  n * integrate(f, -Inf, Inf, rel.tol = 1e-12, abs.tol = 0)$value
}
d2f <- function(n) {
  g <- function(x) 1 - pnorm(x)^n - pnorm(-x)^n
  2 * integrate(g, 0, Inf, rel.tol = 1e-12, abs.tol = 0)$value
}
d3f <- function(n) {
  h <- function(w) sapply(w, function(v) 2 * v * (1 - rangecdf(v, n)))
  m2 <- integrate(h, 0, 20, rel.tol = 1e-11, abs.tol = 0)$value
  sqrt(m2 - d2f(n)^2)
}
d4f <- function(n) uniroot(function(w) rangecdf(w, n) - 0.5, c(0, 20), tol = 1e-13)$root
c4f <- function(n) sqrt(2 / (n - 1)) * exp(lgamma(n / 2) - lgamma((n - 1) / 2))
cst <- list()
for (n in c(2:30, 40, 50, 75, 100)) {
  s <- sprintf("const-%d", n)
  d2 <- d2f(n); d3 <- d3f(n)
  cst[[n]] <- c(d2, d3)
  out(s, "d2", d2); out(s, "d3", d3); out(s, "d4", d4f(n)); out(s, "c4", c4f(n))
}
D2 <- function(n) { if (is.null(cst[[n]])) cst[[n]] <<- c(d2f(n), d3f(n)); cst[[n]][1] }
D3 <- function(n) { if (is.null(cst[[n]])) cst[[n]] <<- c(d2f(n), d3f(n)); cst[[n]][2] }

## Invented series.
set.seed(20261211)
ind <- round(c(rnorm(40, 10, 0.05), rnorm(20, 10.08, 0.05)), 3)  # shift after 40
ar <- numeric(80); e <- rnorm(80, 0, 1)
ar[1] <- e[1]; for (i in 2:80) ar[i] <- 0.6 * ar[i - 1] + e[i]
ar <- round(50 + ar, 2)                                            # autocorrelated
ties <- round(20 + 0.01 * (1:50) + rnorm(50, 0, 0.15), 1)          # drift, many ties
small <- round(rnorm(9, 3, 0.2), 2)                                # a short series
series <- list(ind = ind, ar = ar, ties = ties, small = small)

mrbar <- function(x, w) {
  m <- sapply(w:length(x), function(i) diff(range(x[(i - w + 1):i])))
  m
}
pettitt <- function(x) {
  n <- length(x)
  U <- sapply(1:(n - 1), function(t) sum(sign(outer(x[1:t], x[(t + 1):n], "-"))))
  t <- which.max(abs(U)); K <- abs(U[t])
  list(t = t, K = K, p = min(1, 2 * exp(-6 * K^2 / (n^3 + n^2))))
}
for (s in names(series)) {
  x <- series[[s]]; n <- length(x)
  for (i in seq_along(x)) out(s, sprintf("x:%d", i), x[i])
  # individuals chart, all readings and the first half as baseline
  for (b in c("all", "half")) {
    xb <- if (b == "all") x else x[1:floor(n / 2)]
    mr <- mrbar(xb, 2)
    out(s, paste0(b, ".centre"), mean(xb))
    out(s, paste0(b, ".mrbar"), mean(mr))
    out(s, paste0(b, ".sigma"), mean(mr) / D2(2))
    out(s, paste0(b, ".sigmamed"), median(mr) / d4f(2))
  }
  mr3 <- mrbar(x, 3)
  out(s, "all.sigma3", mean(mr3) / D2(3))
  out(s, "all.sigmamed3", median(mr3) / d4f(3))
  # EWMA (Roberts 1959) and tabular CUSUM (Page 1954) with centre and sigma
  # from all readings
  mu <- mean(x); sg <- mean(mrbar(x, 2)) / D2(2)
  lam <- 0.2; L <- 3
  z <- numeric(n); zp <- mu
  for (i in 1:n) { zp <- lam * x[i] + (1 - lam) * zp; z[i] <- zp }
  hw <- L * sg * sqrt(lam / (2 - lam) * (1 - (1 - lam)^(2 * (1:n))))
  k <- 0.5 * sg; h <- 5 * sg
  cp <- numeric(n); cm <- numeric(n); a <- 0; b <- 0
  for (i in 1:n) { a <- max(0, x[i] - (mu + k) + a); b <- max(0, (mu - k) - x[i] + b); cp[i] <- a; cm[i] <- b }
  for (i in seq_len(n)) {
    out(s, sprintf("ewma:%d", i), z[i]); out(s, sprintf("ewmahw:%d", i), hw[i])
    out(s, sprintf("cusum+:%d", i), cp[i]); out(s, sprintf("cusum-:%d", i), cm[i])
  }
  # lag-1 autocorrelation and Ljung-Box
  r1 <- acf(x, lag.max = 1, plot = FALSE)$acf[2]
  lb <- Box.test(x, lag = 1, type = "Ljung-Box")
  out(s, "r1", r1); out(s, "lbq", lb$statistic); out(s, "lbp", lb$p.value)
  # runs about the median, values on the median dropped
  md <- median(x); sd1 <- sign(x - md); sd1 <- sd1[sd1 != 0]
  n1 <- sum(sd1 > 0); n2 <- sum(sd1 < 0); N <- n1 + n2
  R <- 1 + sum(diff(sd1) != 0)
  mu.r <- 2 * n1 * n2 / N + 1
  var.r <- 2 * n1 * n2 * (2 * n1 * n2 - N) / (N^2 * (N - 1))
  pr <- function(r) {
    k <- r %/% 2
    if (r %% 2 == 0) 2 * choose(n1 - 1, k - 1) * choose(n2 - 1, k - 1) / choose(N, n1)
    else (choose(n1 - 1, k) * choose(n2 - 1, k - 1) + choose(n1 - 1, k - 1) * choose(n2 - 1, k)) / choose(N, n1)
  }
  pall <- sapply(2:N, pr)
  le <- sum(pall[(2:N) <= R]); ge <- sum(pall[(2:N) >= R])
  rl <- rle(sd1)$lengths
  out(s, "runs", R); out(s, "runs.above", n1); out(s, "runs.below", n2)
  out(s, "runs.z", (R - mu.r) / sqrt(var.r))
  out(s, "runs.pexact", min(1, 2 * min(le, ge)))
  out(s, "runs.longest", max(rl))
  # Mann-Kendall with the tie correction; Kendall's tau-b from cor()
  S <- sum(sign(outer(x, x, "-"))[lower.tri(diag(n))])
  tt <- table(x)
  vs <- (n * (n - 1) * (2 * n + 5) - sum(tt * (tt - 1) * (2 * tt + 5))) / 18
  Z <- if (S > 0) (S - 1) / sqrt(vs) else if (S < 0) (S + 1) / sqrt(vs) else 0
  out(s, "mk.s", S); out(s, "mk.var", vs); out(s, "mk.z", Z); out(s, "mk.p", 2 * pnorm(-abs(Z)))
  out(s, "mk.tau", cor(x, seq_len(n), method = "kendall"))
  # Sen's slope with Gilbert's (1987) interval
  ij <- which(upper.tri(diag(n)), arr.ind = TRUE)
  sl <- sort((x[ij[, 2]] - x[ij[, 1]]) / (ij[, 2] - ij[, 1]))
  Np <- length(sl)
  os <- function(k) { if (k <= 1) return(sl[1]); if (k >= Np) return(sl[Np]); f <- floor(k); sl[f] + (k - f) * (sl[f + 1] - sl[f]) }
  C <- qnorm(0.975) * sqrt(vs)
  out(s, "sen.slope", median(sl)); out(s, "sen.lo", os((Np - C) / 2)); out(s, "sen.hi", os((Np + C) / 2 + 1))
  out(s, "sen.intercept", median(x - median(sl) * (0:(n - 1))))
  # Pettitt (1979) with its approximate p-value and a permutation p-value
  pt <- pettitt(x)
  out(s, "pettitt.t", pt$t); out(s, "pettitt.k", pt$K); out(s, "pettitt.p", pt$p)
  out(s, "pettitt.before", mean(x[1:pt$t])); out(s, "pettitt.after", mean(x[(pt$t + 1):n]))
  set.seed(7)
  perm <- replicate(2000, pettitt(sample(x))$K)
  out(s, "pettitt.pperm", mean(perm >= pt$K))
}

## Subgroups: equal sizes and unequal sizes.
set.seed(424242)
eq <- lapply(1:25, function(i) round(rnorm(5, 74, 0.01), 3))
sz <- rep(c(3, 5, 8, 4, 6), 4)
uneq <- lapply(seq_along(sz), function(i) round(rnorm(sz[i], 12.5 + (i > 15) * 0.02, 0.02), 3))
big <- lapply(1:12, function(i) round(rnorm(12, 5, 0.1), 2))
groups <- list("sub-eq" = eq, "sub-uneq" = uneq, "sub-big" = big)
for (s in names(groups)) {
  g <- groups[[s]]
  for (i in seq_along(g)) for (j in seq_along(g[[i]])) out(s, sprintf("g:%d:%d", i, j), g[[i]][j])
  ns <- sapply(g, length)
  R <- sapply(g, function(v) diff(range(v))); S <- sapply(g, sd)
  d2 <- sapply(ns, D2); d3 <- sapply(ns, D3); c4 <- c4f(ns)
  f <- d2^2 / d3^2; hh <- c4^2 / (1 - c4^2)
  out(s, "centre", sum(unlist(g)) / sum(ns))
  out(s, "sigma.r", sum(f * R / d2) / sum(f)); out(s, "df.r", sum(f) / 2)
  out(s, "sigma.s", sum(hh * S / c4) / sum(hh)); out(s, "df.s", sum(hh) / 2)
  nu <- sum(ns - 1)
  out(s, "sigma.pooled", sqrt(sum((ns - 1) * S^2) / nu) / c4f(nu + 1))
  if (s == "sub-eq") { # the textbook forms with equal sizes
    out(s, "rbar", mean(R)); out(s, "sbar", mean(S))
  }
}

## Average run lengths by the Markov chain of Brook and Evans (1972),
## 301 states, as in stats/method (checks the implementation, not the method).
cusum1 <- function(k, h, d, m = 301) {
  w <- h / (m - 0.5); c <- (0:(m - 1)) * w
  P <- matrix(0, m, m)
  for (i in 1:m) {
    P[i, 1] <- pnorm(w / 2 - c[i] + k - d)
    if (m > 1) P[i, 2:m] <- pnorm(c[2:m] + w / 2 - c[i] + k - d) - pnorm(c[2:m] - w / 2 - c[i] + k - d)
  }
  solve(diag(m) - P, rep(1, m))[1]
}
ewma1 <- function(lam, L, d, m = 301) {
  h <- L * sqrt(lam / (2 - lam)); w <- 2 * h / m; c <- -h + ((0:(m - 1)) + 0.5) * w
  P <- matrix(0, m, m)
  for (i in 1:m) P[i, ] <- pnorm((c + w / 2 - (1 - lam) * c[i]) / lam - d) - pnorm((c - w / 2 - (1 - lam) * c[i]) / lam - d)
  solve(diag(m) - P, rep(1, m))[(m + 1) / 2]
}
for (h in c(4, 5)) for (d in c(0, 0.5, 1)) { # d = 2: the lower side (ARL near 1e12) is singular at double precision
  up <- cusum1(0.5, h, d); lo <- cusum1(0.5, h, -d)
  out(sprintf("cusum-h%g", h), sprintf("arl:%g", d), 1 / (1 / up + 1 / lo))
}
for (p in list(c(0.1, 2.814), c(0.2, 2.962), c(0.05, 2.615), c(0.4, 3.054))) for (d in c(0, 0.5, 1, 2))
  out(sprintf("ewma-%g-%g", p[1], p[2]), sprintf("arl:%g", d), ewma1(p[1], p[2], d))
