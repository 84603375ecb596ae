#!/usr/bin/python3
"""Writes envsift's demo data: an invented island, Quillmarrow, and three invented taxa.

Everything here is made up. The terrain is a sum of smooth analytic shapes (no real place):
a long north-south ridge (the Quill ridge) in the east, a lower massif in the south-west, rolling
lowland elsewhere, a dry valley in the rain shadow east of the ridge and a lake (nodata).

Layers (each on its own grid, to exercise per-layer handling):
  dem.tif          elevation, m        Int16,   EPSG:4326, 0.005 deg, nodata -32768
  temperature.tif  mean annual, deg C  Int16 x 0.1 (scale/offset), EPSG:4326, 0.01 deg, nodata -9999
  rainfall.tif     annual, mm          Float32, EPSG:32631 (UTM 31N, projected), 1000 m, nodata -1
  dry_months.tif   months < 50 mm      Byte,    EPSG:4326, 0.0125 deg, larger extent, nodata 255
Temperature falls 6.5 deg C per km of elevation (ICAO Standard Atmosphere lapse rate); rainfall
rises on the windward (west) slope and drops in the lee.

Taxa: Oxmontia nivicola (montane), Cumbrexa humilis (moist lowland), Evrandia vulgaris (generalist),
Pexaltra rara (a handful of records: too few to judge). Planted errors are listed in
demo-points/truth.csv. Their published ranges (demo-points/ranges.geojson, for --ranges) are drawn
as an atlas would: the 0.1-degree grid cells where each taxon is expected, merged into polygons.
Deterministic: same script, same bytes.

usage: scripts/make-demo-data.py [OUTPUT_ROOT]   (default: the project root)
needs: scripts/install-deps --reference-tools (Debian python3-gdal, python3-numpy)
"""
import csv
import math
import os
import sys

import numpy as np
from osgeo import gdal, ogr, osr

gdal.UseExceptions()
ROOT = sys.argv[1] if len(sys.argv) > 1 else os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
RASTERS = os.path.join(ROOT, "demo-rasters")
POINTS = os.path.join(ROOT, "demo-points")
LAKE = (-0.2, -0.2, 0.04)  # lon, lat, radius in degrees


def elevation(lon, lat):
    ridge = 2300 * np.exp(-((lon - 0.5) / 0.12) ** 2) * np.exp(-((lat - 0.45) / 0.4) ** 2)
    massif = 1700 * np.exp(-((lon + 0.5) ** 2 + (lat + 0.55) ** 2) / 0.15 ** 2)
    rolling = 60 * np.sin(7 * lon + 1.3) * np.cos(5 * lat - 0.4) + 25 * np.sin(23 * lon * lat)
    return 150 + ridge + massif + rolling


def rainfall(lon, lat):
    z = elevation(lon, lat)
    windward = 600 * np.exp(-((lon - 0.38) / 0.12) ** 2) * np.exp(-((lat - 0.45) / 0.35) ** 2)
    shadow = 650 * np.exp(-((lon - 0.78) / 0.13) ** 2) * np.exp(-((lat - 0.4) / 0.35) ** 2)
    return np.maximum(200.0, 900 + 0.5 * z + windward - shadow + 80 * np.sin(3 * lat))


def temperature(lon, lat):
    return 27.0 - 0.0065 * elevation(lon, lat) - 0.5 * lat


def in_lake(lon, lat):
    return (lon - LAKE[0]) ** 2 + (lat - LAKE[1]) ** 2 < LAKE[2] ** 2


def write_geographic(name, dtype, west, north, res, cols, rows, values, nodata, unit, scale=None):
    path = os.path.join(RASTERS, name)
    ds = gdal.GetDriverByName("GTiff").Create(
        path, cols, rows, 1, dtype,
        ["TILED=YES", "BLOCKXSIZE=64", "BLOCKYSIZE=64", "COMPRESS=DEFLATE", "PREDICTOR=2"])
    ds.SetGeoTransform((west, res, 0, north, 0, -res))
    srs = osr.SpatialReference()
    srs.ImportFromEPSG(4326)
    ds.SetProjection(srs.ExportToWkt())
    band = ds.GetRasterBand(1)
    band.SetNoDataValue(nodata)
    band.SetUnitType(unit)
    if scale is not None:
        band.SetScale(scale)
        band.SetOffset(0.0)
    band.WriteArray(values)
    ds = None


