/**
 * A Parquet run file (contract section 9), opened for reading one row group at a time:
 *
 *   file handle ──footer──► schema, row groups, codecs (checked before any row)
 *        │      ──row group g, needed columns only──► hyparquet ──► one decoded array per column
 *        └──sequential 1 MiB reads──► SHA-256 of the bytes as stored (alongside, same handle)
 *
 * Memory is bounded by one row group: the bytes of its needed column chunks and their decoded
 * arrays, never the whole file (`AsyncBuffer` reads exactly the slices hyparquet asks for).
 * The library (hyparquet) decodes plain, dictionary and delta pages; the decompressors are Node's
 * zlib for gzip and brotli, and hyparquet-compressors for snappy (WebAssembly, faster than the
 * JavaScript one hyparquet has built in), zstd and lz4. Flat columns (all a run file has) are read
 * page by page here with the library's page decoders (`readFlat`); any other column goes through
 * the library's row-group reader.
 */
import { createHash } from "node:crypto";
import type { FileHandle } from "node:fs/promises";
import { brotliDecompressSync, gunzipSync } from "node:zlib";
import {
  type AsyncBuffer,
  type ColumnData,
  type CompressionCodec,
  type Compressors,
  type DecodedArray,
  type FileMetaData,
  type SchemaElement,
  type SchemaTree,
  parquetMetadataAsync,
  parquetRead,
  parquetSchema,
} from "hyparquet";
import { compressors as extraCompressors } from "hyparquet-compressors";
import { parquetHeader, readPage } from "hyparquet/src/column.js";
import { DEFAULT_PARSERS, convert, convertWithDictionary } from "hyparquet/src/convert.js";
import { decompressPage, readDataPage, readDataPageV2 } from "hyparquet/src/datapage.js";
import { getMaxDefinitionLevel } from "hyparquet/src/schema.js";
import * as ingestMessages from "../messages/ingest.js";
import { UserError } from "../messages/error.js";
import { openRunFile } from "./openFile.js";

/** The four bytes a Parquet file starts and ends with. */
const MAGIC = "PAR1";

/** Decompressors by codec; UNCOMPRESSED needs none. */
const COMPRESSORS: Compressors = {
  SNAPPY: extraCompressors.SNAPPY,
  GZIP: (input) => gunzipSync(input),
  BROTLI: (input) => brotliDecompressSync(input),
  ZSTD: extraCompressors.ZSTD,
  LZ4: extraCompressors.LZ4,
  LZ4_RAW: extraCompressors.LZ4_RAW,
};

/** The codecs Sojourn reads, for messages. */
export const PARQUET_CODECS: readonly CompressionCodec[] = ["UNCOMPRESSED", "SNAPPY", "GZIP", "ZSTD", "BROTLI", "LZ4", "LZ4_RAW"];

/** A counting seam for tests: what the reader held at once. */
export interface ParquetProbe {
  /** The most rows whose decoded cells were held at one time. */
  mostRowsHeld: number;
  /**
   * The longest single read of the file's bytes for a row group (the footer is read once, up to
   * 512 KiB from the end; the hash reads 1 MiB at a time).
   */
  longestRead: number;
  /** Row groups read. */
  groups: number;
}

export function newProbe(): ParquetProbe {
  return { mostRowsHeld: 0, longestRead: 0, groups: 0 };
}

/** One top-level column of the file. */
export interface ParquetColumn {
  name: string;
  /** The Parquet type in words, for messages: `DOUBLE`, `BYTE_ARRAY (UTF8)`, `a nested group`. */
  type: string;
  /** Whether its cells come out as numbers (integers and floating point), texts, or other values. */
  kind: "number" | "text" | "other";
  /** Whether it is not one plain value per row: a group (a list, a struct, a map) or a repeated field. */
  nested: boolean;
}

/** One row group: its 0-based first row and its number of rows. */
export interface RowGroupSpan {
  start: number;
  rows: number;
}

const HASH_CHUNK = 1 << 20;

/** Describes a schema element's type for a message: `INT64 (TIMESTAMP_MILLIS)`. */
function typeName(e: SchemaElement, nested: boolean): string {
  if (nested) return `a nested group${e.converted_type !== undefined ? ` (${e.converted_type})` : ""}`;
  const logical = e.logical_type?.type;
  const extra = e.converted_type ?? (logical !== undefined && logical !== "INTEGER" ? logical : undefined);
  return extra === undefined ? String(e.type) : `${e.type} (${extra})`;
}

