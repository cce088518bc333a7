/**
 * Which layout (contract section 9) a run file has, guessed from the cells of its first rows.
 *
 *   rows ──ColumnProfile.add──► per column: filled, numbers, range, distinct, order; per pair of
 *        number columns: how often a <= b on one row; per text x number column: b non-decreasing
 *        within each value of the text?
 *        ──guessLayout──► events {time, series, value, entity} | entities {id, event columns} |
 *                         levels {time, level columns} | not recognised (why)
 *
 * The rules, tried in this order (docs/tutorial.md says them in words):
 *
 * 1. entities: a column filled on every row with a different value on every row (the id; a number
 *    column of not only whole numbers that never decreases is a clock, not an id), and at least two
 *    other number columns that look like clock times: at least 80 % of their values differ,
 *    the ranges of consecutive ones overlap, and on every row where both are filled one is at most the other.
 * 2. events: a text column filled on every row whose few values repeat (the series), and a
 *    number column filled on every row that never decreases within a series (the time). The
 *    value is a number column left; the entity the column left with the most distinct values.
 * 3. levels: a number column filled on every row that never decreases (the time), and at least
 *    one other number column (the levels; empty cells allowed).
 *
 * Pure: no file access, so that the rules are tested on rows written in the test.
 */
import type { Cell } from "../ingest/records.js";
import { parseDecimalText } from "../ingest/decimal.js";

/** Distinct values kept per column; past this a column has "many" values. */
export const VALUES_CAP = 64;
/** A column with at most this many distinct values (and repeats) is an attribute worth a `where` suggestion. */
export const FEW_VALUES = 12;
/** Rows a column keeps every value of, to tell whether they all differ (an id). */
const UNIQUE_CAP = 200_000;
/** Columns compared pairwise at most (cost grows with the square). */
const PAIR_CAP = 32;

/** What the rows read show about one column. */
export interface ColumnFacts {
  name: string;
  /** Position in the file's columns. */
  index: number;
  /** Non-empty cells, and how many of them are finite numbers. */
  filled: number;
  numbers: number;
  min: number;
  max: number;
  /** Every number is whole. */
  integers: boolean;
  /** Every filled cell differs from every other (checked up to `UNIQUE_CAP` rows). */
  unique: boolean;
  /** Distinct cell texts with their counts, up to `VALUES_CAP` (then `many`). */
  values: Map<string, number>;
  many: boolean;
  /** The numbers never decrease in file order. */
  nonDecreasing: boolean;
  /** Where the first decrease was: the row's line, and the number before. */
  firstDecrease: { line: number; before: number; after: number } | null;
}

/** Two number columns on the rows where both hold a number: how many such rows, and on how many the first is at most the second. */
export interface RowOrder {
  compared: number;
  atMost: number;
  /** The first row where the first was greater: its line. */
  firstAbove: number | null;
}

/** The per-column and per-pair facts of the rows read. */
export class ColumnProfile {
  readonly columns: ColumnFacts[] = [];
  rows = 0;
  private seen: (Set<string> | null)[] = [];
  private lastNumber: number[] = [];
  private readonly order = new Map<string, RowOrder>();
  /** `withinSeries.get(s + "\0" + t)`: last number of column t per value of text column s, or null once it decreased. */
  private readonly withinSeries = new Map<string, Map<string, number> | null>();
  private readonly numbersOfRow: number[] = [];

