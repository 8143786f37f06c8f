/**
 * Reads one leaf column of a Parquet file page by page, as flat values with their repetition and
 * definition levels (Melnik et al. 2010, "Dremel", §4; the Parquet format spec, "Nested Encoding"),
 * without assembling rows into JavaScript arrays: a million 64-float factor rows assembled by the library
 * cost gigabytes of small arrays, while a page of flat values costs its own bytes. Decoding (pages, snappy,
 * dictionaries, levels) is hyparquet's; this file walks the column chunks of one row group at a time, so
 * memory is bounded by one column chunk, not by the file.
 */
import fs from 'node:fs';
import { asyncBufferFromFile, parquetMetadataAsync, type FileMetaData, type ParquetType, type SchemaTree } from 'hyparquet';
import { parquetHeader } from 'hyparquet/src/column.js';
import { convertWithDictionary, DEFAULT_PARSERS } from 'hyparquet/src/convert.js';
import { decompressPage, readDataPage, readDataPageV2 } from 'hyparquet/src/datapage.js';
import { readRleBitPackedHybrid } from 'hyparquet/src/encoding.js';
import { readPlain } from 'hyparquet/src/plain.js';
import { snappyUncompress } from 'hyparquet/src/snappy.js';
import { getSchemaPath } from 'hyparquet/src/schema.js';
import { InputError } from '../../core/errors.ts';

/** Indexable values of one page (a typed array, or a plain array after dictionary look-up). */
export interface Values {
  readonly length: number;
  readonly [i: number]: unknown;
}

/** One data page of a leaf column. */
export interface LeafPage {
  /** Definition level per entry; undefined when every entry is at the max level (hyparquet drops the levels then). */
  definition: ArrayLike<number> | undefined;
  /** Entries in the page (values, plus nulls and empty lists). */
  entries: number;
  /** Repetition level per entry; empty when the column is not repeated (one entry per row). */
  repetition: ArrayLike<number>;
  /** The present values only, in order (entries below the max definition level have none). */
  values: Values;
}

export interface LeafColumn {
  /** The leaf's path in the schema, e.g. ['features', 'list', 'element']. */
  path: string[];
  maxDefinition: number;
  maxRepetition: number;
  /** Definition level at which a repeated ancestor holds at least one entry (lists: non-empty). */
  repeatedDefinition: number;
  type: string;
}

export interface ParquetFile {
  file: string;
  metadata: FileMetaData;
  rows: number;
}

/** Reads a file's footer; a file that is not Parquet is refused with its name. */
export async function openParquet(file: string): Promise<ParquetFile> {
  try {
    const metadata = await parquetMetadataAsync(await asyncBufferFromFile(file));
    return { file, metadata, rows: Number(metadata.num_rows) };
  } catch (e) {
    throw new InputError(`not a readable Parquet file (${(e as Error).message})`, { file });
  }
}

/**
 * The single leaf under top-level column `name` (a flat column is its own leaf; a list column's leaf is
 * its element), or an InputError naming the file when the column is missing or has several leaves.
 */
export function leafOf(p: ParquetFile, name: string): LeafColumn {
  const top = getSchemaPath(p.metadata.schema, [])[0]!;
  let node: SchemaTree | undefined = top.children.find((c) => c.element.name === name);
  if (!node) {
    const have = top.children.map((c) => c.element.name).join(', ');
    throw new InputError(`has no column '${name}' (its columns: ${have || 'none'})`, { file: p.file });
  }
  const path = [node.element.name];
  while (node.children.length > 0) {
    if (node.children.length !== 1) throw new InputError(`column '${name}' is a structure of several fields, not a list of numbers`, { file: p.file });
    node = node.children[0]!;
    path.push(node.element.name);
  }
  const schemaPath = getSchemaPath(p.metadata.schema, path);
  let maxDefinition = 0;
  let maxRepetition = 0;
  let repeatedDefinition = 0;
  for (const { element } of schemaPath.slice(1)) {
    if (element.repetition_type !== 'REQUIRED') maxDefinition++;
    if (element.repetition_type === 'REPEATED') {
      maxRepetition++;
      repeatedDefinition = maxDefinition;
    }
  }
  return { path, maxDefinition, maxRepetition, repeatedDefinition, type: node.element.type ?? 'unknown' };
}

/**
 * Calls `onPage` for every data page of `leaf` in row group `group`, in order. Reads only that column
 * chunk's bytes from disk.
 */
