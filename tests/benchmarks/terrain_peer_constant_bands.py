#!/usr/bin/python3
"""Peer for tests/benchmarks/terrain_bench.cpp: a lower bound of a many-level map run that needs
no tidewright at all. GDAL writes N float32 bands that are all nodata (NaN, as a depth band is
where nothing floods) and N byte bands that are all 0, each as large as the DEM, with the map
writer's creation options for each cell type (given by the benchmark from
terrain::geotiff_creation_options, comma-separated NAME=VALUE). Content that compresses to almost
nothing still passes through the predictor and the compressor, so a run writing N depth and N
extent bands costs at least this. Prints the wall-clock seconds of the float32 file, then of the
byte file.

usage: terrain_peer_constant_bands.py COLUMNS ROWS BANDS FOLDER FLOAT32_OPTIONS BYTE_OPTIONS
"""
import os
import sys
import time

import numpy as np
from osgeo import gdal

gdal.UseExceptions()
cols, rows, bands = int(sys.argv[1]), int(sys.argv[2]), int(sys.argv[3])
folder = sys.argv[4]
float_options, byte_options = sys.argv[5].split(","), sys.argv[6].split(",")
seconds = []
for name, gdal_type, value, options in [("nan-bands.tif", gdal.GDT_Float32, np.float32(np.nan), float_options),
                                        ("zero-bands.tif", gdal.GDT_Byte, np.uint8(0), byte_options)]:
    block = np.full((rows, cols), value)
    path = os.path.join(folder, name)
    start = time.perf_counter()
    ds = gdal.GetDriverByName("GTiff").Create(path, cols, rows, bands, gdal_type, options)
    for b in range(1, bands + 1):
        band = ds.GetRasterBand(b)
        band.WriteArray(block)
        band.FlushCache()
    ds = None
    seconds.append(time.perf_counter() - start)
    os.remove(path)
print(" ".join("%.3f" % s for s in seconds))
