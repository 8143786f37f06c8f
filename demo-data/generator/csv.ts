/** CSV output: RFC 4180 quoting and buffered writing through one stream per file. */
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';

/** Quotes a field when it holds a comma, quote or line break, doubling inner quotes (RFC 4180, section 2). */
export function csvField(s: string): string {
  return /[",\r\n]/.test(s) ? '"' + s.replace(/"/g, '""') + '"' : s;
}

const BATCH = 8192;

/**
 * Writes a header and `count` rows, joining rows into batches so the stream sees a few hundred
 * writes rather than one per row, and waiting for 'drain' when the stream's buffer is full.
 */
export async function writeCsv(path: string, header: string, count: number, row: (k: number) => string): Promise<void> {
  const stream = createWriteStream(path, { encoding: 'utf8' });
  const failed = new Promise<never>((_, reject) => stream.once('error', reject));
  const write = async (chunk: string): Promise<void> => {
    if (!stream.write(chunk)) await Promise.race([once(stream, 'drain'), failed]);
  };
  await write(header + '\n');
  const lines: string[] = [];
  for (let k = 0; k < count; k++) {
    lines.push(row(k));
    if (lines.length === BATCH || k === count - 1) {
      await write(lines.join('\n') + '\n');
      lines.length = 0;
    }
  }
  stream.end();
  await Promise.race([once(stream, 'finish'), failed]);
}
