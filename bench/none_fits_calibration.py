#!/usr/bin/python3
"""Calibration of the pool rule's "none of the template fits" probability on a study that
bench/fewshot.py built with --leave-out (its --work folder): 1 - the best calibrated confidence of
every test passage (trellis suggest --json --top 1000), against whether the reference coding gives
it no theme of the template (its themes were all under the left-out one). Prints a reliability
table (ten bins), the expected calibration error, and the ROC AUC of the probability for the
left-out passages against the others.

  none_fits_calibration.py OUT WORK "Left-out theme" [--trellis CMD] [--noisy-or]

With --noisy-or the probability is the product of 1 - p over the themes instead.
"""
import json, shlex, subprocess, sys

out, work, leave = sys.argv[1:4]
tr = shlex.split(sys.argv[sys.argv.index("--trellis") + 1]) if "--trellis" in sys.argv else ["bin/trellis"]
under = lambda th: th == leave or th.startswith(leave + " > ")
truth = {}
for line in open(f"{out}/truth.jsonl", encoding="utf-8"):
    r = json.loads(line)
    if r["split"] == "test":
        truth[f"survey-{r['transcript']}"] = not [t for t in r["themes"] if not under(t)]
res = json.loads(subprocess.run(tr + ["suggest", "--study", f"{work}/study", "--json", "--top", "1000"], capture_output=True, text=True, check=True).stdout)
pairs = []
for p in res["passages"]:
    y = truth.get(p["transcript"])
    if y is None:
        continue
    if "--noisy-or" in sys.argv:
        none = 1.0
        for c in p["candidates"]:
            none *= 1 - c["confidence"]
    else:
        none = 1 - max((c["confidence"] for c in p["candidates"]), default=0.0)
    pairs.append((none, 1 if y else 0))
bins = [[] for _ in range(10)]
for q, y in pairs:
    bins[min(int(q * 10), 9)].append((q, y))
ece = 0.0
print("bin        passages  mean none_fits  share with no template theme")
for i, b in enumerate(bins):
    if not b:
        continue
    mq = sum(q for q, _ in b) / len(b)
    my = sum(y for _, y in b) / len(b)
    ece += len(b) / len(pairs) * abs(mq - my)
    print(f"{i/10:.1f}-{(i+1)/10:.1f}  {len(b):8d}  {mq:14.3f}  {my:10.3f}")
pos = [q for q, y in pairs if y]
neg = [q for q, y in pairs if not y]
auc = sum((a > b) + 0.5 * (a == b) for a in pos for b in neg) / max(len(pos) * len(neg), 1)
print(f"passages {len(pairs)}, with no template theme {len(pos)}; ECE {ece:.3f}; AUC {auc:.3f}")
