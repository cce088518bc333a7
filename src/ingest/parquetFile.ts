/**
 * A Parquet run file (contract section 9), opened for reading one row group at a time:
 *
 *   file handle ──footer──► schema, row groups, codecs (checked before any row)
 *        │      ──row group g, needed columns only──► hyparquet ──► one decoded array per column
 *        └──sequential 1 MiB reads──► SHA-256 of the bytes as stored (alongside, same handle)
 *
 * Memory is bounded by one row group: the bytes of its needed column chunks and their decoded
 * arrays, never the whole file (`AsyncBuffer` reads exactly the slices hyparquet asks for).
 * The library (hyparquet) decodes plain, dictionary and delta pages; the decompressors are
 * hyparquet's own snappy, Node's zlib for gzip and brotli, and hyparquet-compressors for zstd and
 * lz4.
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
  parquetMetadataAsync,
  parquetRead,
  parquetSchema,
} from "hyparquet";
import { compressors as extraCompressors } from "hyparquet-compressors";
import * as ingestMessages from "../messages/ingest.js";
import { UserError } from "../messages/error.js";
import { openRunFile } from "./openFile.js";

/** The four bytes a Parquet file starts and ends with. */
const MAGIC = "PAR1";

/** Decompressors by codec; UNCOMPRESSED and SNAPPY need none (hyparquet decodes them itself). */
const COMPRESSORS: Compressors = {
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

  private constructor(
    private readonly handle: FileHandle,
    readonly display: string,
    readonly bytes: number,
    private readonly metadata: FileMetaData,
    private readonly probe: ParquetProbe,
  ) {
    const tree = parquetSchema(metadata);
    this.columns = tree.children.map((c) => {
      const nested = c.children.length > 0;
      return { name: c.element.name, type: typeName(c.element, nested), kind: nested ? "other" : kindOf(c.element) };
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
    const parts = new Map<string, ColumnData[]>(names.map((n) => [n, []]));
    if (names.length > 0 && span.rows > 0) {
      try {
        await parquetRead({
          file: this.buffer,
          metadata: this.metadata,
          columns: [...new Set(names)],
          rowStart: span.start,
          rowEnd: span.start + span.rows,
          compressors: COMPRESSORS,
          onChunk: (chunk) => parts.get(chunk.columnName)?.push(chunk),
        });
      } catch (e) {
        if (e instanceof UserError) throw e;
        throw ingestMessages.damagedParquet(this.display, g + 1, span.start + 1, span.start + span.rows, detailOf(e));
      }
    }
    this.probe.groups++;
    this.probe.mostRowsHeld = Math.max(this.probe.mostRowsHeld, span.rows);
    return names.map((n) => joined(parts.get(n)!, span, (detail) => ingestMessages.damagedParquet(this.display, g + 1, span.start + 1, span.start + span.rows, detail)));
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

/** The pieces of one column in one row group, as one array of `span.rows` cells. */
function joined(parts: ColumnData[], span: RowGroupSpan, damaged: (detail: string) => UserError): DecodedArray {
  parts.sort((a, b) => a.rowStart - b.rowStart);
  const total = parts.reduce((n, p) => n + p.columnData.length, 0);
  if (parts.length === 0 || parts[0].rowStart !== span.start || total !== span.rows) {
    throw damaged(`a column gives ${total} cells for ${span.rows} rows`);
  }
  if (parts.length === 1) return parts[0].columnData;
  const out: unknown[] = [];
  for (const p of parts) for (let i = 0; i < p.columnData.length; i++) out.push(p.columnData[i]);
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
