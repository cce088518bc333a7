/**
 * Hands bytes to a row parser through one working buffer, and keeps the part of a row that runs
 * past the bytes at hand for the next fill. Also drops a UTF-8 byte-order mark at the start.
 *
 *   working buffer: [ carried part of a row | newly read bytes | free space ]
 *
 * Chunks are copied in (`push`), the reader's buffers stay free for the next read. After each
 * parse the unparsed tail moves to the front. The buffer grows only when one row is longer than
 * half of it.
 *
 * A row (a record: a quoted field may hold line breaks) may be at most `limit` bytes long, its
 * line break not counted. The parsers check each complete row; the feeder checks the row still
 * open at the end of the bytes at hand, so a file without line breaks (a 1 GB line, a gzip member
 * that expands to one, an unterminated quote) is refused once `limit` bytes of it are held, and
 * the working buffer never grows much past `limit` plus one fill.
 *
 * Line ends: the file's first line break decides. When it is a carriage return alone (the line
 * end of some old systems), every carriage return not followed by a line feed is read as a line
 * feed, in the working copy (the bytes hashed are the file's own); else the bytes are left as
 * they are (line feeds, or carriage return and line feed).
 */
import type { UserError } from "../messages/error.js";

/** The longest row read by default: 1 MiB. A manifest may change it (`max_row_bytes`). */
export const DEFAULT_ROW_LIMIT = 1 << 20;
/** The range a manifest may set the row limit in: 1 KiB to 256 MiB. */
export const ROW_LIMIT_MIN = 1 << 10;
export const ROW_LIMIT_MAX = 1 << 28;

/**
 * Bytes a parser may look past the end of a complete row before it hands it over (a closing quote
 * waits for the comma or the line feed after it, a carriage return for its line feed).
 */
const LOOKAHEAD = 2;

/** A parser of rows from bytes. */
export interface ChunkParser {
  /**
   * Reads the complete rows of `buf` from `pos` on and returns where the first incomplete one
   * starts (`buf.length` when none). With `final`, the end of `buf` ends the last row.
   */
  parse(buf: Buffer, pos: number, final: boolean): number;
  /** Called once after the final `parse`: throws when the file held no header or no row at all. */
  finish(): void;
  /**
   * The error for the row starting at `start` (the first incomplete one, as `parse` returned it),
   * which runs on past `limit` bytes to the end of `buf` with no end in sight.
   */
  tooLong(buf: Buffer, start: number, limit: number): UserError;
}

/** A row left over longer than this waits until as many bytes again arrived before it is retried. */
const RETRY_LIMIT = 1 << 16;

const LF = 10;
const CR = 13;
/** How the file's lines end, as its first line break says. */
const ENDS_UNKNOWN = 0;
const ENDS_LF = 1;
const ENDS_CR = 2;

export class ChunkFeeder {
  private work: Buffer;
  /** Bytes held at the front of `work`: the carried tail plus bytes not yet parsed. */
  private held = 0;
  /** Length of the carried tail after the last parse. */
  private carried = 0;
  /** Bytes to hold beyond the carried tail before it is parsed again (0: at the next fill). */
  private wait = 0;
  private started = false;
  private endings = ENDS_UNKNOWN;
  /** Whether the last byte held is a carriage return whose next byte has not arrived yet. */
  private pendingCR = false;

  /** `size`: the largest number of bytes one fill brings; `limit`: the longest row, in bytes. */
  constructor(
    private readonly parser: ChunkParser,
    private readonly size: number,
    private readonly limit: number = DEFAULT_ROW_LIMIT,
  ) {
    this.work = Buffer.allocUnsafe(Math.max(2 * size, 64));
  }

  /** Free space of at least `size` bytes to copy into; then `filled` with the bytes copied. */
  private space(): Buffer {
    if (this.work.length - this.held < this.size) {
      const bigger = Buffer.allocUnsafe(Math.max(2 * this.work.length, this.held + this.size));
      this.work.copy(bigger, 0, 0, this.held);
      this.work = bigger;
    }
    return this.work.subarray(this.held, this.held + this.size);
  }

  /** `n` bytes were written at the start of the last `space()`. */
  private filled(n: number): void {
    if (n === 0) return;
    if (this.endings !== ENDS_LF) this.lineEnds(this.held, this.held + n);
    this.held += n;
    // While a long row waits for more bytes, it is parsed again once it may be too long.
    if (this.held - this.carried < this.wait && this.held <= this.limit + LOOKAHEAD) return;
    this.run(false);
  }

  /** Copies `chunk` in, `size` bytes at a time. */
  push(chunk: Buffer): void {
    for (let at = 0; at < chunk.length; at += this.size) {
      const part = chunk.subarray(at, at + this.size);
      part.copy(this.space());
      this.filled(part.length);
    }
  }

  /**
   * Reads the line ends of the new bytes `work[from..to)` (see the class comment). A carriage
   * return at the end of the held bytes stays unparsed (no row ends there before its next byte),
   * so it is still the last byte held when the next bytes arrive.
   */
  private lineEnds(from: number, to: number): void {
    const work = this.work;
    if (this.pendingCR) {
      this.pendingCR = false;
      const lf = work[from] === LF;
      if (this.endings === ENDS_UNKNOWN) this.endings = lf ? ENDS_LF : ENDS_CR;
      if (this.endings === ENDS_LF) return;
      if (!lf) work[from - 1] = LF;
    }
    if (this.endings === ENDS_UNKNOWN) {
      let i = from;
      while (i < to && work[i] !== LF && work[i] !== CR) i++;
      if (i === to) return;
      if (work[i] === LF || (i + 1 < to && work[i + 1] === LF)) {
        this.endings = ENDS_LF;
        return;
      }
      if (i + 1 === to) {
        this.pendingCR = true;
        return;
      }
      this.endings = ENDS_CR;
      from = i;
    }
    const bytes = work.subarray(0, to);
    for (let i = bytes.indexOf(CR, from); i !== -1; i = bytes.indexOf(CR, i + 1)) {
      if (i + 1 === to) {
        this.pendingCR = true;
        break;
      }
      if (bytes[i + 1] !== LF) bytes[i] = LF;
    }
  }

  /** The end of the data: parses what is left and lets the parser check the file as a whole. */
  finish(): void {
    if (this.pendingCR && this.endings !== ENDS_LF) this.work[this.held - 1] = LF;
    this.pendingCR = false;
    this.run(true);
    this.parser.finish();
  }

  private run(final: boolean): void {
    const buf = this.work.subarray(0, this.held);
    let pos = 0;
    if (!this.started) {
      if (buf.length < 3 && !final) {
        this.keep(0);
        return;
      }
      this.started = true;
      if (buf.length >= 3 && buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf) pos = 3;
    }
    const used = this.parser.parse(buf, pos, final);
    if (used < buf.length && final) throw new Error(`ingest: the parser left ${buf.length - used} bytes at the end of the data`);
    if (buf.length - used > this.limit + LOOKAHEAD) throw this.parser.tooLong(buf, used, this.limit);
    this.keep(used);
  }

  /** Moves the unparsed bytes from `from` on to the front. */
  private keep(from: number): void {
    const tail = this.held - from;
    if (from > 0 && tail > 0) this.work.copyWithin(0, from, this.held);
    this.held = tail;
    this.carried = tail;
    this.wait = tail > RETRY_LIMIT ? tail : 0;
  }
}
