# DeLong reference values from R's pROC for the holdouts of cases.json (written by generate.py).
#
# For each model: AUC = P(good scores safer than bad) + 1/2 P(tie), with the scores turned to
# "higher = safer" (negated when the model's higher = riskier), bads as pROC's controls and goods
# as its cases, direction "<". Then var() and ci.auc() (DeLong), cov() (DeLong), and the paired
# roc.test(challenger, champion, method = "delong"): Z = (AUC challenger - AUC champion) / se, the
# two-sided p, the one-sided p (alternative = "greater"), and conf.int of the difference.
#
#   Rscript tests/reference/holdouts/proc.R > tests/reference/holdouts/proc.json
suppressPackageStartupMessages({ library(pROC); library(jsonlite) })

args <- commandArgs(trailingOnly = FALSE)
here <- dirname(normalizePath(sub("^--file=", "", args[grep("^--file=", args)])))
cases <- fromJSON(file.path(here, "cases.json"), simplifyVector = FALSE)

safety <- function(x, higher) if (higher == "safer") x else -x
model_roc <- function(bad, score, higher) {
  roc(response = bad, predictor = safety(score, higher), levels = c(1, 0), direction = "<", quiet = TRUE)
}
model_values <- function(r) {
  ci <- ci.auc(r, method = "delong", conf.level = 0.95)
  list(auc = as.numeric(auc(r)), var = var(r, method = "delong"), ciLower = ci[1], ciUpper = ci[3])
}
paired <- function(bad, d, higher) {
  champion <- model_roc(bad, d$champion, higher$champion)
  challenger <- model_roc(bad, d$challenger, higher$challenger)
  two <- roc.test(challenger, champion, method = "delong", paired = TRUE, conf.level = 0.95)
  one <- roc.test(challenger, champion, method = "delong", paired = TRUE, alternative = "greater")
  list(
    n = nrow(d), goods = sum(bad == 0), bads = sum(bad == 1),
    champion = model_values(champion), challenger = model_values(challenger),
    cov = cov(challenger, champion, method = "delong"),
    z = unname(two$statistic), pTwoSided = two$p.value, pOneSided = one$p.value,
    ciLower = two$conf.int[1], ciUpper = two$conf.int[2]
  )
}

out <- list(source = "tests/reference/holdouts/proc.R",
            versions = list(R = paste(R.version$major, R.version$minor, sep = "."),
                            pROC = as.character(packageVersion("pROC"))),
            cases = list())
for (case in cases) {
  d <- read.csv(file.path(here, case$file))
  bad <- d$bad
  if (isTRUE(case$single)) {
    r <- model_roc(bad, d$champion, case$higherIs$champion)
    a <- as.numeric(auc(r)); n_bad <- sum(bad == 1); n_good <- sum(bad == 0)
    # Hanley & McNeil 1982's own standard-error formula (their eq. 2 with Q1 = A/(2-A),
    # Q2 = 2A^2/(1+A)), for comparison with the published 0.032.
    q1 <- a / (2 - a); q2 <- 2 * a^2 / (1 + a)
    se_hm <- sqrt((a * (1 - a) + (n_bad - 1) * (q1 - a^2) + (n_good - 1) * (q2 - a^2)) / (n_bad * n_good))
    result <- list(n = nrow(d), goods = n_good, bads = n_bad, champion = model_values(r), hanleyMcNeilSe = se_hm)
  } else {
    result <- paired(bad, d, case$higherIs)
    if (!is.null(case$segment)) {
      result$segments <- lapply(sort(unique(d[[case$segment]])), function(level) {
        rows <- d[[case$segment]] == level
        c(list(value = level), paired(bad[rows], d[rows, ], case$higherIs))
      })
      # Holm-adjusted p across the segments, one- and two-sided: p.adjust(method = "holm")
      holm1 <- p.adjust(sapply(result$segments, function(s) s$pOneSided), method = "holm")
      holm2 <- p.adjust(sapply(result$segments, function(s) s$pTwoSided), method = "holm")
      for (i in seq_along(holm1)) {
        result$segments[[i]]$pOneSidedHolm <- holm1[i]
        result$segments[[i]]$pTwoSidedHolm <- holm2[i]
      }
    }
  }
  out$cases[[case$file]] <- result
}
# Holm's adjustment on a fixed vector with a tie and values that cap at 1: p.adjust(method = "holm").
holm_input <- c(0.01, 0.04, 0.03, 0.04, 0.2, 0.5)
out$holm <- list(input = holm_input, adjusted = p.adjust(holm_input, method = "holm"))
cat(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE), "\n")
