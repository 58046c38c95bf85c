# Reference values for the capability, conformance, tolerance and fit methods
# of stats/method (capability*_test.go, conform*_test.go, tolerance*_test.go,
# fit*_test.go), computed with R 4.2.2 (Debian r-base-core; MASS from its
# recommended packages, r-cran-nortest 1.0-4). The formulas are written out
# here from their published sources, independently of the Go code.
# Regenerate from the repository root with
#   Rscript testdata/rref/capability.R > testdata/rref/capability.tsv
# It also writes the invented data sets to testdata/rref/capability_data.tsv
# (set, value with 17 significant digits).
# Output: one line per figure: set, statistic, value (17 significant digits).
suppressPackageStartupMessages({ library(MASS); library(nortest) })
cat("set\tstat\tvalue\n")
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v))

# ---- invented data sets, deterministic
set.seed(20261203)
sets <- list(
  norm50   = round(rnorm(50, 10, 0.2), 3),
  lnorm200 = round(exp(rnorm(200, 1, 0.4)), 4),
  weib3    = round(5 + rweibull(300, 2.2, 1.5), 4),
  gamma3   = round(2 + rgamma(300, shape = 3, rate = 2), 4),
  lnorm3   = round(20 + exp(rnorm(400, 0.5, 0.5)), 4),
  small5   = c(4.01, 4.03, 3.98, 4.02, 4.00)
)
con <- file("testdata/rref/capability_data.tsv", "w")
writeLines("set\tvalue", con)
for (s in names(sets)) writeLines(sprintf("%s\t%.17g", s, sets[[s]]), con)
close(con)

# ---- Conformance: counts on the 3-decimal mantissas, Clopper-Pearson (1934)
cp <- function(k, n, lev) {
  a <- 1 - lev
  c(if (k == 0) 0 else qbeta(a / 2, k, n - k + 1),
    if (k == n) 1 else qbeta(1 - a / 2, k + 1, n - k),
    if (k == n) 1 else qbeta(1 - a, k + 1, n - k))
}
x <- sets$norm50; n <- length(x)
m <- round(x * 1000); lsl <- 9750; usl <- 10300
below <- sum(m < lsl); above <- sum(m > usl)
out("conform", "n", n); out("conform", "lsl_m", lsl); out("conform", "usl_m", usl)
out("conform", "below", below); out("conform", "above", above)
for (v in list(list("below", below), list("above", above), list("outside", below + above))) {
  r <- cp(v[[2]], n, 0.95)
  out("conform", paste0(v[[1]], "_lo"), r[1]); out("conform", paste0(v[[1]], "_hi"), r[2])
  out("conform", paste0(v[[1]], "_ub"), r[3])
  bt <- binom.test(v[[2]], n, conf.level = 0.95)$conf.int
  out("conform", paste0(v[[1]], "_binomtest_lo"), bt[1]); out("conform", paste0(v[[1]], "_binomtest_hi"), bt[2])
}
for (k in c(0, 1, 7, 500)) {
  r <- cp(k, 500, 0.90)
  out(sprintf("cp_%d_500_90", k), "lo", r[1]); out(sprintf("cp_%d_500_90", k), "hi", r[2]); out(sprintf("cp_%d_500_90", k), "ub", r[3])
}

# ---- Expected fraction outside under a normal
mu <- mean(x); s <- sd(x)
out("expected", "mean", mu); out("expected", "sd", s)
out("expected", "below", pnorm((9.75 - mu) / s)); out("expected", "above", pnorm((mu - 10.3) / s))
out("expected", "far_below", pnorm((9.75 - 12) / 0.03))  # a far tail

