# Reference values for the Groups section (stats/groups.go), computed with
# R 4.2.2 (Debian r-base-core), base packages only, on the invented and
# published data sets of testdata/rref/groups-data.tsv (written by
# groups.R). Regenerate from the repository root with
#   Rscript testdata/rref/groupsec.R > testdata/rref/groupsec.tsv
# Per group: n, mean and its t interval (t.test), SD and its chi-square
# interval, median (type 7), quartiles (type 7), the count of readings
# beyond Tukey's fences (1.5 and 3 IQR beyond the type 7 quartiles), and,
# against limits set here from the data (LSL = the 10th percentile of all
# readings, type 1, USL = the 90th), the count outside with the
# Clopper-Pearson interval (binom.test), Ppk from the group's overall SD
# and Cpk from its within-process sigma (average moving range / d2 of the
# group's readings in file order), each with the interval of Bissell (1990)
# written out by its formula. For sets
# of two groups the Welch difference and the Hodges-Lehmann shift are
# given as group 1 minus group 0 (the section's direction).

d <- read.delim("testdata/rref/groups-data.tsv", colClasses = c("character", "integer", "character"))
cat("set\tstat\tvalue\n")
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v))
for (s in unique(d$set)) {
  ds <- d[d$set == s, ]
  x <- as.numeric(ds$value)
  lsl <- unname(quantile(x, 0.1, type = 1)); usl <- unname(quantile(x, 0.9, type = 1))
  out(s, "lsl", lsl); out(s, "usl", usl)
  gl <- split(x, ds$group)
  for (g in names(gl)) {
    v <- gl[[g]]; n <- length(v); p <- paste0("g", g, ".")
    out(s, paste0(p, "n"), n)
    out(s, paste0(p, "mean"), mean(v))
    tt <- t.test(v, conf.level = 0.95)
    out(s, paste0(p, "mean.lo"), tt$conf.int[1]); out(s, paste0(p, "mean.hi"), tt$conf.int[2])
    sdv <- sd(v)
    out(s, paste0(p, "sd"), sdv)
    out(s, paste0(p, "sd.lo"), sdv * sqrt((n - 1) / qchisq(0.975, n - 1)))
    out(s, paste0(p, "sd.hi"), sdv * sqrt((n - 1) / qchisq(0.025, n - 1)))
    q <- unname(quantile(v, c(0.25, 0.5, 0.75), type = 7))
    out(s, paste0(p, "q1"), q[1]); out(s, paste0(p, "median"), q[2]); out(s, paste0(p, "q3"), q[3])
    iqr <- q[3] - q[1]
    # fences compared in exact decimals: scale by 10^4 and round (the data have at most 3 decimals)
    sc <- function(z) round(z * 1e4)
    inner <- sum(sc(v) < sc(q[1] - 1.5 * iqr) | sc(v) > sc(q[3] + 1.5 * iqr))
    outer <- sum(sc(v) < sc(q[1] - 3 * iqr) | sc(v) > sc(q[3] + 3 * iqr))
    out(s, paste0(p, "inner"), inner); out(s, paste0(p, "outer"), outer)
    k <- sum(v < lsl) + sum(v > usl)
    out(s, paste0(p, "outside"), k)
    bt <- binom.test(k, n, conf.level = 0.95)
    out(s, paste0(p, "outside.lo"), bt$conf.int[1]); out(s, paste0(p, "outside.hi"), bt$conf.int[2])
    ppk <- min(mean(v) - lsl, usl - mean(v)) / (3 * sdv)
    h <- qnorm(0.975) * sqrt(1 / (9 * n) + ppk^2 / (2 * (n - 1)))
    out(s, paste0(p, "ppk"), ppk); out(s, paste0(p, "ppk.lo"), ppk - h); out(s, paste0(p, "ppk.hi"), ppk + h)
    # within: average moving range of span 2 (readings in file order) / d2(2),
    # d2(2) = 2/sqrt(pi); effective degrees of freedom by Patnaik (1950) from
    # the exact variance of the average of m = n-1 moving ranges (adjacent
    # ranges correlated with covariance c1, sigma = 1)
    m <- n - 1
    d2 <- 2 / sqrt(pi)
    sw <- mean(abs(diff(v))) / d2
    v0 <- 2 * (1 - 2 / pi); c1 <- 2 * sqrt(3) / pi + 1 / 3 - 4 / pi
    df <- 1 / (2 * (m * v0 + 2 * (m - 1) * c1) / (m^2 * d2^2))
    cpk <- min(mean(v) - lsl, usl - mean(v)) / (3 * sw)
    h <- qnorm(0.975) * sqrt(1 / (9 * n) + cpk^2 / (2 * df))
    out(s, paste0(p, "sigma.within"), sw)
    out(s, paste0(p, "cpk"), cpk); out(s, paste0(p, "cpk.lo"), cpk - h); out(s, paste0(p, "cpk.hi"), cpk + h)
  }
  if (length(gl) == 2) {
    tt <- t.test(gl[[2]], gl[[1]], conf.level = 0.95)
    out(s, "diff", tt$estimate[1] - tt$estimate[2]); out(s, "diff.lo", tt$conf.int[1]); out(s, "diff.hi", tt$conf.int[2])
    wt <- suppressWarnings(wilcox.test(gl[[2]], gl[[1]], conf.int = TRUE, conf.level = 0.95))
    out(s, "shift", wt$estimate); out(s, "shift.lo", wt$conf.int[1]); out(s, "shift.hi", wt$conf.int[2])
    out(s, "mw.p", wt$p.value)
  }
}
