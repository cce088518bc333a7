/**
 * Vega-lite specs for the report's charts. Pure: numbers and labels in, a spec out. The specs
 * carry their data inline; `html.ts` compiles and renders them to static SVG at build time.
 *
 * Every chart states the time unit on its time axis or in its value axis title.
 */
import type { TopLevelSpec } from "vega-lite";
import type { LevelTrace, TraceLine } from "../outcome/index.js";
import { fsum } from "../stats/fsum.js";

/** The report's palette; the CSS in templates/report.css uses the same values. */
export const PALETTE = {
  ink: "#22313a",
  muted: "#6b6357",
  rule: "#d8cfc0",
  paper: "#fffdf8",
  kiln: "#b4532a",
  tide: "#2a7f78",
  ochre: "#d9a441",
  haze: "#e9e1d3",
} as const;

/** Most values a histogram bins; larger samples are subsampled evenly. */
export const MAX_HISTOGRAM_VALUES = 5000;

const SCHEMA = "https://vega.github.io/schema/vega-lite/v6.json";
const WIDTH = 620;
const FONT = "Liberation Sans, Arial, Helvetica, sans-serif";

function config() {
  return {
    font: FONT,
    background: "transparent",
    padding: 8,
    view: { stroke: null },
    axis: {
      labelColor: PALETTE.ink,
      titleColor: PALETTE.ink,
      gridColor: PALETTE.haze,
      domainColor: PALETTE.muted,
      tickColor: PALETTE.muted,
      labelFontSize: 11,
      titleFontSize: 11,
      titleFontWeight: 600,
      labelLimit: 240,
    },
    legend: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, labelFontSize: 11, orient: "top", labelLimit: 400, symbolStrokeWidth: 2 },
    header: { labelColor: PALETTE.ink, labelFontSize: 11, labelFont: FONT, labelLimit: 240 },
  } as const;
}

/**
 * The value a chart groups, facets, colours or places on a nominal axis by, in place of a name.
 * Vega keeps facets and aggregate groups in plain objects keyed by that value, so a scenario
 * named `__proto__` lost its facet and its bars, and one named `constructor` or `valueOf` could
 * meet a member of every object. A key never is such a member's name (it starts with `n:`);
 * axes, legends and facet headers show the name again (`NAME_LABEL`), and each mark's
 * accessible description is written from the name, not the key.
 */
export function nameKey(name: string): string {
  return `n:${name}`;
}

/** The vega expression that shows a key's name: the key without its `n:`. */
const NAME_LABEL = "slice(datum.value, 2)";

/**
 * An axis title. Vega reads a title that is exactly the name of a member of every object
 * (`constructor`, `valueOf`, `toString`, ...) as a reference to that member and fails to draw the
 * chart; a space after the text (not drawn) keeps it a text.
 */
export function axisTitle(text: string): string;
export function axisTitle(text: string | null): string | null;
export function axisTitle(text: string | null): string | null {
  if (text === null) return null;
  return text === "__proto__" || text in Object.prototype ? `${text} ` : text;
}

/** One scenario's interval for the interval chart. `label` is the rounded mean as shown. */
export interface IntervalPoint {
  scenario: string;
  mean: number | null;
  low: number | null;
  high: number | null;
  label: string;
}

