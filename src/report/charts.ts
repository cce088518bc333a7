/**
 * Vega-lite specs for the report's charts. Pure: numbers and labels in, a spec out. The specs
 * carry their data inline; `html.ts` compiles and renders them to static SVG at build time.
 *
 * Every chart states the time unit on its time axis or in its value axis title.
 */
import type { TopLevelSpec } from "vega-lite";

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

/** Most points a step chart draws; longer traces are thinned (see `thinSteps`). */
export const MAX_TRACE_POINTS = 2000;
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
  const order = points.map((p) => p.scenario);
  const y = { field: "scenario", type: "nominal", sort: order, title: null } as const;
  const x = { field: "mean", type: "quantitative", title: valueTitle, scale: { zero: false } } as const;
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: { step: 34 },
    data: { values: points.filter((p) => p.mean !== null) },
    layer: [
      {
        mark: { type: "rule", strokeWidth: 3, color: PALETTE.kiln },
        transform: [{ filter: "datum.low !== null && datum.high !== null" }],
        encoding: { y, x: { field: "low", type: "quantitative", title: valueTitle }, x2: { field: "high" } },
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
        encoding: { y, x },
      },
      {
        mark: { type: "text", dy: -11, fontSize: 10, color: PALETTE.ink },
        encoding: { y, x, text: { field: "label" } },
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

/** Each run's value as a dot on its scenario's row, with the scenario mean as a bar. */
export function runsChart(points: RunPoint[], scenarios: string[], valueTitle: string): TopLevelSpec {
  const y = { field: "scenario", type: "nominal", sort: scenarios, title: null } as const;
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: { step: 30 },
    data: { values: points },
    layer: [
      {
        mark: { type: "tick", thickness: 2, size: 20, color: PALETTE.kiln },
        encoding: { y, x: { aggregate: "mean", field: "value", type: "quantitative", title: valueTitle } },
      },
      {
        mark: { type: "point", filled: true, size: 48, color: PALETTE.tide, opacity: 0.75 },
        encoding: {
          y,
          x: { field: "value", type: "quantitative", title: valueTitle, scale: { zero: false } },
        },
      },
    ],
    config: config(),
  };
}

/** A change point of a level: `value` holds on [time, next time). */
export interface StepPoint {
  time: number;
  value: number;
  running_mean: number;
}

/**
 * Thins a step trace to at most about `max` points: the time range is cut into equal buckets
 * and each bucket keeps its first point, its lowest and highest level, and its last point, so
 * peaks and troughs stay visible.
 */
export function thinSteps(points: StepPoint[], max: number = MAX_TRACE_POINTS): StepPoint[] {
  if (points.length <= max) return points;
  const buckets = Math.max(1, Math.floor(max / 4));
  const t0 = points[0].time;
  const span = points[points.length - 1].time - t0 || 1;
  const out: StepPoint[] = [];
  let start = 0;
  while (start < points.length) {
    const b = Math.min(buckets - 1, Math.floor(((points[start].time - t0) / span) * buckets));
    let end = start;
    while (end + 1 < points.length && Math.min(buckets - 1, Math.floor(((points[end + 1].time - t0) / span) * buckets)) === b) end++;
    let lo = start;
    let hi = start;
    for (let i = start; i <= end; i++) {
      if (points[i].value < points[lo].value) lo = i;
      if (points[i].value > points[hi].value) hi = i;
    }
    for (const i of [...new Set([start, lo, hi, end])].sort((a, b2) => a - b2)) out.push(points[i]);
    start = end + 1;
  }
  return out;
}

/**
 * One run's level over time: the step line with the area under it shaded, the running time
 * average since the start of collection, and the warm-up shaded and marked.
 */
export function traceChart(args: {
  points: StepPoint[];
  from: number;
  to: number;
  warmup: number | null;
  timeTitle: string;
  valueTitle: string;
  levelLabel: string;
  averageLabel: string;
  warmupLabel: string;
}): TopLevelSpec {
  const pts = thinSteps(args.points);
  const last = pts[pts.length - 1];
  const steps = [...pts.map((p) => ({ time: p.time, value: p.value, series: args.levelLabel })),
    { time: args.to, value: last ? last.value : 0, series: args.levelLabel }];
  const running = pts.filter((p) => p.time > args.from && Number.isFinite(p.running_mean))
    .map((p) => ({ time: p.time, mean: p.running_mean, series: args.averageLabel }));
  const colorScale = {
    domain: [args.levelLabel, args.averageLabel],
    range: [PALETTE.ink, PALETTE.kiln],
  };
  const color = { field: "series", type: "nominal", scale: colorScale, legend: { title: null } } as const;
  const xTime = { field: "time", type: "quantitative", title: args.timeTitle, scale: { nice: false } } as const;
  const layer: object[] = [];
  if (args.warmup !== null && args.warmup > (pts[0]?.time ?? 0)) {
    layer.push({
      data: { values: [{ start: pts[0]?.time ?? 0, end: args.warmup, label: args.warmupLabel }] },
      mark: { type: "rect", color: PALETTE.haze, opacity: 0.8 },
      encoding: { x: { field: "start", type: "quantitative" }, x2: { field: "end" } },
    });
    layer.push({
      data: { values: [{ end: args.warmup, label: args.warmupLabel }] },
      mark: { type: "rule", color: PALETTE.muted, strokeDash: [3, 3] },
      encoding: { x: { field: "end", type: "quantitative" } },
    });
    layer.push({
      data: { values: [{ end: args.warmup, label: args.warmupLabel }] },
      mark: { type: "text", align: "right", baseline: "bottom", dx: -3, y: -3, fontSize: 10, fontStyle: "italic", color: PALETTE.muted },
      encoding: { x: { field: "end", type: "quantitative" }, text: { field: "label" } },
    });
  }
  layer.push({
    data: { values: steps },
    mark: { type: "area", interpolate: "step-after", color: PALETTE.ochre, opacity: 0.28 },
    encoding: { x: xTime, y: { field: "value", type: "quantitative", title: args.valueTitle } },
  });
  layer.push({
    data: { values: steps },
    mark: { type: "line", interpolate: "step-after", strokeWidth: 1.2 },
    encoding: {
      x: xTime,
      y: { field: "value", type: "quantitative", title: args.valueTitle },
      color,
    },
  });
  if (running.length > 0) {
    layer.push({
      data: { values: running },
      mark: { type: "line", strokeWidth: 2, strokeDash: [6, 3] },
      encoding: {
        x: xTime,
        y: { field: "mean", type: "quantitative" },
        color,
      },
    });
  }
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: 170,
    layer,
    config: config(),
  } as TopLevelSpec;
}

