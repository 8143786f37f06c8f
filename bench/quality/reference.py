#!/usr/bin/python3
"""The reference side of the quality benchmark: the same published methods, written here over numpy/scipy
(Debian's python3-numpy, python3-scipy, python3-sklearn), scoring the same split with the same metric.

Reads DATA/items.csv, DATA/train.csv and DATA/test.csv (bench/quality/prepare.py writes them), tunes each
model on a validation split carved from train.csv the way `train --tune` carves its own (the last 20% of
the training signals by time; the customers with training history and new items there, at most 1,000,
sampled with a seeded generator), refits the best settings on all of train.csv and scores test.csv.
Writes a JSON report and the ranked top-K lists (for the metric cross-check in run.ts).

Metrics (the same definitions as src-main/core/metrics): per customer, items the customer has in training
are removed from the ranking; NDCG@K with binary relevance and log2 discount (Järvelin & Kekäläinen 2002);
Recall@K = hits / min(K, |held-out|) (Liang, Krishnan, Hoffman & Jebara 2018); means over customers.
Ties in a ranking are broken by the lower item index (items.csv order).

Models:
- popularity: the number of training customers who bought the item.
- item-kNN: Sarwar, Karypis, Konstan & Riedl (2001) §3.1.1 cosine on presence columns with shrinkage,
  sim(i,j) = x_i.x_j / (|x_i||x_j| + shrink); each item keeps its k most similar items; score(u,j) =
  sum over history items h of sim(h,j) where j is among h's neighbours.
- EASE: Steck (2019) eq. 8 on presence: P = (X'X + lambda I)^-1, B = I - P diag(1/diag P), diag B = 0.
- iALS: Hu, Koren & Volinsky (2008) eq. 4 in alternating sweeps, each row solved by CG_STEPS conjugate-gradient
  steps warm-started from the last sweep (Takacs, Pilaszy & Tikk 2011), vectorised over all rows, preference p = 1 where the customer bought, confidence c = 1 + alpha r (linear) or
  1 + alpha log(1 + r / eps), eps = 1 (log), r = the summed value: a purchase's quantity, or for a signal of
  kind 'rating' its stars less 2.5 (signal_value: Shelfwright's reading of a rating; prepare_movielens.py keeps
  only 3 stars and more, so presence is unchanged and the Online Retail data, all purchases, reads as before).
- content: TF-IDF of the item text (scikit-learn TfidfVectorizer, smooth idf, l2 norm, English stop
  words) and cosine similarity; score(u,j) = mean cosine of j to the customer's distinct history items.
"""
import argparse
import csv
import json
import math
import os
import sys
import time

import numpy as np
import scipy.sparse as sp

K = 20
VALIDATION_SHARE = 0.2
VALIDATION_CUSTOMERS = 1000
# Conjugate-gradient steps per row and sweep in tuning, twice as many in the final fit (Takacs et al. 2011 use 3;
# on this data 12 steps match an exact per-row solve to 4 digits of validation NDCG@20, 6 come within 0.5%).
CG_STEPS = 6


# ---------------------------------------------------------------- data

def read_csv(path):
    with open(path, newline='', encoding='utf-8') as f:
        return list(csv.DictReader(f))


# A rating's positive evidence, as Shelfwright's matrix reads it (core/matrix/build.ts RATING_NEUTRAL): a rating r
# counts max(0, r - 2.5), so on a 1-5 scale 3, 4 and 5 stars weigh 0.5, 1.5 and 2.5. Every other kind (a purchase's
# quantity, a count of views) keeps its value. Only iALS reads values; the other models read presence.
RATING_NEUTRAL = 2.5


def signal_value(row):
    v = float(row['value'])
    if row.get('kind') == 'rating':
        if v <= RATING_NEUTRAL:
            raise ValueError(f'a rating of {v} carries no positive evidence: drop it when preparing the data')
        return v - RATING_NEUTRAL
    return v


class Data:
    def __init__(self, folder):
        items = read_csv(os.path.join(folder, 'items.csv'))
        self.item_ids = [r['id'] for r in items]
        self.titles = [' '.join(x for x in (r.get('title', ''), r.get('description', '')) if x) for r in items]
        self.item_index = {i: n for n, i in enumerate(self.item_ids)}
        train = read_csv(os.path.join(folder, 'train.csv'))
        self.customer_ids = sorted({r['customer'] for r in train})
        self.customer_index = {c: n for n, c in enumerate(self.customer_ids)}
        self.u = np.array([self.customer_index[r['customer']] for r in train], dtype=np.int64)
        self.i = np.array([self.item_index[r['item']] for r in train], dtype=np.int64)
        self.v = np.array([signal_value(r) for r in train])
        self.at = np.array([r['at'] for r in train])
        test = read_csv(os.path.join(folder, 'test.csv'))
        self.test = {}
        for r in test:
            self.test.setdefault(self.customer_index[r['customer']], set()).add(self.item_index[r['item']])
        self.n_users, self.n_items = len(self.customer_ids), len(self.item_ids)