/** Mean and confidence interval of one measure, one row per scenario. */
export function intervalChart(points: IntervalPoint[], valueTitle: string): TopLevelSpec {
  const order = points.map((p) => nameKey(p.scenario));
  const y = { field: "scenario_key", type: "nominal", scale: { domain: order }, title: null, axis: { labelExpr: NAME_LABEL } } as const;
  const x = { field: "mean", type: "quantitative", title: axisTitle(valueTitle), scale: { zero: false } } as const;
  const description = { field: "about" } as const;
  const values = points
    .filter((p) => p.mean !== null)
    .map((p) => ({ ...p, scenario_key: nameKey(p.scenario), about: `${p.scenario}: mean ${p.label}` }));
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: { step: 34 },
    data: { values },
    layer: [
      {
        mark: { type: "rule", strokeWidth: 3, color: PALETTE.kiln },
        transform: [{ filter: "datum.low !== null && datum.high !== null" }],
        encoding: { y, x: { field: "low", type: "quantitative", title: axisTitle(valueTitle) }, x2: { field: "high" }, description },
      },
      {
        mark: { type: "tick", thickness: 2, size: 14, color: PALETTE.kiln },
        transform: [{ filter: "datum.low !== null" }],
        encoding: { y, x: { field: "low", type: "quantitative" } },
      },
      {
        mark: { type: "tick", thickness: 2, size: 14, color: PALETTE.kiln },
        transform: [{ filter: "datum.high !== null" }],
        encoding: { y, x: { field: "high", type: "quantitative" } },
      },
      {
        mark: { type: "point", filled: true, size: 70, color: PALETTE.ink, opacity: 1 },
        encoding: { y, x, description },
      },
      {
        mark: { type: "text", dy: -11, fontSize: 10, color: PALETTE.ink },
        encoding: { y, x, text: { field: "label" }, description },
      },
    ],
    config: config(),
  };
}

/** One run's primary value for the run chart. */
export interface RunPoint {
  scenario: string;
  run: string;
  value: number;
}

/**
 * Each run's value as a dot on its scenario's row, with the scenario mean (the plain mean of the
 * values drawn, compensated sum) as a bar. The means are computed here rather than by vega, whose
 * aggregate groups by a plain object.
 */
export function runsChart(points: RunPoint[], scenarios: string[], valueTitle: string): TopLevelSpec {
  const y = { field: "scenario_key", type: "nominal", scale: { domain: scenarios.map(nameKey) }, title: null, axis: { labelExpr: NAME_LABEL } } as const;
  const byScenario = new Map<string, number[]>();
  for (const p of points) {
    const list = byScenario.get(p.scenario);
    if (list === undefined) byScenario.set(p.scenario, [p.value]);
    else list.push(p.value);
  }
  const means = [...byScenario].map(([scenario, values]) => {
    const mean = fsum(values) / values.length;
    return { scenario, scenario_key: nameKey(scenario), mean, about: `${scenario}: mean of the runs ${mean}` };
  });
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: { step: 30 },
    layer: [
      {
        data: { values: means },
        mark: { type: "tick", thickness: 2, size: 20, color: PALETTE.kiln },
        encoding: { y, x: { field: "mean", type: "quantitative", title: axisTitle(valueTitle) }, description: { field: "about" } },
      },
      {
        data: { values: points.map((p) => ({ ...p, scenario_key: nameKey(p.scenario), about: `${p.scenario}, run ${p.run}: ${p.value}` })) },
        mark: { type: "point", filled: true, size: 48, color: PALETTE.tide, opacity: 0.75 },
        encoding: {
          y,
          x: { field: "value", type: "quantitative", title: axisTitle(valueTitle), scale: { zero: false } },
          description: { field: "about" },
        },
      },
    ],
    config: config(),
  };
}

/** The area under a trace's level from c up to `t` (c <= t <= end), exactly from its change points when it has them, else at slice ends only (null elsewhere). */
export function areaSince(line: TraceLine, c: number, t: number): number | null {
  const steps = line.steps;
  if (steps !== null) {
    // The last change point at or before t.
    let lo = 0;
    let hi = steps.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (steps[mid].time <= t) lo = mid;
      else hi = mid - 1;
    }
    const s = steps[lo];
    const from = s.time > c ? s.time : c;
    return s.area + (t > from ? s.value * (t - from) : 0);
  }
  for (const sl of line.slices) if (sl.to === t) return sl.area_to;
  return null;
}

/**
 * The running time average area(c, t) / (t - c) of a level, sampled where a chart needs it: at
 * every change point after c and at every slice end, so consecutive samples are about a pixel
 * apart and the curve between change points (area so far over elapsed time) is drawn as a curve.
 * For a utilization, the running ratio of the busy area to the capacity area at the same times.
 * Starts at c with the limit of the average there (the level, or busy over capacity, at c).
 */