def centres(west, north, res, cols, rows):
    lon = west + (np.arange(cols) + 0.5) * res
    lat = north - (np.arange(rows) + 0.5) * res
    return np.meshgrid(lon, lat)


def make_rasters():
    os.makedirs(RASTERS, exist_ok=True)
    lon, lat = centres(-1.0, 1.0, 0.005, 400, 400)
    dem = np.round(elevation(lon, lat)).astype(np.int16)
    dem[in_lake(lon, lat)] = -32768
    write_geographic("dem.tif", gdal.GDT_Int16, -1.0, 1.0, 0.005, 400, 400, dem, -32768, "m")

    lon, lat = centres(-1.0, 1.0, 0.01, 200, 200)
    t = np.round(temperature(lon, lat) * 10).astype(np.int16)
    t[in_lake(lon, lat)] = -9999
    write_geographic("temperature.tif", gdal.GDT_Int16, -1.0, 1.0, 0.01, 200, 200, t, -9999, "°C", scale=0.1)

    lon, lat = centres(-1.1, 1.1, 0.0125, 176, 176)
    dry = np.clip(np.round(12 - rainfall(lon, lat) / 150), 0, 12).astype(np.uint8)
    dry[in_lake(lon, lat)] = 255
    write_geographic("dry_months.tif", gdal.GDT_Byte, -1.1, 1.1, 0.0125, 176, 176, dry, 255, "months")

    # Rainfall on a projected grid: UTM zone 31N, 1 km cells, covering the island.
    utm = osr.SpatialReference()
    utm.ImportFromEPSG(32631)
    wgs = osr.SpatialReference()
    wgs.ImportFromEPSG(4326)
    wgs.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
    utm.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
    west, north, res, cols, rows = 50000.0, 112000.0, 1000.0, 232, 224
    x = west + (np.arange(cols) + 0.5) * res
    y = north - (np.arange(rows) + 0.5) * res
    xx, yy = np.meshgrid(x, y)
    to_geo = osr.CoordinateTransformation(utm, wgs)
    pts = np.array(to_geo.TransformPoints(np.column_stack([xx.ravel(), yy.ravel()])))
    glon, glat = pts[:, 0].reshape(xx.shape), pts[:, 1].reshape(xx.shape)
    rain = rainfall(glon, glat).astype(np.float32)
    rain[in_lake(glon, glat)] = -1
    path = os.path.join(RASTERS, "rainfall.tif")
    ds = gdal.GetDriverByName("GTiff").Create(
        path, cols, rows, 1, gdal.GDT_Float32,
        ["TILED=YES", "BLOCKXSIZE=64", "BLOCKYSIZE=64", "COMPRESS=DEFLATE", "PREDICTOR=3"])
    ds.SetGeoTransform((west, res, 0, north, 0, -res))
    ds.SetProjection(utm.ExportToWkt())
    ds.GetRasterBand(1).SetNoDataValue(-1)
    ds.GetRasterBand(1).SetUnitType("mm")
    ds.GetRasterBand(1).WriteArray(rain)
    ds = None


def draw(rng, count, suitability):
    """Rejection sampling over the island in proportion to suitability (0..1)."""
    out = []
    while len(out) < count:
        lon, lat = rng.uniform(-0.97, 0.97, 2)
        if in_lake(lon, lat):
            continue
        if rng.uniform() < suitability(lon, lat):
            out.append((round(lon, 5), round(lat, 5)))
    return out


def draw_across_elevations(rng, count):
    """A generalist: elevations spread evenly from lowland to summit (lowland is most of the
    island's area, so drawing by area alone would make every upland record look odd)."""
    out = []
    for _ in range(count):
        target = rng.uniform(120, 2300)
        out.extend(draw(rng, 1, lambda lo, la: float(abs(elevation(lo, la) - target) < 60)))
    return out


