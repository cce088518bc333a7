/**
 * Events of several series merged into time order as they arrive.
 *
 * The contract orders time only within each series, so a measure that reads two series (busy and
 * capacity, enter and leave) must merge them. Each input is one series, so its events come in
 * time order (the reader checks it); an event can be passed on as soon as no input can still send
 * one that sorts before it: every input without a waiting event has already sent one at the same
 * time or later. Only the events that one series is ahead of the others wait:
 *
 *   add(input, event) ─► queue of its input ─► the smallest head, once no input can undercut it ─► emit
 *   finish ─► every queue to the end, in order
 *
 * The order is by time; at one time either in arrival order (`ties: "arrival"`, a stable sort
 * of all events by time) or by input, lower first, then arrival (`ties: "input"`, a stable sort
 * of input 0's events followed by input 1's). With rows in time order across series (an entity
 * table after its sort, an event table written in time order) nothing waits longer than until the
 * other series' next row; with one series written after the other, the whole first one waits.
 */
export type EventEmit = (time: number, kind: number, value: number, entity: string | undefined, line: number) => void;

export class EventMerge {
  private readonly queues: EventQueue[];
  /** The time of the latest event each input sent (-Infinity: none yet). */
  private readonly last: Float64Array;
  private seq = 0;
  private waiting = 0;

  constructor(
    inputs: number,
    private readonly ties: "arrival" | "input",
    private readonly emit: EventEmit,
  ) {
    this.queues = Array.from({ length: inputs }, () => new EventQueue());
    this.last = new Float64Array(inputs).fill(-Infinity);
  }

  /** The most events waiting at once, for tests of the bound. */
  peak = 0;

  add(input: number, time: number, kind: number, value: number, entity: string | undefined, line: number): void {
    this.last[input] = time;
    const seq = this.seq++;
    if (this.waiting === 0 && this.clear(input, time)) {
      this.emit(time, kind, value, entity, line);
      return;
    }
    this.queues[input].push(time, kind, value, entity, line, seq);
    if (++this.waiting > this.peak) this.peak = this.waiting;
    this.release(false);
  }

  /** Emits every event still waiting, in order. */
  finish(): void {
    this.release(true);
  }

  /**
   * Whether no other input can still send an event that sorts before one of `input` at `time`
   * (called for the head that sorts first, so inputs with a waiting event cannot): each input
   * without a waiting event sent one later, or at the same time when its future events at that
   * time sort after.
   */
  private clear(input: number, time: number): boolean {
    const { queues, last } = this;
    for (let j = 0; j < queues.length; j++) {
      if (j === input || queues[j].size > 0) continue;
      const t = last[j];
      if (t > time) continue;
      if (t === time && (this.ties === "arrival" || j > input)) continue;
      return false;
    }
    return true;
  }

  private release(all: boolean): void {
    const queues = this.queues;
    while (this.waiting > 0) {
      // The head that sorts first.
      let best = -1;
      for (let j = 0; j < queues.length; j++) {
        const q = queues[j];
        if (q.size === 0) continue;
        if (best < 0 || this.before(q, j, queues[best], best)) best = j;
      }
      const q = queues[best];
      if (!all && !this.clear(best, q.headTime)) return;
      const at = q.head;
      const time = q.times[at];
      const kind = q.kinds[at];
      const value = q.values[at];
      const entity = q.entities[at];
      const line = q.lines[at];
      q.shift();
      this.waiting--;
      this.emit(time, kind, value, entity, line);
    }
  }

  private before(a: EventQueue, ia: number, b: EventQueue, ib: number): boolean {
    const ta = a.headTime;
    const tb = b.headTime;
    if (ta !== tb) return ta < tb;
    return this.ties === "arrival" ? a.seqs[a.head] < b.seqs[b.head] : ia < ib;
  }
}

/** A first-in first-out queue of events in typed arrays (a ring, grown by doubling). */
class EventQueue {
  times = new Float64Array(64);
  values = new Float64Array(64);
  lines = new Float64Array(64);
  seqs = new Float64Array(64);
  kinds = new Uint8Array(64);
  entities: (string | undefined)[] = new Array<string | undefined>(64).fill(undefined);
  head = 0;
  size = 0;

  get headTime(): number {
    return this.times[this.head];
  }

  push(time: number, kind: number, value: number, entity: string | undefined, line: number, seq: number): void {
    if (this.size === this.times.length) this.grow();
    const i = (this.head + this.size) & (this.times.length - 1);
    this.times[i] = time;
    this.kinds[i] = kind;
    this.values[i] = value;
    this.entities[i] = entity;
    this.lines[i] = line;
    this.seqs[i] = seq;
    this.size++;
  }

  shift(): void {
    this.entities[this.head] = undefined;
    this.head = (this.head + 1) & (this.times.length - 1);
    this.size--;
  }

  /** Doubles the ring, the waiting events moved to the front in order. */
  private grow(): void {
    const n = this.times.length;
    const times = new Float64Array(2 * n);
    const values = new Float64Array(2 * n);
    const lines = new Float64Array(2 * n);
    const seqs = new Float64Array(2 * n);
    const kinds = new Uint8Array(2 * n);
    const entities = new Array<string | undefined>(2 * n).fill(undefined);
    for (let k = 0; k < this.size; k++) {
      const i = (this.head + k) & (n - 1);
      times[k] = this.times[i];
      values[k] = this.values[i];
      lines[k] = this.lines[i];
      seqs[k] = this.seqs[i];
      kinds[k] = this.kinds[i];
      entities[k] = this.entities[i];
    }
    this.times = times;
    this.values = values;
    this.lines = lines;
    this.seqs = seqs;
    this.kinds = kinds;
    this.entities = entities;
    this.head = 0;
  }
}
