/**
 * `sojourn init`'s bounded read of a file in the other layouts (contract section 9), once
 * `guessLayout` has named its columns: the same `FileHead` as `readHead` gives for an event table,
 * so that the kind, capacity and end guesses of `scanRuns` work on every layout.
 *
 *   entities: each event column ──► a series of valueless rows with an entity (a count), and for
 *             each ordered pair of event columns: rows with both, in order, and with the first only
 *   levels:   each level column ──► a series of valued rows at the row's time (`HeadTally`, as
 *             `readHead` does), compared with the level every other column holds
 *
 * A cell the report's reader would refuse is refused here with the same message.
 */
import * as ingestMessages from "../messages/ingest.js";
import { type Cell, readCells } from "./readCells.js";
import { type FileHead, HeadTally } from "./readHead.js";
import { numberOf } from "./layoutGuess.js";

/** Two event columns of an entity table over the rows read. */
export interface EntityPairFacts {
  /** Rows with both filled, and of those how many had the first at most the second. */
  shared: number;
  inOrder: number;
  /** Rows with the first filled and the second empty. */
  open: number;
  /** The line of the first row with the second before the first, or null. */
  firstBackwards: number | null;
}

export interface EntitiesHead extends FileHead {
  /** `pairs.get(a + "\0" + b)` for every two event columns a, b. */
  entityPairs: Map<string, EntityPairFacts>;
  /** For each two event columns a before b (in the order given): the most rows between a and b at one time. */
  mostBetween: Map<string, number>;
}

const text = (cell: Cell) => (typeof cell === "string" ? cell : String(cell));

/**
 * Where the named columns are among a file's columns. The header of a JSON Lines file grows as
 * keys appear (`readCells`), so the places are looked up again when a row is wider.
 */
class Places {
  private header: readonly string[] = [];
  private width = -1;
  at: number[] = [];

  constructor(private readonly names: readonly string[]) {}

  setHeader(header: readonly string[]): void {
    this.header = header;
    this.width = -1;
  }

  /** The cell of name k on this row (null when the column is absent). */
  cell(cells: readonly Cell[], k: number): Cell {
    if (cells.length !== this.width) {
      this.width = cells.length;
      this.at = this.names.map((n) => this.header.indexOf(n));
    }
    const i = this.at[k];
    return i >= 0 && i < cells.length ? cells[i] : null;
  }
}

/** The first `limit` rows of an entity table with id column `id` and event columns `events`. */
export async function readEntitiesHead(path: string, display: string, id: string, events: readonly string[], limit: number): Promise<EntitiesHead> {
  const tally = new HeadTally(events);
  const pairs = new Map<string, EntityPairFacts>();
  const facts = events.map((a) => events.map((b) => (a === b ? null : { shared: 0, inOrder: 0, open: 0, firstBackwards: null as number | null })));
  events.forEach((a, i) => events.forEach((b, j) => facts[i][j] !== null && pairs.set(a + "\u0000" + b, facts[i][j]!)));
  const times = new Float64Array(events.length);
  // For each pair i < j: the times rows entered (had i) and left (had j), to find the most between at once.
  const spans = events.map((_, i) => events.map((_, j) => (i < j ? { enter: [] as number[], leave: [] as number[] } : null)));
  const places = new Places([id, ...events]);
  let last = -Infinity;
  const read = await readCells(
    path,
    display,
    limit,
    (cells, line) => {
      const idCell = places.cell(cells, 0);
      if (idCell === null) throw ingestMessages.entityIdEmpty(display, line, id);
      for (let k = 0; k < events.length; k++) {
        const cell = places.cell(cells, 1 + k);
        const t = cell === null ? NaN : numberOf(cell);
        if (t === undefined) throw ingestMessages.eventTimeNotANumber(display, line, events[k], text(cell));
        times[k] = t;
        if (t === t) {
          tally.row(k, t, NaN, text(idCell));
          if (t > last) last = t;
        }
      }
      for (let i = 0; i < events.length; i++) {
        if (times[i] !== times[i]) continue;
        for (let j = 0; j < events.length; j++) {
          const f = facts[i][j];
          if (f === null) continue;
          if (times[j] !== times[j]) f.open++;
          else {
            f.shared++;
            if (times[i] <= times[j]) f.inOrder++;
            else f.firstBackwards ??= line;
          }
          const span = spans[i][j];
          if (span !== null) {
            span.enter.push(times[i]);
            if (times[j] === times[j]) span.leave.push(times[j]);
          }
        }
      }
    },
    (header) => places.setHeader(header),
  );
  // Entity times are not kept: the pairs above say all the manifest needs.
  for (const h of tally.heads) h.entityTimes = null;
  const mostBetween = new Map<string, number>();
  events.forEach((a, i) => events.forEach((b, j) => spans[i][j] !== null && mostBetween.set(a + "\u0000" + b, mostAtOnce(spans[i][j]!.enter, spans[i][j]!.leave))));
  return { rows: read.rows, cut: read.cut, lastTime: Number.isFinite(last) ? last : null, series: tally.heads.filter((h) => h.rows > 0), pairs: new Map(), entityPairs: pairs, mostBetween };
}

/**
 * The most entities in between at one time, from the times they entered and left: a leave and an
 * enter at the same time do not overlap (the level between them lasts no time).
 *
 * @example mostAtOnce([0, 1, 2], [2, 3]) // 2 (from 1 to 2; at 2 one leaves as one enters)
 */
export function mostAtOnce(enter: number[], leave: number[]): number {
  enter.sort((x, y) => x - y);
  leave.sort((x, y) => x - y);
  let most = 0;
  let inside = 0;
  let j = 0;
  for (const t of enter) {
    while (j < leave.length && leave[j] <= t) {
      inside--;
      j++;
    }
    inside++;
    if (inside > most) most = inside;
  }
  return most;
}

/** The first `limit` rows of a levels table with time column `time` and level columns `levels`. */
export async function readLevelsHead(path: string, display: string, time: string, levels: readonly string[], limit: number): Promise<FileHead> {
  const tally = new HeadTally(levels);
  const places = new Places([time, ...levels]);
  let last = -Infinity;
  let lastLine = 0;
  const read = await readCells(
    path,
    display,
    limit,
    (cells, line) => {
      const cell = places.cell(cells, 0);
      if (cell === null) throw ingestMessages.missingTime(display, line);
      const t = numberOf(cell);
      if (t === undefined) throw ingestMessages.notANumber(display, line, "time", text(cell));
      if (t < last) throw ingestMessages.levelTimeDecreased(display, line, time, last, t, lastLine);
      last = t;
      lastLine = line;
      for (let k = 0; k < levels.length; k++) {
        const c = places.cell(cells, 1 + k);
        if (c === null) continue;
        const v = numberOf(c);
        if (v === undefined) throw ingestMessages.levelNotANumber(display, line, levels[k], text(c));
        tally.row(k, t, v, undefined);
      }
    },
    (header) => places.setHeader(header),
  );
  return { rows: read.rows, cut: read.cut, lastTime: Number.isFinite(last) ? last : null, series: tally.heads.filter((h) => h.rows > 0), pairs: tally.pairs };
}
