import { describe, expect, it } from 'vitest';
import { planColumns } from '../../src-main/ingest/fields.ts';

/** The fields a signal file's header row is matched to, without any --map. */
const detect = (headers: string[], kind?: 'other') => planColumns('plays.csv', 'signals', headers, {}, kind).mapping;

describe('signal headers of published logs map without a mapping', () => {
  it('reads MovieLens ratings.csv (userId, movieId, rating, timestamp)', () => {
    // The column names of ratings.csv as the MovieLens README documents them (Harper & Konstan 2015,
    // "The MovieLens Datasets: History and Context", ACM TiiS 5(4)).
    expect(detect(['userId', 'movieId', 'rating', 'timestamp'], 'other')).toEqual({ customer: 'userId', item: 'movieId', value: 'rating', at: 'timestamp' });
  });

  it('reads Book-Crossing ratings (User-ID, ISBN, Book-Rating)', () => {
    // BX-Book-Ratings.csv's header (Ziegler, McNee, Konstan & Lausen 2005, the Book-Crossing dataset).
    expect(detect(['User-ID', 'ISBN', 'Book-Rating'], 'other')).toEqual({ customer: 'User-ID', item: 'ISBN', value: 'Book-Rating' });
  });

  it('reads the UCI Online Retail invoice lines (CustomerID, StockCode, Quantity, InvoiceDate)', () => {
    // The original file's columns (Chen 2015, doi:10.24432/C5BW33; test/fixtures/online-retail/README.md).
    const headers = ['InvoiceNo', 'StockCode', 'Description', 'Quantity', 'InvoiceDate', 'UnitPrice', 'CustomerID', 'Country'];
    expect(detect(headers, 'other')).toEqual({ customer: 'CustomerID', item: 'StockCode', value: 'Quantity', at: 'InvoiceDate' });
  });
});

describe('common export names for the item and the count', () => {
  // Names a shop's or a service's export gives its columns (common practice, no source).
  it.each(['artist', 'Track', 'song', 'product', 'SKU', 'article', 'book', 'movie', 'game', 'Track ID', 'song_id', 'film'])('takes %s as the item', (h) => {
    expect(detect(['user', h, 'count'], 'other').item).toBe(h);
  });

  it.each(['plays', 'play_count', 'Play Count', 'count', 'quantity', 'qty', 'times', 'times_played', 'listens', 'units'])('takes %s as the value', (h) => {
    expect(detect(['customer_id', 'product', h], 'other').value).toBe(h);
  });

  it.each(['listener', 'username', 'buyer_id', 'client_id', 'account_id'])('takes %s as the customer', (h) => {
    expect(detect([h, 'sku', 'qty'], 'other').customer).toBe(h);
  });

  it('tells a count of times from a time', () => {
    expect(detect(['user', 'song', 'times', 'time'], 'other')).toEqual({ customer: 'user', item: 'song', value: 'times', at: 'time' });
  });

  it('refuses two columns that could both be the item, and takes the one the editor names', () => {
    expect(() => detect(['user', 'artist', 'track', 'plays'], 'other')).toThrow("columns 'artist' and 'track' could both be item; pass a mapping");
    const plan = planColumns('plays.csv', 'signals', ['user', 'artist', 'track', 'plays'], { item: 'artist' }, 'other');
    expect(plan.mapping).toEqual({ customer: 'user', item: 'artist', value: 'plays' });
  });

  it('still needs a customer column: a file of products and counts alone is refused with what it has', () => {
    expect(() => detect(['product', 'quantity'], 'other')).toThrow('missing required column customer for signals (columns: product, quantity)');
  });
});

describe('item files', () => {
  it('take a stock code or an ISBN as the id', () => {
    expect(planColumns('items.csv', 'items', ['StockCode', 'Description', 'UnitPrice']).mapping).toMatchObject({ id: 'StockCode', description: 'Description', price: 'UnitPrice' });
    expect(planColumns('books.csv', 'items', ['ISBN', 'Book-Title', 'Book-Author', 'Publisher']).mapping).toMatchObject({ id: 'ISBN', supplier: 'Publisher' });
  });
});
