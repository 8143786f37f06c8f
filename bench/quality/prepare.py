#!/usr/bin/python3
"""Converts the UCI "Online Retail" file into Shelfwright import files and the fixed quality split.

Dataset: Online Retail, Daqing Chen (2015), UCI Machine Learning Repository, doi:10.24432/C5BW33,
licence CC BY 4.0; described in Chen, Sain & Guo (2012), J. Database Marketing & Customer Strategy
Management 19(3):197-208, doi:10.1057/dbm.2012.17. A UK gift-ware shop's 541,909 invoice lines,
2010-12-01 to 2011-12-09. See bench/quality/README.md.

Input: the UCI columns InvoiceNo, StockCode, Description, Quantity, InvoiceDate, UnitPrice, CustomerID,
Country as CSV (the UCI .xlsx saved as CSV; InvoiceDate as "YYYY-MM-DD HH:MM[:SS]").

What is dropped, and why (counts are printed):
- cancellations (InvoiceNo starting with "C") and lines with Quantity <= 0: returns and stock corrections
  are not purchases;
- lines without a CustomerID: they cannot be tied to a customer;
- lines with UnitPrice <= 0: stock adjustments and free samples, not sales;
- service codes that are not products (postage, fees, manual lines, samples, vouchers): SERVICE_CODES below.

Output (in OUT):
- items.csv:   id, title, description, category, price, added   (title = the code's most frequent
               description; description and category are left empty, the file has no such fields;
               price = median unit price of the training lines; added = first training sale)
- signals.csv: customer, item, kind, value, at   every kept purchase; lines of one invoice for the same
               (customer, item, minute) are summed, since the workspace keeps one signal per identity
- train.csv:   the signals before the split time (what both sides train on)
- test.csv:    customer, item   the held-out pairs (distinct), see split below
- split.json:  the split's parameters and counts

The split (fixed, seeded, documented):
- global time split: signals at or after SPLIT_AT (the last 28 days of the log) are the test window;
- the catalogue is the items sold before SPLIT_AT (an item first sold in the test window cannot be
  ranked by a model trained before it: it is counted and dropped from the truth);
- test customers have at least one training purchase and at least one test-window purchase of a
  catalogue item they did not buy in training; at most --customers of them are kept, sampled with
  random.Random(--seed) from the sorted ids; their truth is those new items (items already bought in
  training are excluded, as the evaluators exclude them from the rankings).

--slice N makes the small CI fixture instead: see make_slice().
"""
import argparse
import csv
import json
import os
import random
import statistics
import sys
from collections import Counter, defaultdict
from datetime import datetime

SPLIT_AT = '2011-11-11T00:00'
SLICE_MAX_SIGNALS = 40
SERVICE_CODES = {'POST', 'DOT', 'M', 'm', 'D', 'C2', 'S', 'B', 'BANK CHARGES', 'PADS', 'CRUK', 'AMAZONFEE'}


def parse_time(s):
    s = s.strip()
    for fmt in ('%Y-%m-%d %H:%M:%S', '%Y-%m-%d %H:%M', '%m/%d/%Y %H:%M', '%d/%m/%Y %H:%M'):
        try:
            return datetime.strptime(s, fmt).strftime('%Y-%m-%dT%H:%M')
        except ValueError:
            pass
    raise ValueError(f'unreadable InvoiceDate {s!r}')


def read_raw(path):
    counts = Counter()
    lines = []  # (customer, item, at, quantity, price, description)
    with open(path, newline='', encoding='utf-8') as f:
        for row in csv.DictReader(f):
            counts['lines'] += 1
            inv, code = row['InvoiceNo'].strip(), row['StockCode'].strip()
            qty, price, cust = int(float(row['Quantity'])), float(row['UnitPrice']), row['CustomerID'].strip()
            if inv.upper().startswith('C'):
                counts['dropped: cancellation'] += 1
            elif qty <= 0:
                counts['dropped: quantity <= 0'] += 1
            elif cust == '':
                counts['dropped: no customer'] += 1
            elif price <= 0:
                counts['dropped: unit price <= 0'] += 1
            elif code in SERVICE_CODES or code.lower().startswith('gift_'):
                counts['dropped: service code'] += 1
            else:
                counts['kept'] += 1
                if cust.endswith('.0'):
                    cust = cust[:-2]
                lines.append((cust, code, parse_time(row['InvoiceDate']), qty, price, row['Description'].strip()))
    return lines, counts


