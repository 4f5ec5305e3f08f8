# Reference values for server/stats/wilson.ts, two-proportion.ts and fisher-exact.ts.
# Run from the repository root:  Rscript tests/reference/policy/proportions.R
# Writes tests/reference/policy/proportions.json (R 4.2.2, stats package; jsonlite for output).
suppressPackageStartupMessages(library(jsonlite))

wilson_cases <- list(
  c(0, 10, 0.95), c(10, 10, 0.95), c(1, 10, 0.95), c(3, 7, 0.90), c(50, 1000, 0.95),
  c(25, 812, 0.95), c(52, 812, 0.99), c(1, 1, 0.95), c(0, 1, 0.95), c(12345, 1000000, 0.95),
  c(500000, 1000000, 0.999), c(2, 3, 0.80), c(0, 250000, 0.95)
)
wilson <- lapply(wilson_cases, function(v) {
  ci <- suppressWarnings(prop.test(v[1], v[2], correct = FALSE, conf.level = v[3])$conf.int)
  list(x = v[1], n = v[2], confidence = v[3], lower = ci[1], upper = ci[2])
})

two_cases <- list(
  c(25, 812, 52, 812), c(10, 100, 20, 150), c(0, 50, 5, 60), c(100, 1000, 100, 1000),
  c(3, 7, 4, 9), c(5000, 100000, 5400, 100000), c(60, 200, 30, 220), c(700, 1000, 20, 1000)
)
two <- lapply(two_cases, function(v) {
  r <- suppressWarnings(prop.test(c(v[1], v[3]), c(v[2], v[4]), correct = FALSE))
  list(x1 = v[1], n1 = v[2], x2 = v[3], n2 = v[4], statistic = unname(r$statistic), p = r$p.value)
})

# Tables as rows (a b / c d); R's matrix() fills by column, hence c(a, c, b, d).
fisher_cases <- list(
  c(3, 1, 1, 3), c(0, 5, 5, 0), c(1, 9, 11, 3), c(2, 7, 8, 2), c(10, 0, 0, 10), c(5, 5, 5, 5),
  c(0, 0, 3, 4), c(1, 0, 0, 0), c(120, 880, 160, 840), c(1500, 98500, 1700, 98300),
  c(0, 100000, 5, 99995), c(25, 787, 52, 760), c(300, 10, 10, 300), c(400, 0, 0, 400),
  c(4, 2, 1, 6), c(7, 1, 2, 30), c(2, 40, 9, 30), c(0, 30, 0, 40)
)
fisher <- lapply(fisher_cases, function(v) {
  r <- fisher.test(matrix(c(v[1], v[3], v[2], v[4]), nrow = 2))
  list(a = v[1], b = v[2], c = v[3], d = v[4], p = r$p.value)
})

out <- list(
  source = paste("R", paste(R.version$major, R.version$minor, sep = "."),
                 "stats::prop.test(correct = FALSE) and stats::fisher.test"),
  wilson = wilson, twoProportion = two, fisher = fisher
)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE), "tests/reference/policy/proportions.json")
