# Reference fixtures for the Mahalanobis tests, made with R (Debian r-base-core) and robustbase
# (Debian r-cran-robustbase) on data sets that ship with them.
# Needs: scripts/install-deps --reference-tools. Run from this folder: Rscript make_fixtures.R
#
# For each data set it writes NAME.csv: the data columns, then
#   classical_d2  stats::mahalanobis(x, colMeans(x), cov(x))
#   robust_d2     stats::mahalanobis(x, mcd$center, mcd$cov)
#   raw_d2        stats::mahalanobis(x, mcd$raw.center, mcd$raw.cov)
# and NAME-mcd.csv: rows "center", "raw_center", then the reweighted and raw covariance rows.
# and NAME-detmcd.csv (same layout) and NAME-detmcd-d2.csv (robust_d2, raw_d2, flagged) from the
# deterministic MCD, covMcd(nsamp = "deterministic") (Hubert, Rousseeuw & Verdonck 2012);
# in_best marks the rows of its best h-subset.
# covMcd is called with use.correction = FALSE (no small-sample correction factors, which
# envsift does not apply); its consistency factors are kept. nsamp = 10000 random starts instead
# of the default 500: at 500, covMcd stops on hbk at a subset with log det(raw cov) 1.5430,
# while the optimum, which envsift's FAST-MCD finds, has 1.5382 (R reaches it from 2000 starts).
suppressMessages(library(robustbase))
sets <- list(
  stackloss = stackloss,                                   # datasets, n = 21, p = 4
  hbk = hbk[, 1:3],                                        # robustbase, n = 75, p = 3
  starsCYG = starsCYG,                                     # robustbase, n = 47, p = 2
  swiss = swiss,                                           # datasets, n = 47, p = 6
  quakes = quakes                                          # datasets, n = 1000, p = 5
)
fmt <- function(v) sprintf("%.15g", v)
for (name in names(sets)) {
  x <- as.matrix(sets[[name]])
  set.seed(1)
  mcd <- covMcd(x, use.correction = FALSE, nsamp = 10000)
  out <- data.frame(apply(x, 2, fmt),
                    classical_d2 = fmt(mahalanobis(x, colMeans(x), cov(x))),
                    robust_d2 = fmt(mahalanobis(x, mcd$center, mcd$cov)),
                    raw_d2 = fmt(mahalanobis(x, mcd$raw.center, mcd$raw.cov)))
  write.csv(out, paste0(name, ".csv"), row.names = FALSE, quote = FALSE)
  est <- rbind(center = mcd$center, raw_center = mcd$raw.center, mcd$cov, mcd$raw.cov)
  rownames(est) <- c("center", "raw_center", paste0("cov", 1:ncol(x)), paste0("raw_cov", 1:ncol(x)))
  est_text <- apply(est, 2, fmt)
  rownames(est_text) <- rownames(est)
  write.csv(est_text, paste0(name, "-mcd.csv"), quote = FALSE)
  det <- covMcd(x, use.correction = FALSE, nsamp = "deterministic")
  det_est <- rbind(center = det$center, raw_center = det$raw.center, det$cov, det$raw.cov)
  rownames(det_est) <- rownames(est)
  det_text <- apply(det_est, 2, fmt)
  rownames(det_text) <- rownames(est)
  write.csv(det_text, paste0(name, "-detmcd.csv"), quote = FALSE)
  det_d2 <- mahalanobis(x, det$center, det$cov)
  write.csv(data.frame(robust_d2 = fmt(det_d2), raw_d2 = fmt(mahalanobis(x, det$raw.center, det$raw.cov)),
                       flagged = as.integer(det_d2 > qchisq(0.975, ncol(x))),
                       in_best = as.integer(seq_len(nrow(x)) %in% det$best)),
            paste0(name, "-detmcd-d2.csv"), row.names = FALSE, quote = FALSE)
  cat(name, ": deterministic MCD log det(raw cov) =", fmt(determinant(det$raw.cov)$modulus),
      " (FAST-MCD", fmt(determinant(mcd$raw.cov)$modulus), "), best subset",
      paste(sort(det$best), collapse = " "), "\n")
  cat(name, ": n =", nrow(x), " p =", ncol(x), " h =", mcd$quan,
      " flagged (robust_d2 > qchisq(0.975, p)):", which(mahalanobis(x, mcd$center, mcd$cov) > qchisq(0.975, ncol(x))), "\n")
}
