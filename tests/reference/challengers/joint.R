# Joint DeLong test of one champion against several challengers on the same accounts, from R's
# pROC (DeLong, DeLong & Clarke-Pearson 1988, Biometrics 44:837–845, the contrast-matrix test):
# every AUC's var() and every pair's cov() (method "delong") make the covariance matrix S of the
# K + 1 AUCs; the contrast L has a row per challenger (challenger − champion);
#   chi2 = (L theta)' (L S L')^- (L theta),  df = rank(L S L'),  p = P(chi2_df > chi2)
# with MASS::ginv for the generalised inverse (equal to solve() when L S L' is of full rank).
# Each challenger against the champion: roc.test(challenger, champion, method = "delong",
# paired = TRUE) Z, two-sided p, one-sided p (alternative = "greater"), conf.int, and Holm across
# the K by p.adjust; each pair of challengers: roc.test(b, a) for b after a.
# Scores are turned to "higher = safer", bads as pROC's controls and goods as its cases.
#
#   Rscript tests/reference/challengers/joint.R > tests/reference/challengers/joint.json
suppressPackageStartupMessages({ library(pROC); library(MASS); library(jsonlite) })

args <- commandArgs(trailingOnly = FALSE)
here <- dirname(normalizePath(sub("^--file=", "", args[grep("^--file=", args)])))
cases <- fromJSON(file.path(here, "cases.json"), simplifyVector = FALSE)

safety <- function(x, higher) if (higher == "safer") x else -x
model_roc <- function(bad, score, higher) {
  roc(response = bad, predictor = safety(score, higher), levels = c(1, 0), direction = "<", quiet = TRUE)
}
test <- function(b, a) {
  two <- roc.test(b, a, method = "delong", paired = TRUE, conf.level = 0.95)
  one <- roc.test(b, a, method = "delong", paired = TRUE, alternative = "greater")
  list(z = unname(two$statistic), pTwoSided = two$p.value, pOneSided = one$p.value,
       ciLower = two$conf.int[1], ciUpper = two$conf.int[2])
}

out <- list(source = "tests/reference/challengers/joint.R",
            versions = list(R = paste(R.version$major, R.version$minor, sep = "."),
                            pROC = as.character(packageVersion("pROC"))),
            cases = list())
for (case in cases) {
  d <- read.csv(file.path(here, case$file))
  columns <- if (is.null(case$columns)) names(d)[-1] else unlist(case$columns)
  higher <- unlist(case$higherIs)
  rocs <- lapply(seq_along(columns), function(i) model_roc(d$bad, d[[columns[i]]], higher[i]))
  m <- length(rocs)
  theta <- sapply(rocs, function(r) as.numeric(auc(r)))
  S <- matrix(0, m, m)
  for (i in 1:m) for (j in 1:m) {
    S[i, j] <- if (i == j) var(rocs[[i]], method = "delong") else cov(rocs[[i]], rocs[[j]], method = "delong")
  }
  L <- cbind(-1, diag(m - 1))
  contrast <- L %*% theta
  V <- L %*% S %*% t(L)
  chi2 <- as.numeric(t(contrast) %*% ginv(V) %*% contrast)
  df <- qr(V, tol = 1e-10)$rank
  vsChampion <- lapply(2:m, function(k) test(rocs[[k]], rocs[[1]]))
  holm1 <- p.adjust(sapply(vsChampion, function(t) t$pOneSided), method = "holm")
  holm2 <- p.adjust(sapply(vsChampion, function(t) t$pTwoSided), method = "holm")
  for (k in seq_along(vsChampion)) {
    vsChampion[[k]]$pOneSidedHolm <- holm1[k]
    vsChampion[[k]]$pTwoSidedHolm <- holm2[k]
  }
  pairwise <- list()
  if (m >= 3) for (a in 2:(m - 1)) for (b in (a + 1):m) {
    pairwise[[length(pairwise) + 1]] <- c(list(a = a - 1, b = b - 1), test(rocs[[b]], rocs[[a]]))
  }
  key <- paste(case$file, paste(columns, collapse = "+"))
  out$cases[[key]] <- list(
    file = case$file, columns = columns, n = nrow(d), goods = sum(d$bad == 0), bads = sum(d$bad == 1),
    auc = theta, covariance = S, joint = list(chi2 = chi2, df = df, p = pchisq(chi2, df, lower.tail = FALSE)),
    vsChampion = vsChampion, pairwise = pairwise
  )
}
cat(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE, matrix = "rowmajor"), "\n")
