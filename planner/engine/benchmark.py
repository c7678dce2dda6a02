"""Benchmark of the engine: ``python -m planner.engine.benchmark``.

Prints the time of the full line list of an asymmetric top up to J = 100 with
a-, b- and c-type transitions, the time of the bare eigen-solve of the same
Wang blocks, their ratio, and the peak memory of the run.  Targets (on the
project's 2-core machine): ≤ 0.5 s, ≤ 3× the eigen-solve, ≤ 200 MB.

The molecule uses the SO2 ground-state constants (A-reduction, Ir, recalled
from the literature, quartic terms only) with all three dipole components set
to 1 D so that every selection rule is exercised.
"""

from __future__ import annotations

import argparse
import resource
import time
import tracemalloc

import numpy as np

from .levels import AsymmetricSolver
from .predict import predict
from .request import PredictionRequest
from .species import Species, State

SO2_CONSTANTS_MHZ = {
    "A": (60778.552, 0.002),
    "B": (10318.0735, 0.0002),
    "C": (8799.7033, 0.0002),
    "DeltaJ": (0.0066, 1e-6),
    "DeltaJK": (-0.1169, 1e-5),
    "DeltaK": (2.5907, 1e-4),
    "deltaJ": (0.0017, 1e-7),
    "deltaK": (0.02533, 1e-6),
}


def benchmark_species() -> Species:
    return Species(
        name="SO2 (all dipole types)",
        rotor="asymmetric",
        mass_amu=63.962,
        dipole_debye=(1.0, 1.0, 1.0),
        states=(State("v=0", 0.0, SO2_CONSTANTS_MHZ),),
    )


def benchmark_request(j_max: int) -> PredictionRequest:
    # A window wide enough for every line and a floor low enough to keep them all.
    return PredictionRequest(0.0, 2.0e7, 300.0, relative_floor=1e-15, j_cap=j_max)


def eigen_blocks(species: Species, j_max: int) -> list[np.ndarray]:
    """The Wang-block matrices of J = 0..j_max that the engine diagonalises."""
    solver = AsymmetricSolver(species.states[0], species.reduction, species.representation)
    return [matrix for j in range(j_max + 1) for _, matrix in solver.block_matrices(j)[1]]


def timed(function) -> float:
    start = time.perf_counter()
    function()
    return time.perf_counter() - start


def main(argv=None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--j-max", type=int, default=100, help="highest J (default 100)")
    parser.add_argument("--repeats", type=int, default=15, help="interleaved runs of each timing (default 15)")
    args = parser.parse_args(argv)

    species = benchmark_species()
    request = benchmark_request(args.j_max)
    matrices = eigen_blocks(species, args.j_max)
    cold = timed(lambda: predict(species, request))  # also fills the small direction-cosine cache
    count = len(predict(species, request).lines)

    # Interleaved, so that both timings of a pair see the same state of a shared machine.
    full, bare = [], []
    for _ in range(args.repeats):
        full.append(timed(lambda: predict(species, request)))
        bare.append(timed(lambda: [np.linalg.eigh(matrix) for matrix in matrices]))
    ratios = np.array(full) / np.array(bare)

    tracemalloc.start()
    predict(species, request)
    _, traced_peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    rss_peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0

    print(f"asymmetric top, J = 0..{args.j_max}, a/b/c-type lines: {count} lines, {len(matrices)} Wang blocks")
    print(f"full line list          {min(full) * 1e3:8.1f} ms   best of {args.repeats} (target <= 500 ms)")
    print(f"  first run             {cold * 1e3:8.1f} ms   (cold caches)")
    print(f"bare eigen-solve        {min(bare) * 1e3:8.1f} ms   best of {args.repeats}, numpy.linalg.eigh per block")
    print(f"ratio full / eigen      {np.median(ratios):8.2f}      median of the interleaved pairs (target <= 3)")
    print(f"peak memory of the run  {traced_peak / 2**20:8.1f} MB   (tracemalloc; target <= 200 MB)")
    print(f"process peak RSS        {rss_peak_mb:8.1f} MB   (interpreter and libraries included)")


if __name__ == "__main__":
    main()
