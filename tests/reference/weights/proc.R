# pROC on the row-expanded weighted files written by generate.py (each row repeated w times):
# AUC of both models (P(good safer than bad) + 1/2 P(tie); bads as pROC's controls, goods as its
# cases, direction "<"). pROC has no sampling weights, so only the point estimates are compared
# (the DeLong variance of an expanded file treats the copies as independent accounts, which they
# are not); the weighted standard error is checked against the bootstrap in generate.py.
#
#   Rscript tests/reference/weights/proc.R > tests/reference/weights/weights-proc.json
suppressPackageStartupMessages({ library(pROC); library(jsonlite) })

args <- commandArgs(trailingOnly = FALSE)
here <- dirname(normalizePath(sub("^--file=", "", args[grep("^--file=", args)])))

values <- function(name) {
  d <- read.csv(file.path(here, name))
  e <- d[rep(seq_len(nrow(d)), d$w), ]
  model <- function(score) {
    r <- roc(response = e$bad, predictor = score, levels = c(1, 0), direction = "<", quiet = TRUE)
    as.numeric(auc(r))
  }
  list(file = name, expandedRows = nrow(e), champion = list(auc = model(e$champion)), challenger = list(auc = model(e$challenger)))
}

out <- list(source = "tests/reference/weights/proc.R",
            versions = list(R = paste(R.version$major, R.version$minor, sep = "."), pROC = as.character(packageVersion("pROC"))),
            weighted = values("weighted-3000.csv"),
            goodsWeighted = values("goods-weighted-3000.csv"))
cat(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE), "\n")
