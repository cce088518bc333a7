/**
 * The last step of every layout: event rows (series, time, value, entity, line) to the requests
 * that want them. Counts rows per series, checks that time does not decrease within a series,
 * and applies each request's `where` to the row's attribute cells.
 *
 * Routing is split in two so that a row can be matched when its attribute cells are at hand and
 * delivered later (the `entities` layout sorts its events first): `route` gives a small number
 * standing for "series s, to these requests", `deliver` hands the row to them.
 */
import type { WhereFilter } from "../manifest/types.js";
import * as ingestMessages from "../messages/ingest.js";
import type { Cell } from "./records.js";
import type { SeriesRequest } from "./readTypes.js";
import type { RowSink } from "./seriesTable.js";
import { cellMatchesAny } from "./where.js";

/** One distinct series met in the file. */
export interface SeriesSlot {
  readonly name: string;
  /** Position in order of first appearance. */
  readonly index: number;
  rows: number;
  lastTime: number;
  lastLine: number;
  /** Requests of this series without a `where`. */
  readonly plain: readonly number[];
  /** Requests of this series with a `where`, each with its tests over the attribute cells. */
  readonly filtered: readonly { request: number; tests: readonly { attribute: number; values: readonly (number | string)[] }[] }[];
  /** The route of a row that matches no filter (`plain` only). */
  readonly base: number;
  /** Routes by the set of filtered requests matched. */
  readonly routes: Map<string, number>;
}

interface Route {
  slot: SeriesSlot;
  targets: readonly number[];
}

export class RowRouter {
  /** Data rows delivered, all series. */
  rows = 0;
  /** The attribute columns any `where` names, in order of first mention. */
  readonly attributes: readonly string[];
  private readonly slots = new Map<string, SeriesSlot>();
  private readonly order: SeriesSlot[] = [];
  private readonly routeTable: Route[] = [];
  private readonly entity: readonly boolean[];

  constructor(
    private readonly requests: readonly SeriesRequest[],
    private readonly onRow: RowSink,
    private readonly display: string,
  ) {
    const attributes: string[] = [];
    for (const r of requests) for (const w of r.where ?? []) if (!attributes.includes(w.column)) attributes.push(w.column);
    this.attributes = attributes;
    this.entity = requests.map((r) => r.entity);
  }

  /** The names of the series requested, each once, in request order. */
  get requestedNames(): string[] {
    return [...new Set(this.requests.map((r) => r.name))];
  }

  /** The slot of series `name`, made on first sight. */
  slot(name: string): SeriesSlot {
    let s = this.slots.get(name);
    if (s === undefined) {
      const plain: number[] = [];
      const filtered: SeriesSlot["filtered"][number][] = [];
      this.requests.forEach((r, i) => {
        if (r.name !== name) return;
        if (r.where === undefined || r.where === null) plain.push(i);
        else filtered.push({ request: i, tests: testsOf(r.where, this.attributes) });
      });
      const base = this.routeTable.length;
      s = { name, index: this.order.length, rows: 0, lastTime: -Infinity, lastLine: 0, plain, filtered, base, routes: new Map() };
      this.routeTable.push({ slot: s, targets: plain });
      this.slots.set(name, s);
      this.order.push(s);
    }
    return s;
  }

  /**
   * The route of a row of `slot` whose attribute cells are `cells[from + k]` for attribute k
   * (`attributes[k]`).
   */
  route(slot: SeriesSlot, cells: readonly Cell[], from: number): number {
    if (slot.filtered.length === 0) return slot.base;
    let key = "";
    for (let j = 0; j < slot.filtered.length; j++) {
      const f = slot.filtered[j];
      let ok = true;
      for (const t of f.tests) {
        if (!cellMatchesAny(cells[from + t.attribute], t.values)) {
          ok = false;
          break;
        }
      }
      if (ok) key += `${j},`;
    }
    if (key === "") return slot.base;
    let r = slot.routes.get(key);
    if (r === undefined) {
      r = this.routeTable.length;
      const picked = key.slice(0, -1).split(",").map((j) => slot.filtered[Number(j)].request);
      this.routeTable.push({ slot, targets: [...slot.plain, ...picked].sort((a, b) => a - b) });
      slot.routes.set(key, r);
    }
    return r;
  }

  /** The series of a route. */
  slotOf(route: number): SeriesSlot {
    return this.routeTable[route].slot;
  }

  /** Counts the row, checks its series' time order and gives it to the requests of its route. */
  deliver(route: number, time: number, value: number, entity: string | undefined, line: number): void {
    const { slot, targets } = this.routeTable[route];
    this.rows++;
    slot.rows++;
    if (time < slot.lastTime) throw ingestMessages.timeDecreased(this.display, line, slot.name, slot.lastTime, time, slot.lastLine);
    slot.lastTime = time;
    slot.lastLine = line;
    for (let k = 0; k < targets.length; k++) {
      const i = targets[k];
      this.onRow(i, time, value, this.entity[i] ? entity : undefined, line);
    }
  }

  /** Rows per series that has any, in order of first appearance (as `SeriesTable.counts`). */
  counts(): Record<string, number> {
    const out: Record<string, number> = {};
    for (const s of this.order) {
      if (s.rows === 0) continue;
      Object.defineProperty(out, s.name, { value: s.rows, enumerable: true, writable: true, configurable: true });
    }
    return out;
  }
}

function testsOf(where: WhereFilter, attributes: readonly string[]) {
  return where.map((w) => ({ attribute: attributes.indexOf(w.column), values: w.values }));
}