# ---- Capability indices (Kane 1986; Bissell 1990; Boyles 1991)
sw <- mean(abs(diff(x))) / 1.128379; dfw <- 0.62 * (n - 1)  # inputs only
LSL <- 9.6; USL <- 10.5; TG <- 10.05; lev <- 0.95; a <- 1 - lev
out("cap", "in_mean", mu); out("cap", "in_sw", sw); out("cap", "in_dfw", dfw); out("cap", "in_so", s)
out("cap", "in_n", n); out("cap", "in_lsl", LSL); out("cap", "in_usl", USL); out("cap", "in_t", TG)
chi <- function(v, df) c(v * sqrt(qchisq(a / 2, df) / df), v * sqrt(qchisq(1 - a / 2, df) / df), v * sqrt(qchisq(a, df) / df))
bis <- function(v, df) { se <- sqrt(1 / (9 * n) + v^2 / (2 * df)); c(v - qnorm(1 - a / 2) * se, v + qnorm(1 - a / 2) * se, v - qnorm(lev) * se) }
emit <- function(name, v, ci) { out("cap", name, v); out("cap", paste0(name, "_lo"), ci[1]); out("cap", paste0(name, "_hi"), ci[2]); out("cap", paste0(name, "_lb"), ci[3]) }
for (fam in list(list("C", sw, dfw), list("P", s, n - 1))) {
  sg <- fam[[2]]; df <- fam[[3]]; p <- fam[[1]]
  v <- (USL - LSL) / (6 * sg); emit(paste0(p, "p"), v, chi(v, df))
  l <- (mu - LSL) / (3 * sg); emit(paste0(p, "PL"), l, bis(l, df))
  u <- (USL - mu) / (3 * sg); emit(paste0(p, "PU"), u, bis(u, df))
  k <- min(l, u); emit(paste0(p, "pk"), k, bis(k, df))
}
aa <- (mu - TG) / s; cpm <- (USL - LSL) / (6 * sqrt(s^2 + (mu - TG)^2))
nu <- n * (1 + aa^2)^2 / (1 + 2 * aa^2)
emit("Cpm", cpm, chi(cpm, nu)); out("cap", "Cpm_df", nu)

# ---- Sample size for a Cpk lower bound (Bissell 1990)
ss <- function(c, req, lev) { z <- qnorm(lev); nn <- 2; while (!(c - z * sqrt(1 / (9 * nn) + c^2 / (2 * (nn - 1))) > req)) nn <- nn + 1; nn }
for (cc in list(c(1.5, 1.33, 0.95), c(1.2, 1.0, 0.95), c(2.0, 1.33, 0.99), c(1.34, 1.33, 0.90)))
  out(sprintf("cpkn_%g_%g_%g", cc[1], cc[2], cc[3]), "n", ss(cc[1], cc[2], cc[3]))

# ---- Normal tolerance factors: exact two-sided by the Odeh-Owen integral
# (integrate + uniroot), Howe (1969), exact one-sided by the noncentral t.
k2exact <- function(n, P, g, df = n - 1) {
  rr <- function(xx) uniroot(function(r) pnorm(xx + r) - pnorm(xx - r) - P, c(0, xx + 50), tol = 1e-14)$root
  cover <- function(k) sqrt(2 * n / pi) * integrate(function(xs) sapply(xs, function(xx)
    pchisq(df * rr(xx)^2 / k^2, df, lower.tail = FALSE) * exp(-n * xx^2 / 2)), 0, Inf, rel.tol = 1e-12)$value
  uniroot(function(k) cover(k) - g, c(0.5, 200), tol = 1e-12)$root
}
for (cs in list(c(2, .9, .95), c(4, .99, .95), c(10, .9, .95), c(10, .99, .99), c(30, .95, .95), c(43, .9, .99), c(100, .999, .95), c(1000, .99, .95))) {
  nn <- cs[1]; P <- cs[2]; g <- cs[3]; id <- sprintf("tol_%d_%g_%g", nn, P, g)
  out(id, "k2", k2exact(nn, P, g))
  out(id, "howe", sqrt((nn - 1) * (1 + 1 / nn) * qnorm((1 + P) / 2)^2 / qchisq(1 - g, nn - 1)))
  out(id, "k1", qt(g, nn - 1, qnorm(P) * sqrt(nn)) / sqrt(nn))
}
for (tc in list(c(2, 10, 1), c(-1, 5, 0.5), c(5, 3, 4), c(30, 50, 25), c(0.5, 1, -2), c(40, 20, 36), c(12, 7, 10))) {
  out(sprintf("pnt_%g_%g_%g", tc[1], tc[2], tc[3]), "p", pt(tc[1], tc[2], tc[3]))
}
for (qc in list(c(0.95, 9, 4), c(0.99, 29, 12.7), c(0.05, 4, -1))) out(sprintf("qnt_%g_%g_%g", qc[1], qc[2], qc[3]), "q", qt(qc[1], qc[2], qc[3]))

