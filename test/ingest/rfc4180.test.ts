import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { readSource } from '../../src-main/ingest/source.ts';
import { tempDir, write } from './helpers.ts';

/**
 * External check: RFC 4180, "Common Format and MIME Type for Comma-Separated Values (CSV) Files",
 * section 2, rules 1-7. Each case is the RFC's own example (with CRLF written out) and the records the
 * RFC says it holds. The first record is read as our header; we check header + rows together.
 */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let n = 0;
async function records(content: string): Promise<{ all: string[][]; lines: number[] }> {
  const file = write(dir, `rfc-${++n}.csv`, content);
  const all: string[][] = [];
  const lines: number[] = [];
  await readSource(file, 'csv', {
    header: (h) => void all.push(h),
    newColumn: () => {},
    broken: () => {},
    row: (v, line) => {
      all.push(v as string[]);
      lines.push(line);
    },
  });
  return { all, lines };
}

describe('CSV reading per RFC 4180 section 2', () => {
  it('rule 1: each record is on its own line, delimited by CRLF', async () => {
    expect((await records('aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n')).all).toEqual([['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });
  it('rule 2: the last record may have no ending line break', async () => {
    expect((await records('aaa,bbb,ccc\r\nzzz,yyy,xxx')).all).toEqual([['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });
  it('rule 3: an optional header line has the same format as records', async () => {
    const r = await records('field_name,field_name2,field_name3\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n');
    expect(r.all).toEqual([['field_name', 'field_name2', 'field_name3'], ['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });
  it('rule 4: fields are separated by commas and spaces are part of a field', async () => {
    expect((await records('aaa,bbb,ccc\r\n a , b ,c \r\n')).all).toEqual([['aaa', 'bbb', 'ccc'], [' a ', ' b ', 'c ']]);
  });
  it('rule 5: fields may be enclosed in double quotes', async () => {
    expect((await records('"aaa","bbb","ccc"\r\nzzz,yyy,xxx\r\n')).all).toEqual([['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });
  it('rule 5: a double quote inside an unquoted field is kept as data, not refused', async () => {
    // Rule 5 tells writers not to put one there; for readers, RFC 4180 section 3 ("Interoperability
    // considerations") asks implementors to "be liberal in what you accept from others" (quoted from memory).
    // A catalogue title such as 12" pot then imports as written.
    expect((await records('aaa,bbb,ccc\r\nz"zz,12" pot,xxx\r\n')).all).toEqual([['aaa', 'bbb', 'ccc'], ['z"zz', '12" pot', 'xxx']]);
  });
  it('rule 5: text after the closing quote of a quoted field is refused with its line', async () => {
    const e = await records('aaa,bbb,ccc\r\nzzz,"yy"y,xxx\r\n').then(() => undefined, (x: unknown) => x);
    expect((e as Error).message).toMatch(/not readable as CSV: text follows the closing double quote/);
    expect((e as { where: { line: number } }).where.line).toBe(2);
  });
  it('rule 6: quoted fields hold line breaks, double quotes and commas; line numbers follow the file', async () => {
    const r = await records('"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx\r\nq,"a,b",c\r\n');
    expect(r.all).toEqual([['aaa', 'b\r\nbb', 'ccc'], ['zzz', 'yyy', 'xxx'], ['q', 'a,b', 'c']]);
    // The header spans lines 1-2, so the records start on lines 3 and 4.
    expect(r.lines).toEqual([3, 4]);
  });
  it('rule 7: a double quote inside a quoted field is escaped by doubling it', async () => {
    expect((await records('"aaa","b""bb","ccc"\r\nx,y,z\r\n')).all).toEqual([['aaa', 'b"bb', 'ccc'], ['x', 'y', 'z']]);
  });
});
