/**
 * Calculation tables that stay useful at any length.
 *
 * A cell is a number, a text, or empty (null). Producers may also write NaN for an empty cell,
 * which lets them keep a row array of plain numbers (stored unboxed, no allocation per row);
 * `build` turns NaN into null.
 *
 * A table with at most `maxRows` rows is kept whole. A longer one keeps its first `edgeRows`
 * rows, its last `edgeRows` rows, and checkpoint rows in between: every row whose index is a
 * multiple of a stride, the stride doubling whenever the checkpoints would exceed their budget
 * (maxRows - 2 * edgeRows). Which rows are kept therefore depends only on the row count, never on
 * timing, and every kept row carries its index and its running sums, so a reader can check any
 * stretch against the full table (`sojourn table` writes it on demand).
 *
 * Memory is bounded by maxRows rows whatever the length of the run.
 */

export type Cell = number | string | null;

export interface BuiltTable {
  columns: string[];
  rowsTotal: number;
  rows: Cell[][];
  shortened: boolean;
}

export class TableBuilder {
  private readonly head: Cell[][] = [];
  private checkpoints: Cell[][] = [];
  private stride = 1;
  /**
   * Ring of the latest rows once the table overflows, in typed storage so that keeping a row
   * copies doubles without boxing them: numbers go to `ringNumbers`; a text or empty cell sets
   * its flag in `ringIsOther` and goes to `ringOther`.
   */
  private readonly ringNumbers: Float64Array;
  private readonly ringIsOther: Uint8Array;
  private readonly ringOther: Cell[];
  /** Whether any cell in the ring was ever a text or empty cell (else `ringIsOther` is all 0). */
  private ringHasOther = false;
  private ringSize = 0;
  private ringNext = 0;
  private total = 0;
  private readonly checkpointBudget: number;
  /** The rows seen after the head while the table may still turn out short. */
  private readonly middle: Cell[][] = [];
  private overflowed = false;

  constructor(
    readonly columns: string[],
    private readonly maxRows: number,
    private readonly edgeRows: number,
  ) {
    if (edgeRows * 2 >= maxRows) this.edgeRows = Math.floor(maxRows / 4);
    this.checkpointBudget = Math.max(1, maxRows - 2 * this.edgeRows);
    const cells = this.edgeRows * columns.length;
    this.ringNumbers = new Float64Array(cells);
    this.ringIsOther = new Uint8Array(cells);
    this.ringOther = new Array<Cell>(cells).fill(null);
  }

  /** Adds one row (its values are copied; the caller may reuse the array). */
  add(row: readonly Cell[]): void {
    const index = this.total++;
    if (index < this.edgeRows) {
      this.head.push(row.slice());
      return;
    }
    if (!this.overflowed) {
      if (this.head.length + this.middle.length < this.maxRows) {
        this.middle.push(row.slice());
        return;
      }
      this.overflow();
    }
    this.keepTail(row);
    if (isMultiple(index, this.stride)) this.addCheckpoint(row.slice());
  }

  /**
   * `add` for a row of numbers only (NaN for an empty cell): the same table, with less work per
   * row once the table is long (no per-cell type test in the tail).
   */
  addNumbers(row: readonly number[]): void {
    if (!this.overflowed || this.edgeRows === 0) {
      this.add(row);
      return;
    }
    const index = this.total++;
    const width = this.columns.length;
    const numbers = this.ringNumbers;
    let k = this.ringNext * width;
    for (let j = 0; j < width; j++) numbers[k + j] = row[j];
    if (this.ringHasOther) for (let j = 0; j < width; j++) this.ringIsOther[k + j] = 0;
    k = this.ringNext + 1;
    this.ringNext = k === this.edgeRows ? 0 : k;
    if (this.ringSize < this.edgeRows) this.ringSize++;
    if (isMultiple(index, this.stride)) this.addCheckpoint(row.slice());
  }