export function runningAverage(level: TraceLine, capacity: TraceLine | null, c: number, end: number): { time: number; mean: number }[] {
  const times = new Set<number>();
  for (const sl of level.slices) if (sl.to > c) times.add(sl.to);
  const exact = level.steps !== null && (capacity === null || capacity.steps !== null);
  if (exact) for (const line of capacity === null ? [level] : [level, capacity]) for (const s of line.steps!) if (s.time > c && s.time <= end) times.add(s.time);
  const out: { time: number; mean: number }[] = [];
  const at = levelAt(level, c);
  const capAt = capacity === null ? 1 : levelAt(capacity, c);
  if (at !== null && capAt !== null && capAt !== 0) out.push({ time: c, mean: at / capAt });
  for (const t of [...times].sort((x, y) => x - y)) {
    const a = areaSince(level, c, t);
    const d = capacity === null ? t - c : areaSince(capacity, c, t);
    if (a === null || d === null || !(d !== 0)) continue;
    out.push({ time: t, mean: a / d });
  }
  return out;
}

/** The level in effect just after `t` (from the change points, or the slice holding t when it is constant there). */
function levelAt(line: TraceLine, t: number): number | null {
  if (line.steps !== null) {
    let v = line.steps[0].value;
    for (const s of line.steps) {
      if (s.time > t) break;
      v = s.value;
    }
    return v;
  }
  const sl = line.slices.find((x) => x.to > t);
  return sl !== undefined && sl.low === sl.high ? sl.low : null;
}

/** A run's trace (window, warm-up, level and capacity: `LevelTrace` of outcome/) and the words drawn with it. */
export interface TraceChartArgs extends Pick<LevelTrace, "start" | "from" | "to" | "warmup" | "level" | "capacity"> {
  timeTitle: string;
  valueTitle: string;
  levelLabel: string;
  capacityLabel: string;
  averageLabel: string;
  /** For a utilization: the title of the right axis (the running utilization, a fraction). */
  averageTitle: string | null;
  warmupLabel: string;
}

/** True when a trace is drawn as a band of slices (too many change points for a step line). */
export function tracedAsBand(args: Pick<TraceChartArgs, "level" | "capacity">): boolean {
  return args.level.steps === null || (args.capacity !== null && args.capacity.steps === null);
}

/** Step-after points of a line: every change point, and the level held at the end. */
function stepRows(line: TraceLine, end: number, series: string): { time: number; value: number; series: string }[] {
  const steps = line.steps!;
  const rows = steps.map((p) => ({ time: p.time, value: p.value, series }));
  rows.push({ time: end, value: steps[steps.length - 1].value, series });
  return rows;
}

/**
 * One run's level over its whole window: the warm-up as a grey band from the window's start, the
 * level as a step line with the area under it shaded (or, on a run with more change points than
 * the chart can draw one by one, as a band of the lowest and highest level in each slice of the
 * window with the slice's time average as a line), and the running time average from c as a
 * curve. For a utilization the capacity is drawn too, and the running utilization (busy area over
 * capacity area so far) is read on a right axis from 0.
 *
 * Every height comes from the trace: the y axis spans the true lowest and highest level (and 0).
 */
