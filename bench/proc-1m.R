# The reference R workflow the compare command is timed against (issue 3): read the holdout with
# data.table's fread, two roc(), the paired DeLong roc.test(), and two ks.test() (goods vs bads),
# for one holdout file. Usage: Rscript bench/proc-1m.R FILE safer|riskier
suppressPackageStartupMessages({ library(data.table); library(pROC) })
args <- commandArgs(trailingOnly = TRUE)
start <- Sys.time()
d <- fread(args[1])
sign <- if (args[2] == "safer") 1 else -1
champion <- roc(d$bad, sign * d$champion, levels = c(1, 0), direction = "<", quiet = TRUE)
challenger <- roc(d$bad, sign * d$challenger, levels = c(1, 0), direction = "<", quiet = TRUE)
test <- roc.test(challenger, champion, method = "delong", paired = TRUE)
ks_champion <- suppressWarnings(ks.test(d$champion[d$bad == 1], d$champion[d$bad == 0]))
ks_challenger <- suppressWarnings(ks.test(d$challenger[d$bad == 1], d$challenger[d$bad == 0]))
cat(sprintf("AUC %.6f %.6f z %.4f KS %.6f %.6f in %.2f s\n", auc(champion), auc(challenger), test$statistic,
            ks_champion$statistic, ks_challenger$statistic, as.numeric(Sys.time() - start, units = "secs")))
