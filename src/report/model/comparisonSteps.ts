/**
 * The appendix's comparison arithmetic: for each comparison a − b, the values it used (the
 * per-pair differences, or each side's values for Welch) and every step written out with its
 * numbers, from `StudyOutcome.comparisons` (src/study/comparisonTables.ts). The numbers are the
 * study's; this file only puts them into words.
 */
import type { ComparisonArithmetic, TableRecord } from "../../outcome/index.js";
import type { PairedSteps, SpreadSteps, WelchSide, WelchSteps } from "../../stats/differenceSteps.js";
import { meanCorrectionMatters, PREVIEW_HEAD as TABLE_HEAD_ROWS, PREVIEW_TAIL as TABLE_TAIL_ROWS } from "../../study/tables.js";
import { key, type ReportContext } from "./anchors.js";
import { methodWords } from "./comparisons.js";
import type { ArithmeticStep, Cell, ComparisonBlock, ValuesTable } from "./view.js";
import { fmt, intervalText, link, primaryName, q, text } from "./words.js";

/** The most rows of values shown per table, as for the calculation tables (`appendix.ts`). */
const TABLE_ROW_CAP = TABLE_HEAD_ROWS + TABLE_TAIL_ROWS;

/** The comparison-arithmetic part of the appendix, or null when the study compares no scenarios. */
export function comparisonBlocksView(ctx: ReportContext): { intro: string; blocks: ComparisonBlock[] } | null {
  const { results, outcome } = ctx;
  if ((results.comparisons ?? []).length === 0) return null;
  const blocks = outcome.comparisons.flatMap((c) => {
    const id = ctx.comparisonIds[c.index];
    return id === null || id === undefined ? [] : [comparisonBlock(ctx, c, id)];
  });
  return {
    intro: "Each comparison of the comparisons section, step by step: the values it used, then every step with its numbers. " +
      `Tables of values show at most ${TABLE_ROW_CAP} rows here (the first ${TABLE_HEAD_ROWS} and the last ${TABLE_TAIL_ROWS}); ` +
      "the comparison's CSV file, named under it with its SHA-256 digest, holds every value and step at full precision.",
    blocks,
  };
}

function comparisonBlock(ctx: ReportContext, c: ComparisonArithmetic, id: string): ComparisonBlock {
  const entry = ctx.results.comparisons?.[c.index];
  const record = ctx.outcome.tables.find((t) => t.kind === "comparison" && t.comparison?.index === c.index);
  const kind = (() => { try { return ctx.measureOf(c.a, c.measure).kind; } catch { return "level" as const; } })();
  const onBatches = entry?.basis === "batch-means";
  // A value links to where it comes from: the run's calculation table, or the run's batch means.
  const source = (scenario: string, run: string): string | null =>
    onBatches ? (ctx.batchIds.get(key(scenario, c.measure)) ?? null) : ctx.tbId(scenario, run, c.measure);
  const what = onBatches ? "batch means" : `run values (the ${primaryName(kind)} of each run)`;
  const compared = `a = ${q(c.a)}, b = ${q(c.b)}: the difference a − b of the means of ${c.measure}, ${methodWords(c.method)}, on ${what}` +
    (entry?.values !== undefined ? `: ${entry.values}.` : ".");
  const steps = c.steps;
  return {
    id,
    back: `#${ctx.comparisonRowIds[c.index]}`,
    heading: `${c.measure} — ${q(c.a)} − ${q(c.b)} — ${methodWords(c.method)}`,
    compared,
    assumes: entry?.assumes ?? null,
    values: steps.method === "paired" ? [pairedValues(c, steps, source)] : welchValues(c, steps, source),
    unpaired: c.unpaired.length === 0 ? null :
      `Left out, no run of the same id on the other side: ${c.unpaired.map((u) => `run ${u.run} of ${q(u.scenario)} (${fmt(u.value)})`).join(", ")}.`,
    steps: steps.method === "paired" ? pairedSteps(c, steps) : welchSteps(c, steps),
    note: steps.note,
    file: fileSentence(c, record),
  };
}

function fileSentence(c: ComparisonArithmetic, record: TableRecord | undefined): string {
  return record === undefined
    ? `The CSV file ${c.file} holds these values and steps at full precision.`
    : `The CSV file ${record.file} holds these values and steps at full precision (${fmt(record.rows_total)} rows). SHA-256 ${record.sha256}.`;
}

