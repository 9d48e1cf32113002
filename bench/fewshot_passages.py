"""The study's passages matched to a fewshot.py protocol's reference rows, as the shared script
matches them (its own text normalisation): for the benchmark aids that read a protocol's study."""
import csv
import json
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "shared", "bench"))
import fewshot  # noqa: E402


def matched(src, work):
    """[(sheet row, reference row)] for every passage of WORK/sheet.csv found in SRC/truth.jsonl."""
    by_t = {}
    for line in open(os.path.join(src, "truth.jsonl"), encoding="utf-8"):
        r = json.loads(line)
        by_t.setdefault(r["transcript"], []).append(r)
    out = []
    for s in csv.DictReader(open(os.path.join(work, "sheet.csv"), encoding="utf-8-sig", newline="")):
        t = os.path.splitext(os.path.basename(s["transcript"]))[0]
        if t not in by_t and t.startswith("survey-"):  # a survey's respondents may carry the file's name
            t = t[len("survey-"):]
        norm = fewshot.norm(s["text"])
        hit = next((r for r in by_t.get(t, []) if norm and norm in fewshot.norm(r["text"])), None)
        if hit is not None:
            out.append((s, hit))
    return out
