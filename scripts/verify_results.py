"""Recompute the scores of an audit folder with scikit-learn / scipy / numpy
and print the largest difference from results.json, per score.

usage: /usr/bin/python3 scripts/verify_results.py DATA.csv AUDIT_DIR [--label COL] [--id COL]

Needs scikit-learn (1.2.1 used here) and scipy. Recomputes, for every run on
all rows: trustworthiness and continuity (sklearn.manifold.trustworthiness;
when results.json says they averaged over all rows),
kNN overlap, label silhouette (sklearn.metrics.silhouette_score), leave-one-out
kNN label accuracy, density correlation and, when results.json says they were
exact, distance Spearman (scipy.stats.spearmanr) and AUC of R_NX; per setting
on all rows, the mean and max Procrustes disparity (scipy.spatial.procrustes).
Scores are computed in the space the audit states (features, z-scored with
--scale), so run this on audits without --scale, or z-score first.
"""
import csv
import json
import sys

import numpy as np
from scipy.spatial import procrustes
from scipy.spatial.distance import pdist, squareform
from scipy.stats import pearsonr, spearmanr
from sklearn.manifold import trustworthiness
from sklearn.metrics import silhouette_score

args = sys.argv[1:]
data_path, audit = args[0], args[1]
label_col = args[args.index("--label") + 1] if "--label" in args else None
id_col = args[args.index("--id") + 1] if "--id" in args else None

with open(data_path, newline="") as f:
    rows = list(csv.reader(f))
header, body = rows[0], rows[1:]
feat = [j for j, h in enumerate(header) if h not in (label_col, id_col)]
X = np.array([[float(r[j]) for j in feat] for r in body])
labels = np.array([r[header.index(label_col)] for r in body]) if label_col else None
res = json.load(open(f"{audit}/results.json"))
k = res["sweep"]["k"]
n = X.shape[0]


def stable_knn(D, kk):
    D = D.copy()
    np.fill_diagonal(D, np.inf)
    return np.argsort(D, axis=1, kind="stable")[:, :kk]


DX = squareform(pdist(X, "sqeuclidean"))
knnX = stable_knn(DX, k)
worst = {}


def note(name, ours, ref):
    if ours is None:
        return
    worst[name] = max(worst.get(name, 0.0), abs(ours - ref))


def rnx_auc(DXs, DYs):
    m = DXs.shape[0]
    rx = np.argsort(np.argsort(np.where(np.eye(m, dtype=bool), np.inf, DXs), axis=1, kind="stable"), axis=1)
    ry = np.argsort(np.argsort(np.where(np.eye(m, dtype=bool), np.inf, DYs), axis=1, kind="stable"), axis=1)
    off = ~np.eye(m, dtype=bool)
    Q = np.zeros((m - 1, m - 1))
    np.add.at(Q, (rx[off], ry[off]), 1)
    Ks = np.arange(1, m - 1)
    cum = np.cumsum(np.cumsum(Q, axis=0), axis=1)
    qnx = np.array([cum[K - 1, K - 1] for K in Ks]) / (Ks * m)
    rnx = ((m - 1) * qnx - Ks) / (m - 1 - Ks)
    return float(np.sum(rnx / Ks) / np.sum(1.0 / Ks))


maps = {}
for run in res["runs"]:
    if run["status"] != "ok" or run.get("rows"):
        continue
    Y = np.loadtxt(f"{audit}/{run['embedding']}", delimiter=",", skiprows=1)
    maps.setdefault(run["setting"], []).append(Y)
    m = run["metrics"]
    if res["dataset"].get("scoring", {}).get("rank_rows", n) == n:  # sampled above 10,000 rows
        note("trustworthiness", m["trustworthiness"], trustworthiness(X, Y, n_neighbors=k))
        note("continuity", m["continuity"], trustworthiness(Y, X, n_neighbors=k))
    DY = squareform(pdist(Y, "sqeuclidean"))
    knnY = stable_knn(DY, k)
    note("knn_overlap", m["knn_overlap"], np.mean([len(set(a) & set(b)) / k for a, b in zip(knnX, knnY)]))
    rX = np.log(np.take_along_axis(DX, knnX, 1).mean(1))
    rY = np.log(np.take_along_axis(DY, knnY, 1).mean(1))
    note("density_correlation", m.get("density_correlation"), pearsonr(rX, rY)[0])
    if res["dataset"].get("scoring", {}).get("distance_all_pairs"):
        note("distance_spearman", m.get("distance_spearman"), spearmanr(pdist(X), pdist(Y)).correlation)
    if res["dataset"].get("scoring", {}).get("rnx_rows") == n and n <= 2000:
        note("auc_rnx", m.get("auc_rnx"), rnx_auc(DX, DY))
    if labels is not None:
        note("label_silhouette", m.get("label_silhouette"), silhouette_score(Y, labels))
        acc = 0
        for i in range(n):
            votes = {}
            first = {}
            for rank, j in enumerate(knnY[i]):
                votes[labels[j]] = votes.get(labels[j], 0) + 1
                first.setdefault(labels[j], rank)
            best = max(votes.items(), key=lambda kv: (kv[1], -first[kv[0]]))[0]
            acc += best == labels[i]
        note("label_knn_accuracy", m.get("label_knn_accuracy"), acc / n)

for s in res["settings"]:
    Ys = maps.get(s["id"], [])
    if len(Ys) < 2 or s["stability"]["procrustes_mean"] is None:
        continue
    d = [procrustes(Ys[a], Ys[b])[2] for a in range(len(Ys)) for b in range(a + 1, len(Ys))]
    note("procrustes_mean", s["stability"]["procrustes_mean"], float(np.mean(d)))
    note("procrustes_max", s["stability"]["procrustes_max"], float(np.max(d)))

print(json.dumps({"n": n, "k": k, "max_abs_difference": worst}, indent=1))