def matrices(n_users, n_items, u, i, v):
    """Presence X (0/1) and summed values R, customers x items, CSR."""
    r = sp.csr_matrix((v, (u, i)), shape=(n_users, n_items))
    r.sum_duplicates()
    x = r.copy()
    x.data[:] = 1.0
    return x, r


def validation_split(d, seed):
    """The last VALIDATION_SHARE of the training signals by time are validation (a global time split)."""
    order = np.sort(d.at)
    cut = order[int(math.floor(len(order) * (1 - VALIDATION_SHARE)))]
    fit = d.at < cut
    x, r = matrices(d.n_users, d.n_items, d.u[fit], d.i[fit], d.v[fit])
    coo = x.tocoo()
    seen = set(zip(coo.row.tolist(), coo.col.tolist()))
    truth = {}
    for uu, ii in zip(d.u[~fit].tolist(), d.i[~fit].tolist()):
        if x.indptr[uu + 1] > x.indptr[uu] and (uu, ii) not in seen:
            truth.setdefault(int(uu), set()).add(int(ii))
    users = sorted(truth)
    rng = np.random.default_rng(seed)
    if len(users) > VALIDATION_CUSTOMERS:
        users = sorted(rng.choice(users, VALIDATION_CUSTOMERS, replace=False).tolist())
    return x, r, {u: truth[u] for u in users}, str(cut)


# ---------------------------------------------------------------- metrics

def ndcg_recall(ranked, truth, k=K):
    """NDCG@k (binary, log2) and Recall@k with denominator min(k, |truth|) for one ranked list."""
    dcg = sum(1.0 / math.log2(r + 2) for r, j in enumerate(ranked[:k]) if j in truth)
    ideal = sum(1.0 / math.log2(r + 2) for r in range(min(k, len(truth))))
    hits = sum(1 for j in ranked[:k] if j in truth)
    return dcg / ideal, hits / min(k, len(truth))


def top_k(scores, history_rows, k=K):
    """Top-k item indices per row of `scores`, history removed, ties to the lower index."""
    s = scores.astype(np.float64, copy=True)
    for row, items in enumerate(history_rows):
        s[row, items] = -np.inf
    out = []
    for row in range(s.shape[0]):
        part = np.argpartition(-s[row], k)[: k + 1] if s.shape[1] > k + 1 else np.arange(s.shape[1])
        # widen to every item tied with the k-th best so the tie rule is exact
        kth = np.sort(s[row, part])[::-1][min(k, len(part)) - 1]
        cand = np.nonzero(s[row] >= kth)[0]
        cand = cand[np.lexsort((cand, -s[row, cand]))]
        out.append([int(j) for j in cand[:k] if s[row, j] != -np.inf])
    return out


def evaluate(score_batch, x, truth, k=K, batch=256):
    """Mean NDCG@k and Recall@k over the customers of `truth`; `score_batch(users)` gives dense scores."""
    users = sorted(truth)
    lists, nd, rc = {}, [], []
    for start in range(0, len(users), batch):
        us = users[start:start + batch]
        scores = np.asarray(score_batch(np.array(us)))
        hist = [x.indices[x.indptr[u]:x.indptr[u + 1]] for u in us]
        for u, ranked in zip(us, top_k(scores, hist, k)):
            lists[u] = ranked
            a, b = ndcg_recall(ranked, truth[u], k)
            nd.append(a)
            rc.append(b)
    return {'ndcg': float(np.mean(nd)), 'recall': float(np.mean(rc)), 'customers': len(users)}, lists


# ---------------------------------------------------------------- models

def popularity(x, _r, _p):
    counts = np.asarray(x.sum(axis=0)).ravel()
    return lambda us: np.tile(counts, (len(us), 1))


_GRAM = {}


def gram(x):
    """X'X as a dense array, computed once per matrix (every grid point of item-kNN and EASE reuses it)."""
    if id(x) not in _GRAM:
        _GRAM[id(x)] = (x, (x.T @ x).toarray())
    return _GRAM[id(x)][1]


def cosine_shrunk(x, shrink):
    g = gram(x)
    norms = np.sqrt(np.diag(g))
    s = g / (np.outer(norms, norms) + shrink + 1e-300)
    np.fill_diagonal(s, 0.0)
    return s


