/**
 * Wording helpers of the report: how a measure, a figure, a window or an interval is put in words,
 * and the one rounding rule (`../number.ts`) applied to every number shown.
 */
import type { Measure, Warmup } from "../../manifest/types.js";
import type { BatchMeansFigures, RunStats } from "../../outcome/index.js";
import { formatNumber, formatPercent, MISSING } from "../number.js";
import type { Cell } from "./view.js";

export const fmt = formatNumber;
export const q = (name: string) => `“${name}”`;

export function kindLabel(kind: Measure["kind"]): string {
  return { level: "level (time average)", utilization: "utilization", observation: "observation (mean)", count: "count" }[kind];
}

export function primaryName(kind: Measure["kind"]): string {
  return { level: "time average", utilization: "utilization", observation: "mean", count: "count" }[kind];
}

/** A heading or axis title with the measure's unit after it, when it has one: "mean (h)". */
export function withUnit(title: string, unit: string | null): string {
  return unit === null ? title : `${title} (${unit})`;
}

/**
 * The axis title of a measure's values: its label, what the value is, and its unit; "per run"
 * unless `perRun` is false (an interval from the batch means of one long run is not per run).
 */
export function valueTitle(m: Measure, perRun = true): string {
  const per = perRun ? " per run" : "";
  switch (m.kind) {
    case "level":
      return withUnit(`time average of ${m.label}${per}`, m.unit);
    case "utilization":
      return withUnit(`utilization of ${m.label}${per}`, m.unit === "fraction" ? "share of capacity" : m.unit);
    case "observation":
      return withUnit(`mean of ${m.label}${per}`, m.unit);
    case "count":
      return withUnit(`${m.label}: count${per}`, m.unit);
  }
}

export function capacityText(m: Measure): string {
  if (m.kind !== "utilization") return "";
  return m.capacity.type === "constant" ? `capacity ${fmt(m.capacity.value)}` : `capacity from series ${q(m.capacity.series)}`;
}


/** The warm-up in words; `labelOf` gives the label of the measure an estimate runs on. */
export function warmupText(w: Warmup, unit: string, labelOf: (name: string) => string = (n) => n): string {
  switch (w.type) {
    case "none":
      return "none";
    case "fixed":
      return `${fmt(w.time)} ${unit}`;
    case "mser-5":
      return `estimated by MSER-5 from ${labelOf(w.measure)} (slice of ${fmt(w.slice)} ${unit})`;
  }
}

export function figureLabel(kind: Measure["kind"], figure: string): string {
  if (figure === "value") return primaryName(kind);
  const dot = figure.indexOf(".");
  const group = dot < 0 ? figure : figure.slice(0, dot);
  const k = dot < 0 ? "" : figure.slice(dot + 1);
  switch (group) {
    case "quantiles":
      return k === "0.5" ? "median (0.5 quantile)" : `${k} quantile`;
    case "within":
      return `share of values ≤ ${k}`;
    case "time_at_least":
      return `share of time at level ≥ ${k}`;
    default:
      return figure;
  }
}

export function intervalText(lo: number | null, hi: number | null): string {
  return lo === null || hi === null ? MISSING : `[${fmt(lo)}, ${fmt(hi)}]`;
}

export function relative(s: { mean: number | null; half_width: number | null }): string {
  if (s.mean === null || s.half_width === null || s.mean === 0) return MISSING;
  return formatPercent(s.half_width / Math.abs(s.mean));
}

export function dateText(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

export const text = (t: string): Cell => ({ text: t, href: null });
export const link = (t: string, href: string | null): Cell => ({ text: t, href: href === null ? null : `#${href}` });

/** A run's batch means, when its measure has them (a count never has). */
export function batchMeansOf(st: RunStats | undefined): BatchMeansFigures | undefined {
  return st === undefined || st.kind === "count" ? undefined : st.batch_means;
}

/**
 * A message from the engine with each decimal number in it rounded by the report's rule
 * ("L = 14.793044444444446" → "L = 14.79"); whole numbers and names are left as they are.
 */
export function roundNumbersIn(message: string): string {
  return message.replace(/(?<![\w.])-?\d+\.\d+(?:e[-+]?\d+)?(?![\w.])/gi, (m) => fmt(Number(m)));
}
