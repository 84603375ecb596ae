# Reference values for envsift's medcouple and adjusted-boxplot fences, from robustbase
# (Debian r-cran-robustbase) on data sets that ship with R. Run from this folder:
#   Rscript make_fixtures.R
# Writes values_<name>.csv (one number per line) and skewness.csv (one row per data set).
library(robustbase)
options(mc_doScale_quiet = TRUE)
sets <- list(
  precip = as.numeric(precip),                      # n = 70: mc averages mc(x) and -mc(-x)
  islands = as.numeric(islands),                    # n = 48, strongly right-skewed
  rivers = as.numeric(rivers),                      # n = 141: the fast algorithm alone
  eruptions = faithful$eruptions,                   # n = 272, bimodal
  ozone = airquality$Ozone[!is.na(airquality$Ozone)],  # n = 116, with ties
  stackloss = as.numeric(stackloss$stack.loss),     # n = 21, many ties
  negative = -as.numeric(rivers)                    # left-skewed
)
rows <- NULL
for (name in names(sets)) {
  x <- sets[[name]]
  write.table(format(x, digits = 17), sprintf("values_%s.csv", name), row.names = FALSE,
              col.names = FALSE, quote = FALSE)
  a <- adjboxStats(x)
  rows <- rbind(rows, data.frame(dataset = name, n = length(x), mc = format(mc(x), digits = 17),
                                 lower_hinge = a$stats[2], upper_hinge = a$stats[4],
                                 fence_low = format(a$fence[1], digits = 17),
                                 fence_high = format(a$fence[2], digits = 17)))
}
write.csv(rows, "skewness.csv", row.names = FALSE, quote = FALSE)