export function traceChart(args: TraceChartArgs): TopLevelSpec {
  const { level, capacity } = args;
  const band = tracedAsBand(args);
  const series = [args.levelLabel, ...(capacity !== null ? [args.capacityLabel] : []), args.averageLabel];
  const colorScale = { domain: series, range: [PALETTE.ink, ...(capacity !== null ? [PALETTE.tide] : []), PALETTE.kiln] };
  const color = { field: "series", type: "nominal", scale: colorScale, legend: { title: null } } as const;
  const xTime = { field: "time", type: "quantitative", title: axisTitle(args.timeTitle), scale: { domain: [args.start, args.to], nice: false, zero: false } } as const;
  const lows = [level.min, ...(capacity !== null ? [capacity.min] : [])];
  const highs = [level.max, ...(capacity !== null ? [capacity.max] : [])];
  const yLow = Math.min(0, ...lows);
  let yHigh = Math.max(0, ...highs);
  if (yHigh === yLow) yHigh = yLow + 1;
  const yScale = { domain: [yLow, yHigh] };
  const yValue = { field: "value", type: "quantitative", title: axisTitle(args.valueTitle), scale: yScale } as const;
  const layer: object[] = [];
  if (args.from > args.start) {
    const w = { start: args.start, end: args.from, label: args.warmupLabel };
    layer.push({
      name: "warmup_band",
      data: { values: [w] },
      mark: { type: "rect", color: PALETTE.haze, opacity: 0.8 },
      encoding: { x: { field: "start", type: "quantitative", scale: xTime.scale }, x2: { field: "end" } },
    }, {
      data: { values: [w] },
      mark: { type: "rule", color: PALETTE.muted, strokeDash: [3, 3] },
      encoding: { x: { field: "end", type: "quantitative" } },
    }, {
      data: { values: [w] },
      mark: { type: "text", align: "right", baseline: "bottom", dx: -3, y: -3, fontSize: 10, fontStyle: "italic", color: PALETTE.muted },
      encoding: { x: { field: "end", type: "quantitative" }, text: { field: "label" } },
    });
  }
  // The capacity first, wide and dashed, so that the busy line drawn over it leaves it visible where they meet.
  const lines: { line: TraceLine; label: string; name: string }[] = [];
  if (capacity !== null) lines.push({ line: capacity, label: args.capacityLabel, name: "capacity" });
  lines.push({ line: level, label: args.levelLabel, name: "level" });
  if (!band) layer.push({
    name: "level_area",
    data: { values: stepRows(level, args.to, args.levelLabel) },
    mark: { type: "area", interpolate: "step-after", color: PALETTE.ochre, opacity: 0.28 },
    // Not stacked: ties (several rows at one time) would otherwise pile up on one another.
    encoding: { x: xTime, y: { ...yValue, stack: null } },
  });
  for (const { line, label, name } of lines) {
    if (!band) {
      layer.push({
        name: `${name}_line`,
        data: { values: stepRows(line, args.to, label) },
        mark: { type: "line", interpolate: "step-after", ...(name === "capacity" ? { strokeWidth: 3, strokeDash: [6, 3] } : { strokeWidth: 1.2 }) },
        encoding: { x: xTime, y: yValue, color },
      });
    } else {
      const slices = line.slices.map((s) => ({ start: s.from, end: s.to, low: s.low, high: s.high, series: label }));
      layer.push({
        name: `${name}_band`,
        data: { values: slices },
        // A stroke as wide as a pixel keeps a band one slice wide (a spike of an instant) visible at its height.
        mark: { type: "rect", color: name === "level" ? PALETTE.ochre : PALETTE.tide, opacity: name === "level" ? 0.8 : 0.3, stroke: name === "level" ? PALETTE.ochre : PALETTE.tide, strokeWidth: 0.8 },
        encoding: { x: { field: "start", type: "quantitative", title: axisTitle(args.timeTitle), scale: xTime.scale }, x2: { field: "end" }, y: { field: "low", type: "quantitative", title: axisTitle(args.valueTitle), scale: yScale }, y2: { field: "high" } },
      });
      const means = line.slices.map((s) => ({ time: s.from, value: s.mean, series: label }));
      const lastSlice = line.slices[line.slices.length - 1];
      if (lastSlice !== undefined) means.push({ time: lastSlice.to, value: lastSlice.mean, series: label });
      layer.push({
        name: `${name}_slice_mean`,
        data: { values: means },
        mark: { type: "line", interpolate: "step-after", strokeWidth: 1, ...(name === "capacity" ? { strokeDash: [2, 2] } : {}) },
        encoding: { x: xTime, y: yValue, color },
      });
    }
  }
  const running = runningAverage(level, capacity, args.from, args.to).map((p) => ({ ...p, series: args.averageLabel }));
  const spec: Record<string, unknown> = { $schema: SCHEMA, width: WIDTH, height: 170, config: config() };
  if (running.length > 0) {
    const runLayer = {
      name: "running_average",
      data: { values: running },
      mark: { type: "line", strokeWidth: 2, strokeDash: [6, 3] },
      encoding: {
        x: xTime,
        y: args.averageTitle === null
          ? { field: "mean", type: "quantitative", scale: yScale }
          : { field: "mean", type: "quantitative", title: axisTitle(args.averageTitle), scale: { domain: [0, Math.max(1, ...running.map((p) => p.mean))] }, axis: { orient: "right" } },
        color,
      },
    };
    if (args.averageTitle === null) layer.push(runLayer);
    else {
      spec.layer = [{ layer }, runLayer];
      spec.resolve = { scale: { y: "independent" } };
      return spec as unknown as TopLevelSpec;
    }
  }
  spec.layer = layer;
  return spec as unknown as TopLevelSpec;
}

