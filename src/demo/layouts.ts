/**
 * The demo queue's rows (`queue.ts`) written in the other layouts of contract section 9, as
 * models that keep one record per customer, or one row per instant, write them:
 *
 * - `queueAsEntities`: one row per customer, `id,arrive,start,depart`, in departure order
 *   (customers still inside at the end last, in arrival order), an empty cell for an event the
 *   customer never had; `start` is the time of the customer's `wait` row (the start of service);
 * - `queueAsLevels`: one row per change of `queue` or `busy`, `time,queue,busy`, in the order of
 *   the event table, the cell of the level that did not change left empty.
 */
import type { DemoRow } from "./queue.js";

export function queueAsEntities(rows: Iterable<DemoRow>): string {
  const byId = new Map<string, { arrive: number; start: number | null; depart: number | null }>();
  const departed: string[] = [];
  for (const r of rows) {
    if (r.entity === null) continue;
    if (r.series === "arrive") byId.set(r.entity, { arrive: r.time, start: null, depart: null });
    else if (r.series === "wait") byId.get(r.entity)!.start = r.time;
    else if (r.series === "depart") {
      byId.get(r.entity)!.depart = r.time;
      departed.push(r.entity);
    }
  }
  const order = [...departed, ...[...byId.keys()].filter((id) => byId.get(id)!.depart === null)];
  const cell = (x: number | null) => (x === null ? "" : String(x));
  let out = "id,arrive,start,depart\n";
  for (const id of order) {
    const c = byId.get(id)!;
    out += `${id},${c.arrive},${cell(c.start)},${cell(c.depart)}\n`;
  }
  return out;
}

export function queueAsLevels(rows: Iterable<DemoRow>): string {
  let out = "time,queue,busy\n";
  for (const r of rows) {
    if (r.series === "queue") out += `${r.time},${r.value},\n`;
    else if (r.series === "busy") out += `${r.time},,${r.value}\n`;
  }
  return out;
}
