/**
 * The selections of the best scenario (results.json `selections`): per `select:` entry, the
 * sentence the result supports, a table of each scenario's first stage, runs needed and interval
 * of the multiple comparisons with the best, and (once the selection is made) a chart of those
 * intervals; in the appendix, the arithmetic: the constant with its equation, each S_i and N_i,
 * each difference D_i with its interval.
 */
import type { SelectionEntry } from "../../outcome/index.js";
import { bestComparisonChart } from "../charts.js";
import { formatPercent } from "../number.js";
import { anchor, type ReportContext } from "./anchors.js";
import { tableView, type ArithmeticStep, type Chart, type TableView } from "./view.js";
import { fmt, intervalText, link, q, text } from "./words.js";

export interface SelectionView {
  id: string;
  /** The measure's name in the manifest and results.json. */
  key: string;
  heading: string;
  /** The plain sentence the result supports (also in the opening summary). */
  statement: string;
  table: TableView;
  /** The intervals of the multiple comparisons with the best; null while runs are missing. */
  chart: Chart | null;
  notes: string[];
}

export interface SelectionSteps {
  id: string;
  back: string;
  heading: string;
  steps: ArithmeticStep[];
  file: string;
}

/** The anchors of each selection's section and of its arithmetic in the appendix. */
export function selectionIds(entries: readonly SelectionEntry[]): { section: string; steps: string }[] {
  return entries.map((s, i) => ({ section: anchor("selection", i + 1, s.measure), steps: anchor("selection-steps", i + 1, s.measure) }));
}

/** "a", "a and b", "a, b and c". */
function names(xs: string[]): string {
  return xs.length <= 1 ? (xs[0] ?? "") : `${xs.slice(0, -1).join(", ")} and ${xs.at(-1)}`;
}

/**
 * The sentence a selection supports, in the report's words: the scenario selected, its
 * assurance, the runs it took and the scenarios ruled out; or, while runs are missing, how many
 * each scenario still needs and which could be best from the first stage (subset selection).
 */
export function selectionSentence(ctx: ReportContext, s: SelectionEntry): string {
  const label = ctx.labelOf(s.measure);
  const unit = ctx.unitOf(s.measure);
  const delta = `${fmt(s.input.delta)}${unit === null ? "" : ` ${unit}`}`;
  const total = s.scenarios.reduce((a, sc) => a + Math.max(sc.runs_needed, sc.first_stage_runs), 0);
  if (s.complete && s.selected !== null) {
    const out = (s.comparisons_with_best ?? []).filter((c) => c.ruled_out).map((c) => q(c.scenario));
    return `${q(s.selected)} is best in ${label} (${s.input.better} is better), or within ${delta} of the best, with probability at least ${fmt(s.input.pcs)}; ` +
      `it took ${fmt(total)} runs in all (${s.procedure}).` +
      (out.length > 0 ? ` ${names(out)} can be ruled out.` : " No scenario can be ruled out.");
  }
  const missing = s.scenarios.filter((sc) => sc.runs_missing > 0).map((sc) => `${q(sc.scenario)} ${fmt(sc.runs_missing)} more (${fmt(sc.runs_needed)} in all)`);
  return `No best ${label} selected yet: for probability ${fmt(s.input.pcs)} within ${delta}, ${names(missing)} ${missing.length === 1 ? "is" : "are"} needed (${s.procedure}). ` +
    `From the first ${fmt(s.input.first_stage)} runs, ${s.subset.length === 1 ? `only ${q(s.subset[0])} could be best` : `${names(s.subset.map(q))} could be best`}.`;
}

