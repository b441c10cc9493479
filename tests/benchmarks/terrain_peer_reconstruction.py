#!/usr/bin/python3
"""Peer for tests/benchmarks/terrain_bench.cpp: the flood threshold of the same DEM by
scikit-image's morphological reconstruction by erosion, seeded from the sea (the DEM's edge
cells at or below 0 m), 8-connectivity. Prints the CPU seconds and the wall-clock seconds spent
in reconstruction alone (reading the file is excluded; the machine is shared, so CPU time is
the fairer figure) and a checksum of the result.

usage: terrain_peer_reconstruction.py DEM.tif
"""
import sys
import time

import numpy as np
from osgeo import gdal
from skimage.morphology import reconstruction

gdal.UseExceptions()
# ReadRaster + frombuffer rather than ReadAsArray: on this Debian build ReadAsArray of a
# megapixel band crashes once SciPy is loaded (seen with python3-gdal 3.6.2).
ds = gdal.Open(sys.argv[1])
z = np.frombuffer(ds.GetRasterBand(1).ReadRaster(buf_type=gdal.GDT_Float64), dtype=np.float64)
z = z.reshape(ds.RasterYSize, ds.RasterXSize).copy()
edge = np.zeros(z.shape, dtype=bool)
edge[0, :] = edge[-1, :] = edge[:, 0] = edge[:, -1] = True
sea = edge & (z <= 0.0)
low = z.min() - 1.0
mask = z.copy()
mask[sea] = low
marker = np.full(z.shape, z.max() + 1.0)
marker[sea] = low
start_cpu = time.process_time()
start_wall = time.perf_counter()
filled = reconstruction(marker, mask, method="erosion", footprint=np.ones((3, 3)))
cpu = time.process_time() - start_cpu
wall = time.perf_counter() - start_wall
print(f"{cpu:.6f} {wall:.6f} {float(filled[~sea].sum()):.6e}")
