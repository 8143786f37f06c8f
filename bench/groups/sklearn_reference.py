"""Reference figures from scikit-learn for bench/groups/sklearn-check.ts (Debian's python3-sklearn).

Reads unit vectors (float32, n x dim), our labels and the planted labels (int32), our first k-means++
centres (float64, k x dim) and a sample index (int32); prints one JSON object:
- inertia of KMeans(n_init=restarts) with k-means++ (sklearn's own seeding and random_state),
- inertia of Lloyd's algorithm from our initial centres (same start, so the same local optimum is expected),
- adjusted_rand_score(our labels, planted labels),
- silhouette_score on the sample (Euclidean on unit vectors).
"""
import json
import sys

import numpy as np
from sklearn.cluster import KMeans
from sklearn.metrics import adjusted_rand_score, silhouette_score

args = json.loads(sys.argv[1])
n, dim, k = args["n"], args["dim"], args["k"]
x = np.fromfile(args["x"], dtype=np.float32).reshape(n, dim).astype(np.float64)
ours = np.fromfile(args["labels"], dtype=np.int32)
truth = np.fromfile(args["truth"], dtype=np.int32)
init = np.fromfile(args["init"], dtype=np.float64).reshape(k, dim)
sample = np.fromfile(args["sample"], dtype=np.int32)
sample_labels = np.fromfile(args["sampleLabels"], dtype=np.int32)

best = KMeans(n_clusters=k, init="k-means++", n_init=args["restarts"], random_state=args["seed"], algorithm="lloyd").fit(x)
same_start = KMeans(n_clusters=k, init=init, n_init=1, max_iter=300, tol=0.0, algorithm="lloyd").fit(x)
print(json.dumps({
    "inertiaRestarts": float(best.inertia_),
    "inertiaSameStart": float(same_start.inertia_),
    "ari": float(adjusted_rand_score(ours, truth)),
    "silhouette": float(silhouette_score(x[sample], sample_labels, metric="euclidean")),
}))
