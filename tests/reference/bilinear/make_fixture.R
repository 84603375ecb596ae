# Reference fixture for bilinear sampling, made with R's terra (Debian r-cran-terra).
# Needs: scripts/install-deps --reference-tools. Run from this folder: Rscript make_fixture.R
# Writes grid.tif (a small non-linear 7 x 6 grid, EPSG:4326) and expected.csv (interior points
# with terra::extract(method = "bilinear") values).
library(terra)
r <- rast(nrows = 6, ncols = 7, xmin = 10, xmax = 17, ymin = -3, ymax = 3, crs = "EPSG:4326")
values(r) <- round((1:42)^1.5 + 10 * sin(1:42), 3)
writeRaster(r, "grid.tif", overwrite = TRUE, datatype = "FLT8S", gdal = c("COMPRESS=NONE"))
set.seed(42)
# interior: at least half a cell from the edge, where all four neighbouring centres exist
pts <- data.frame(lon = runif(60, 10.5, 16.5), lat = runif(60, -2.5, 2.5))
v <- extract(r, as.matrix(pts), method = "bilinear")
out <- data.frame(lon = sprintf("%.10f", pts$lon), lat = sprintf("%.10f", pts$lat),
                  expected = sprintf("%.12g", v[, 1]))
write.csv(out, "expected.csv", row.names = FALSE, quote = FALSE)
