"""Reference timing for the benchmark: scikit-learn's Barnes-Hut TSNE on the
same raw float64 matrix the JavaScript side wrote.

usage: python3 sklearn_tsne.py FILE N D [PERPLEXITY]
prints one JSON line: {"seconds", "trustworthiness", "kl_divergence", "sklearn"}.
Run with OMP_WAIT_POLICY=PASSIVE on small machines (libgomp and OpenBLAS
otherwise spin against each other).
"""
import json
import sys
import time

import numpy as np
import sklearn
from sklearn.manifold import TSNE, trustworthiness

path, n, d = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
perplexity = float(sys.argv[4]) if len(sys.argv) > 4 else 30.0
X = np.fromfile(path, dtype="<f8").reshape(n, d)
t0 = time.perf_counter()
model = TSNE(n_components=2, perplexity=perplexity, init="pca", learning_rate="auto", method="barnes_hut", random_state=0)
Y = model.fit_transform(X)
seconds = time.perf_counter() - t0
trust = trustworthiness(X, Y, n_neighbors=10) if n <= 10000 else None
print(json.dumps({"seconds": seconds, "trustworthiness": trust, "kl_divergence": float(model.kl_divergence_), "sklearn": sklearn.__version__}))