/** The section of the selections, or null when the study selects none. */
export function selectionsView(ctx: ReportContext): { intro: string; items: SelectionView[] } | null {
  const entries = ctx.results.selections ?? [];
  if (ctx.study.selections.length === 0) return null;
  const ids = selectionIds(entries);
  const items = entries.map((s, i): SelectionView => {
    const unit = ctx.unitOf(s.measure);
    const label = ctx.labelOf(s.measure);
    const steps = ids[i].steps;
    const num = (t: string) => link(t, steps);
    const table = tableView(
      `Selecting the best ${label}`,
      ["Scenario", "First-stage runs", "First-stage mean", "First-stage SD", "Runs needed", "Runs present", "More runs", "Mean over the runs needed", "Interval against the best", "Ruled out", "Could be best (first stage)"],
      s.scenarios.map((sc) => {
        const c = s.comparisons_with_best?.find((b) => b.scenario === sc.scenario) ?? null;
        return [
          text(sc.scenario), num(fmt(sc.first_stage_runs)), num(fmt(sc.first_stage_mean)), num(fmt(sc.first_stage_sd)), num(fmt(sc.runs_needed)),
          text(fmt(sc.runs_present)), text(fmt(sc.runs_missing)), text(fmt(sc.mean)), c === null ? text("—") : num(intervalText(c.lower, c.upper)),
          text(c === null ? "—" : c.ruled_out ? "yes" : "no"), text(s.subset.includes(sc.scenario) ? "yes" : "no"),
        ];
      }),
    );
    const chart: Chart | null = s.comparisons_with_best === null ? null : {
      id: `${ids[i].section}-chart`,
      caption: `${label}: each scenario's interval for its mean minus the best of the others, oriented so that positive is better (${s.input.better} is better); a bar that ends at 0 rules the scenario out.`,
      spec: bestComparisonChart(
        s.comparisons_with_best.map((c) => ({ scenario: c.scenario, lower: c.lower, upper: c.upper, label: intervalText(c.lower, c.upper) })),
        `${label}${unit === null ? "" : ` (${unit})`}, against the best of the others`,
      ),
    };
    return {
      id: ids[i].section,
      key: s.measure,
      heading: `The best ${label} (${s.input.better} is better)`,
      statement: selectionSentence(ctx, s),
      table,
      chart,
      notes: [
        `${s.procedure}, ${s.input.method === "paired" ? "runs paired by id (common random numbers)" : "scenarios independent"}; indifference ${fmt(s.input.delta)}, probability of a correct selection ${formatPercent(s.input.pcs)}, first stage ${fmt(s.input.first_stage)} runs of each of ${fmt(s.input.k)} scenarios; ${s.constant.symbol} = ${fmt(s.constant.value)}.`,
      ],
    };
  });
  const left = ctx.study.selections.length - entries.length;
  return {
    intro: [
      "Each selection names the scenario that is best in one measure, or within the indifference amount of the best, with the probability stated.",
      "The first-stage runs of each scenario say how many runs it needs in all; once every scenario has them, the scenario with the best mean over them is selected, and the interval of each scenario's mean minus the best of the others (multiple comparisons with the best) says which can be ruled out.",
      "The numbers link to their arithmetic in the appendix.",
      ...(left > 0 ? [`${fmt(left)} select entr${left === 1 ? "y" : "ies"} could not be computed: the warnings say why.`] : []),
    ].join(" "),
    items,
  };
}

/** The arithmetic of each selection, for the appendix; null when the study selects none. */
export function selectionSteps(ctx: ReportContext, files: readonly string[]): { intro: string; blocks: SelectionSteps[] } | null {
  const entries = ctx.results.selections ?? [];
  if (entries.length === 0) return null;
  const ids = selectionIds(entries);
  const blocks = entries.map((s, i): SelectionSteps => {
    const sym = s.constant.symbol;
    const steps: ArithmeticStep[] = [
      { label: `constant ${sym}`, formula: s.constant.steps.equation, value: fmt(s.constant.value) },
    ];
    if (s.pooled_variance !== null) {
      steps.push({ label: "pooled variance of the differences S²", formula: `degrees of freedom ${fmt(s.pooled_df)}`, value: fmt(s.pooled_variance) });
    }
    for (const sc of s.scenarios) {
      steps.push({ label: `S of ${q(sc.scenario)}`, formula: `√(Σ (x_j − x̄)² / (n0 − 1)) over the first ${fmt(sc.first_stage_runs)} runs, x̄ = ${fmt(sc.first_stage_mean)}`, value: fmt(sc.first_stage_sd) });
      const spread = s.pooled_variance === null ? fmt(sc.first_stage_sd) : fmt(Math.sqrt(s.pooled_variance));
      steps.push({ label: `N of ${q(sc.scenario)}`, formula: `max(n0, ⌈(${sym} · S / δ)²⌉) = max(${fmt(s.input.first_stage)}, ⌈(${fmt(s.constant.value)} · ${spread} / ${fmt(s.input.delta)})²⌉)`, value: fmt(sc.runs_needed) });
    }
    for (const c of s.comparisons_with_best ?? []) {
      steps.push({ label: `D of ${q(c.scenario)}`, formula: `mean of ${q(c.scenario)} − best mean of the others (signs turned when smaller is better); interval [min(0, D − δ), max(0, D + δ)]`, value: `${fmt(c.difference)} ${intervalText(c.lower, c.upper)}` });
    }
    return { id: ids[i].steps, back: `#${ids[i].section}`, heading: `Selecting the best ${ctx.labelOf(s.measure)}`, steps, file: files[i] ?? "" };
  });
  return { intro: "The constant of the procedure with its equation, each scenario's first-stage standard deviation S and runs needed N, and, once the selection is made, each difference D with its interval.", blocks };
}
