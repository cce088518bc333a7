/**
 * Events of several series merged into time order.
 *
 * The contract orders time only within each series, so a measure that reads two series (busy and
 * capacity, enter and leave) buffers their events in compact typed arrays and replays them by
 * (time, file order). Already-ordered input, the common case, is replayed without sorting.
 */
export class EventBuffer {
  private times = new Float64Array(1024);
  private values = new Float64Array(1024);
  private kinds = new Uint8Array(1024);
  private ids = new Int32Array(1024);
  private lines = new Float64Array(1024);
  private n = 0;
  private ordered = true;
  private lastTime = -Infinity;

  add(time: number, kind: number, value: number, id: number, line: number): void {
    if (this.n === this.times.length) this.grow();
    const i = this.n++;
    this.times[i] = time;
    this.kinds[i] = kind;
    this.values[i] = value;
    this.ids[i] = id;
    this.lines[i] = line;
    if (time < this.lastTime) this.ordered = false;
    else this.lastTime = time;
  }

  private grow(): void {
    const size = this.times.length * 2;
    const t = new Float64Array(size);
    t.set(this.times);
    this.times = t;
    const v = new Float64Array(size);
    v.set(this.values);
    this.values = v;
    const k = new Uint8Array(size);
    k.set(this.kinds);
    this.kinds = k;
    const d = new Int32Array(size);
    d.set(this.ids);
    this.ids = d;
    const l = new Float64Array(size);
    l.set(this.lines);
    this.lines = l;
  }

  get length(): number {
    return this.n;
  }

  /** Calls `fn` for every event in (time, insertion) order. */
  replay(fn: (time: number, kind: number, value: number, id: number, line: number) => void): void {
    const { times, kinds, values, ids, lines } = this;
    if (this.ordered) {
      for (let i = 0; i < this.n; i++) fn(times[i], kinds[i], values[i], ids[i], lines[i]);
      return;
    }
    const order = new Uint32Array(this.n);
    for (let i = 0; i < this.n; i++) order[i] = i;
    order.sort((a, b) => times[a] - times[b] || a - b);
    for (let j = 0; j < this.n; j++) {
      const i = order[j];
      fn(times[i], kinds[i], values[i], ids[i], lines[i]);
    }
  }
}

/** Interns entity ids as small integers. */
export class EntityIds {
  private readonly ids = new Map<string, number>();
  private readonly names: string[] = [];
  id(name: string): number {
    let i = this.ids.get(name);
    if (i === undefined) {
      i = this.names.length;
      this.ids.set(name, i);
      this.names.push(name);
    }
    return i;
  }
  name(id: number): string {
    return this.names[id];
  }
  get size(): number {
    return this.names.length;
  }
}
