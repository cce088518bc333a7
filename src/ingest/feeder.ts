/**
 * Hands chunks of decompressed bytes to a row parser and keeps the part of a row that runs past a
 * chunk's end for the next one. Also drops a UTF-8 byte-order mark at the start of the data.
 */

/** A parser of rows from bytes. */
export interface ChunkParser {
  /**
   * Reads the complete rows of `buf` from `pos` on and returns where the first incomplete one
   * starts (`buf.length` when none). With `final`, the end of `buf` ends the last row.
   */
  parse(buf: Buffer, pos: number, final: boolean): number;
  /** Called once after the final `parse`: throws when the file held no header or no row at all. */
  finish(): void;
}

/** A row left over longer than this waits until as many bytes again arrived before it is retried. */
const RETRY_LIMIT = 1 << 16;

export class ChunkFeeder {
  private carry: Buffer | null = null;
  private held: Buffer[] = [];
  private heldBytes = 0;
  /** Bytes to hold before the carried row is parsed again (0: at the next chunk). */
  private wait = 0;
  private started = false;

  constructor(private readonly parser: ChunkParser) {}

  push(chunk: Buffer): void {
    if (chunk.length === 0) return;
    if (this.carry !== null) {
      this.held.push(chunk);
      this.heldBytes += chunk.length;
      if (this.heldBytes < this.wait) return;
      chunk = this.takeAll();
    }
    this.run(chunk, false);
  }

  /** The end of the data: parses what is left and lets the parser check the file as a whole. */
  finish(): void {
    this.run(this.carry === null ? Buffer.alloc(0) : this.takeAll(), true);
    this.parser.finish();
  }

  private takeAll(): Buffer {
    const all = Buffer.concat([this.carry as Buffer, ...this.held]);
    this.carry = null;
    this.held = [];
    this.heldBytes = 0;
    return all;
  }

  private run(buf: Buffer, final: boolean): void {
    let pos = 0;
    if (!this.started) {
      if (buf.length < 3 && !final) {
        this.keep(buf, 0);
        return;
      }
      this.started = true;
      if (buf.length >= 3 && buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf) pos = 3;
    }
    const used = this.parser.parse(buf, pos, final);
    if (used < buf.length) {
      if (final) throw new Error(`ingest: the parser left ${buf.length - used} bytes at the end of the data`);
      this.keep(buf, used);
    }
  }

  private keep(buf: Buffer, from: number): void {
    const tail = buf.length - from;
    this.carry = buf.subarray(from);
    this.wait = tail > RETRY_LIMIT ? tail : 0;
  }
}
