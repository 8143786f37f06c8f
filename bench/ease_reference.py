"""EASE reference fit with numpy/OpenBLAS, for `npm run bench:ease` (bench/ease.bench.ts runs it).

Reads X (customers x items, 0/1) from the binary file bench/ease.bench.ts writes:
  int32 rows, int32 cols, int32 nnz, int32 indptr[rows + 1], int32 indices[nnz]   (little-endian)
and fits EASE (Steck 2019, eq. 8) twice, timing each step:
  inv:      G = X^T X + lambda I (scipy.sparse when present), P = np.linalg.inv(G) (as the paper's code),
            B = -P / diag(P), diag(B) = 0
  cholesky: the same G, P by LAPACK potrf + potri (scipy.linalg), the algorithm bench/ease.bench.ts times.
Prints one JSON line: the timings in seconds, a checksum of B, and the BLAS in use (threadpoolctl when
installed, else numpy's build configuration).
Usage: python3 ease_reference.py FILE LAMBDA
"""
import json
import sys
import time

import numpy as np


def blas_info():
    try:
        from threadpoolctl import threadpool_info

        return [
            {k: d.get(k) for k in ("internal_api", "version", "architecture", "num_threads", "filepath")}
            for d in threadpool_info()
        ]
    except ImportError:
        import io
        import contextlib

        buf = io.StringIO()
        with contextlib.redirect_stdout(buf):
            np.show_config()
        return buf.getvalue()


def read_x(path):
    raw = np.fromfile(path, dtype="<i4")
    rows, cols, nnz = int(raw[0]), int(raw[1]), int(raw[2])
    indptr = raw[3 : 3 + rows + 1]
    indices = raw[4 + rows : 4 + rows + nnz]
    return rows, cols, indptr, indices


def gram(rows, cols, indptr, indices, lam):
    try:
        import scipy.sparse as sp

        x = sp.csr_matrix((np.ones(len(indices)), indices, indptr), shape=(rows, cols))
        g = (x.T @ x).toarray()
        how = "scipy.sparse"
    except ImportError:
        x = np.zeros((rows, cols))
        for u in range(rows):
            x[u, indices[indptr[u] : indptr[u + 1]]] = 1.0
        g = x.T @ x
        how = "dense numpy"
    g[np.diag_indices(cols)] += lam
    return g, how


def weights(p):
    b = p / (-np.diag(p))
    np.fill_diagonal(b, 0.0)
    return b


def main():
    path, lam = sys.argv[1], float(sys.argv[2])
    rows, cols, indptr, indices = read_x(path)
    out = {"items": cols, "blas": blas_info()}

    t0 = time.perf_counter()
    g, how = gram(rows, cols, indptr, indices, lam)
    t1 = time.perf_counter()
    p = np.linalg.inv(g)
    t2 = time.perf_counter()
    b = weights(p)
    t3 = time.perf_counter()
    out["gram"] = how
    out["inv"] = {"gram": t1 - t0, "inverse": t2 - t1, "weights": t3 - t2, "total": t3 - t0}
    out["checksum"] = float(np.abs(b).sum())
    del p, b

    try:
        import scipy.linalg as sl

        t0 = time.perf_counter()
        g, _ = gram(rows, cols, indptr, indices, lam)
        t1 = time.perf_counter()
        c, _ = sl.cho_factor(g, lower=True, overwrite_a=True, check_finite=False)
        t2 = time.perf_counter()
        p, info = sl.lapack.dpotri(c, lower=1, overwrite_c=1)
        if info != 0:
            raise RuntimeError("dpotri failed")
        p = np.tril(p) + np.tril(p, -1).T
        t3 = time.perf_counter()
        b = weights(p)
        t4 = time.perf_counter()
        out["cholesky"] = {"gram": t1 - t0, "factor": t2 - t1, "inverse": t3 - t2, "weights": t4 - t3, "total": t4 - t0}
    except ImportError:
        out["cholesky"] = None
    print(json.dumps(out))


if __name__ == "__main__":
    main()