/** How the cells of a leaf column come out of hyparquet. */
function kindOf(e: SchemaElement): ParquetColumn["kind"] {
  const ct = e.converted_type;
  const logical = e.logical_type?.type;
  switch (e.type) {
    case "DOUBLE":
    case "FLOAT":
      return "number";
    case "INT32":
    case "INT64":
      if (ct === undefined || ct.startsWith("INT_") || ct.startsWith("UINT_") || ct === "DECIMAL") {
        return logical === undefined || logical === "INTEGER" || logical === "DECIMAL" ? "number" : "other";
      }
      return "other";
    case "FIXED_LEN_BYTE_ARRAY":
      return ct === "DECIMAL" || logical === "DECIMAL" || logical === "FLOAT16" ? "number" : "other";
    case "BYTE_ARRAY":
      if (ct === "DECIMAL" || logical === "DECIMAL") return "number";
      // Unannotated byte arrays are decoded as UTF-8 texts too (hyparquet's default), as older writers mean them.
      return ct === undefined && logical === undefined ? "text" : ct === "UTF8" || ct === "ENUM" || logical === "STRING" || logical === "ENUM" ? "text" : "other";
    default:
      return "other";
  }
}

export class ParquetRunFile {
  readonly columns: ParquetColumn[];
  readonly groups: RowGroupSpan[];
  readonly rows: number;
  private readonly buffer: AsyncBuffer;
  /** For each top-level column, its leaf when it is flat (no nesting, not repeated), else null. */
  private readonly flat: (FlatLeaf | null)[];

  private constructor(
    private readonly handle: FileHandle,
    readonly display: string,
    readonly bytes: number,
    private readonly metadata: FileMetaData,
    private readonly probe: ParquetProbe,
  ) {
    const tree = parquetSchema(metadata);
    this.flat = tree.children.map((c) =>
      c.children.length === 0 && c.element.repetition_type !== "REPEATED"
        ? { name: c.element.name, element: c.element, path: [tree, c], maxDefinition: getMaxDefinitionLevel([tree, c]) }
        : null,
    );
    this.columns = tree.children.map((c, i) => {
      const nested = c.children.length > 0;
      const repeated = !nested && this.flat[i] === null;
      const type = (repeated ? "a repeated " : "") + typeName(c.element, nested);
      return { name: c.element.name, type, kind: nested ? "other" : kindOf(c.element), nested: this.flat[i] === null };
    });
    let start = 0;
    this.groups = metadata.row_groups.map((g) => {
      const span = { start, rows: Number(g.num_rows) };
      start += span.rows;
      return span;
    });
    this.rows = start;
    this.buffer = fileBuffer(handle, bytes, probe);
  }

  /**
   * Opens a `.parquet` run file and reads its footer. Throws the user's message for a file that is
   * not Parquet, is cut short, or uses a compression there is no decompressor for.
   */
  static async open(path: string, display: string, probe: ParquetProbe = newProbe()): Promise<ParquetRunFile> {
    const handle = await openRunFile(path, display);
    try {
      const bytes = (await handle.stat()).size;
      const head = Buffer.alloc(4);
      const tail = Buffer.alloc(4);
      if (bytes >= 4) await handle.read(head, 0, 4, 0);
      if (head.toString("latin1") !== MAGIC) throw ingestMessages.notParquet(display, bytes);
      if (bytes >= 12) await handle.read(tail, 0, 4, bytes - 4);
      if (bytes < 12 || tail.toString("latin1") !== MAGIC) {
        throw ingestMessages.truncatedParquet(display, bytes, "it does not end with the 4 bytes `PAR1`");
      }
      let metadata: FileMetaData;
      try {
        // The footer is fetched in one read of up to 512 KiB from the end (the library's initial fetch), not counted in the probe.
        metadata = await parquetMetadataAsync(fileBuffer(handle, bytes, newProbe()));
      } catch (e) {
        throw ingestMessages.truncatedParquet(display, bytes, detailOf(e));
      }
      const file = new ParquetRunFile(handle, display, bytes, metadata, probe);
      file.checkCodecs();
      return file;
    } catch (e) {
      await handle.close();
      throw e;
    }
  }

  /** Every column chunk's codec has a decompressor (checked before any row is read). */
  private checkCodecs(): void {
    for (const g of this.metadata.row_groups) {
      for (const c of g.columns) {
        const codec = c.meta_data?.codec;
        if (codec !== undefined && !PARQUET_CODECS.includes(codec)) {
          throw ingestMessages.unsupportedParquetCodec(this.display, c.meta_data!.path_in_schema.join("."), codec, PARQUET_CODECS);
        }
      }
    }
  }

  /** The index of the top-level column `name`, or -1. */
  indexOf(name: string): number {
    return this.columns.findIndex((c) => c.name === name);
  }