/** Rows shown of a long list: the first `TABLE_HEAD_ROWS` and the last `TABLE_TAIL_ROWS`, with a gap marker between. */
function capped<T>(rows: T[], cells: (r: T) => Cell[], file: string): ValuesTable["rows"] {
  if (rows.length <= TABLE_ROW_CAP) return rows.map((r) => ({ cells: cells(r), gap: null }));
  const hidden = rows.length - TABLE_ROW_CAP;
  return [
    ...rows.slice(0, TABLE_HEAD_ROWS).map((r) => ({ cells: cells(r), gap: null })),
    { cells: null, gap: `… ${fmt(hidden)} rows not shown: see ${file} …` },
    ...rows.slice(-TABLE_TAIL_ROWS).map((r) => ({ cells: cells(r), gap: null })),
  ];
}

function pairedValues(c: ComparisonArithmetic, s: PairedSteps, source: (scenario: string, run: string) => string | null): ValuesTable {
  return {
    caption: `Pairs of runs with the same id (${fmt(s.n)})`,
    columns: ["Run", "aᵢ", "bᵢ", "dᵢ = aᵢ − bᵢ", "dᵢ − d̄", "(dᵢ − d̄)²"],
    rows: capped(s.rows, (r) => [
      text(r.run), link(fmt(r.a), source(c.a, r.run)), link(fmt(r.b), source(c.b, r.run)),
      text(fmt(r.difference)), text(fmt(r.deviation)), text(fmt(r.squared)),
    ], c.file),
  };
}

function welchValues(c: ComparisonArithmetic, s: WelchSteps, source: (scenario: string, run: string) => string | null): ValuesTable[] {
  const side = (name: string, letter: string, w: WelchSide): ValuesTable => ({
    caption: `${letter} = ${q(name)}: ${fmt(w.n)} values`,
    columns: ["Value of", `${letter}ᵢ`, `${letter}ᵢ − ${letter}̄`, `(${letter}ᵢ − ${letter}̄)²`],
    rows: capped(w.rows, (r) => [text(r.run), link(fmt(r.value), source(name, r.run)), text(fmt(r.deviation)), text(fmt(r.squared))], c.file),
  });
  return [side(c.a, "a", s.a), side(c.b, "b", s.b)];
}

/** Σ, mean, Σ of squared deviations (with the mean's rounding correction when it matters), variance and sd of one list. */
function spreadSteps(s: SpreadSteps, x: string, sub: string, what: string, of: string): ArithmeticStep[] {
  const mean = `${x}̄`;
  const variance = `s${sub}²`;
  const df = fmt(s.n - 1);
  const out: ArithmeticStep[] = [
    { label: `Number of ${what}`, formula: `n${sub}`, value: fmt(s.n) },
    { label: `Sum of ${what}`, formula: `Σ ${x}ᵢ`, value: fmt(s.sum) },
    { label: `Mean${of}`, formula: `${mean} = Σ ${x}ᵢ / n${sub} = ${fmt(s.sum)} / ${fmt(s.n)}`, value: fmt(s.mean) },
  ];
  if (s.sum_squared !== null) out.push({ label: `Sum of squared deviations${of}`, formula: `Σ (${x}ᵢ − ${mean})²`, value: fmt(s.sum_squared) });
  if (meanCorrectionMatters(s)) {
    out.push({ label: "Correction for the rounding of the mean", formula: `c = (Σ (${x}ᵢ − ${mean}))² / n${sub}`, value: fmt(s.mean_correction) });
    if (s.variance !== null) out.push({ label: `Sample variance${of}`, formula: `${variance} = (Σ (${x}ᵢ − ${mean})² − c) / (n${sub} − 1) = (${fmt(s.sum_squared)} − ${fmt(s.mean_correction)}) / ${df}`, value: fmt(s.variance) });
  } else if (s.variance !== null) {
    out.push({ label: `Sample variance${of}`, formula: `${variance} = Σ (${x}ᵢ − ${mean})² / (n${sub} − 1) = ${fmt(s.sum_squared)} / ${df}`, value: fmt(s.variance) });
  }
  return out;
}

/** The Bonferroni level of each comparison, the t quantile at it, the half-width and the interval. */
function endSteps(c: ComparisonArithmetic, s: PairedSteps | WelchSteps, centre: string, centreValue: number | null, se: string, df: string): ArithmeticStep[] {
  const out: ArithmeticStep[] = [c.comparisons === 1
    ? { label: "Confidence (the study's only comparison, so no Bonferroni adjustment)", formula: "the study's confidence", value: fmt(c.confidence_each) }
    : {
      label: `Confidence of each comparison (Bonferroni, ${fmt(c.comparisons)} comparisons)`,
      formula: `1 − (1 − ${fmt(c.confidence)}) / ${fmt(c.comparisons)}`,
      value: fmt(c.confidence_each),
    }];
  if (s.t !== null) out.push({ label: "t quantile", formula: `t(p = 1 − (1 − ${fmt(c.confidence_each)}) / 2 = ${fmt(s.p)}; ${df} = ${fmt(s.df)})`, value: fmt(s.t) });
  if (s.half_width !== null) out.push({ label: "Half-width", formula: `h = t · ${se} = ${fmt(s.t)} × ${fmt(s.standard_error)}`, value: fmt(s.half_width) });
  if (s.ci_low !== null && s.ci_high !== null) {
    out.push({ label: "Interval", formula: `${centre} ± h = ${fmt(centreValue)} ± ${fmt(s.half_width)}`, value: intervalText(s.ci_low, s.ci_high) });
  }
  return out;
}

