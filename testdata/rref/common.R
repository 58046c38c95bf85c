# Shared by the reference scripts here (source()d from the repository root):
# the output line and the medcouple by its definition.

# out writes one line: set, statistic, value (17 significant digits).
out <- function(set, stat, v) cat(sprintf("%s\t%s\t%.17g\n", set, stat, v))

# Medcouple by its definition (Brys, Hubert and Struyf 2004), O(n^2), with
# the special kernel for pairs tied with the median.
mc_naive <- function(x) {
  m <- median(x)
  xm <- x[x <= m] - m; xp <- x[x >= m] - m
  k <- sum(x == m)
  h <- outer(xp, xm, function(u, w) (u + w) / (u - w))
  h <- h[!(outer(xp == 0, xm == 0, "&"))]
  h <- c(h, rep(-1, k * (k - 1) / 2), rep(0, k), rep(1, k * (k - 1) / 2))
  median(h)
}