  /**
   * The decoded cells of the named top-level columns in row group `g`, one array per name, each
   * `groups[g].rows` long (`null` or `undefined` for a null cell). Reads only those columns' chunks.
   */
  async readGroup(g: number, names: readonly string[]): Promise<DecodedArray[]> {
    const span = this.groups[g];
    const damaged = (detail: string) => ingestMessages.damagedParquet(this.display, g + 1, span.start + 1, span.start + span.rows, detail);
    const out = new Map<string, DecodedArray>();
    const nested: string[] = [];
    for (const name of new Set(names)) {
      const i = this.indexOf(name);
      if (span.rows > 0 && i >= 0 && this.flat[i] !== null) out.set(name, await this.readFlat(g, this.flat[i]!, damaged));
      else nested.push(name);
    }
    if (nested.length > 0) {
      const parts = new Map<string, ColumnData[]>(nested.map((n) => [n, []]));
      if (span.rows > 0) {
        try {
          await parquetRead({
            file: this.buffer,
            metadata: this.metadata,
            columns: nested,
            rowStart: span.start,
            rowEnd: span.start + span.rows,
            compressors: COMPRESSORS,
            onChunk: (chunk) => parts.get(chunk.columnName)?.push(chunk),
          });
        } catch (e) {
          if (e instanceof UserError) throw e;
          throw damaged(detailOf(e));
        }
      }
      for (const n of nested) out.set(n, span.rows === 0 ? [] : joined(parts.get(n)!, span, damaged));
    }
    this.probe.groups++;
    this.probe.mostRowsHeld = Math.max(this.probe.mostRowsHeld, span.rows);
    return names.map((n) => out.get(n)!);
  }

  /**
   * The cells of a flat (top-level, not repeated) column in row group `g`, decoded page by page
   * with the library's page decoders; a null cell (definition level below the column's) is null.
   * This does what hyparquet's own column reader does for such a column, without its general
   * assembly of nested lists, which costs more than the decoding for a column that may hold nulls.
   */
  private async readFlat(g: number, leaf: FlatLeaf, damaged: (detail: string) => UserError): Promise<DecodedArray> {
    const rows = this.groups[g].rows;
    const chunk = this.metadata.row_groups[g].columns.find((c) => c.meta_data?.path_in_schema.length === 1 && c.meta_data.path_in_schema[0] === leaf.name);
    const meta = chunk?.meta_data;
    if (meta === undefined) throw damaged(`column \`${leaf.name}\` has no data in this row group`);
    const start = Number(meta.dictionary_page_offset || meta.data_page_offset);
    const length = Number(meta.total_compressed_size);
    if (!(start >= 0 && length >= 0 && start + length <= this.bytes)) throw damaged(`column \`${leaf.name}\` points past the end of the file`);
    const bytes = await this.buffer.slice(start, start + length);
    const decoder = { pathInSchema: meta.path_in_schema, type: meta.type, element: leaf.element, schemaPath: leaf.path, codec: meta.codec, parsers: DEFAULT_PARSERS, compressors: COMPRESSORS, utf8: true };
    const reader = { view: new DataView(bytes), offset: 0 };
    // A column that may hold nulls is written straight into one array of the group's cells; a
    // required one keeps its pages' arrays (typed arrays for numbers), joined at the end.
    const cells: unknown[] | null = leaf.maxDefinition > 0 ? new Array<unknown>(rows) : null;
    const pieces: DecodedArray[] = [];
    let dictionary: DecodedArray | undefined;
    let held = 0;
    try {
      while (held < rows && reader.offset < reader.view.byteLength - 1) {
        const header = parquetHeader(reader);
        let levels: ArrayLike<number> | undefined;
        let values: DecodedArray;
        let n: number;
        if (header.type === "DICTIONARY_PAGE") {
          const { data } = readPage(reader, header, decoder, dictionary, undefined, 0);
          if (data !== undefined) dictionary = convert(data, decoder);
          continue;
        }
        const compressed = new Uint8Array(bytes, reader.offset, header.compressed_page_size);
        reader.offset += header.compressed_page_size;
        if (header.type === "DATA_PAGE" && header.data_page_header !== undefined) {
          const daph = header.data_page_header;
          const page = decompressPage(compressed, Number(header.uncompressed_page_size), meta.codec, COMPRESSORS);
          const read = readDataPage(page, daph, decoder);
          levels = read.definitionLevels;
          values = convertWithDictionary(read.dataPage, dictionary, daph.encoding, decoder);
          n = daph.num_values;
        } else if (header.type === "DATA_PAGE_V2" && header.data_page_header_v2 !== undefined) {
          const daph2 = header.data_page_header_v2;
          const read = readDataPageV2(compressed, header, decoder);
          levels = read.definitionLevels;
          values = convertWithDictionary(read.dataPage, dictionary, daph2.encoding, decoder);
          n = daph2.num_values;
        } else continue; // an index page: nothing to read
        if (held + n > rows) throw damaged(`column \`${leaf.name}\` gives more cells than the row group's ${rows} rows`);
        if (cells === null) pieces.push(values);
        else if (levels === undefined || levels.length === 0) {
          if (values.length !== n) throw damaged(`a page of column \`${leaf.name}\` gives ${values.length} cells for ${n} rows`);
          for (let i = 0; i < n; i++) cells[held + i] = values[i];
        } else {
          const max = leaf.maxDefinition;
          let j = 0;
          for (let i = 0; i < n; i++) cells[held + i] = levels[i] === max ? values[j++] : null;
        }
        held += n;
      }
    } catch (e) {
      if (e instanceof UserError) throw e;
      throw damaged(detailOf(e));
    }
    const total = cells === null ? pieces.reduce((sum, p) => sum + p.length, 0) : held;
    if (total !== rows) throw damaged(`column \`${leaf.name}\` gives ${total} cells for ${rows} rows`);
    if (cells !== null) return cells as DecodedArray;
    return concatenated(pieces, total);
  }