def make_points():
    os.makedirs(POINTS, exist_ok=True)
    rng = np.random.RandomState(20261201)
    taxa = [
        ("Oxmontia nivicola", 320, lambda lo, la: math.exp(-((elevation(lo, la) - 1900) / 280) ** 2)),
        ("Cumbrexa humilis", 260,
         lambda lo, la: math.exp(-((elevation(lo, la) - 180) / 120) ** 2 - ((rainfall(lo, la) - 1000) / 200) ** 2)),
        ("Evrandia vulgaris", 300, None),  # found at every elevation: see draw_across_elevations
        ("Pexaltra rara", 5, lambda lo, la: math.exp(-((elevation(lo, la) - 1500) / 200) ** 2)),
    ]
    rows = []
    for taxon, count, suit in taxa:
        for lon, lat in draw(rng, count, suit) if suit else draw_across_elevations(rng, count):
            rows.append({"scientificName": taxon, "decimalLongitude": lon, "decimalLatitude": lat})
    # A few records share a cell with an earlier one, as re-visits of one site do.
    for k in rng.choice(len(rows), 25, replace=False):
        rows.insert(int(k) + 1, dict(rows[int(k)]))

    truth = []

    def plant(kind, index, lon, lat, note, detectable="yes"):
        r = rows[index]
        truth.append({"kind": kind, "original_lon": r["decimalLongitude"], "original_lat": r["decimalLatitude"],
                      "note": note, "environmental_outlier": detectable, "row": index})
        r["decimalLongitude"], r["decimalLatitude"] = lon, lat

    montane = [i for i, r in enumerate(rows) if r["scientificName"] == "Oxmontia nivicola"]
    lowland = [i for i, r in enumerate(rows) if r["scientificName"] == "Cumbrexa humilis"]
    # On the ridge with lat clearly different from lon, so that a swap lands in the lowland.
    ridge = [i for i in montane if abs(rows[i]["decimalLatitude"] - rows[i]["decimalLongitude"]) > 0.25
             and 0.4 < rows[i]["decimalLongitude"] < 0.6 and elevation(rows[i]["decimalLongitude"],
                                                                       rows[i]["decimalLatitude"]) > 1500]
    a, b, c, d = ridge[:4]
    plant("wrong_location", a, 0.81, 0.33, "montane record placed in the dry valley east of the ridge")
    r = rows[b]
    plant("sign_flip", b, -r["decimalLongitude"], r["decimalLatitude"], "longitude sign flipped")
    r = rows[c]
    plant("lat_lon_swap", c, r["decimalLatitude"], r["decimalLongitude"], "latitude and longitude swapped")
    r = rows[d]
    plant("decimal_shift", d, round(r["decimalLongitude"] / 10, 6), r["decimalLatitude"],
          "longitude decimal point shifted one place")
    plant("wrong_location", lowland[3], 0.5, 0.45, "lowland record placed on the ridge crest")

    # Records that cannot be sampled, kept to show their reason codes.
    problems = [
        ("position_empty", "", "0.1", "longitude left empty"),
        ("position_not_number", "east of the lake", "-0.1", "longitude written as words"),
        ("position_off_globe", "0.3", "95.2", "latitude beyond 90"),
        ("outside_layer", "5.5", "0.2", "point off the island's rasters"),
        ("nodata", str(LAKE[0]), str(LAKE[1]), "point in the lake"),
    ]
    for kind, lon, lat, note in problems:
        rows.append({"scientificName": "Evrandia vulgaris", "decimalLongitude": lon, "decimalLatitude": lat})
        truth.append({"kind": kind, "original_lon": lon, "original_lat": lat, "note": note,
                      "environmental_outlier": "no", "row": len(rows) - 1})

    uncertainties = [30, 100, 250, 1000, 5000]
    for i, r in enumerate(rows):
        r["occurrenceID"] = "QM-%04d" % (i + 1)
        r["coordinateUncertaintyInMeters"] = uncertainties[rng.randint(len(uncertainties))]
        try:
            z = elevation(float(r["decimalLongitude"]), float(r["decimalLatitude"]))
            r["minimumElevationInMeters"] = int(round(z + rng.normal(0, 40)))
        except ValueError:
            r["minimumElevationInMeters"] = ""
        r["locality"] = "Quillmarrow, survey plot %d" % (1 + rng.randint(400))
    for t in truth:
        t["occurrenceID"] = rows[t.pop("row")]["occurrenceID"]
    # The record moved to the dry valley keeps the elevation its label states (a montane one).
    for t in truth:
        if t["kind"] == "wrong_location" and "dry valley" in t["note"]:
            r = next(r for r in rows if r["occurrenceID"] == t["occurrenceID"])
            r["minimumElevationInMeters"] = int(round(elevation(t["original_lon"], t["original_lat"])))

    fields = ["occurrenceID", "scientificName", "decimalLongitude", "decimalLatitude",
              "coordinateUncertaintyInMeters", "minimumElevationInMeters", "locality"]
    with open(os.path.join(POINTS, "occurrences.csv"), "w", newline="") as f:
        w = csv.DictWriter(f, fieldnames=fields, lineterminator="\n")
        w.writeheader()
        w.writerows(rows)
    with open(os.path.join(POINTS, "truth.csv"), "w", newline="") as f:
        w = csv.DictWriter(f, fieldnames=["occurrenceID", "kind", "environmental_outlier", "original_lon",
                                          "original_lat", "note"], lineterminator="\n")
        w.writeheader()
        w.writerows(truth)