/** Evenly spaced subsample of at most `max` values (the first and last kept). */
export function evenSample(values: number[], max: number = MAX_HISTOGRAM_VALUES): number[] {
  if (values.length <= max) return values;
  const out: number[] = [];
  for (let i = 0; i < max; i++) out.push(values[Math.round((i * (values.length - 1)) / (max - 1))]);
  return out;
}

/** Histogram of observation values, one row per scenario, shared bins. */
export function histogramChart(
  rows: { scenario: string; value: number }[],
  scenarios: string[],
  valueTitle: string,
  countTitle: string,
): TopLevelSpec {
  return {
    $schema: SCHEMA,
    data: { values: rows },
    facet: { row: { field: "scenario", type: "nominal", sort: scenarios, title: null, header: { labelAngle: 0, labelAlign: "left", labelAnchor: "start", labelOrient: "top" } } },
    spacing: 10,
    spec: {
      width: WIDTH,
      height: 80,
      mark: { type: "bar", color: PALETTE.tide, opacity: 0.85, binSpacing: 1 },
      encoding: {
        x: { field: "value", type: "quantitative", bin: { maxbins: 30 }, title: valueTitle },
        y: { aggregate: "count", type: "quantitative", title: countTitle },
      },
    },
    config: config(),
  } as TopLevelSpec;
}