# ---- Distribution-free tolerance (Wilks 1941)
conf <- function(n, r, s, P) pbeta(P, n - r - s + 1, r + s, lower.tail = FALSE)
for (dc in list(c(59, 1, 1, .95), c(93, 1, 1, .95), c(59, 0, 1, .95), c(300, 2, 3, .99), c(1000, 5, 5, .99))) {
  out(sprintf("dfree_%d_%d_%d_%g", dc[1], dc[2], dc[3], dc[4]), "conf", conf(dc[1], dc[2], dc[3], dc[4]))
}
nmin <- function(r, s, P, g) { nn <- r + s; while (conf(nn, r, s, P) < g) nn <- nn + 1; nn }
for (dc in list(c(1, 1, .95, .95), c(0, 1, .95, .95), c(1, 1, .99, .95), c(0, 1, .99, .99), c(2, 2, .9, .9), c(1, 1, .999, .95))) {
  out(sprintf("dfreen_%d_%d_%g_%g", dc[1], dc[2], dc[3], dc[4]), "n", nmin(dc[1], dc[2], dc[3], dc[4]))
}

# ---- Empirical quantiles (type 7) with order-statistic intervals
oci <- function(x, p, lev) {
  x <- sort(x); n <- length(x); a <- (1 - lev) / 2
  k <- qbinom(a, n, p); if (pbinom(k, n, p) > a) k <- k - 1
  l <- k + 1; u <- qbinom(1 - a, n, p) + 1
  c(quantile(x, p, type = 7, names = FALSE), l, u,
    pbinom(min(u, n + 1) - 1, n, p) - (if (l >= 1) pbinom(l - 1, n, p) else 0))
}
for (s in c("lnorm200", "weib3")) for (p in c(0.00135, 0.5, 0.99865)) {
  r <- oci(sets[[s]], p, 0.95)
  out(s, sprintf("eq_%g", p), r[1]); out(s, sprintf("eq_%g_l", p), r[2]); out(s, sprintf("eq_%g_u", p), r[3]); out(s, sprintf("eq_%g_ach", p), r[4])
}