export function readLeafPages(p: ParquetFile, group: number, leaf: LeafColumn, onPage: (page: LeafPage) => void, scratch: Scratch = newScratch()): void {
  const rowGroup = p.metadata.row_groups[group]!;
  const chunk = rowGroup.columns.find((c) => c.meta_data && c.meta_data.path_in_schema.join('.') === leaf.path.join('.'));
  if (!chunk?.meta_data) throw new InputError(`row group ${group + 1} has no data for column ${leaf.path.join('.')}`, { file: p.file });
  const meta = chunk.meta_data;
  if (meta.codec !== 'SNAPPY' && meta.codec !== 'UNCOMPRESSED') {
    throw new InputError(
      `column ${leaf.path.join('.')} is compressed with ${meta.codec}, which this reader does not decode: save with Spark's default, snappy (spark.sql.parquet.compression.codec=snappy)`,
      { file: p.file },
    );
  }
  const start = Number(meta.dictionary_page_offset ?? meta.data_page_offset);
  const length = Number(meta.total_compressed_size);
  const bytes = grow(scratch, 'chunk', length);
  const fd = fs.openSync(p.file, 'r');
  try {
    let got = 0;
    while (got < length) {
      const n = fs.readSync(fd, bytes, got, length - got, start + got);
      if (n === 0) throw new InputError(`ends inside row group ${group + 1} (truncated file?)`, { file: p.file });
      got += n;
    }
  } finally {
    fs.closeSync(fd);
  }
  const schemaPath = getSchemaPath(p.metadata.schema, leaf.path);
  const element = schemaPath[schemaPath.length - 1]!.element;
  const decoder = {
    pathInSchema: leaf.path,
    type: meta.type,
    element,
    schemaPath,
    codec: meta.codec,
    parsers: DEFAULT_PARSERS,
  };
  const reader = { view: new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength), offset: 0 };
  let dictionary: Values | undefined;
  try {
    while (reader.offset < length - 1) {
      const header = parquetHeader(reader);
      const body = bytes.subarray(reader.offset, reader.offset + header.compressed_page_size);
      reader.offset += header.compressed_page_size;
      if (header.type === 'DICTIONARY_PAGE') {
        const page = decompressPage(body, Number(header.uncompressed_page_size), meta.codec, undefined);
        const count = header.dictionary_page_header!.num_values;
        dictionary = readPlain({ view: new DataView(page.buffer, page.byteOffset, page.byteLength), offset: 0 }, meta.type, count, element.type_length);
      } else if (header.type === 'DATA_PAGE') {
        const daph = header.data_page_header!;
        const size = Number(header.uncompressed_page_size);
        if (daph.encoding === 'PLAIN' && (meta.codec === 'SNAPPY' || meta.codec === 'UNCOMPRESSED')) {
          // Into reused buffers: a row group's garbage is otherwise freed late, and a few of them add up.
          let page = body;
          if (meta.codec === 'SNAPPY') {
            page = grow(scratch, 'page', size);
            snappyUncompress(body, page);
          }
          onPage(readPlainPage(scratch, page, daph.num_values, leaf, meta.type, element.type_length));
        } else {
          const page = decompressPage(body, size, meta.codec, undefined);
          const d = readDataPage(page, daph, decoder);
          onPage(leafPage(d, convertWithDictionary(d.dataPage, dictionary as never, daph.encoding, decoder)));
        }
      } else if (header.type === 'DATA_PAGE_V2') {
        const daph2 = header.data_page_header_v2!;
        const d = readDataPageV2(body, header, decoder);
        onPage(leafPage(d, convertWithDictionary(d.dataPage, dictionary as never, daph2.encoding, decoder)));
      }
      // INDEX_PAGE and unknown page types carry no values.
    }
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError(`could not read column ${leaf.path.join('.')} in row group ${group + 1} (${(e as Error).message})`, { file: p.file });
  }
}

function leafPage(d: { definitionLevels: number[] | undefined; repetitionLevels: number[] }, values: Values): LeafPage {
  const def = d.definitionLevels && d.definitionLevels.length > 0 ? d.definitionLevels : undefined;
  const entries = def ? def.length : d.repetitionLevels.length > 0 ? d.repetitionLevels.length : values.length;
  return { definition: def, repetition: d.repetitionLevels, values, entries };
}

/**
 * A version-1 data page of PLAIN values, its levels decoded into bytes (one byte per entry, where the library
 * makes a JavaScript array of 8-byte numbers: a DuckDB row group of 122,880 rows × 64 factors is one page of
 * 7.9 million entries, 126 MB of level arrays the library's way, 16 MB this way). Levels are RLE/bit-packed
 * hybrid with a 4-byte length prefix in a v1 page (Parquet format spec, "Data Pages"); hyparquet decodes them.
 */
function readPlainPage(scratch: Scratch, page: Uint8Array, entries: number, leaf: LeafColumn, type: ParquetType, typeLength: number | undefined): LeafPage {
  const reader = { view: new DataView(page.buffer, page.byteOffset, page.byteLength), offset: 0 };
  let repetition: Uint8Array = NO_LEVELS;
  if (leaf.maxRepetition > 0) {
    repetition = grow(scratch, 'repetition', entries);
    readRleBitPackedHybrid(reader, 32 - Math.clz32(leaf.maxRepetition), repetition);
  }
  let definition: Uint8Array | undefined;
  let present = entries;
  if (leaf.maxDefinition > 0) {
    definition = grow(scratch, 'definition', entries);
    readRleBitPackedHybrid(reader, 32 - Math.clz32(leaf.maxDefinition), definition);
    present = 0;
    for (let e = 0; e < entries; e++) if (definition[e] === leaf.maxDefinition) present++;
    if (present === entries) definition = undefined;
  }
  let values: Values;
  if (type === 'FLOAT' && LITTLE_ENDIAN) {
    // The floats follow the levels at any byte offset: copied into a reused, aligned buffer.
    const raw = grow(scratch, 'values', 4 * present);
    raw.set(page.subarray(reader.offset, reader.offset + 4 * present));
    values = new Float32Array(raw.buffer, 0, present);
  } else values = readPlain(reader, type, present, typeLength) as Values;
  return { definition, repetition, values, entries };
}

const LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/**
 * Buffers reused from page to page and row group to row group by one reader (readLeafPages is synchronous and
 * its caller consumes each page before the next, so one set serves all its reads). Dropped with the reader,
 * so a long-running app keeps none of it after an import.
 */
export type Scratch = Map<string, Uint8Array>;
export const newScratch = (): Scratch => new Map();

function grow(scratch: Scratch, name: string, length: number): Uint8Array {
  let b = scratch.get(name);
  if (!b || b.length < length) {
    b = new Uint8Array(Math.max(length, Math.ceil((b?.length ?? 0) * 1.25)));
    scratch.set(name, b);
  }
  return b.subarray(0, length);
}

const NO_LEVELS = new Uint8Array(0);
