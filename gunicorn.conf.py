"""gunicorn's settings for Linecast, read from the working directory: run `gunicorn planner.wsgi` beside this file.

Options given on the command line (--bind, --workers, --threads) take precedence.
"""

import os

# The engine diagonalises many small matrices (Wang blocks of a few to a few hundred rows), too small for
# OpenBLAS's threads to help; with several workers on few cores those threads only wait for each other.
# Measured on the 2-core machine (2026-12-02): one SO2 prediction, 85–110 GHz at 300 K, took 0.6–1.2 s
# with OpenBLAS's default threads and 0.18–0.22 s with one.  Set before the workers import numpy.
os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

# Pages are CPU-bound Python (templates, numpy): threads of one worker only queue behind its GIL, and a
# kept-alive connection stays with one worker however busy.  `manage.py load_test` on the 2-core machine
# (20 clients, 2026-12-02): 3 workers × 2 threads 36 requests/s, p95 1.6 s; 4 single-threaded (sync)
# workers 52-68 requests/s, p95 0.4-0.6 s.  Each worker keeps its own prediction cache unless
# LINECAST_CACHE_URL names a shared one; about 150 MB resident each.
workers = 4
threads = 1
# A cold plan over a large catalogue may take several seconds on a busy machine; the engine refuses
# requests that would take far longer (its J caps), so a minute only catches a stuck worker.
timeout = 60
