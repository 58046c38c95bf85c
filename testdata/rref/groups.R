# Reference values for the group methods (stats/method: anova.go,
# ranks.go, pairwise.go, spreadtest.go, studrange.go), computed with
# R 4.2.2 (Debian r-base-core), base packages only.
# Regenerate from the repository root with
#   Rscript testdata/rref/groups.R
# It writes the invented data sets, generated here deterministically, to
# testdata/rref/groups-data.tsv (set, group, value as typed) and the
# reference values to testdata/rref/groups.tsv (set, statistic, value with
# 17 significant digits). Two published data sets are added as they are:
# R's PlantGrowth (Dobson 1983, "An Introduction to Statistical
# Modelling", table 7.1) and the permeability constants of Hollander and
# Wolfe (1973, "Nonparametric Statistical Methods", p. 69), as in the
# examples of R's wilcox.test.
# Brown-Forsythe (Levene centred on the median), Games-Howell, Dunn's test
# and Hedges' g are written out here by their formulas.

set.seed(20261203)
sets <- list()
nodup <- function(gen) { repeat { x <- gen(); if (!anyDuplicated(unlist(x))) return(x) } }
fmt <- function(x, d) formatC(x, format = "f", digits = d)
mk <- function(name, groups, d) sets[[name]] <<- lapply(groups, function(v) fmt(v, d))

# two groups, equal sizes, no ties (exact rank-sum path)
mk("g2-equal", nodup(function() list(rnorm(12, 50.2, 0.4), rnorm(12, 50.6, 0.4))), 3)
# two groups, smallest allowed sizes, no ties
mk("g2-small", nodup(function() list(rnorm(3, 8, 1), rnorm(4, 9, 1))), 2)
# two groups, unequal sizes, coarse resolution: many ties (normal approximation)
mk("g2-ties", list(rnorm(15, 12.3, 0.3), rnorm(40, 12.5, 0.5)), 1)
# two groups above the exact limit, unequal variances
mk("g2-large", list(rnorm(60, 100, 2), rnorm(75, 101, 4)), 2)
# three groups, equal sizes
mk("g3-equal", list(rnorm(10, 5, 0.2), rnorm(10, 5.1, 0.2), rnorm(10, 5.3, 0.2)), 2)
# four groups, unequal sizes and variances
mk("g4-unequal", list(rnorm(5, 20, 1), rnorm(8, 21, 2), rnorm(12, 20.5, 0.5), rnorm(20, 22, 3)), 2)
# five groups of whole numbers: heavy ties
mk("g5-ties", list(round(rnorm(6, 30, 2)), round(rnorm(9, 31, 2)), round(rnorm(11, 30, 3)),
                  round(rnorm(13, 33, 2)), round(rnorm(15, 30.5, 2))), 0)
# six groups, one outlying group
mk("g6-outlier", c(lapply(1:5, function(i) rnorm(10, 7.5, 0.1)), list(rnorm(10, 7.9, 0.1))), 3)
# eight groups, sizes 3 to 30, unequal variances
mk("g8-mixed", lapply(1:8, function(i) rnorm(c(3, 4, 6, 9, 12, 18, 24, 30)[i], 10 + 0.3 * (i %% 3), 0.2 + 0.1 * i)), 2)
# published: PlantGrowth (Dobson 1983)
sets[["plantgrowth"]] <- lapply(split(PlantGrowth$weight, PlantGrowth$group), function(v) fmt(v, 2))
# published: Hollander and Wolfe (1973, p. 69)
sets[["hw-permeability"]] <- list(fmt(c(0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46), 2),
                                  fmt(c(1.15, 0.88, 0.90, 0.74, 1.21), 2))

dat <- file("testdata/rref/groups-data.tsv", "w")
cat("set\tgroup\tvalue\n", file = dat)
for (s in names(sets)) for (g in seq_along(sets[[s]])) for (v in sets[[s]][[g]])
  cat(sprintf("%s\t%d\t%s\n", s, g - 1, v), file = dat)
close(dat)

ref <- file("testdata/rref/groups.tsv", "w")
cat("set\tstat\tvalue\n", file = ref)
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v), file = ref)

