#!/usr/bin/python3
"""Converts MovieLens 100K into Shelfwright import files and a fixed quality split (the second real data set).

Dataset: MovieLens 100K, GroupLens Research (University of Minnesota), released 1998; F. Maxwell Harper and
Joseph A. Konstan (2015), The MovieLens Datasets: History and Context, ACM TiiS 5(4):19, doi:10.1145/2827872.
Licence: the data set's README (research use; acknowledge it in publications; no redistribution without
GroupLens's permission; no commercial use without permission), so it is never committed here. 100,000 ratings
(1 to 5 stars) by 943 users of 1,682 films, 1997-09-20 to 1998-04-22. See bench/quality/README.md.

Why this set: a service of a very different kind from the gift-ware wholesaler of bench/quality/prepare.py
(film ratings by private viewers, not invoice lines of shops), with item text (title and genres) and times, and
small enough that the reference's full tuning runs in minutes.

Input: the ml-100k folder (u.data: user, item, rating, unix time, tab-separated; u.item: '|'-separated, Latin-1,
title in field 2 and 19 genre flags in fields 6-24; u.genre: the genre names in flag order).

What is kept, and why (counts are printed):
- ratings of 3 stars or more: 1 and 2 stars are dislikes, not positive feedback. Shelfwright's own matrix gives a
  rating r the weight max(0, r - 2.5) (core/matrix/build.ts RATING_NEUTRAL), so 1 and 2 stars weigh nothing
  there; dropping them here keeps both sides' training pairs, histories and truths identical;
- nothing else is dropped (MovieLens has one rating per user and film).

Output (in OUT), the same files as prepare.py:
- items.csv:   id, title, description, category, price, added  (title = the film's title with its year;
               description = its genre names, so that both content models read them as words; category and
               price empty; added = its first training rating)
- signals.csv: customer, item, kind, value, at   every kept rating: kind 'rating', value = stars (3, 4 or 5),
               at = the rating's UTC time
- train.csv:   the signals before the split time
- test.csv:    customer, item   the held-out pairs (distinct)
- split.json:  the split's parameters and counts

The split (fixed, seeded, documented), the same rule as prepare.py:
- global time split: ratings at or after SPLIT_AT (the last 66 days of the log) are the test window;
- the catalogue is the films rated before SPLIT_AT (a film first rated in the test window is dropped from the
  truth);
- test customers have at least one training rating and at least one test-window rating of a catalogue film they
  did not rate in training; at most --customers of them are kept, sampled with random.Random(--seed) from the
  sorted ids (with the default 1,000 every eligible customer is kept: there are 127); their truth is those films.
"""
import argparse
import os
import sys
from collections import Counter
from datetime import datetime, timezone

from prepare import split, write_csv, write_outputs  # the same split and output files as the Online Retail preparation

SPLIT_AT = '1998-02-15T00:00:00'
MIN_STARS = 3


def read_genres(folder):
    names = []
    with open(os.path.join(folder, 'u.genre'), encoding='latin-1') as f:
        for line in f:
            line = line.strip()
            if line:
                name, idx = line.rsplit('|', 1)
                names.append((int(idx), name))
    return [n for _i, n in sorted(names)]


def read_films(folder, genres):
    films = {}
    with open(os.path.join(folder, 'u.item'), encoding='latin-1') as f:
        for line in f:
            fields = line.rstrip('\r\n').split('|')
            if len(fields) < 5 + len(genres):
                continue
            flags = fields[5:5 + len(genres)]
            # 'unknown' is the flag of a film without a genre, not a genre word
            words = [g for g, flag in zip(genres, flags) if flag == '1' and g != 'unknown']
            films[fields[0]] = (fields[1].strip(), ' '.join(words))
    return films


def read_ratings(folder):
    counts = Counter()
    signals = []
    with open(os.path.join(folder, 'u.data'), encoding='latin-1') as f:
        for line in f:
            line = line.strip()
            if not line:
                continue
            user, item, stars, ts = line.split('\t')[:4]
            counts['ratings'] += 1
            if int(stars) < MIN_STARS:
                counts[f'dropped: under {MIN_STARS} stars'] += 1
                continue
            counts['kept'] += 1
            at = datetime.fromtimestamp(int(ts), tz=timezone.utc).strftime('%Y-%m-%dT%H:%M:%S')
            signals.append((user, item, 'rating', int(stars), at))
    signals.sort(key=lambda r: (r[4], int(r[0]), int(r[1])))
    return signals, counts


def main():
    ap = argparse.ArgumentParser(description=__doc__.split('\n')[0])
    ap.add_argument('raw', help='the ml-100k folder (u.data, u.item, u.genre)')
    ap.add_argument('out', help='folder for the import files')
    ap.add_argument('--customers', type=int, default=1000, help='test customers kept at most (default 1000)')
    ap.add_argument('--seed', type=int, default=19980215)
    a = ap.parse_args()
    genres = read_genres(a.raw)
    films = read_films(a.raw, genres)
    signals, counts = read_ratings(a.raw)
    for k, v in counts.items():
        print(f'{k:>40}: {v:,}')
    unknown = sorted({s[1] for s in signals} - set(films))
    if unknown:
        sys.exit(f'u.data names films that u.item lacks: {unknown[:5]}')
    first = {}
    for _c, i, _k, _v, at in signals:
        if at < SPLIT_AT and i not in first:
            first[i] = at  # signals are in time order
    items = [(i, films[i][0], films[i][1], '', '', first[i]) for i in sorted(first, key=int)]
    train, test, eligible, chosen, pairs, dropped = split(signals, set(first), a.customers, a.seed, SPLIT_AT, order=int, unseen='films first rated')  # one rating per user and film: no test pair is a training pair
    os.makedirs(a.out, exist_ok=True)
    write_csv(os.path.join(a.out, 'items.csv'), ['id', 'title', 'description', 'category', 'price', 'added'], items)
    write_outputs(a.out, {
        'dataset': 'MovieLens 100K (GroupLens; Harper & Konstan 2015, doi:10.1145/2827872), research use, not redistributed',
        'split': 'global time', 'testFrom': SPLIT_AT, 'seed': a.seed, 'minStars': MIN_STARS,
    }, signals, train, test, items, eligible, chosen, pairs, dropped)


if __name__ == '__main__':
    sys.exit(main())