def write_csv(path, header, rows):
    with open(path, 'w', newline='', encoding='utf-8') as f:
        w = csv.writer(f, lineterminator='\n')
        w.writerow(header)
        w.writerows(rows)


def convert(lines):
    """Signals summed per (customer, item, minute); items from the training lines."""
    summed = defaultdict(int)
    for cust, code, at, qty, _p, _d in lines:
        summed[(cust, code, at)] += qty
    signals = sorted(((c, i, 'purchase', q, at) for (c, i, at), q in summed.items()), key=lambda r: (r[4], r[0], r[1]))
    return signals


def catalogue(lines, before):
    names, prices, first = defaultdict(Counter), defaultdict(list), {}
    for cust, code, at, qty, price, desc in lines:
        if at >= before:
            continue
        if desc:
            names[code][desc] += 1
        prices[code].append(price)
        if code not in first or at < first[code]:
            first[code] = at
    items = []
    for code in sorted(first):
        title = min(names[code].items(), key=lambda kv: (-kv[1], kv[0]))[0] if names[code] else code
        items.append((code, title, '', '', f'{statistics.median(prices[code]):.2f}', first[code]))
    return items


def split(signals, item_ids, n_customers, seed, split_at=SPLIT_AT, order=None, unseen='items first sold'):
    """The global time split shared by every data set's preparation: signals before `split_at` train, the rest test.
    A test pair counts when its customer has training history, its item is in the catalogue (`item_ids`) and the
    customer did not have it in training; `n_customers` of the eligible customers are drawn with `seed`, listed in
    `order` (a sort key; None sorts the id strings). `unseen` names the items left out for the dropped-pairs count."""
    train = [s for s in signals if s[4] < split_at]
    test = [s for s in signals if s[4] >= split_at]
    had = defaultdict(set)
    for c, i, *_ in train:
        had[c].add(i)
    new = defaultdict(set)
    dropped = Counter()
    for c, i, *_ in test:
        if c not in had:
            dropped['test pairs of customers without training history'] += 1
        elif i not in item_ids:
            dropped[f'test pairs of {unseen} in the test window'] += 1
        elif i in had[c]:
            dropped['test pairs the customer already bought in training'] += 1
        else:
            new[c].add(i)
    eligible = sorted(new, key=order)
    chosen = sorted(random.Random(seed).sample(eligible, min(n_customers, len(eligible))), key=order)
    pairs = [(c, i) for c in chosen for i in sorted(new[c], key=order)]
    return train, test, eligible, chosen, pairs, dropped


def make_slice(signals_path, out, n_items, n_customers, seed):
    """The CI fixture: the n_items items bought by most customers before SPLIT_AT, then n_customers
    customers sampled (seeded) among those with 3 to SLICE_MAX_SIGNALS training signals and a new
    test-window purchase on those items (the cap keeps the file small: wholesalers with hundreds of lines
    would fill it); every signal of theirs on those items is kept, and the same split rule is applied."""
    with open(signals_path, newline='', encoding='utf-8') as f:
        signals = [(r['customer'], r['item'], r['kind'], int(r['value']), r['at']) for r in csv.DictReader(f)]
    buyers = defaultdict(set)
    for c, i, _k, _v, at in signals:
        if at < SPLIT_AT:
            buyers[i].add(c)
    top = set(sorted(buyers, key=lambda i: (-len(buyers[i]), i))[:n_items])
    tr, te, n_train = defaultdict(set), defaultdict(set), Counter()
    for c, i, _k, _v, at in signals:
        if i in top:
            (tr if at < SPLIT_AT else te)[c].add(i)
            n_train[c] += at < SPLIT_AT
    eligible = sorted(c for c in tr if len(tr[c]) >= 3 and n_train[c] <= SLICE_MAX_SIGNALS and te[c] - tr[c])
    chosen = set(random.Random(seed).sample(eligible, min(n_customers, len(eligible))))
    kept = [s for s in signals if s[0] in chosen and s[1] in top]
    return kept


