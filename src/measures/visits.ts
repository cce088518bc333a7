import * as msg from "../messages/study.js";
import type { SeriesRead } from "./accumulator.js";
import { EntityIds, EventBuffer } from "./events.js";

const START = 0;
const END = 1;

/**
 * Entity visits: the events of a start series and an end series, paired per entity in time
 * order (contract section 2). An end without an open start, or a second start before the end,
 * is an input error naming the file and the line. An entity may start again after it ended.
 */
export class EntityVisits {
  readonly reads: SeriesRead[];
  private readonly events = new EventBuffer();
  private readonly ids = new EntityIds();

  constructor(
    private readonly measure: string,
    private readonly start: string,
    private readonly end: string,
    private readonly file: string,
  ) {
    this.reads = [
      { series: start, entity: true },
      { series: end, entity: true },
    ];
  }

  row(slot: number, time: number, entity: string | undefined, line: number): void {
    if (entity === undefined) throw msg.rowWithoutEntity(this.file, line, this.reads[slot].series, this.measure);
    this.events.add(time, slot === 0 ? START : END, 0, this.ids.id(entity), line);
  }

  name(id: number): string {
    return this.ids.name(id);
  }

  /**
   * Replays every event in time order (ties in file order): `onStart(time, line)` when an entity
   * starts, `onEnd(time, id, began, line, startLine)` when it ends, with the time it began and the
   * run-file lines of both events. Returns how many are still open.
   */
  replay(
    onStart: (time: number, line: number) => void,
    onEnd: (time: number, id: number, began: number, line: number, startLine: number) => void,
  ): number {
    const began = new Float64Array(this.ids.size).fill(NaN);
    const startLine = new Float64Array(this.ids.size);
    let open = 0;
    this.events.replay((time, kind, _v, id, line) => {
      if (kind === START) {
        if (began[id] === began[id]) throw msg.duplicateEnter(this.file, line, this.ids.name(id), this.start, this.measure, startLine[id]);
        began[id] = time;
        startLine[id] = line;
        open++;
        onStart(time, line);
      } else {
        const t0 = began[id];
        if (t0 !== t0) throw msg.leaveWithoutEnter(this.file, line, this.ids.name(id), this.end, this.measure, this.start);
        began[id] = NaN;
        open--;
        onEnd(time, id, t0, line, startLine[id]);
      }
    });
    return open;
  }
}