function pairedSteps(c: ComparisonArithmetic, s: PairedSteps): ArithmeticStep[] {
  const out = spreadSteps(s, "d", "", "pairs", " of the differences").map((st, i) => (i === 1 ? { ...st, label: "Sum of differences" } : st));
  out.splice(3, 0, { label: "Means of a and b over the pairs", formula: "ā, b̄", value: `${fmt(s.mean_a)}, ${fmt(s.mean_b)}` });
  if (s.sd !== null) out.push({ label: "Standard deviation of the differences", formula: `s = √s² = √${fmt(s.variance)}`, value: fmt(s.sd) });
  if (s.standard_error !== null) out.push({ label: "Standard error", formula: `se = s / √n = ${fmt(s.sd)} / √${fmt(s.n)}`, value: fmt(s.standard_error) });
  if (s.df !== null) out.push({ label: "Degrees of freedom", formula: `df = n − 1 = ${fmt(s.n)} − 1`, value: fmt(s.df) });
  return [...out, ...endSteps(c, s, "d̄", s.mean, "se", "df")];
}

function welchSteps(c: ComparisonArithmetic, s: WelchSteps): ArithmeticStep[] {
  const out: ArithmeticStep[] = [];
  for (const [letter, side] of [["a", s.a], ["b", s.b]] as const) {
    out.push(...spreadSteps(side, letter, `_${letter}`, `values of ${letter}`, ` of ${letter}`));
    if (side.variance_over_n !== null) {
      out.push({ label: `Variance of the mean of ${letter}`, formula: `s_${letter}² / n_${letter} = ${fmt(side.variance)} / ${fmt(side.n)}`, value: fmt(side.variance_over_n) });
    }
  }
  if (s.difference !== null) out.push({ label: "Difference of the means", formula: `ā − b̄ = ${fmt(s.a.mean)} − ${fmt(s.b.mean)}`, value: fmt(s.difference) });
  if (s.standard_error_squared !== null) {
    out.push({ label: "Squared standard error", formula: `se² = s_a²/n_a + s_b²/n_b = ${fmt(s.a.variance_over_n)} + ${fmt(s.b.variance_over_n)}`, value: fmt(s.standard_error_squared) });
  }
  if (s.standard_error !== null) out.push({ label: "Standard error", formula: `se = √se² = √${fmt(s.standard_error_squared)}`, value: fmt(s.standard_error) });
  if (s.share_a !== null && s.share_b !== null) {
    out.push({ label: "Share of a in se²", formula: `w_a = (s_a²/n_a) / se² = ${fmt(s.a.variance_over_n)} / ${fmt(s.standard_error_squared)}`, value: fmt(s.share_a) });
    out.push({ label: "Share of b in se²", formula: `w_b = (s_b²/n_b) / se² = ${fmt(s.b.variance_over_n)} / ${fmt(s.standard_error_squared)}`, value: fmt(s.share_b) });
  }
  if (s.df_term_a !== null && s.df_term_b !== null) {
    out.push({ label: "Term of a in ν", formula: `w_a² / (n_a − 1) = ${fmt(s.share_a)}² / ${fmt(s.a.n - 1)}`, value: fmt(s.df_term_a) });
    out.push({ label: "Term of b in ν", formula: `w_b² / (n_b − 1) = ${fmt(s.share_b)}² / ${fmt(s.b.n - 1)}`, value: fmt(s.df_term_b) });
  }
  if (s.df !== null) {
    out.push({
      label: "Degrees of freedom (Welch–Satterthwaite)",
      formula: s.df_term_a !== null && s.df_term_b !== null
        ? `ν = 1 / (w_a²/(n_a − 1) + w_b²/(n_b − 1)) = 1 / (${fmt(s.df_term_a)} + ${fmt(s.df_term_b)})`
        : "ν = 1 / (w_a²/(n_a − 1) + w_b²/(n_b − 1))",
      value: fmt(s.df),
    });
  }
  return [...out, ...endSteps(c, s, "(ā − b̄)", s.difference, "se", "ν")];
}