# ---- Maximum-likelihood fits
ad <- function(Fx) { # Anderson-Darling A^2 from F at the sorted data
  n <- length(Fx); i <- seq_len(n)
  -n - mean((2 * i - 1) * (log(Fx) + log(1 - rev(Fx))))
}
fits <- function(s, x) {
  x <- sort(x); n <- length(x)
  # normal (ML sigma), A^2 and p by nortest (sample SD)
  f <- fitdistr(x, "normal"); out(s, "normal_mu", f$estimate[1]); out(s, "normal_sigma", f$estimate[2])
  out(s, "normal_ll", f$loglik)
  if (n > 7) { at <- ad.test(x); out(s, "normal_ad", at$statistic); out(s, "normal_p", at$p.value) }
  out(s, "normal_q00135", qnorm(0.00135, f$estimate[1], f$estimate[2]))
  if (min(x) > 0) {
    f <- fitdistr(x, "lognormal"); out(s, "lognormal_mu", f$estimate[1]); out(s, "lognormal_sigma", f$estimate[2])
    out(s, "lognormal_ll", f$loglik)
    if (n > 7) { at <- ad.test(log(x)); out(s, "lognormal_ad", at$statistic); out(s, "lognormal_p", at$p.value) }
    f <- tryCatch(suppressWarnings(fitdistr(x, "weibull", control = list(reltol = 1e-14))), error = function(e) NULL)
    if (!is.null(f)) {
      out(s, "weibull_shape", f$estimate[1]); out(s, "weibull_scale", f$estimate[2]); out(s, "weibull_ll", f$loglik)
      out(s, "weibull_ad", ad(pweibull(x, f$estimate[1], f$estimate[2])))
      out(s, "weibull_q99865", qweibull(0.99865, f$estimate[1], f$estimate[2]))
    }
    # gamma: optim on the log-likelihood in log parameters (fitdistr's
    # bounded search stops early on near-normal data)
    nllg <- function(p) -sum(dgamma(x, exp(p[1]), scale = exp(p[2]), log = TRUE))
    o <- optim(c(log(mean(x)^2 / var(x)), log(var(x) / mean(x))), nllg, control = list(reltol = 1e-15, maxit = 20000))
    o <- optim(o$par, nllg, method = "BFGS", control = list(reltol = 1e-15, maxit = 2000))
    f <- list(estimate = c(exp(o$par[1]), 1 / exp(o$par[2])), loglik = -o$value)
    out(s, "gamma_shape", f$estimate[1]); out(s, "gamma_scale", 1 / f$estimate[2]); out(s, "gamma_ll", f$loglik)
    out(s, "gamma_ad", ad(pgamma(x, f$estimate[1], f$estimate[2])))
    # Box-Cox: lambda maximising the profile log-likelihood, written out
    gm <- exp(mean(log(x)))
    prof <- function(l) { t <- if (abs(l) < 1e-12) log(x / gm) else ((x / gm)^l - 1) / l; -n / 2 * log(mean((t - mean(t))^2)) }
    l <- optimize(prof, c(-5, 5), maximum = TRUE, tol = 1e-10)$maximum
    t <- if (abs(l) < 1e-12) log(x / gm) else ((x / gm)^l - 1) / l
    v <- mean((t - mean(t))^2)
    out(s, "boxcox_lambda", l); out(s, "boxcox_ll", -n / 2 * (log(2 * pi * v) + 1) + (l - 1) * sum(log(x / gm)) - n * log(gm))
    out(s, "boxcox_ad", ad(pnorm(t, mean(t), sqrt(v))))
  }
  # 3-parameter fits: optim on the full log-likelihood, written out
  sp <- diff(range(x))
  if (n >= 10) {
    nll <- function(p) { th <- min(x) - exp(p[1]); z <- log(x - th); -sum(dnorm(z, p[2], exp(p[3]), log = TRUE) - z) }
    best <- NULL
    for (t0 in c(0.05, 0.3, 1, 3)) {
      th <- min(x) - t0 * sp; z <- log(x - th)
      o <- optim(c(log(t0 * sp), mean(z), log(sd(z))), nll, control = list(reltol = 1e-15, maxit = 20000))
      o <- optim(o$par, nll, method = "BFGS", control = list(reltol = 1e-15, maxit = 2000))
      if (is.null(best) || o$value < best$value) best <- o
    }
    th <- min(x) - exp(best$par[1])
    out(s, "lognormal3_threshold", th); out(s, "lognormal3_ll", -best$value)
    out(s, "lognormal3_ad", ad(plnorm(x - th, best$par[2], exp(best$par[3]))))
    nll <- function(p) -sum(dweibull(x - (min(x) - exp(p[1])), exp(p[2]), exp(p[3]), log = TRUE))
    best <- NULL
    for (t0 in c(0.1, 0.5, 1, 2)) {
      o <- optim(c(log(t0 * sp), log(2), log(sp)), nll, control = list(reltol = 1e-15, maxit = 20000))
      o <- optim(o$par, nll, method = "BFGS", control = list(reltol = 1e-15, maxit = 2000))
      if (exp(o$par[2]) > 1 && (is.null(best) || o$value < best$value)) best <- o
    }
    if (!is.null(best)) {
      th <- min(x) - exp(best$par[1])
      out(s, "weibull3_threshold", th); out(s, "weibull3_shape", exp(best$par[2])); out(s, "weibull3_ll", -best$value)
      out(s, "weibull3_ad", ad(pweibull(x - th, exp(best$par[2]), exp(best$par[3]))))
    }
    nll <- function(p) -sum(dgamma(x - (min(x) - exp(p[1])), exp(p[2]), scale = exp(p[3]), log = TRUE))
    best <- NULL
    for (t0 in c(0.1, 0.5, 1, 2)) {
      z <- x - min(x) + t0 * sp
      o <- optim(c(log(t0 * sp), log(mean(z)^2 / var(z)), log(var(z) / mean(z))), nll, control = list(reltol = 1e-15, maxit = 20000))
      o <- optim(o$par, nll, method = "BFGS", control = list(reltol = 1e-15, maxit = 2000))
      if (exp(o$par[2]) > 1 && (is.null(best) || o$value < best$value)) best <- o
    }
    if (!is.null(best)) {
      th <- min(x) - exp(best$par[1])
      out(s, "gamma3_threshold", th); out(s, "gamma3_shape", exp(best$par[2])); out(s, "gamma3_ll", -best$value)
      out(s, "gamma3_ad", ad(pgamma(x - th, exp(best$par[2]), scale = exp(best$par[3]))))
    }
  }
}
for (s in c("norm50", "lnorm200", "weib3", "gamma3", "lnorm3", "small5")) fits(s, sets[[s]])

# ---- Percentile method (ISO 22514-2) from the Weibull fit of weib3
x <- sets$weib3; f <- suppressWarnings(fitdistr(x, "weibull", control = list(reltol = 1e-14)))
q <- qweibull(c(0.00135, 0.5, 0.99865), f$estimate[1], f$estimate[2]); L <- 4.9; U <- 9.5
out("pctl", "pp", (U - L) / (q[3] - q[1])); out("pctl", "ppl", (q[2] - L) / (q[2] - q[1]))
out("pctl", "ppu", (U - q[2]) / (q[3] - q[2])); out("pctl", "lsl", L); out("pctl", "usl", U)
out("pctl", "below", pweibull(L, f$estimate[1], f$estimate[2])); out("pctl", "above", pweibull(U, f$estimate[1], f$estimate[2], lower.tail = FALSE))
