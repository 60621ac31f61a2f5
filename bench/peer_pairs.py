"""Peer measurement: sum of -log|x_i - x_j| over i < j with scipy.spatial.distance.pdist.

Usage: python3 bench/peer_pairs.py POINTS.f64 N D
Reads N*D little-endian float64 coordinates and prints one JSON line with the value and timing.
"""
import json
import sys
import time

import numpy as np
from scipy.spatial.distance import pdist


def main() -> None:
    path, n, d = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
    pts = np.fromfile(path, dtype='<f8').reshape(n, d)
    t0 = time.perf_counter()
    dist = pdist(pts)
    value = -float(np.sum(np.log(dist)))
    seconds = time.perf_counter() - t0
    pairs = n * (n - 1) // 2
    print(json.dumps({'value': value, 'seconds': seconds, 'pairs': pairs, 'pairsPerSecond': pairs / seconds}))


if __name__ == '__main__':
    main()