  /** The facts of one row. `header` is the file's columns (it may grow for JSON Lines). */
  add(header: readonly string[], cells: readonly Cell[], line: number): void {
    while (this.columns.length < header.length) {
      const index = this.columns.length;
      this.columns.push({ name: header[index], index, filled: 0, numbers: 0, min: Infinity, max: -Infinity, integers: true, unique: true, values: new Map(), many: false, nonDecreasing: true, firstDecrease: null });
      this.seen.push(new Set());
      this.lastNumber.push(NaN);
    }
    this.rows++;
    const nums = this.numbersOfRow;
    nums.length = 0;
    for (let k = 0; k < this.columns.length; k++) {
      const c = this.columns[k];
      const cell = k < cells.length ? cells[k] : null;
      nums[k] = NaN;
      if (cell === null) continue;
      c.filled++;
      const text = typeof cell === "string" ? cell : String(cell);
      if (!c.many) {
        c.values.set(text, (c.values.get(text) ?? 0) + 1);
        if (c.values.size > VALUES_CAP) c.many = true;
      }
      const seen = this.seen[k];
      if (seen !== null) {
        if (seen.has(text)) {
          c.unique = false;
          this.seen[k] = null;
        } else if (seen.size < UNIQUE_CAP) seen.add(text);
      }
      const x = numberOf(cell);
      if (x === undefined) continue;
      c.numbers++;
      nums[k] = x;
      if (x < c.min) c.min = x;
      if (x > c.max) c.max = x;
      if (!Number.isInteger(x)) c.integers = false;
      const before = this.lastNumber[k];
      if (x < before && c.nonDecreasing) {
        c.nonDecreasing = false;
        c.firstDecrease = { line, before, after: x };
      }
      this.lastNumber[k] = x;
    }
    const n = Math.min(this.columns.length, PAIR_CAP);
    for (let a = 0; a < n; a++) {
      const x = nums[a];
      if (x !== x) continue;
      for (let b = 0; b < n; b++) {
        const y = nums[b];
        if (b === a || y !== y) continue;
        const key = `${a}\u0000${b}`;
        let o = this.order.get(key);
        if (o === undefined) this.order.set(key, (o = { compared: 0, atMost: 0, firstAbove: null }));
        o.compared++;
        if (x <= y) o.atMost++;
        else o.firstAbove ??= line;
      }
    }
    for (let s = 0; s < n; s++) {
      const cs = this.columns[s];
      const cell = s < cells.length ? cells[s] : null;
      if (cs.many || cell === null) continue;
      const series = String(cell);
      for (let t = 0; t < n; t++) {
        const x = nums[t];
        if (t === s || x !== x) continue;
        const key = `${s}\u0000${t}`;
        let last = this.withinSeries.get(key);
        if (last === null) continue;
        if (last === undefined) this.withinSeries.set(key, (last = new Map()));
        const before = last.get(series);
        if (before !== undefined && x < before) this.withinSeries.set(key, null);
        else last.set(series, x);
      }
    }
  }

  /** How columns a and b compare on the rows where both hold numbers. */
  rowOrder(a: ColumnFacts, b: ColumnFacts): RowOrder {
    return this.order.get(`${a.index}\u0000${b.index}`) ?? { compared: 0, atMost: 0, firstAbove: null };
  }

  /** Whether the numbers of column t never decrease within each value of column s (checked on rows where s is text). */
  nonDecreasingWithin(s: ColumnFacts, t: ColumnFacts): boolean {
    const last = this.withinSeries.get(`${s.index}\u0000${t.index}`);
    return last !== null && last !== undefined;
  }
}

/** A cell as a finite number, or undefined. */
export function numberOf(cell: Cell): number | undefined {
  if (typeof cell === "number") return Number.isFinite(cell) ? cell : undefined;
  if (typeof cell === "string") {
    const x = parseDecimalText(cell);
    return x === undefined || x !== x ? undefined : x;
  }
  return undefined;
}

/** A column that is not part of the layout: its values, when few, for a `where` suggestion. */
export interface Attribute {
  name: string;
  /** Its distinct values (in order of first appearance), or null when there are more than `FEW_VALUES`. */
  values: string[] | null;
}

export type LayoutGuess =
  | { layout: "events"; time: string; series: string; value: string | null; entity: string | null; attributes: Attribute[]; why: string[] }
  | { layout: "entities"; entity: string; events: string[]; attributes: Attribute[]; why: string[] }
  | { layout: "levels"; time: string; levels: string[]; attributes: Attribute[]; why: string[] }
  | { layout: null; why: string };

const isNumberColumn = (c: ColumnFacts) => c.filled > 0 && c.numbers === c.filled;
const isTextColumn = (c: ColumnFacts) => c.filled > 0 && c.numbers < c.filled;
const full = (p: ColumnProfile) => (c: ColumnFacts) => c.filled === p.rows;
const q = (name: string) => JSON.stringify(name);
const range = (c: ColumnFacts) => `${c.min} to ${c.max}`;

