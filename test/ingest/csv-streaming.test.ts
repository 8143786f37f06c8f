import { afterAll, describe, expect, it } from 'vitest';
import { parse as parseReference, CsvError } from 'csv-parse/sync';
import fs from 'node:fs';
import { InputError } from '../../src-main/core/errors.ts';
import { readSource } from '../../src-main/ingest/source.ts';
import { tempDir, write } from './helpers.ts';

/**
 * The CSV reader streams the file through Papa Parse in 1 MiB chunks and counts record lines itself.
 * External check: across chunk boundaries, multi-byte text, quotes and line breaks, the records must be
 * exactly those csv-parse/sync (another well-kept RFC 4180 reader, whole file in one call) reads, and an
 * error's line must be the one it reports. Where the two readers differ by design, the test says so.
 */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let n = 0;
async function ours(content: string | Buffer, delimiter?: string): Promise<{ all: string[][]; lines: number[] }> {
  const file = write(dir, `s-${++n}.csv`, content);
  const all: string[][] = [];
  const lines: number[] = [];
  await readSource(
    file,
    'csv',
    { header: (h) => void all.push(h), newColumn: () => {}, broken: () => {}, row: (v, line) => void (all.push(v as string[]), lines.push(line)) },
    delimiter,
  );
  return { all, lines };
}
const reference = (content: string, delimiter = ',') =>
  (parseReference(content, { delimiter, bom: true, relax_column_count: true, skip_empty_lines: false }) as string[][]).filter(
    (r) => !(r.length === 1 && r[0] === ''),
  );

/** `rows` plain records, then `tail`: big enough to cross the reader's 1 MiB chunks when rows is large. */
function plainThen(rows: number, tail: string, eol = '\n'): string {
  const out = [`id,title,note${eol}`];
  for (let i = 0; i < rows; i++) out.push(`i${i},Ærø ${i} ✓, spaces kept ${eol}`); // multi-byte text across chunk edges
  return out.join('') + tail;
}

describe('streaming CSV reading agrees with csv-parse on the whole file', () => {
  const cases: [string, string][] = [
    ['LF, no quotes at all', plainThen(40_000, 'last,row,here')],
    ['CRLF, no quotes at all', plainThen(40_000, 'last,row,here\r\n', '\r\n')],
    ['a quoted field after 1.5 MB (hand-over mid-file, mid-chunk)', plainThen(40_000, 'q,"a ""quoted"", field\nwith a line break",x\nz,y,x\n')],
    ['CRLF with a quoted CRLF after the first chunk', plainThen(40_000, 'q,"two\r\nlines",x\r\nz,y,x\r\n', '\r\n')],
    ['a bare CR inside an LF file (a data character, as csv-parse keeps it)', plainThen(100, 'a,b\rc,d\ne,f,g\n')],
    ['blank lines and a BOM', `\uFEFFid,title\n\nb1,x\n\n\nb2,y\n`],
    ['a trailing delimiter and short rows', 'id,title,x\nb1,t,\nb2\n,,,\n'],
  ];
  for (const [name, content] of cases) {
    it(name, async () => {
      expect((await ours(content)).all).toEqual(reference(content));
    });
  }

  it('an LF line inside a CRLF file is a record of its own (csv-parse, set on CRLF, would keep the LF as data)', async () => {
    // Files glued together from two sources mix line breaks; reading LF as a break keeps each row a row,
    // as Python's csv reader does (docs: "The reader is hard-coded to recognise either '\r' or '\n' as
    // end-of-line", quoted from memory).
    const r = await ours(plainThen(2, 'a,b,c\nd,e,f\r\n', '\r\n'));
    expect(r.all.slice(-2)).toEqual([['a', 'b', 'c'], ['d', 'e', 'f']]);
    expect(r.lines).toEqual([2, 3, 4, 5]);
  });

  it('semicolon and tab delimiters', async () => {
    const semi = plainThen(2_000, 'q;"x;y";z\n').replaceAll(',', ';');
    expect((await ours(semi, ';')).all).toEqual(reference(semi, ';'));
    const tab = plainThen(2_000, 'q\t"x\ty"\tz\n').replaceAll(',', '\t');
    expect((await ours(tab, '\t')).all).toEqual(reference(tab, '\t'));
  });

  it('line numbers stay those of the file across chunks', async () => {
    const r = await ours(plainThen(3, 'q,"two\nlines",x\nz,y,x\n'));
    // header line 1, plain rows on lines 2-4, the quoted record spans lines 5-6, the last record is line 7.
    expect(r.lines).toEqual([2, 3, 4, 5, 7]);
  });

  it('a malformed quote deep in the file is reported on the line csv-parse gives for the whole file', async () => {
    const content = plainThen(30_000, 'x,y,z\nq,"fine",x\nz,"y"y,x\n');
    let expected: number | undefined;
    try {
      reference(content);
    } catch (e) {
      expected = (e as CsvError & { lines: number }).lines;
    }
    expect(expected).toBe(30_004); // header + 30,000 rows + 2 good rows, then the bad one
    const e = await ours(content).then(() => undefined, (x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).where.line).toBe(expected);
    expect((e as InputError).message).toMatch(/not readable as CSV/);
  });
});
