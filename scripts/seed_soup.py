"""Train one recipe at several seeds, side by side, and average them into a uniform soup.

Usage: .venv/bin/python scripts/seed_soup.py --out-dir runs/X --seeds 127 131 137 [--parallel 3] \
           -- <train-reader flags: --init-dir, --train-files, --max-steps, --device, ...>

Each seed S trains into ``OUT/seedS`` (``excerptor train-reader --out-dir OUT/seedS --seed S <flags>``; a run that
stops can be restarted and resumes from its checkpoint), then ``OUT/soup`` holds the uniform weight average of their
``final/`` folders (``engine.training.average.uniform_soup``). With ``--device cuda`` the runs share the one GPU.
"""

from __future__ import annotations

import argparse
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine.training.average import uniform_soup  # noqa: E402


def train_commands(out_dir: Path, seeds: list[int], flags: list[str]) -> dict[int, list[str]]:
    """One train-reader command per seed; the seed and output folder are this script's to set."""
    for reserved in ("--seed", "--out-dir"):
        if reserved in flags:
            raise ValueError(f"{reserved} is set per seed by this script (got {reserved} in the flags)")
    if len(set(seeds)) != len(seeds) or len(seeds) < 2:
        raise ValueError(f"a soup needs at least two different seeds (got {seeds})")
    return {seed: [sys.executable, "-m", "engine.cli", "train-reader", "--out-dir", str(out_dir / f"seed{seed}"),
                   "--seed", str(seed), *flags] for seed in seeds}


def run_all(commands: dict[int, list[str]], out_dir: Path, parallel: int) -> dict[int, int]:
    """Run the commands, at most ``parallel`` at once; each writes its output to OUT/seedS.out. Returns exit codes."""
    pending, running, codes = list(commands.items()), {}, {}
    while pending or running:
        while pending and len(running) < parallel:
            seed, command = pending.pop(0)
            log = open(out_dir / f"seed{seed}.out", "w", encoding="utf-8")
            running[seed] = (subprocess.Popen(command, cwd=ROOT, stdout=log, stderr=subprocess.STDOUT), log)
        for seed, (process, log) in list(running.items()):
            if process.poll() is not None:
                log.close()
                codes[seed] = process.returncode
                del running[seed]
                print(f"{time.strftime('%H:%M:%S')} seed {seed} exited {process.returncode}", flush=True)
        time.sleep(2)
    return codes


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--out-dir", type=Path, required=True)
    parser.add_argument("--seeds", type=int, nargs="+", required=True)
    parser.add_argument("--parallel", type=int, default=1, help="runs at once (default 1)")
    parser.add_argument("flags", nargs=argparse.REMAINDER, help="-- then the train-reader flags")
    args = parser.parse_args()
    if args.parallel < 1:
        raise ValueError(f"--parallel must be >= 1 (got {args.parallel})")
    flags = args.flags[1:] if args.flags[:1] == ["--"] else args.flags
    args.out_dir.mkdir(parents=True, exist_ok=True)
    commands = train_commands(args.out_dir, args.seeds, flags)
    codes = run_all(commands, args.out_dir, args.parallel)
    failed = {seed: code for seed, code in codes.items() if code != 0}
    if failed:
        print(f"runs failed (seed: exit code): {failed}; see {args.out_dir}/seedS.out", file=sys.stderr)
        return 1
    print(uniform_soup([args.out_dir / f"seed{s}" / "final" for s in args.seeds], args.out_dir / "soup"))
    return 0


if __name__ == "__main__":
    sys.exit(main())