def prune_rows(s, k):
    """Keep each row's k largest entries (item h's k most similar items)."""
    if k is None or k >= s.shape[1] - 1:
        return s
    out = np.zeros_like(s)
    idx = np.argpartition(-s, k, axis=1)[:, :k]
    rows = np.arange(s.shape[0])[:, None]
    out[rows, idx] = s[rows, idx]
    return out


def itemknn(x, _r, p):
    s = prune_rows(cosine_shrunk(x, p['shrink']), p['k'])
    return lambda us: x[us] @ s


def ease(x, _r, p):
    g = gram(x).copy()
    g[np.diag_indices_from(g)] += p['lambda']
    pinv = np.linalg.inv(g)
    b = pinv / (-np.diag(pinv))
    np.fill_diagonal(b, 0.0)
    return lambda us: x[us] @ b


def confidence(values, p):
    if p['scaling'] == 'log':
        return 1.0 + p['alpha'] * np.log1p(values / 1.0)
    return 1.0 + p['alpha'] * values


def als_sweep(r_rows, own, fixed, reg, p, steps):
    """One side of Hu et al. eq. 4 for every row at once, x_u = (Y'C_uY + reg I)^-1 Y'C_u 1 with p_ui = 1 where
    r_ui > 0, by `steps` conjugate-gradient steps warm-started from the current rows (Takacs, Pilaszy & Tikk
    2011): A_u v = (Y'Y + reg I) v + sum_i (c_ui - 1)(y_i.v) y_i, all rows vectorised over the nonzeros."""
    k = fixed.shape[1]
    gram_reg = fixed.T @ fixed + reg * np.eye(k)
    rows = np.repeat(np.arange(r_rows.shape[0]), np.diff(r_rows.indptr))
    c = confidence(r_rows.data, p)
    yc = fixed[r_rows.indices]
    weights = sp.csr_matrix((c - 1.0, r_rows.indices, r_rows.indptr), shape=r_rows.shape)

    def a_times(v):
        weights.data = (c - 1.0) * np.einsum('nk,nk->n', v[rows], yc)
        return v @ gram_reg + weights @ fixed

    b = sp.csr_matrix((c, r_rows.indices, r_rows.indptr), shape=r_rows.shape) @ fixed
    has = np.diff(r_rows.indptr) > 0
    x = np.where(has[:, None], own, 0.0)
    res = b - a_times(x)
    direction = res.copy()
    rs = np.einsum('nk,nk->n', res, res)
    for _ in range(steps):
        ap = a_times(direction)
        denom = np.einsum('nk,nk->n', direction, ap)
        step = np.divide(rs, denom, out=np.zeros_like(rs), where=denom > 0)
        x += step[:, None] * direction
        res -= step[:, None] * ap
        rs_new = np.einsum('nk,nk->n', res, res)
        direction = res + np.divide(rs_new, rs, out=np.zeros_like(rs), where=rs > 0)[:, None] * direction
        rs = rs_new
    return x


def ials(_x, r, p):
    rng = np.random.default_rng(p.get('seed', 1))
    k = p['factors']
    users = rng.normal(0, 0.01, (r.shape[0], k))
    items = rng.normal(0, 0.01, (r.shape[1], k))
    rt = r.T.tocsr()
    for _ in range(p['iterations']):
        users = als_sweep(r, users, items, p['regularization'], p, p.get('cgSteps', CG_STEPS))
        items = als_sweep(rt, items, users, p['regularization'], p, p.get('cgSteps', CG_STEPS))
    return lambda us: users[us] @ items.T


def content(x, _r, p):
    from sklearn.feature_extraction.text import TfidfVectorizer
    v = TfidfVectorizer(stop_words='english', smooth_idf=True, norm='l2').fit_transform(p['texts'])
    s = (v @ v.T).toarray()
    np.fill_diagonal(s, 0.0)
    counts = np.maximum(np.diff(x.indptr), 1)
    return lambda us: (x[us] @ s) / counts[us][:, None]


# ---------------------------------------------------------------- tuning

