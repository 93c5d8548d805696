# Golden values for core/stats/exact_stratified and core/stats/exact_homogeneity, from R's stats
# package: mantelhaen.test(exact = TRUE) (exact conditional test, conditional MLE, exact interval),
# fisher.test per stratum, and Zelen's exact homogeneity test written out by its definition
# (brute-force enumeration with dhyper; Zelen 1971, Biometrika 58:129).
#
# Regenerate:  Rscript tests/reference/exact_stratified_golden.R > tests/core/stats/data/exact_stratified_golden.txt
#
# Layout: each stratum as focal events a, focal non-events b, reference events c, reference
# non-events d; R's x[, , k] = matrix(c(a, c, b, d), 2) (rows = group, columns = outcome).
# Output lines (numbers with 17 significant digits, Inf / NaN as such):
#   case NAME K a1 b1 c1 d1 ... aK bK cK dK
#   exact P_TWO_SIDED P_GREATER P_LESS ESTIMATE CI_LOW CI_HIGH
#   fisher k P ESTIMATE CI_LOW CI_HIGH          (k from 0; strata where a cannot vary are skipped)
#   zelen P TABLES                              (NaN when fewer than two strata vary; P NaN and
#                                                TABLES -1 when too many to enumerate here)
options(warn = 1)
g <- function(x) ifelse(is.finite(x), sprintf("%.17g", x), ifelse(is.na(x), "NaN", ifelse(x > 0, "Inf", "-Inf")))

zelen <- function(x) {
  K <- dim(x)[3]
  n1 <- apply(x, 3, function(t) sum(t[1, ])); m1 <- apply(x, 3, function(t) sum(t[, 1]))
  m0 <- apply(x, 3, function(t) sum(t[, 2]))
  lo <- pmax(0, n1 - m0); hi <- pmin(n1, m1)
  v <- which(hi > lo)
  if (length(v) < 2) return(c(NaN, 0))
  a <- x[1, 1, v]
  if (prod(hi[v] - lo[v] + 1) > 2e6) return(c(NA, -1))  # too many to enumerate here: skipped
  grid <- as.matrix(expand.grid(lapply(v, function(k) lo[k]:hi[k])))
  grid <- grid[rowSums(grid) == sum(a), , drop = FALSE]
  logp <- function(row) sum(dhyper(row, m1[v], m0[v], n1[v], log = TRUE))
  lp <- apply(grid, 1, logp)
  lobs <- logp(a)
  pr <- exp(lp - max(lp))
  c(sum(pr[lp - lobs <= log1p(1e-7)]) / sum(pr), nrow(grid))
}

emit <- function(name, x) {
  K <- dim(x)[3]
  cells <- unlist(lapply(1:K, function(k) c(x[1, 1, k], x[1, 2, k], x[2, 1, k], x[2, 2, k])))
  cat("case", name, K, cells, "\n")
  # mantelhaen.test needs two strata; one stratum is fisher.test (the same method).
  test <- if (K == 1) function(alt) fisher.test(x[, , 1], alternative = alt)
          else function(alt) mantelhaen.test(x, exact = TRUE, alternative = alt)
  two <- test("two.sided"); gr <- test("greater"); le <- test("less")
  cat("exact", g(two$p.value), g(gr$p.value), g(le$p.value), g(two$estimate), g(two$conf.int[1]), g(two$conf.int[2]), "\n")
  for (k in 1:K) {
    t <- x[, , k]
    if (min(sum(t[1, ]), sum(t[, 1])) == max(0, sum(t[1, ]) - sum(t[, 2]))) next  # a fixed by its margins
    f <- fisher.test(t)
    cat("fisher", k - 1, g(f$p.value), g(f$estimate), g(f$conf.int[1]), g(f$conf.int[2]), "\n")
  }
  z <- zelen(x)
  cat("zelen", g(z[1]), g(z[2]), "\n")
}

# R's help page for mantelhaen.test: Mantel's penicillin and rabbits (Agresti 1990, pp. 231-237).
Rabbits <- array(c(0, 0, 6, 5, 3, 0, 3, 6, 6, 2, 0, 4, 5, 6, 1, 0, 2, 5, 0, 0), dim = c(2, 2, 5))
emit("rabbits", Rabbits)
# R datasets::UCBAdmissions (Bickel, Hammel & O'Connell 1975, Science 187:398), rows = admitted /
# rejected, columns = male / female: group = sex, outcome = admitted, so transpose each department.
ucb <- aperm(UCBAdmissions, c(2, 1, 3))
emit("ucb_admissions", ucb)
# statsmodels' StratifiedTable test table (R / DescTools reference values in its test suite).
emit("statsmodels_five", array(c(20, 14, 10, 24, 15, 12, 3, 15, 3, 2, 3, 2, 12, 3, 7, 5, 1, 0, 3, 2), dim = c(2, 2, 5)))
# R's help page for fisher.test: Fisher's tea tasting (Agresti 1990, p. 61) and convictions of
# like-sex twins (Fisher 1962), each as one stratum.
emit("tea_tasting", array(c(3, 1, 1, 3), dim = c(2, 2, 1)))
emit("convictions", array(c(2, 10, 15, 3), dim = c(2, 2, 1)))

# Random small tables: 2 to 6 strata, 1 to 12 rows per group, event rates drawn per stratum.
set.seed(20261205)
for (i in 1:60) {
  K <- sample(2:6, 1)
  x <- array(0, dim = c(2, 2, K))
  for (k in 1:K) {
    n <- sample(1:12, 2, replace = TRUE); p <- runif(2)
    e <- rbinom(2, n, p)
    x[, , k] <- matrix(c(e[1], e[2], n[1] - e[1], n[2] - e[2]), 2)
  }
  n1 <- apply(x, 3, function(t) sum(t[1, ])); m1 <- apply(x, 3, function(t) sum(t[, 1]))
  m0 <- apply(x, 3, function(t) sum(t[, 2]))
  if (sum(pmin(n1, m1) > pmax(0, n1 - m0)) == 0) next  # S cannot vary: R stops
  emit(paste0("random_", i), x)
}
