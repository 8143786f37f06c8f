import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import type { EditionSnapshot, SnapshotSlot } from '../../src-main/core/editing/snapshot.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import { csvCell, DISCLOSURE_NOTE, escapeHtml, exportEdition, exportNotes } from '../../src-main/services/export/index.ts';

function slot(k: number, title: string, promoted = false): SnapshotSlot {
  return {
    slot: k,
    itemId: k + 1,
    externalId: `SKU-${k + 1}`,
    title,
    category: 'lanterns',
    supplier: 'Mossgate',
    promoted,
    pinned: k === 0,
    score: 0.5,
    percentile: 0.9 - k * 0.1,
    rank: k + 1,
  };
}

/** Titles an attacker could plant in a catalogue import. */
const HOSTILE = ['=HYPERLINK("http://x.invalid","y")', '+1+2', '-2+3', '@SUM(A1)', '\tTab lead', '\rCR lead'];

const snapshot: EditionSnapshot = {
  edition: { id: 1, label: 'Week <10> & "friends"', date: '2026-03-02' },
  publishedAt: Date.parse('2026-03-01T10:00:00Z'),
  shelves: [
    {
      label: 'Front <script>alert(1)</script>',
      position: 1,
      brief: parseBrief({ size: 7 }),
      meter: null,
      violations: [],
      slots: [...HOSTILE.map((t, k) => slot(k, t, k === 1)), { ...slot(6, 'plain, with "quotes"'), externalId: null, title: null, itemId: null }],
    },
  ],
  editionMeter: null,
};

describe('CSV export', () => {
  // OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): cells beginning with
  // =, +, -, @, tab (0x09) or carriage return (0x0D) are prefixed with a single quote.
  it.each(['=', '+', '-', '@', '\t', '\r'])('neutralises a cell beginning with %j', (c) => {
    const cell = csvCell(`${c}1+1`);
    const unquoted = cell.startsWith('"') ? cell.slice(1, -1) : cell;
    expect(unquoted).toBe(`'${c}1+1`);
  });

  it('leaves other cells alone, including ones with a formula character later on', () => {
    expect(csvCell('lantern = light')).toBe('lantern = light');
    expect(csvCell(42)).toBe('42');
    expect(csvCell(null)).toBe('');
  });

  // RFC 4180 section 2: fields with commas, quotes or line breaks are quoted, quotes doubled. csv-parse,
  // an independent RFC 4180 reader, must read back exactly the neutralised values.
  it('round-trips through an RFC 4180 reader with every hostile title neutralised', () => {
    const text = exportEdition(snapshot, 'csv');
    // Strict: every record has the header's column count (csv-parse rejects a ragged record by default).
    const rows = parse(text) as string[][];
    expect(rows[0]).toEqual(['edition', 'date', 'shelf', 'slot', 'item', 'title', 'category', 'supplier', 'sponsored', 'pinned', 'percentile', 'rank']);
    expect(rows.slice(1, 4).map((r) => r[11])).toEqual(['1', '2', '3']);
    expect(rows.slice(1, 7).map((r) => r[5])).toEqual(HOSTILE.map((t) => `'${t}`));
    expect(rows.slice(1).every((r) => !/^[=+\-@\t\r]/.test(r.join('')))).toBe(true);
    expect(rows[2]![8]).toBe('Sponsored');
    expect(rows[1]![8]).toBe('');
    expect(rows[1]![0]).toBe('Week <10> & "friends"');
    expect(DISCLOSURE_NOTE).toMatch(/differ by country/);
  });

  // RFC 4180 section 2 defines a CSV as an optional header line and records of the same number of fields;
  // it has no comments, so a free-text note row would be read as a record. csv-parse with `columns: true`
  // (each record an object keyed by the header) reads exactly one record per slot and nothing else.
  it('is one table: a header and one record per slot, no note row; the note travels in a separate file', () => {
    const text = exportEdition(snapshot, 'csv');
    const records = parse(text, { columns: true }) as Record<string, string>[];
    expect(records).toHaveLength(snapshot.shelves[0]!.slots.length);
    expect(records.map((r) => r['slot'])).toEqual(['1', '2', '3', '4', '5', '6', '7']);
    expect(text).not.toContain('Note:');
    const notes = exportNotes(snapshot, 'csv')!;
    expect(notes).toContain(DISCLOSURE_NOTE);
    for (const column of Object.keys(records[0]!)) expect(notes).toMatch(new RegExp(`^  ${column}: `, 'm'));
    expect(exportNotes(snapshot, 'json')).toBeNull();
  });
});

describe('JSON export', () => {
  it('says "Sponsored" in words on promoted slots and carries the note', () => {
    const doc = JSON.parse(exportEdition(snapshot, 'json'));
    expect(doc.shelves[0].slots[1].sponsored).toBe('Sponsored');
    expect(doc.shelves[0].slots[0].sponsored).toBeNull();
    expect(doc.shelves[0].slots[0].title).toBe(HOSTILE[0]);
    expect(doc.note).toBe(DISCLOSURE_NOTE);
    expect(doc.shelves[0].slots).toHaveLength(7);
  });
});

describe('HTML preview', () => {
  const html = exportEdition(snapshot, 'html');

  it('has no scripts and makes no outside request', () => {
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/(src|href)\s*=\s*["']?\s*(https?:)?\/\//i);
    expect(html).not.toMatch(/<(link|img|iframe|object|embed)\b/i);
    expect(html).not.toMatch(/@import|url\(/i);
  });

  it('escapes every text it shows', () => {
    expect(html).toContain('Front &lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).toContain('Week &lt;10&gt; &amp; &quot;friends&quot;');
    expect(html).toContain('=HYPERLINK(&quot;http://x.invalid&quot;,&quot;y&quot;)');
    // HTML Living Standard, "escapingString": & < > " are the characters that need it (' too in attributes).
    expect(escapeHtml(`<a href='x'>&</a>`)).toBe('&lt;a href=&#39;x&#39;&gt;&amp;&lt;/a&gt;');
  });

  it('labels the sponsored item in words and carries the disclosure note', () => {
    expect(html.match(/>Sponsored</g)).toHaveLength(1);
    // The label is its own element on its own line, apart from the supplier (read as text: "Mossgate Sponsored").
    expect(html).toMatch(/<span class="meta">lanterns · Mossgate<\/span> <span class="sponsored">Sponsored<\/span>/);
    expect(html).toMatch(/\.meta \{[^}]*display: block/);
    expect(html).toContain(escapeHtml(DISCLOSURE_NOTE));
    expect(html).toMatch(/<style>/);
  });
});

describe('percentiles in the exports', () => {
  it('are on one scale, 0 to 100, in the CSV and the JSON alike', () => {
    const csv = parse(exportEdition(snapshot, 'csv'), { columns: true }) as Record<string, string>[];
    const json = JSON.parse(exportEdition(snapshot, 'json')) as { shelves: { slots: { percentile: number | null }[] }[] };
    const fromJson = json.shelves.flatMap((s) => s.slots.map((x) => x.percentile));
    expect(fromJson.slice(0, 3)).toEqual([90, 80, 70]);
    expect(csv.map((r) => (r['percentile'] === '' ? null : Number(r['percentile'])))).toEqual(fromJson);
  });
});