def grid(model, quick):
    if model == 'itemknn':
        ks = [20, 100, 400, None] if quick else [10, 20, 50, 100, 200, 400, None]
        shrinks = [0, 10, 100] if quick else [0, 10, 50, 200]
        return [[{'k': k, 'shrink': s} for k in ks for s in shrinks]]
    if model == 'ease':
        return [[{'lambda': l} for l in ([10, 100, 1000, 10000] if quick else [10, 30, 100, 300, 1000, 3000, 10000])]]
    if model == 'ials':
        it = 6 if quick else 8
        regs = [0.01, 1, 100] if quick else [0.01, 0.1, 1, 10, 100, 1000]
        conf = [('log', 1), ('log', 10), ('linear', 1)] if quick else [('log', 1), ('log', 100), ('linear', 0.1), ('linear', 1), ('linear', 10)]
        sizes = [32, 128] if quick else [32, 128, 256]
        # coordinate search over decades: regularisation, then confidence, then factors (each stage keeps the best so far)
        return [
            [{'factors': 64, 'regularization': g, 'scaling': 'log', 'alpha': 10, 'iterations': it} for g in regs],
            [{'scaling': s, 'alpha': a} for s, a in conf],
            [{'factors': f} for f in sizes],
        ]
    return [[{}]]


FITS = {'popularity': popularity, 'itemknn': itemknn, 'ease': ease, 'ials': ials, 'content': content}


def tune(model, vx, vr, vtruth, extra, quick, log):
    best, best_score, trials = None, -1.0, []
    for stage in grid(model, quick):
        base = dict(best or {})
        for point in stage:
            params = {**base, **point, **extra}
            t0 = time.time()
            result, _ = evaluate(FITS[model](vx, vr, params), vx, vtruth)
            shown = {k: v for k, v in params.items() if k not in ('texts',)}
            trials.append({'params': shown, 'ndcg': result['ndcg'], 'seconds': round(time.time() - t0, 2)})
            log(f'  {model:10} {json.dumps(shown)} validation NDCG@{K} {result["ndcg"]:.4f} ({time.time() - t0:.1f} s)')
            if result['ndcg'] > best_score:
                best, best_score = {k: v for k, v in params.items() if k != 'texts'}, result['ndcg']
    return best, best_score, trials


def main():
    ap = argparse.ArgumentParser(description='numpy/scipy reference for the quality benchmark')
    ap.add_argument('data')
    ap.add_argument('--out', default='bench/out/reference.json')
    ap.add_argument('--lists', default='bench/out/reference-lists.json')
    ap.add_argument('--models', default='popularity,itemknn,ease,ials,content')
    ap.add_argument('--quick', action='store_true', help='smaller grids (for a fast look; not the benchmark)')
    ap.add_argument('--seed', type=int, default=1)
    a = ap.parse_args()
    log = lambda s: print(s, file=sys.stderr, flush=True)
    t_all = time.time()
    d = Data(a.data)
    x, r = matrices(d.n_users, d.n_items, d.u, d.i, d.v)
    vx, vr, vtruth, vfrom = validation_split(d, a.seed)
    log(f'reference: {d.n_users} customers, {d.n_items} items, {len(d.u)} training signals; validation from {vfrom}, '
        f'{len(vtruth)} validation customers; {len(d.test)} test customers')
    report = {'k': K, 'validationFrom': vfrom, 'validationCustomers': len(vtruth), 'testCustomers': len(d.test),
              'numpy': np.__version__, 'models': {}}
    all_lists = {}
    for model in a.models.split(','):
        extra = {'texts': d.titles} if model == 'content' else {}
        t0 = time.time()
        best, vscore, trials = tune(model, vx, vr, vtruth, extra, a.quick, log)
        final = {**best, **extra}
        if model == 'ials':
            final['iterations'] = 15
            final['cgSteps'] = 2 * CG_STEPS
        t1 = time.time()
        result, lists = evaluate(FITS[model](x, r, final), x, d.test)
        log(f'{model:10} best {json.dumps(best)} -> test NDCG@{K} {result["ndcg"]:.4f} Recall@{K} {result["recall"]:.4f}')
        report['models'][model] = {**result, 'params': {k: v for k, v in final.items() if k != 'texts'},
                                   'validationNdcg': vscore, 'trials': trials,
                                   'tuneSeconds': round(t1 - t0, 1), 'fitAndTestSeconds': round(time.time() - t1, 1)}
        all_lists[model] = {d.customer_ids[u]: [d.item_ids[j] for j in ranked] for u, ranked in lists.items()}
    report['seconds'] = round(time.time() - t_all, 1)
    os.makedirs(os.path.dirname(a.out) or '.', exist_ok=True)
    with open(a.out, 'w') as f:
        json.dump(report, f, indent=1)
    with open(a.lists, 'w') as f:
        json.dump({'k': K, 'truth': {d.customer_ids[u]: sorted(d.item_ids[j] for j in t) for u, t in d.test.items()},
                   'lists': all_lists,
                   'metrics': {m: {'ndcg': v['ndcg'], 'recall': v['recall']} for m, v in report['models'].items()}}, f)
    log(f'reference done in {report["seconds"]} s')


if __name__ == '__main__':
    sys.exit(main())