/** The layout of the rows profiled: the first rule of the module comment that fits. */
export function guessLayout(p: ColumnProfile): LayoutGuess {
  if (p.rows === 0) return { layout: null, why: "no data rows were read" };
  return guessEntities(p) ?? guessEvents(p) ?? guessLevels(p) ?? notRecognised(p);
}

/** Columns that look like clock times: numbers, mostly distinct. */
function timeLike(c: ColumnFacts): boolean {
  return isNumberColumn(c) && (c.many || c.values.size * 5 >= c.filled * 4) && c.filled >= 2;
}

function guessEntities(p: ColumnProfile): LayoutGuess | null {
  if (p.rows < 2) return null;
  const ids = p.columns.filter((c) => full(p)(c) && c.unique);
  // Text ids first (a number column that differs on every row may be a time), then file order.
  ids.sort((a, b) => Number(isNumberColumn(a)) - Number(isNumberColumn(b)) || a.index - b.index);
  for (const id of ids) {
    const times = p.columns.filter((c) => c !== id && timeLike(c));
    if (times.length < 2) continue;
    // A number "id" that is not all whole numbers and never decreases is more likely a clock (a table of levels).
    if (isNumberColumn(id) && !id.integers && id.nonDecreasing) continue;
    // Per-row order: a before b when a <= b on every row both are filled; then by mean position.
    const chain = orderTimes(p, times);
    const ordered = chain.slice(1).filter((b, i) => {
      const o = p.rowOrder(chain[i], b);
      return o.compared > 0 && o.atMost === o.compared;
    });
    if (ordered.length === 0) continue;
    // Consecutive events' ranges overlap (a first arrival before the last start, and so on).
    const overlap = chain.slice(1).every((d, i) => chain[i].min <= d.max && d.min <= chain[i].max);
    if (!overlap) continue;
    const attributes = p.columns.filter((c) => c !== id && !chain.includes(c) && c.filled > 0).map(attribute);
    const why = [
      `${q(id.name)} holds a different value on every one of the ${p.rows} rows read (an id)`,
      `${chain.map((c) => q(c.name)).join(", ")} hold numbers (${chain.map(range).join("; ")}), consecutive ranges overlapping, at least 80 % of the values different: clock times of events`,
    ];
    if (!isTextColumn(id)) why.push(`UNSURE: the id ${q(id.name)} holds numbers; if it is a time, this is not one row per entity`);
    return { layout: "entities", entity: id.name, events: chain.map((c) => c.name), attributes, why };
  }
  return null;
}

/**
 * The time columns in per-row order: a column goes before another when it is at most the other
 * on every row where both are filled; columns not ordered that way keep the order of their means.
 */
export function orderTimes(p: ColumnProfile, times: ColumnFacts[]): ColumnFacts[] {
  const before = (a: ColumnFacts, b: ColumnFacts) => {
    const o = p.rowOrder(a, b);
    return o.compared > 0 && o.atMost === o.compared && p.rowOrder(b, a).atMost < o.compared;
  };
  const mean = (c: ColumnFacts) => (c.min + c.max) / 2;
  const out: ColumnFacts[] = [];
  const left = [...times].sort((a, b) => mean(a) - mean(b) || a.index - b.index);
  while (left.length > 0) {
    // The first column (by mean) that no column left must come before.
    const i = left.findIndex((c) => !left.some((d) => d !== c && before(d, c)));
    out.push(...left.splice(i < 0 ? 0 : i, 1));
  }
  return out;
}