for (s in names(sets)) {
  gl <- lapply(sets[[s]], as.numeric)
  k <- length(gl)
  x <- unlist(gl)
  g <- factor(rep(seq_len(k) - 1, sapply(gl, length)), levels = seq_len(k) - 1)
  N <- length(x)
  # one-way ANOVA
  a <- summary(aov(x ~ g))[[1]]
  out(s, "anova.F", a[1, "F value"]); out(s, "anova.p", a[1, "Pr(>F)"])
  out(s, "anova.df1", a[1, "Df"]); out(s, "anova.df2", a[2, "Df"])
  out(s, "anova.ssb", a[1, "Sum Sq"]); out(s, "anova.ssw", a[2, "Sum Sq"])
  out(s, "anova.msb", a[1, "Mean Sq"]); out(s, "anova.msw", a[2, "Mean Sq"])
  # Welch's ANOVA
  w <- oneway.test(x ~ g, var.equal = FALSE)
  out(s, "welch.F", w$statistic); out(s, "welch.df1", w$parameter[1])
  out(s, "welch.df2", w$parameter[2]); out(s, "welch.p", w$p.value)
  # Kruskal-Wallis
  kw <- kruskal.test(x ~ g)
  out(s, "kw.H", kw$statistic); out(s, "kw.p", kw$p.value)
  # Bartlett
  b <- bartlett.test(x ~ g)
  out(s, "bartlett.K2", b$statistic); out(s, "bartlett.p", b$p.value)
  # Brown-Forsythe: ANOVA of |x - group median| (Brown and Forsythe 1974)
  z <- abs(x - ave(x, g, FUN = median))
  bf <- anova(lm(z ~ g))
  out(s, "bf.F", bf[1, "F value"]); out(s, "bf.p", bf[1, "Pr(>F)"])
  # SD ratio: largest over smallest; for two groups var.test(largest, smallest)
  sds <- sapply(gl, sd)
  lg <- which.max(sds); sm <- which.min(sds)
  out(s, "sdratio.ratio", sds[lg] / sds[sm])
  out(s, "sdratio.largest", lg - 1); out(s, "sdratio.smallest", sm - 1)
  if (k == 2) {
    vt <- var.test(gl[[lg]], gl[[sm]], conf.level = 0.95)
    out(s, "sdratio.lo", sqrt(vt$conf.int[1])); out(s, "sdratio.hi", sqrt(vt$conf.int[2]))
    out(s, "sdratio.F", vt$statistic); out(s, "sdratio.p", vt$p.value)
    # Welch t
    tt <- t.test(gl[[1]], gl[[2]], conf.level = 0.95)
    out(s, "welcht.t", tt$statistic); out(s, "welcht.df", tt$parameter); out(s, "welcht.p", tt$p.value)
    out(s, "welcht.diff", tt$estimate[1] - tt$estimate[2])
    out(s, "welcht.lo", tt$conf.int[1]); out(s, "welcht.hi", tt$conf.int[2])
    # Wilcoxon rank-sum with Hodges-Lehmann shift
    wt <- suppressWarnings(wilcox.test(gl[[1]], gl[[2]], conf.int = TRUE, conf.level = 0.95))
    out(s, "mw.W", wt$statistic); out(s, "mw.p", wt$p.value)
    out(s, "mw.shift", wt$estimate); out(s, "mw.lo", wt$conf.int[1]); out(s, "mw.hi", wt$conf.int[2])
    out(s, "mw.exact", as.numeric(grepl("exact", wt$method) || !grepl("correction", wt$method)))
    wt90 <- suppressWarnings(wilcox.test(gl[[1]], gl[[2]], conf.int = TRUE, conf.level = 0.90))
    out(s, "mw90.lo", wt90$conf.int[1]); out(s, "mw90.hi", wt90$conf.int[2])
    # the median of all differences (Hodges-Lehmann by its definition)
    out(s, "hl.median", median(outer(gl[[1]], gl[[2]], "-")))
    # Hedges' g (Hedges 1981 exact J; SE of Hedges and Olkin 1985)
    n1 <- length(gl[[1]]); n2 <- length(gl[[2]]); m <- n1 + n2 - 2
    sp <- sqrt(((n1 - 1) * var(gl[[1]]) + (n2 - 1) * var(gl[[2]])) / m)
    d <- (mean(gl[[1]]) - mean(gl[[2]])) / sp
    J <- exp(lgamma(m / 2) - lgamma((m - 1) / 2)) / sqrt(m / 2)
    gg <- J * d
    se <- sqrt((n1 + n2) / (n1 * n2) + gg^2 / (2 * (n1 + n2)))
    out(s, "hedges.d", d); out(s, "hedges.g", gg); out(s, "hedges.se", se)
    out(s, "hedges.lo", gg - qnorm(0.975) * se); out(s, "hedges.hi", gg + qnorm(0.975) * se)
  }
  # Tukey-Kramer
  th <- TukeyHSD(aov(x ~ g), conf.level = 0.95)$g
  pairs <- combn(k, 2)
  for (c in seq_len(ncol(pairs))) {
    i <- pairs[1, c]; j <- pairs[2, c]
    row <- sprintf("%d-%d", j - 1, i - 1)
    key <- sprintf("%d-%d", i - 1, j - 1)
    out(s, paste0("tukey.", key, ".diff"), th[row, "diff"])
    out(s, paste0("tukey.", key, ".lo"), th[row, "lwr"])
    out(s, paste0("tukey.", key, ".hi"), th[row, "upr"])
    out(s, paste0("tukey.", key, ".p"), th[row, "p adj"])
    # Games-Howell by its formula (Games and Howell 1976)
    vi <- var(gl[[i]]) / length(gl[[i]]); vj <- var(gl[[j]]) / length(gl[[j]])
    df <- (vi + vj)^2 / (vi^2 / (length(gl[[i]]) - 1) + vj^2 / (length(gl[[j]]) - 1))
    se <- sqrt((vi + vj) / 2)
    dd <- mean(gl[[j]]) - mean(gl[[i]])
    qc <- qtukey(0.95, k, df)
    out(s, paste0("gh.", key, ".diff"), dd); out(s, paste0("gh.", key, ".df"), df)
    out(s, paste0("gh.", key, ".p"), ptukey(abs(dd) / se, k, df, lower.tail = FALSE))
    out(s, paste0("gh.", key, ".lo"), dd - qc * se); out(s, paste0("gh.", key, ".hi"), dd + qc * se)
  }
  # pairwise Mann-Whitney, Holm-adjusted and raw
  pw <- suppressWarnings(pairwise.wilcox.test(x, g, p.adjust.method = "holm"))$p.value
  pr <- suppressWarnings(pairwise.wilcox.test(x, g, p.adjust.method = "none"))$p.value
  for (c in seq_len(ncol(pairs))) {
    i <- pairs[1, c]; j <- pairs[2, c]
    key <- sprintf("%d-%d", i - 1, j - 1)
    out(s, paste0("pmw.", key, ".padj"), pw[as.character(j - 1), as.character(i - 1)])
    out(s, paste0("pmw.", key, ".p"), pr[as.character(j - 1), as.character(i - 1)])
  }
  # Dunn (1964) by its formula, Holm-adjusted with p.adjust
  r <- rank(x)
  tt <- table(x)
  v <- N * (N + 1) / 12 - sum(tt^3 - tt) / (12 * (N - 1))
  mr <- tapply(r, g, mean); ng <- tapply(r, g, length)
  zs <- numeric(0); ps <- numeric(0); keys <- character(0)
  for (c in seq_len(ncol(pairs))) {
    i <- pairs[1, c]; j <- pairs[2, c]
    zz <- (mr[j] - mr[i]) / sqrt(v * (1 / ng[i] + 1 / ng[j]))
    zs <- c(zs, zz); ps <- c(ps, 2 * pnorm(-abs(zz)))
    keys <- c(keys, sprintf("%d-%d", i - 1, j - 1))
  }
  pa <- p.adjust(ps, "holm")
  for (c in seq_along(keys)) {
    out(s, paste0("dunn.", keys[c], ".z"), zs[c]); out(s, paste0("dunn.", keys[c], ".p"), ps[c])
    out(s, paste0("dunn.", keys[c], ".padj"), pa[c])
  }
}

# the studentized range distribution
for (k in c(2, 3, 5, 10, 20, 50)) for (df in c(2, 2.5, 5, 10, 30, 120, 1000, 30000)) {
  for (q in c(0.5, 1, 2, 3.5, 5, 8)) out("ptukey", sprintf("%g:%g:%g", q, k, df), ptukey(q, k, df))
  for (p in c(0.9, 0.95, 0.99)) out("qtukey", sprintf("%g:%g:%g", p, k, df), qtukey(p, k, df))
}
# Holm's adjustment
hp <- c(0.01, 0.04, 0.03, 0.005, 0.2, 0.04, 0.5)
for (i in seq_along(hp)) { out("holm", sprintf("in%d", i), hp[i]); out("holm", sprintf("out%d", i), p.adjust(hp, "holm")[i]) }
close(ref)
