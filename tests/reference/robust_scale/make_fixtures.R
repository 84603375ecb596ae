# Reference values for the robust scales (src/detect/robust_scale.cpp), made with R (Debian
# r-base-core) and robustbase (Debian r-cran-robustbase 0.95). Run from this folder:
#   Rscript make_fixtures.R
# Writes scales.csv: for each column of R data sets, and for their first n values (n = 2..14, to
# cover Qn's small-sample factors), robustbase::Qn and robustbase::scaleTau2 with their defaults,
# then the values themselves (";"-separated).
suppressMessages(library(robustbase))
cols <- list(stackloss_air = stackloss$Air.Flow, stackloss_acid = stackloss$Acid.Conc.,
             hbk_x1 = hbk$X1, starsCYG_temp = starsCYG$log.Te, swiss_fertility = swiss$Fertility,
             quakes_depth = quakes$depth, quakes_mag = quakes$mag, quakes_lat = quakes$lat)
fmt <- function(v) sprintf("%.17g", v)
rows <- list()
for (name in names(cols)) {
  x <- cols[[name]]
  for (n in c(2:14, length(x))) {
    if (n > length(x)) next
    v <- x[1:n]
    rows[[length(rows) + 1]] <- data.frame(column = name, n = n, qn = fmt(Qn(v)), tau = fmt(scaleTau2(v)),
                                                   values = paste(fmt(v), collapse = ";"))
  }
}
write.csv(do.call(rbind, rows), "scales.csv", row.names = FALSE, quote = FALSE)
