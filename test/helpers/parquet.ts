/**
 * Parquet run files written in the tests with hyparquet-writer: the same rows as a CSV file, in
 * any codec and row-group size.
 *
 * Compressors: snappy is the writer's own, gzip and brotli are Node's zlib. Node 20 has no zstd
 * compressor, so ZSTD pages are written as zstd frames of raw (stored) blocks (RFC 8878 section
 * 3.1.1.2: block type 0, the bytes as they are), which any zstd decoder reads; that checks that
 * the reader hands ZSTD pages to its zstd decompressor, not that decompressor's entropy decoding.
 */
import { brotliCompressSync, gzipSync } from "node:zlib";
import { type ColumnSource, parquetWriteBuffer } from "hyparquet-writer";
import type { CompressionCodec } from "hyparquet";

/** A zstd frame holding `input` in raw blocks of at most 128 KiB (RFC 8878). */
export function zstdStored(input: Uint8Array): Uint8Array {
  const BLOCK = 128 * 1024;
  const blocks = Math.max(1, Math.ceil(input.length / BLOCK));
  const out = new Uint8Array(4 + 1 + 4 + blocks * 3 + input.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, 0xfd2fb528, true); // magic number
  out[4] = (2 << 6) | (1 << 5); // frame content size in 4 bytes, single segment (no window descriptor)
  view.setUint32(5, input.length, true);
  let at = 9;
  for (let b = 0; b < blocks; b++) {
    const part = input.subarray(b * BLOCK, Math.min(input.length, (b + 1) * BLOCK));
    const header = (part.length << 3) | (0 << 1) | (b === blocks - 1 ? 1 : 0); // size, raw block, last?
    out[at] = header & 0xff;
    out[at + 1] = (header >> 8) & 0xff;
    out[at + 2] = (header >> 16) & 0xff;
    out.set(part, at + 3);
    at += 3 + part.length;
  }
  return out;
}

const COMPRESSORS = {
  GZIP: (input: Uint8Array) => new Uint8Array(gzipSync(input)),
  BROTLI: (input: Uint8Array) => new Uint8Array(brotliCompressSync(input)),
  ZSTD: zstdStored,
  /** A codec with no decompressor in Sojourn: the pages are written as they are and marked LZO. */
  LZO: (input: Uint8Array) => input,
};

export interface ParquetOptions {
  codec?: CompressionCodec;
  /** Rows per row group (default: all rows in one group). */
  rowGroupSize?: number;
}

/** A Parquet file of the given columns. */
export function parquetFile(columns: ColumnSource[], options: ParquetOptions = {}): Buffer {
  const rows = columns[0]?.data.length ?? 0;
  const buffer = parquetWriteBuffer({
    columnData: columns,
    codec: options.codec ?? "SNAPPY",
    compressors: COMPRESSORS,
    rowGroupSize: options.rowGroupSize ?? Math.max(1, rows),
  });
  return Buffer.from(buffer);
}

/** One event row: time, series, value (null: empty), entity (null: empty). */
export type EventRow = [number, string, (number | null)?, (string | null)?];

/**
 * The events of a run file as Parquet: `time` DOUBLE, `series` STRING, `value` DOUBLE (nullable),
 * `entity` STRING (nullable), the same columns a CSV file of them has.
 */
export function eventsParquet(rows: readonly EventRow[], options: ParquetOptions = {}): Buffer {
  return parquetFile(
    [
      { name: "time", data: Float64Array.from(rows, (r) => r[0]), type: "DOUBLE", nullable: false },
      { name: "series", data: rows.map((r) => r[1]), type: "STRING" },
      { name: "value", data: rows.map((r) => r[2] ?? null), type: "DOUBLE" },
      { name: "entity", data: rows.map((r) => r[3] ?? null), type: "STRING" },
    ],
    options,
  );
}

/** A Parquet schema element as hyparquet-writer takes it (the flattened schema, root first). */
export type SchemaNode = Parameters<typeof parquetWriteBuffer>[0]["schema"] extends (infer E)[] | undefined ? E : never;

/**
 * A Parquet file with the schema written out (for columns the writer does not infer, such as
 * lists and structs): `schema` is the flattened tree, root first, each group with its
 * `num_children`; `columns` give the top-level columns' cells (arrays for a list, objects for a struct).
 */
export function parquetWithSchema(schema: SchemaNode[], columns: { name: string; data: unknown[] }[]): Buffer {
  return Buffer.from(parquetWriteBuffer({ schema, columnData: columns as ColumnSource[], codec: "SNAPPY" }));
}