  /** First time past maxRows: turn the buffered middle into checkpoints and tail. */
  private overflow(): void {
    this.overflowed = true;
    const middle = this.middle.splice(0);
    for (let i = 0; i < middle.length; i++) {
      const index = this.edgeRows + i;
      this.keepTail(middle[i]);
      if (isMultiple(index, this.stride)) this.addCheckpoint(middle[i]);
    }
  }

  private keepTail(row: readonly Cell[]): void {
    if (this.edgeRows === 0) return;
    const width = this.columns.length;
    let k = this.ringNext * width;
    for (let j = 0; j < width; j++, k++) {
      const c = row[j];
      if (typeof c === "number") {
        this.ringNumbers[k] = c;
        this.ringIsOther[k] = 0;
      } else {
        this.ringIsOther[k] = 1;
        this.ringOther[k] = c;
        this.ringHasOther = true;
      }
    }
    this.ringNext = this.ringNext + 1 === this.edgeRows ? 0 : this.ringNext + 1;
    if (this.ringSize < this.edgeRows) this.ringSize++;
  }

  /** The ring's rows, oldest first. */
  private tail(): Cell[][] {
    const width = this.columns.length;
    const rows: Cell[][] = [];
    const first = this.ringSize < this.edgeRows ? 0 : this.ringNext;
    for (let r = 0; r < this.ringSize; r++) {
      const slot = (first + r) % this.edgeRows;
      const row: Cell[] = new Array(width);
      for (let j = 0, k = slot * width; j < width; j++, k++) row[j] = this.ringIsOther[k] ? this.ringOther[k] : this.ringNumbers[k];
      rows.push(row);
    }
    return rows;
  }

  private addCheckpoint(row: Cell[]): void {
    this.checkpoints.push(row);
    while (this.checkpoints.length > this.checkpointBudget) {
      this.stride *= 2;
      this.checkpoints = this.checkpoints.filter((r) => ((r[0] as number) - 1) % this.stride === 0);
    }
  }

  get rowsTotal(): number {
    return this.total;
  }

  build(): BuiltTable {
    if (!this.overflowed) {
      return { columns: this.columns, rowsTotal: this.total, rows: emptyForNaN([...this.head, ...this.middle]), shortened: false };
    }
    const tail = this.tail();
    const firstTail = tail.length > 0 ? (tail[0][0] as number) : Infinity;
    const rows = [...this.head];
    for (const r of this.checkpoints) {
      const index = r[0] as number;
      if (index > this.edgeRows && index < firstTail) rows.push(r);
    }
    rows.push(...tail);
    return { columns: this.columns, rowsTotal: this.total, rows: emptyForNaN(rows), shortened: true };
  }
}

/** Whether `index` is a multiple of `stride`, a power of two (a bit test below 2^30). */
function isMultiple(index: number, stride: number): boolean {
  return index < 0x40000000 ? (index & (stride - 1)) === 0 : index % stride === 0;
}

/** NaN cells become empty (null) cells. */
function emptyForNaN(rows: Cell[][]): Cell[][] {
  return rows.map((r) => (r.some((c) => c !== c) ? r.map((c) => (c !== c ? null : c)) : r));
}

/**
 * One CSV cell: numbers in shortest round-trip form (a negative number as `-2.5`), text quoted when
 * it needs to be (RFC 4180). A text that starts with `=`, `+`, `-`, `@`, a tab or a carriage
 * return, which a spreadsheet would take for a formula, gets a leading `'` so that it is shown as
 * text (the common guidance against CSV formula injection): the entity `=1+2` is written `'=1+2`.
 */
export function csvCell(c: Cell): string {
  if (c === null) return "";
  if (typeof c === "number") return Object.is(c, -0) ? "0" : String(c);
  const text = FORMULA_START.test(c) ? `'${c}` : c;
  return /[",\r\n]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

const FORMULA_START = /^[=+\-@\t\r]/;

export function tableToCsv(t: BuiltTable): string {
  const lines = [t.columns.map(csvCell).join(",")];
  for (const r of t.rows) lines.push(r.map(csvCell).join(","));
  return lines.join("\n") + "\n";
}