def main():
    ap = argparse.ArgumentParser(description=__doc__.split('\n')[0])
    ap.add_argument('raw', help='the UCI Online Retail file as CSV')
    ap.add_argument('out', help='folder for the import files')
    ap.add_argument('--customers', type=int, default=1000, help='test customers kept (default 1000)')
    ap.add_argument('--seed', type=int, default=20111111)
    ap.add_argument('--slice', nargs=2, type=int, metavar=('ITEMS', 'CUSTOMERS'), help='make the small CI fixture from OUT/signals.csv')
    a = ap.parse_args()
    os.makedirs(a.out, exist_ok=True)
    if a.slice:
        kept = make_slice(os.path.join(a.raw, 'signals.csv'), a.out, a.slice[0], a.slice[1], a.seed)
        lines = [(c, i, at, v, None, None) for c, i, _k, v, at in kept]
        full_items = {r['id']: r for r in csv.DictReader(open(os.path.join(a.raw, 'items.csv'), newline='', encoding='utf-8'))}
        signals = sorted(kept, key=lambda r: (r[4], r[0], r[1]))
        first = {}
        for c, i, _k, _v, at in signals:
            if at < SPLIT_AT and (i not in first or at < first[i]):
                first[i] = at
        items = [(i, full_items[i]['title'], '', '', full_items[i]['price'], first[i]) for i in sorted(first)]
        n_test = 10 ** 9
    else:
        lines, counts = read_raw(a.raw)
        for k, v in counts.items():
            print(f'{k:>40}: {v:,}')
        signals = convert(lines)
        items = catalogue(lines, SPLIT_AT)
        n_test = a.customers
    item_ids = {r[0] for r in items}
    train, test, eligible, chosen, pairs, dropped = split(signals, item_ids, n_test, a.seed)
    write_csv(os.path.join(a.out, 'items.csv'), ['id', 'title', 'description', 'category', 'price', 'added'], items)
    write_outputs(a.out, {'dataset': 'Online Retail (UCI, doi:10.24432/C5BW33), CC BY 4.0', 'split': 'global time', 'testFrom': SPLIT_AT, 'seed': a.seed},
                  signals, train, test, items, eligible, chosen, pairs, dropped, write_signals=not a.slice)


def write_outputs(out, head, signals, train, test, items, eligible, chosen, pairs, dropped, write_signals=True):
    """signals.csv (if write_signals), train.csv, test.csv and split.json (head + the split's counts); prints the counts.
    Shared with prepare_movielens.py."""
    if write_signals:
        write_csv(os.path.join(out, 'signals.csv'), ['customer', 'item', 'kind', 'value', 'at'], signals)
    write_csv(os.path.join(out, 'train.csv'), ['customer', 'item', 'kind', 'value', 'at'], train)
    write_csv(os.path.join(out, 'test.csv'), ['customer', 'item'], pairs)
    info = {
        **head,
        'signals': len(signals), 'train': len(train), 'testWindowSignals': len(test),
        'items': len(items), 'trainCustomers': len({s[0] for s in train}),
        'eligibleTestCustomers': len(eligible), 'testCustomers': len(chosen), 'testPairs': len(pairs),
        'dropped': dict(dropped),
    }
    with open(os.path.join(out, 'split.json'), 'w') as f:
        json.dump(info, f, indent=2)
        f.write('\n')
    for k, v in info.items():
        print(f'{k:>40}: {v}')


if __name__ == '__main__':
    sys.exit(main())