/** Evenly spaced subsample of at most `max` values (the first and last kept). */
export function evenSample(values: number[], max: number = MAX_HISTOGRAM_VALUES): number[] {
  if (values.length <= max) return values;
  const out: number[] = [];
  for (let i = 0; i < max; i++) out.push(values[Math.round((i * (values.length - 1)) / (max - 1))]);
  return out;
}

/**
 * One facet row per scenario, in the study's order, labelled above the row with its name. The
 * facet is by the scenario's key (`nameKey`) and the order comes from a `scenario_order` field
 * (see `withOrder`), never from a list of names: vega looks facets and sort lists up in plain
 * objects, where a scenario called "__proto__" or "constructor" would break the chart.
 */
function scenarioRows() {
  const header = { labelAngle: 0, labelAlign: "left" as const, labelAnchor: "start" as const, labelOrient: "top" as const, labelExpr: NAME_LABEL };
  return { row: { field: "scenario_key", type: "nominal" as const, sort: { field: "scenario_order", op: "min" as const }, title: null, header } };
}

/** Rows with their scenario's key and position in the study, for `scenarioRows`. */
function withOrder<R extends { scenario: string }>(rows: R[], scenarios: string[]): (R & { scenario_key: string; scenario_order: number })[] {
  const position = new Map(scenarios.map((name, i) => [name, i]));
  return rows.map((r) => ({ ...r, scenario_key: nameKey(r.scenario), scenario_order: position.get(r.scenario) ?? scenarios.length }));
}

/** A chart drawn once per scenario, one row each, in the study's order. */
function facetedByScenario(values: object[], spec: object): TopLevelSpec {
  return { $schema: SCHEMA, data: { values }, facet: scenarioRows(), spacing: 10, spec, config: config() } as TopLevelSpec;
}

/** Histogram of observation values, one row per scenario, shared bins. */
export function histogramChart(
  rows: { scenario: string; value: number }[],
  scenarios: string[],
  valueTitle: string,
  countTitle: string,
): TopLevelSpec {
  return facetedByScenario(withOrder(rows, scenarios), {
    width: WIDTH,
    height: 80,
    mark: { type: "bar", color: PALETTE.tide, opacity: 0.85, binSpacing: 1 },
    encoding: {
      x: { field: "value", type: "quantitative", bin: { maxbins: 30 }, title: axisTitle(valueTitle) },
      y: { aggregate: "count", type: "quantitative", title: axisTitle(countTitle) },
    },
  });
}

/** Most points the warm-up plot draws per line; longer slice series are sampled evenly for drawing. */
export const MAX_WELCH_POINTS = 2000;
/** Most points an empirical distribution line draws per scenario (evenly spaced ranks). */
export const MAX_ECDF_POINTS = 800;

/**
 * Welch's moving average (Welch 1983) of a sequence Y₁…Yₘ with window w: for j > w the mean of
 * the 2w + 1 values centred on j; near the start (j ≤ w) the mean of the 2j − 1 values centred on
 * j, so the first point is Y₁ itself. Defined for j = 1…m − w. Returns [] when m < 2w + 1 or w < 1.
 *
 * @example welchMovingAverage([1, 2, 3, 4, 5], 1) // [1, 2, 3, 4]
 */
export function welchMovingAverage(ys: number[], w: number): number[] {
  const m = ys.length;
  if (w < 1 || m < 2 * w + 1) return [];
  const prefix = [0];
  for (const y of ys) prefix.push(prefix[prefix.length - 1] + y);
  const out: number[] = [];
  for (let j = 1; j <= m - w; j++) {
    const s = j <= w ? j - 1 : w;
    out.push((prefix[j + s] - prefix[j - s - 1]) / (2 * s + 1));
  }
  return out;
}