def make_ranges():
    """Atlas-style ranges: 0.1-degree cells over the island, kept where the taxon is expected
    (judged at the cell's centre, as an atlas compiler would), merged into (multi)polygons."""
    expected = [
        ("Cumbrexa humilis", lambda z, r: z < 450 and 650 < r < 1350),
        ("Evrandia vulgaris", lambda z, r: True),
        ("Oxmontia nivicola", lambda z, r: z > 1300),  # the ridge and the massif: two parts
        ("Pexaltra rara", lambda z, r: 1150 < z < 1850),
    ]
    os.makedirs(POINTS, exist_ok=True)
    path = os.path.join(POINTS, "ranges.geojson")
    if os.path.exists(path):
        os.remove(path)
    wgs = osr.SpatialReference()
    wgs.ImportFromEPSG(4326)
    ds = ogr.GetDriverByName("GeoJSON").CreateDataSource(path)
    layer = ds.CreateLayer("ranges", wgs, ogr.wkbMultiPolygon, ["COORDINATE_PRECISION=4", "RFC7946=NO"])
    layer.CreateField(ogr.FieldDefn("scientificName", ogr.OFTString))
    layer.CreateField(ogr.FieldDefn("source", ogr.OFTString))
    step = 0.1
    for taxon, keep in expected:
        cells = ogr.Geometry(ogr.wkbMultiPolygon)
        for i in range(20):
            for j in range(20):
                west, south = -1.0 + i * step, -1.0 + j * step
                lon, lat = west + step / 2, south + step / 2
                if not keep(float(elevation(lon, lat)), float(rainfall(lon, lat))):
                    continue
                ring = ogr.Geometry(ogr.wkbLinearRing)
                for x, y in ((west, south), (west + step, south), (west + step, south + step), (west, south + step),
                             (west, south)):
                    ring.AddPoint_2D(round(x, 4), round(y, 4))
                cell = ogr.Geometry(ogr.wkbPolygon)
                cell.AddGeometry(ring)
                cells.AddGeometry(cell)
        feature = ogr.Feature(layer.GetLayerDefn())
        feature.SetField("scientificName", taxon)
        feature.SetField("source", "invented atlas, 0.1-degree cells")
        feature.SetGeometry(ogr.ForceToMultiPolygon(cells.UnionCascaded()))
        layer.CreateFeature(feature)
    ds = None


if __name__ == "__main__":
    make_rasters()
    make_points()
    make_ranges()
    print("demo data written to %s and %s" % (RASTERS, POINTS))
