# Reference fixture for the range check's distances, made with R's sf and s2 (Debian r-cran-sf,
# r-cran-s2) on Natural Earth country outlines (Debian r-cran-rnaturalearthdata, 1:110 m) used as
# stand-in ranges. Needs: scripts/install-deps --reference-tools. Run from this folder:
#   Rscript make_fixture.R
# Writes ranges.gpkg (the outlines as given, field scientificName) and expected.csv (points with
# s2's distance to each outline, as an angle in radians: metres / s2_earth_radius_meters()).
# envsift takes an edge as the straight line between its vertices in longitude/latitude, cut
# into great-circle arcs within 1 m of it; s2 takes every edge as a great-circle arc.
# So that both measure the same outline, s2 is given the outlines densified every 0.05 degrees
# (each piece then within about 1 m of the drawn line too). Natural
# Earth splits outlines at the antimeridian into parts that share the ±180 meridian, which s2
# rejects as a multipolygon; so s2 measures each part on its own and the distance to the
# outline is the smallest (0 inside any part): the distance to a union is the least to its parts.
library(sf)
library(s2)
sf_use_s2(TRUE)
x <- st_as_sf(rnaturalearthdata::countries110)
# multi-part (Indonesia, Canada), across the antimeridian (Fiji, Russia), near a pole (Greenland,
# Canada, points up to 89.9°), with a hole (South Africa, around Lesotho), long and thin (Chile)
pick <- c("Fiji", "Russia", "Greenland", "Indonesia", "South Africa", "Chile", "Canada")
r <- x[x$admin %in% pick, "admin"]
names(r)[names(r) == "admin"] <- "scientificName"
r <- st_cast(r, "MULTIPOLYGON")
if (file.exists("ranges.gpkg")) invisible(file.remove("ranges.gpkg"))
st_write(r, "ranges.gpkg", quiet = TRUE)

densify_ring <- function(m) {
  out <- m[1, , drop = FALSE]
  for (k in seq_len(nrow(m) - 1)) {
    p <- m[k, ]; q <- m[k + 1, ]
    if (p[1] == q[1] && p[2] == q[2]) next
    if (abs(p[2]) >= 90 && p[2] == q[2]) { out <- rbind(out, q); next }
    pieces <- max(1, ceiling(max(abs(q[1] - p[1]), abs(q[2] - p[2])) / 0.05))
    t <- (1:pieces) / pieces
    out <- rbind(out, cbind(p[1] + t * (q[1] - p[1]), p[2] + t * (q[2] - p[2])))
  }
  out
}
# per range: its parts, each a densified polygon
dense <- lapply(st_geometry(r), function(g)
  st_sfc(lapply(unclass(g), function(poly) st_polygon(lapply(poly, densify_ring))), crs = 4326))

set.seed(7)
rows <- list()
for (i in seq_len(nrow(r))) {
  name <- r$scientificName[i]
  bb <- st_bbox(r[i, ])
  lon <- runif(40, max(-180, bb["xmin"] - 8), min(180, bb["xmax"] + 8))
  lat <- runif(40, max(-90, bb["ymin"] - 8), min(90, bb["ymax"] + 8))
  rows[[i]] <- data.frame(taxon = name, lon = lon, lat = lat)
}
special <- data.frame(
  taxon = c("Fiji", "Fiji", "Fiji", "Russia", "Russia", "Greenland", "Greenland", "Greenland", "Chile",
            "South Africa", "South Africa", "Chile", "Canada"),
  lon = c(179.99, -179.99, -178.5, -179.5, 179.5, 0, 120, -40, -70, 28.2, 28.6, -75, -100),
  lat = c(-16.5, -16.5, -17.5, 68, 66, 89.9, 88, 72, -89.5, -29.6, -29.5, -40, 89.9))
pts <- rbind(do.call(rbind, rows), special)
d <- numeric(nrow(pts))
for (k in seq_len(nrow(pts))) {
  p <- st_sfc(st_point(c(pts$lon[k], pts$lat[k])), crs = 4326)
  d[k] <- min(as.numeric(st_distance(p, dense[[which(r$scientificName == pts$taxon[k])]])))
}
out <- data.frame(taxon = pts$taxon, lon = sprintf("%.6f", pts$lon), lat = sprintf("%.6f", pts$lat),
                  expected_rad = sprintf("%.12g", d / s2_earth_radius_meters()))
write.csv(out, "expected.csv", row.names = FALSE, quote = FALSE)