/** The default window of the warm-up plot: m/20 rounded, at least 1, at most ⌊m/4⌋ (0 when m < 4). */
export function welchWindow(m: number): number {
  if (m < 4) return 0;
  return Math.min(Math.floor(m / 4), Math.max(1, Math.round(m / 20)));
}

/** Indices 0…n−1 sampled evenly to at most `max` (first and last kept). */
function evenIndices(n: number, max: number): number[] {
  if (n <= max) return Array.from({ length: n }, (_, i) => i);
  const out: number[] = [];
  for (let i = 0; i < max; i++) out.push(Math.round((i * (n - 1)) / (max - 1)));
  return [...new Set(out)];
}

/**
 * The warm-up plot: the across-run average of each time slice (thin line with dots), its moving
 * average (thick line), and the chosen warm-up as a rule with its label.
 */
export function welchChart(args: {
  slices: { time: number; mean: number }[];
  smoothed: { time: number; mean: number }[];
  warmup: number | null;
  timeTitle: string;
  valueTitle: string;
  sliceLabel: string;
  smoothLabel: string;
  warmupLabel: string;
}): TopLevelSpec {
  const pick = <T>(xs: T[]) => evenIndices(xs.length, MAX_WELCH_POINTS).map((i) => xs[i]);
  const color = {
    field: "series",
    type: "nominal",
    scale: { domain: [args.sliceLabel, args.smoothLabel], range: [PALETTE.tide, PALETTE.kiln] },
    legend: { title: null },
  } as const;
  const x = { field: "time", type: "quantitative", title: axisTitle(args.timeTitle), scale: { nice: false } } as const;
  const y = { field: "mean", type: "quantitative", title: axisTitle(args.valueTitle) } as const;
  const layer: object[] = [
    {
      data: { values: pick(args.slices).map((p) => ({ time: p.time, mean: p.mean, series: args.sliceLabel })) },
      mark: { type: "line", strokeWidth: 1, opacity: 0.9 },
      encoding: { x, y, color },
    },
  ];
  if (args.smoothed.length > 0) {
    layer.push({
      data: { values: pick(args.smoothed).map((p) => ({ time: p.time, mean: p.mean, series: args.smoothLabel })) },
      mark: { type: "line", strokeWidth: 2.6 },
      encoding: { x, y, color },
    });
  }
  if (args.warmup !== null) {
    const rule = [{ time: args.warmup, label: args.warmupLabel }];
    layer.push({
      data: { values: rule },
      mark: { type: "rule", color: PALETTE.ink, strokeDash: [4, 3], strokeWidth: 1.5 },
      encoding: { x: { field: "time", type: "quantitative" } },
    });
    layer.push({
      data: { values: rule },
      mark: { type: "text", align: "left", baseline: "top", dx: 4, y: 2, fontSize: 10, fontStyle: "italic", color: PALETTE.ink },
      encoding: { x: { field: "time", type: "quantitative" }, text: { field: "label" } },
    });
  }
  return { $schema: SCHEMA, width: WIDTH, height: 200, layer, config: config() } as TopLevelSpec;
}

/**
 * The empirical distribution function of each scenario's observations as a step line: the share
 * of observations ≤ x. The steps are at evenly spaced ranks when there are many values.
 */
export function ecdfSteps(values: number[], max: number = MAX_ECDF_POINTS): { value: number; share: number }[] {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  if (n === 0) return [];
  // Keep the last of equal values: F(x) counts every value ≤ x.
  const last: number[] = [];
  for (let i = 0; i < n; i++) if (i + 1 === n || s[i + 1] !== s[i]) last.push(i);
  const keep = evenIndices(last.length, max).map((k) => last[k]);
  return [{ value: s[0], share: 0 }, ...keep.map((i) => ({ value: s[i], share: (i + 1) / n }))];
}

