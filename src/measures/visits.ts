import * as msg from "../messages/study.js";
import type { SeriesRead } from "./accumulator.js";
import { EventMerge } from "./events.js";

const START = 0;
const END = 1;

/** An entity starts (`time`, the run-file `line` of its start event). */
export type OnStart = (time: number, line: number) => void;
/** An entity ends: `entity` began at `began` (run-file line `startLine`) and ends at `time` (line `line`). */
export type OnEnd = (time: number, entity: string, began: number, line: number, startLine: number) => void;

/**
 * Entity visits: the events of a start series and an end series, paired per entity in time
 * order (ties in file order; contract section 2). An end without an open start, or a second
 * start before the end, is an input error naming the file and the line. An entity may start
 * again after it ended.
 *
 * The visits are followed as the rows come (`EventMerge` puts the two series in time order):
 * only the entities inside (started, not yet ended) are remembered, each with its start time and
 * line, so memory grows with the number inside at once, not with the file. A pairing error is
 * kept and thrown by `finish`, where the measures of a run report their errors, so the message
 * is the one the first error in time order gives, after every error of reading the file.
 */
export class EntityVisits {
  readonly reads: SeriesRead[];
  private readonly merge: EventMerge;
  /** The slot of each entity inside. */
  private readonly inside = new Map<string, number>();
  private began = new Float64Array(1024);
  private startLines = new Float64Array(1024);
  /** Slots given back by entities that ended. */
  private free: number[] = [];
  private slots = 0;
  private failure: unknown = null;
  private failed = false;

  constructor(
    private readonly measure: string,
    private readonly start: string,
    private readonly end: string,
    private readonly file: string,
    private readonly onStart: OnStart,
    private readonly onEnd: OnEnd,
  ) {
    this.reads = [
      { series: start, entity: true },
      { series: end, entity: true },
    ];
    this.merge = new EventMerge(2, "arrival", (time, kind, _v, entity, line) => this.event(time, kind, entity as string, line));
  }

  row(slot: number, time: number, entity: string | undefined, line: number): void {
    if (entity === undefined) throw msg.rowWithoutEntity(this.file, line, this.reads[slot].series, this.measure);
    if (!this.failed) this.merge.add(slot, time, slot === 0 ? START : END, 0, entity, line);
  }

  /** The entities inside now. */
  get open(): number {
    return this.inside.size;
  }

  /** Follows the events still waiting, throws the first pairing error if there was one, and returns how many are still inside. */
  finish(): number {
    if (!this.failed) this.merge.finish();
    if (this.failed) throw this.failure;
    return this.inside.size;
  }

  private event(time: number, kind: number, entity: string, line: number): void {
    if (this.failed) return;
    try {
      if (kind === START) this.entered(time, entity, line);
      else this.left(time, entity, line);
    } catch (e) {
      this.failed = true;
      this.failure = e;
    }
  }

  private entered(time: number, entity: string, line: number): void {
    const inside = this.inside;
    const open = inside.get(entity);
    if (open !== undefined) throw msg.duplicateEnter(this.file, line, entity, this.start, this.measure, this.startLines[open]);
    const slot = this.free.length > 0 ? this.free.pop()! : this.slots++;
    if (slot === this.began.length) this.grow();
    this.began[slot] = time;
    this.startLines[slot] = line;
    inside.set(entity, slot);
    this.onStart(time, line);
  }

  private left(time: number, entity: string, line: number): void {
    const slot = this.inside.get(entity);
    if (slot === undefined) throw msg.leaveWithoutEnter(this.file, line, entity, this.end, this.measure, this.start);
    this.inside.delete(entity);
    this.free.push(slot);
    this.onEnd(time, entity, this.began[slot], line, this.startLines[slot]);
  }

  private grow(): void {
    const began = new Float64Array(2 * this.began.length);
    began.set(this.began);
    this.began = began;
    const lines = new Float64Array(2 * this.startLines.length);
    lines.set(this.startLines);
    this.startLines = lines;
  }
}