  /**
   * Hashes the file's bytes as stored, in order, with 1 MiB reads of the same handle (run alongside
   * the row groups' reads): to `stored` when given, else into the returned SHA-256 (hex).
   */
  async digest(stored?: (chunk: Buffer) => void): Promise<string> {
    const hash = stored === undefined ? createHash("sha256") : null;
    for (let at = 0; at < this.bytes; ) {
      const buf = Buffer.allocUnsafe(Math.min(HASH_CHUNK, this.bytes - at));
      const { bytesRead } = await this.handle.read(buf, 0, buf.length, at);
      if (bytesRead === 0) throw ingestMessages.truncatedParquet(this.display, this.bytes, "the file got shorter while it was read");
      const chunk = buf.subarray(0, bytesRead);
      if (hash !== null) hash.update(chunk);
      else stored!(chunk);
      at += bytesRead;
    }
    return hash === null ? "" : hash.digest("hex");
  }

  close(): Promise<void> {
    return this.handle.close();
  }
}

/** A flat column: its schema element, its schema path (root, leaf) and its highest definition level (0: required). */
interface FlatLeaf {
  name: string;
  element: SchemaElement;
  path: SchemaTree[];
  maxDefinition: number;
}

/** The pieces of one column in one row group, as one array of `span.rows` cells. */
function joined(parts: ColumnData[], span: RowGroupSpan, damaged: (detail: string) => UserError): DecodedArray {
  parts.sort((a, b) => a.rowStart - b.rowStart);
  let total = 0;
  for (const p of parts) total += p.columnData.length;
  if (parts.length === 0 || parts[0].rowStart !== span.start || total !== span.rows) {
    throw damaged(`a column gives ${total} cells for ${span.rows} rows`);
  }
  return concatenated(parts.map((p) => p.columnData), total);
}

/** Arrays of cells one after the other, as one array of `total` cells. */
function concatenated(pieces: DecodedArray[], total: number): DecodedArray {
  if (pieces.length === 1) return pieces[0];
  const first = pieces[0];
  // Typed arrays of one kind (a required number column, one piece per page) are copied as memory.
  if (first !== undefined && !Array.isArray(first) && pieces.every((p) => p.constructor === first.constructor)) {
    const out = new (first.constructor as new (n: number) => Float64Array)(total);
    let at = 0;
    for (const p of pieces) {
      out.set(p as Float64Array, at);
      at += p.length;
    }
    return out;
  }
  const out = new Array<unknown>(total);
  let at = 0;
  for (const data of pieces) for (let i = 0; i < data.length; i++) out[at++] = data[i];
  return out as DecodedArray;
}

/** An `AsyncBuffer` over an open file: each slice is one positioned read of exactly its bytes. */
function fileBuffer(handle: FileHandle, bytes: number, probe: ParquetProbe): AsyncBuffer {
  return {
    byteLength: bytes,
    async slice(start: number, end: number = bytes): Promise<ArrayBuffer> {
      const length = Math.max(0, Math.min(end, bytes) - start);
      probe.longestRead = Math.max(probe.longestRead, length);
      const out = new ArrayBuffer(length);
      let done = 0;
      while (done < length) {
        const { bytesRead } = await handle.read(new Uint8Array(out, done), 0, length - done, start + done);
        if (bytesRead === 0) throw new Error(`the file ends at byte ${start + done}, inside data its footer points to`);
        done += bytesRead;
      }
      return out;
    },
  };
}

/** An error of the library in words (its message without the `parquet ` prefix it adds). */
function detailOf(e: unknown): string {
  const message = e instanceof Error ? e.message : String(e);
  return message.replace(/^parquet\s+/i, "");
}
