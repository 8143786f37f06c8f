import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { importFile } from '../../src-main/services/import.ts';
import { ItemRepo } from '../../src-main/store/items.ts';
import { freshWorkspace, tempDir, write } from './helpers.ts';

const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let k = 0;
async function items(content: string | Buffer, name = 'e.csv') {
  const db = freshWorkspace(dir, `e${++k}.shelf`);
  const r = await importFile(db, { target: 'items', file: write(dir, `${k}-${name}`, content) });
  return { r, repo: new ItemRepo(db) };
}

describe('CSV edge cases', () => {
  it('quoted fields with embedded newlines, quotes and delimiters', async () => {
    const { r, repo } = await items('id,title,description\nq1,"The ""Quiet"" Room","Line one\nline two, with a comma"\nq2,Plain,x\n');
    expect(r.added).toBe(2);
    expect(repo.byExternalId('q1')).toMatchObject({ title: 'The "Quiet" Room', description: 'Line one\nline two, with a comma' });
  });
  it('a UTF-8 byte order mark before the header', async () => {
    const { r, repo } = await items(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('id,title\nå1,Ærø Ferry\n')]));
    expect(r.mapping.id).toBe('id');
    expect(repo.byExternalId('å1')!.title).toBe('Ærø Ferry');
  });
  it('CRLF line endings, with line numbers still right for errors', async () => {
    const { r } = await items('id,title,price\r\nc1,A,1\r\nc2,B,-1\r\n');
    expect(r.errors[0]).toMatchObject({ line: 3, column: 3 });
    const ok = await items('id,title,price\r\nc1,A,1\r\nc2,B,2\r\n');
    expect(ok.repo.byExternalId('c2')!.price).toBe(2);
  });
  it("semicolon-delimited files, and ';' as a tag separator only when the delimiter is ','", async () => {
    const semi = await items('id;title;tags\ns1;Semi;a|b\n');
    expect(semi.r.delimiter).toBe(';');
    expect(semi.repo.byExternalId('s1')!.tags).toEqual(['a', 'b']);
    const comma = await items('id,title,tags\ns2,Comma,a;b|c\n');
    expect(comma.repo.byExternalId('s2')!.tags).toEqual(['a', 'b', 'c']);
  });
  it('a 1 MB description', async () => {
    const long = 'lorem ipsum '.repeat(90_000); // 1,080,000 characters
    const { r, repo } = await items(`id,title,description\nbig,Big,"${long}"\nsmall,Small,s\n`);
    expect(r.added).toBe(2);
    expect(repo.byExternalId('big')!.description).toBe(long);
  });
});
