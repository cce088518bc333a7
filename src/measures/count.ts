import type { CountMeasure } from "../manifest/types.js";
import type { CountRunStats } from "../outcome/index.js";
import type { MeasureAccumulator, MeasureOutput, SeriesRead } from "./accumulator.js";
import type { MeasureSetup } from "./setup.js";
import { TableBuilder } from "./table.js";
import { windowDuration } from "./window.js";

/** `line`: the run-file line of the counted row (contract section 11). */
export const COUNT_COLUMNS = ["index", "time", "running_count", "line"];

/** Each row of the series inside [c, end] counts 1; rate = n / T (contract section 4). */
export class Count implements MeasureAccumulator {
  readonly reads: SeriesRead[];
  private n = 0;
  private readonly table: TableBuilder;
  /** Reused for every row; numbers only so doubles are stored unboxed. */
  private readonly cells: number[] = new Array<number>(COUNT_COLUMNS.length).fill(0);

  constructor(
    measure: CountMeasure,
    private readonly setup: MeasureSetup,
  ) {
    this.reads = [{ series: measure.series, entity: false }];
    this.table = new TableBuilder(COUNT_COLUMNS, setup.table.maxRows, setup.table.edgeRows);
  }

  row(_slot: number, time: number, _value: number, _entity: string | undefined, line: number): void {
    if (time < this.setup.window.collectFrom) return;
    const r = this.cells;
    r[0] = ++this.n;
    r[1] = time;
    r[2] = this.n;
    r[3] = line;
    this.table.addNumbers(r);
  }

  finish(): MeasureOutput {
    const T = windowDuration(this.setup.window);
    const stats: CountRunStats = { kind: "count", value: this.n, n: this.n, rate: T === null ? null : this.n / T };
    return { stats, tables: [{ suffix: "", table: this.table.build() }], warnings: [] };
  }
}