/** ECDF lines by scenario with the measure's thresholds as labelled vertical rules. */
export function ecdfChart(args: {
  rows: { scenario: string; value: number; share: number }[];
  scenarios: string[];
  thresholds: { value: number; label: string }[];
  valueTitle: string;
  shareTitle: string;
}): TopLevelSpec {
  const colors = [PALETTE.tide, PALETTE.kiln, PALETTE.ink, PALETTE.ochre, PALETTE.muted];
  const layer: object[] = [
    {
      data: { values: args.rows.map((r) => ({ ...r, scenario_key: nameKey(r.scenario), about: `${r.scenario}: empirical distribution` })) },
      mark: { type: "line", interpolate: "step-after", strokeWidth: 1.8 },
      encoding: {
        x: { field: "value", type: "quantitative", title: axisTitle(args.valueTitle) },
        y: { field: "share", type: "quantitative", title: axisTitle(args.shareTitle), scale: { domain: [0, 1] }, axis: { format: ".0%" } },
        color: { field: "scenario_key", type: "nominal", scale: { domain: args.scenarios.map(nameKey), range: colors }, legend: { title: null, labelExpr: NAME_LABEL } },
        description: { field: "about" },
      },
    },
  ];
  if (args.thresholds.length > 0) {
    layer.push({
      data: { values: args.thresholds },
      mark: { type: "rule", color: PALETTE.muted, strokeDash: [3, 3] },
      encoding: { x: { field: "value", type: "quantitative" } },
    });
    layer.push({
      data: { values: args.thresholds },
      mark: { type: "text", align: "left", baseline: "top", dx: 3, y: 2, fontSize: 10, color: PALETTE.muted },
      encoding: { x: { field: "value", type: "quantitative" }, text: { field: "label" } },
    });
  }
  return { $schema: SCHEMA, width: WIDTH, height: 200, layer, config: config() } as TopLevelSpec;
}

/** Average share of time at each value, one row of bars per scenario on a shared value axis. */
export function timeAtValueChart(
  rows: { scenario: string; value: number; share: number }[],
  scenarios: string[],
  valueTitle: string,
  shareTitle: string,
): TopLevelSpec {
  return facetedByScenario(withOrder(rows, scenarios), {
    width: WIDTH,
    height: 90,
    mark: { type: "bar", color: PALETTE.ochre, opacity: 0.9 },
    encoding: {
      x: { field: "value", type: "ordinal", sort: "ascending", title: axisTitle(valueTitle), axis: { labelAngle: 0, labelOverlap: "parity" } },
      y: { field: "share", type: "quantitative", title: axisTitle(shareTitle), axis: { format: ".0%" } },
    },
  });
}

/** One point of a response curve chart: a scenario's mean and interval at its factor value. */
export interface CurveChartPoint {
  scenario: string;
  value: number;
  mean: number;
  low: number | null;
  high: number | null;
  /** The mean as the report rounds it, for the point's description. */
  label: string;
}

/** Most distinct factor values the x axis marks one by one; more get the axis' own ticks. */
const MAX_FACTOR_TICKS = 12;

/**
 * A measure against one factor: each scenario's mean as a dot at its factor value, its interval
 * as a vertical bar with end ticks, and the dots of a group joined by a line in factor order. One
 * panel per group (a combination of the other factors), labelled with it, only when there is more
 * than one group; panels share both axes. Groups are faceted by key (`nameKey`), in the given
 * order, so no label can meet a member of a plain object.
 */
