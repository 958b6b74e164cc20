#!/usr/bin/env python3
"""Splits a `perf record -g` profile of `copynumber simulate` into the parts of a run (docs/performance.md,
"Throughput of a whole run"). Each sample goes to the first frame of its call stack, from the leaf up, that
matches a part's rule; samples that match none are "other" (runtime start-up, GC, kernel).

Record with the runtime's perf map so JIT-compiled frames have names:
  DOTNET_PerfMapEnabled=1 DOTNET_EnableWriteXorExecute=0 perf record -e cpu-clock -F 999 -g -o OUT copynumber simulate ...
then: python3 benchmarks/profiles/split_by_part.py OUT [top-frames-per-part]
"""
import collections
import re
import subprocess
import sys

PARTS = [
    ("jit (compiling code)", lambda f: "libclrjit" in f),
    ("simulation: event loop", lambda f: re.search(r"DirectLoop|DirectMethod|ZigguratExponential|LinearSelection|FiringProgram|ExactSimulation|GridRecorder|Xoshiro|CompositionRejection|NextReactionMethod", f)),
    ("recording: moments, histograms per grid point", lambda f: re.search(r"BlockObserver|Accumulate|BlockMoments|MomentAccumulator|CompensatedSum|MomentTree|CountHistogram::Add|ReplicateBlock|SwitchingStatistics", f)),
    ("master-equation exact check", lambda f: "MasterEquation" in f),
    ("tables: summaries and Parquet writing", lambda f: re.search(r"CopyNumber\.Storage|Parquet|Snappier|DistributionSummary|CountHistogram|SummaryFiles|Checkpoint", f)),
    ("reports and figures", lambda f: re.search(r"Reports|ScottPlot|SkiaSharp", f)),
    ("rate equations, analysis", lambda f: re.search(r"Deterministic|Analysis|RateEquation", f)),
]


def main():
    data = sys.argv[1]
    top = int(sys.argv[2]) if len(sys.argv) > 2 else 0
    text = subprocess.run(["perf", "script", "-i", data, "-F", "comm,tid,ip,sym,dso"], capture_output=True, text=True, check=True).stdout
    parts, by_thread, frames_of = collections.Counter(), collections.defaultdict(collections.Counter), collections.defaultdict(collections.Counter)
    for sample in text.split("\n\n"):
        lines = [line for line in sample.strip().split("\n") if line.strip()]
        if not lines:
            continue
        thread = lines[0].split()[0]
        part, hit = "other (runtime start-up, GC, kernel)", None
        for frame in lines[1:]:
            match = next((name for name, rule in PARTS if rule(frame)), None)
            if match:
                part, hit = match, re.sub(r"\s+", " ", frame.strip())[17:160]
                break
        parts[part] += 1
        by_thread[thread][part] += 1
        if hit:
            frames_of[part][hit] += 1
    total = sum(parts.values())
    for name, count in parts.most_common():
        print(f"{100 * count / total:6.1f}%  {count:6d}  {name}")
    print(f"samples {total}")
    for thread, counts in by_thread.items():
        print(thread, dict(counts))
    for name in frames_of if top else []:
        print("##", name)
        for frame, count in frames_of[name].most_common(top):
            print(f"   {count:5d} {frame}")


if __name__ == "__main__":
    main()
