"""``claimcheck simulate``: write a dataset with known truth (simulated, for
testing claimcheck and for demonstrations)."""

from __future__ import annotations

import argparse

from .arguments import value as _value
from .arguments import whole as _whole

HELP = "write a simulated raw dataset with a known fidelity (CSV, NPY, NPZ or Parquet)"
DESCRIPTION = (HELP + ". Ideal probabilities come from Porter-Thomas statistics or from small random circuits "
               "run on claimcheck's own state-vector simulator; outcomes are sampled from F p + (1 - F)/D. "
               "The data are simulated; say so wherever they are shown.")
MODELS = ("porter-thomas", "circuit")
# Limits (README, "Limits"), so that every run ends within about a minute and a
# few hundred megabytes: rows written, circuits, layers, and the simulator's work.
MAX_ROWS = 10_000_000
MAX_CIRCUITS = 100_000
MAX_DEPTH = 1_000
# Amplitude updates: circuits x 2**qubits for Porter-Thomas (up to 20 qubits, where
# every probability is drawn) and circuits x depth x qubits x 2**qubits for circuits.
MAX_WORK = {"porter-thomas": 2_000_000_000, "circuit": 5_000_000_000}
# Defaults: 10 circuits x 1,000 samples, 10,000 rows written in a second or so, give a linear-XEB
# standard error of about sqrt(1 + 2F - F^2) / 100 <= 0.015, so a chosen fidelity of 0.1 or more
# stands out of the noise, and enough circuits for the spread between them to show.
DEFAULT_CIRCUITS = 10
DEFAULT_SAMPLES = 1_000


def _fidelity(text: str) -> float:
    try:
        value = _value(text)
    except argparse.ArgumentTypeError:
        raise argparse.ArgumentTypeError(f"fidelity must be a number, got {text!r}") from None
    if not 0.0 <= value <= 1.0:
        raise argparse.ArgumentTypeError(f"fidelity must lie in [0, 1], got {text}")
    return value


def add_parser(sub) -> None:
    p = sub.add_parser("simulate", help=HELP, description=DESCRIPTION)
    p.add_argument("--qubits", type=_whole(1, "qubits"), required=True, metavar="N",
                   help="qubits (porter-thomas: up to 60; circuit: up to 20, about 16 is quick)")
    p.add_argument("--circuits", type=_whole(1, "circuits"), default=DEFAULT_CIRCUITS, metavar="K",
                   help=f"circuits (default {DEFAULT_CIRCUITS})")
    p.add_argument("--samples", type=_whole(1, "samples"), default=DEFAULT_SAMPLES, metavar="N",
                   help=f"samples per circuit (default {DEFAULT_SAMPLES:,})")
    p.add_argument("--fidelity", type=_fidelity, required=True, metavar="F", help="true fidelity F in [0, 1]")
    p.add_argument("--out", required=True, metavar="FILE", help="output file: .csv, .npy, .npz or .parquet")
    p.add_argument("--seed", type=_whole(0, "seed"), default=0, metavar="S", help="random seed (default 0)")
    p.add_argument("--model", choices=MODELS, default="porter-thomas",
                   help="where the ideal probabilities come from (default porter-thomas)")
    p.add_argument("--depth", type=_whole(1, "depth"), metavar="L",
                   help=f"layers per circuit for --model circuit (default 4 N + 4, at most {MAX_DEPTH:,})")


def run(args, stdout, stderr) -> int:
    import numpy as np

    from ..errors import DataError
    from ..output import check_targets, write_atomic
    from ..raw.simulate_circuits import (FULL_DISTRIBUTION_QUBITS, MAX_CIRCUIT_QUBITS, MAX_QUBITS, default_depth,
                                         simulate_dataset)
    from ..raw.writers import dataset_bytes, format_of

    fmt = format_of(args.out)
    check_targets({"--out": args.out})
    limit = MAX_CIRCUIT_QUBITS if args.model == "circuit" else MAX_QUBITS
    if args.qubits > limit:
        raise DataError(args.out, f"the {args.model} model takes at most {limit} qubits, got {args.qubits}",
                        "use fewer qubits" + (" or --model porter-thomas" if args.model == "circuit" else ""),
                        path="qubits")
    if args.depth is not None and args.model != "circuit":
        raise DataError(args.out, "--depth applies to --model circuit only", "leave out --depth", path="depth")
    rows = args.circuits * args.samples
    if rows > MAX_ROWS:
        raise DataError(args.out, f"{rows:,} rows asked for; simulate writes at most {MAX_ROWS:,}",
                        "use fewer circuits or samples", path="samples")
    if args.circuits > MAX_CIRCUITS:
        raise DataError(args.out, f"{args.circuits:,} circuits asked for; simulate makes at most {MAX_CIRCUITS:,}",
                        "use fewer circuits (and more samples each)", path="circuits")
    if args.depth is not None and args.depth > MAX_DEPTH:
        raise DataError(args.out, f"depth {args.depth:,} asked for; circuits have at most {MAX_DEPTH:,} layers",
                        "use fewer layers", path="depth")
    depth = (args.depth or default_depth(args.qubits)) if args.model == "circuit" else 1
    work = args.circuits * 2 ** min(args.qubits, FULL_DISTRIBUTION_QUBITS) * (
        depth * args.qubits if args.model == "circuit" else 1)
    if work > MAX_WORK[args.model]:
        what = ("circuits x depth x qubits x 2**qubits" if args.model == "circuit" else "circuits x 2**qubits")
        raise DataError(args.out, f"{what} is {work:.3g}, more than the {MAX_WORK[args.model]:.0e} amplitude "
                        "updates simulate does in one run (about a minute)",
                        "use fewer circuits, qubits" + (" or layers" if args.model == "circuit" else ""),
                        path="circuits")
    rng = np.random.default_rng(args.seed)
    data = simulate_dataset(args.qubits, args.circuits, args.samples, args.fidelity, rng, args.model, args.depth)
    write_atomic(args.out, dataset_bytes(data, fmt, args.out))
    depth = f", depth {data.depth}" if data.depth else ""
    stdout.write(f"wrote {rows:,} simulated samples ({args.circuits} circuits x {args.samples}, {args.qubits} qubits, "
                 f"fidelity {args.fidelity:g}, {args.model} model{depth}, seed {args.seed}) to {args.out}\n")
    if fmt == "npy":
        stderr.write("note: NPY keeps only the probability column (no circuit, no heavy); "
                     "use .npz, .csv or .parquet to keep them\n")
    return 0