function guessEvents(p: ColumnProfile): LayoutGuess | null {
  const series = p.columns.filter((c) => full(p)(c) && isTextColumn(c) && !c.many && c.values.size < p.rows);
  const times = p.columns.filter((c) => full(p)(c) && isNumberColumn(c));
  // The contract's names first, then file order.
  const byName = (name: string) => (a: ColumnFacts, b: ColumnFacts) => Number(b.name === name) - Number(a.name === name) || a.index - b.index;
  series.sort(byName("series"));
  times.sort(byName("time"));
  for (const s of series) {
    const t = times.find((c) => p.nonDecreasingWithin(s, c));
    if (t === undefined) continue;
    const rest = p.columns.filter((c) => c !== s && c !== t && c.filled > 0);
    const numbers = rest.filter(isNumberColumn).sort(byName("value"));
    // A value is most likely a number column that is not all whole numbers (ids and counters are).
    const value = numbers.find((c) => c.name === "value") ?? numbers.find((c) => !c.integers) ?? numbers[0] ?? null;
    const others = rest.filter((c) => c !== value);
    const distinct = (c: ColumnFacts) => (c.many ? Infinity : c.values.size);
    const entity = others.find((c) => c.name === "entity") ?? [...others].filter((c) => distinct(c) > 1 && !(c.values.size <= FEW_VALUES && !c.many && isNumberColumn(c))).sort((a, b) => distinct(b) - distinct(a) || a.index - b.index)[0] ?? null;
    const attributes = others.filter((c) => c !== entity).map(attribute);
    const shown = [...s.values.keys()].slice(0, 6).map(q).join(", ");
    const why = [
      `${q(s.name)} is text filled on every row, with ${s.values.size} values that repeat (${shown}${s.values.size > 6 ? ", ..." : ""}): the series`,
      `${q(t.name)} is a number on every row and never decreases within a series (${range(t)}): the time`,
    ];
    if (value !== null) why.push(`${q(value.name)} holds numbers (${range(value)}) on ${value.filled} of ${p.rows} rows: the value`);
    if (entity !== null) why.push(`${q(entity.name)} is filled on ${entity.filled} of ${p.rows} rows with ${entity.many ? "many" : entity.values.size} distinct values: the entity`);
    if (value !== null && entity !== null && isNumberColumn(entity)) why.push(`UNSURE: ${q(value.name)} and ${q(entity.name)} both hold numbers; swap them if ${q(entity.name)} is the value`);
    return { layout: "events", time: t.name, series: s.name, value: value?.name ?? null, entity: entity?.name ?? null, attributes, why };
  }
  return null;
}

function guessLevels(p: ColumnProfile): LayoutGuess | null {
  const times = p.columns.filter((c) => full(p)(c) && isNumberColumn(c) && c.nonDecreasing);
  times.sort((a, b) => Number(b.name === "time") - Number(a.name === "time") || a.index - b.index);
  const time = times[0];
  if (time === undefined) return null;
  const levels = p.columns.filter((c) => c !== time && isNumberColumn(c));
  if (levels.length === 0) return null;
  const attributes = p.columns.filter((c) => c !== time && c.filled > 0 && !levels.includes(c)).map(attribute);
  const why = [`${q(time.name)} is a number on every row and never decreases (${range(time)}): the time`];
  const rough = levels.filter((c) => !c.integers);
  why.push(`${levels.map((c) => q(c.name)).join(", ")} hold numbers (empty cells allowed): one level each`);
  if (rough.length > 0) why.push(`UNSURE: ${rough.map((c) => q(c.name)).join(", ")} hold${rough.length === 1 ? "s" : ""} numbers that are not all whole, unlike most levels (counts of things)`);
  return { layout: "levels", time: time.name, levels: levels.map((c) => c.name), attributes, why };
}

function notRecognised(p: ColumnProfile): LayoutGuess {
  const numbers = p.columns.filter(isNumberColumn);
  const fullNumbers = numbers.filter(full(p));
  let why: string;
  if (numbers.length === 0) why = "no column holds only numbers, so there is no time";
  else if (fullNumbers.length === 0) why = `no number column is filled on every row (${numbers.map((c) => q(c.name)).join(", ")} have empty cells), so there is no time`;
  else {
    const d = fullNumbers.map((c) => (c.firstDecrease === null ? `${q(c.name)} has no other number column beside it` : `${q(c.name)} decreases at line ${c.firstDecrease.line} (${c.firstDecrease.before} then ${c.firstDecrease.after})`));
    why = `no column works as the time: ${d.join("; ")}; and no text column of repeating values (a series) nor an id column with event times was found`;
  }
  return { layout: null, why };
}

function attribute(c: ColumnFacts): Attribute {
  const few = !c.many && c.values.size <= FEW_VALUES && c.values.size < c.filled;
  return { name: c.name, values: few ? [...c.values.keys()] : null };
}