export function responseCurveChart(args: {
  groups: { label: string; points: CurveChartPoint[] }[];
  factorTitle: string;
  valueTitle: string;
}): TopLevelSpec {
  const values = args.groups.flatMap((g, gi) => g.points.map((p, pi) => ({
    ...p, group_key: nameKey(g.label), group_order: gi, point_order: pi,
    about: `${g.label === "" ? "" : `${g.label}: `}${p.scenario} at ${p.value}: mean ${p.label}`,
  })));
  const ticks = [...new Set(values.map((v) => v.value))].sort((a, b) => a - b);
  const x = {
    field: "value", type: "quantitative", title: axisTitle(args.factorTitle), scale: { zero: false, padding: 16 },
    ...(ticks.length <= MAX_FACTOR_TICKS ? { axis: { values: ticks, format: "~g", grid: false } } : {}),
  } as const;
  const y = { field: "mean", type: "quantitative", title: axisTitle(args.valueTitle), scale: { zero: false } } as const;
  const description = { field: "about" } as const;
  const withInterval = "datum.low !== null && datum.high !== null";
  const layer = [
    {
      name: "curve_line",
      mark: { type: "line", color: PALETTE.tide, strokeWidth: 1.5 },
      encoding: { x, y, order: { field: "point_order" } },
    },
    {
      name: "curve_interval",
      mark: { type: "rule", strokeWidth: 2.5, color: PALETTE.kiln },
      transform: [{ filter: withInterval }],
      encoding: { x, y: { field: "low", type: "quantitative", title: axisTitle(args.valueTitle) }, y2: { field: "high" }, description },
    },
    {
      name: "curve_low",
      mark: { type: "tick", orient: "horizontal", thickness: 2, size: 12, color: PALETTE.kiln },
      transform: [{ filter: withInterval }],
      encoding: { x, y: { field: "low", type: "quantitative" } },
    },
    {
      name: "curve_high",
      mark: { type: "tick", orient: "horizontal", thickness: 2, size: 12, color: PALETTE.kiln },
      transform: [{ filter: withInterval }],
      encoding: { x, y: { field: "high", type: "quantitative" } },
    },
    {
      name: "curve_point",
      mark: { type: "point", filled: true, size: 60, color: PALETTE.ink, opacity: 1 },
      encoding: { x, y, description },
    },
  ];
  if (args.groups.length <= 1) return { $schema: SCHEMA, width: WIDTH, height: 220, data: { values }, layer, config: config() } as unknown as TopLevelSpec;
  const header = { labelAngle: 0, labelAlign: "left" as const, labelAnchor: "start" as const, labelExpr: NAME_LABEL, title: null };
  return {
    $schema: SCHEMA,
    data: { values },
    facet: { field: "group_key", type: "nominal", sort: { field: "group_order", op: "min" }, header, title: null },
    columns: 2,
    spacing: 16,
    spec: { width: Math.floor((WIDTH - 16) / 2), height: 180, layer },
    config: config(),
  } as unknown as TopLevelSpec;
}

/** One scenario's interval of the multiple comparisons with the best, for `bestComparisonChart`. */
export interface BestComparisonPoint {
  scenario: string;
  lower: number;
  upper: number;
  /** The interval as shown, for the mark's accessible description. */
  label: string;
}

/**
 * The intervals of the multiple comparisons with the best, one row per scenario: a bar from the
 * interval's lower to its upper end, with end ticks, and a line at zero. Positive is better (the
 * intervals are oriented so), so a bar that ends at zero marks a scenario ruled out, one that
 * starts at zero the selected.
 */
export function bestComparisonChart(points: BestComparisonPoint[], valueTitle: string): TopLevelSpec {
  const order = points.map((p) => nameKey(p.scenario));
  const y = { field: "scenario_key", type: "nominal", scale: { domain: order }, title: null, axis: { labelExpr: NAME_LABEL } } as const;
  const values = points.map((p) => ({ ...p, scenario_key: nameKey(p.scenario), about: `${p.scenario}: ${p.label}` }));
  const x = { field: "lower", type: "quantitative", title: axisTitle(valueTitle) } as const;
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: { step: 34 },
    data: { values },
    layer: [
      {
        name: "best_zero",
        data: { values: [{ zero: 0 }] },
        mark: { type: "rule", strokeWidth: 1, color: PALETTE.muted, strokeDash: [4, 3] },
        encoding: { x: { field: "zero", type: "quantitative" } },
      },
      {
        name: "best_interval",
        mark: { type: "rule", strokeWidth: 3, color: PALETTE.kiln },
        encoding: { y, x, x2: { field: "upper" }, description: { field: "about" } },
      },
      { name: "best_lower", mark: { type: "tick", thickness: 2, size: 14, color: PALETTE.kiln }, encoding: { y, x } },
      { name: "best_upper", mark: { type: "tick", thickness: 2, size: 14, color: PALETTE.kiln }, encoding: { y, x: { field: "upper", type: "quantitative" } } },
    ],
    config: config(),
  } as unknown as TopLevelSpec;
}
