/**
 * The comparison arithmetic of the appendix and the closing line of run tables, on small studies
 * made from seeded invented run files and run through the whole study (runStudy), then the report
 * model and the page.
 */
import { describe, expect, it } from "vitest";
import { uniform } from "../../src/demo/random.js";
import { renderHtml } from "../../src/report/html.js";
import { buildReportModel, type ReportModel } from "../../src/report/model/index.js";
import { formatNumber as fmt } from "../../src/report/number.js";
import { studyOf } from "../helpers/runStudyFrom.js";
import { csv } from "../helpers/tempStudy.js";

const META = { toolVersion: "0.1.0-test", generatedAt: "2025-03-04T05:06:07.000Z" };

/** A scenario name with every character HTML gives a meaning to. */
const FAST = `<b>fast</b> & "co" 'x'`;
const FAST_ESCAPED = "&lt;b&gt;fast&lt;/b&gt; &amp; &quot;co&quot; &#x27;x&#x27;";

type Row = [number, string, (number | null)?];

/** One invented run: a busy level on 0..2 that changes about every 1.5 time units, and a wait observed about every 10. */
function inventedRun(seed: number, busyBias: number, waitScale: number): string {
  const rand = uniform(seed);
  const rows: Row[] = [];
  let t = 0;
  while (t < 100) {
    rows.push([Number(t.toFixed(3)), "busy", Math.min(2, Math.floor(rand() * 3 * busyBias))]);
    t += 0.2 + rand() * 2.6;
  }
  for (let w = 0; w < 9; w++) rows.push([5 + w * 10 + Number(rand().toFixed(3)), "wait", Number((waitScale * (0.5 + rand())).toFixed(3))]);
  return csv(rows);
}

/** Six runs per scenario; waits compared paired and with Welch, the utilization paired (three comparisons). */
async function replicationStudy() {
  const files: Record<string, string> = {};
  for (let r = 1; r <= 6; r++) {
    files[`runs/fast/r${r}.csv`] = inventedRun(100 + r, 0.9, 2);
    files[`runs/slow/r${r}.csv`] = inventedRun(200 + r, 1.1, 3);
  }
  const runs = (s: string) => `[${Array.from({ length: 6 }, (_, i) => `runs/${s}/r${i + 1}.csv`).join(", ")}]`;
  const fast = `'${FAST.replace(/'/g, "''")}'`;
  return studyOf(
    "version: 1\ntitle: Invented counter\nconfidence: 0.9\nscenarios:\n" +
      `  - {name: ${fast}, end: 100, runs: ${runs("fast")}}\n` +
      `  - {name: slow, end: 100, runs: ${runs("slow")}}\n` +
      "measures:\n  - {name: use, kind: utilization, series: busy, capacity: 2}\n  - {name: wait, kind: observation, series: wait}\n" +
      "compare:\n" +
      `  - {measure: wait, scenarios: [${fast}, slow], method: paired}\n` +
      `  - {measure: wait, scenarios: [${fast}, slow], method: welch}\n` +
      `  - {measure: use, scenarios: [${fast}, slow], method: paired}\n`,
    files,
  );
}

/** One long run per scenario with batch means: a level compared with Welch (on batch means) and paired (refused). */
async function longRunStudy() {
  const level = (seed: number, top: number) => {
    const rand = uniform(seed);
    const rows: Row[] = [];
    for (let t = 0; t < 1000; t += 0.5 + rand() * 4) rows.push([Number(t.toFixed(3)), "q", Math.floor(rand() * top)]);
    return csv(rows);
  };
  const fast = `'${FAST.replace(/'/g, "''")}'`;
  return studyOf(
    "version: 1\ntitle: Invented long runs\nanalysis: {method: batch-means, batches: 5}\nscenarios:\n" +
      `  - {name: ${fast}, end: 1000, runs: [runs/a/long.csv]}\n` +
      "  - {name: slow, end: 1000, runs: [runs/b/long.csv]}\n" +
      "measures:\n  - {name: q, kind: level, series: q}\n" +
      "compare:\n" +
      `  - {measure: q, scenarios: [${fast}, slow], method: welch}\n` +
      `  - {measure: q, scenarios: [${fast}, slow], method: paired}\n`,
    { "runs/a/long.csv": level(7, 6), "runs/b/long.csv": level(8, 4) },
  );
}

function stepValue(block: ReportModel["appendix"]["comparisons"], index: number, label: string): string {
  const step = block!.blocks[index].steps.find((s) => s.label === label);
  if (step === undefined) throw new Error(`no step "${label}" in block ${index}`);
  return step.value;
}

/** The text between `id="<id>"` and the end of the element that follows it, on the page. */
function pagePart(html: string, id: string, end: string): string {
  const at = html.indexOf(`id="${id}"`);
  expect(at, id).toBeGreaterThan(0);
  return html.slice(at, html.indexOf(end, at));
}

describe("comparison arithmetic in the appendix", () => {
  it("comparisonsView links every number of each comparison row to an id on the page, and each block back to its row", async () => {
    const { study, outcome } = await replicationStudy();
    const model = buildReportModel(study, outcome, META);
    const html = await renderHtml(model);
    const ids = new Set([...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]));
    const rows = model.comparisons!.table.rows;
    expect(rows).toHaveLength(3);
    for (const row of rows) {
      const hrefs = row.filter((c) => c.href !== null).map((c) => c.href as string);
      expect(hrefs).toHaveLength(7); // mean, se, t, df, half-width, interval, confidence of each
      for (const h of hrefs) expect(ids.has(h.slice(1)), h).toBe(true);
      expect(new Set(hrefs).size).toBe(1);
      expect(html).toContain(`href="${hrefs[0]}"`);
    }
    for (const b of model.appendix.comparisons!.blocks) {
      expect(ids.has(b.back.slice(1)), b.back).toBe(true);
      expect(pagePart(html, b.id, "</article>")).toContain(`href="${b.back}"`);
    }
  });

  it("comparisonBlocksView shows a paired comparison's numbers as results.json has them, and d̄ as the mean of the per-pair differences (computed here)", async () => {
    const { study, outcome, tableFiles } = await replicationStudy();
    const model = buildReportModel(study, outcome, META);
    const c = outcome.results.comparisons![0];
    expect(c.method).toBe("paired");
    const blocks = model.appendix.comparisons;
    const v = (label: string) => stepValue(blocks, 0, label);
    expect(v("Mean of the differences")).toBe(fmt(c.diff_mean));
    expect(v("Means of a and b over the pairs")).toBe(`${fmt(c.mean_a)}, ${fmt(c.mean_b)}`);
    expect(v("Standard error")).toBe(fmt(c.standard_error));
    expect(v("Degrees of freedom")).toBe(fmt(c.df));
    expect(v("Confidence of each comparison (Bonferroni, 3 comparisons)")).toBe(fmt(c.confidence_each));
    expect(v("t quantile")).toBe(fmt(c.t));
    expect(v("Half-width")).toBe(fmt(c.half_width));
    expect(v("Interval")).toBe(`[${fmt(c.ci_low)}, ${fmt(c.ci_high)}]`);
    // The rows: one per pair, d = a − b of the two runs' values in results.json (computed here).
    const [a, b] = outcome.results.scenarios;
    const rows = blocks!.blocks[0].values[0].rows.map((r) => r.cells!.map((x) => x.text));
    expect(rows).toHaveLength(6);
    const wait = (r: (typeof a.runs)[number]) => r.measures.wait.value as number;
    const d = a.runs.map((r, i) => wait(r) - wait(b.runs[i]));
    rows.forEach((r, i) => expect(r.slice(0, 4)).toEqual([a.runs[i].id, fmt(wait(a.runs[i])), fmt(wait(b.runs[i])), fmt(d[i])]));
    expect(fmt(d.reduce((x, y) => x + y, 0) / d.length)).toBe(fmt(c.diff_mean));
    // The CSV file and its digest, as the study wrote them.
    const file = tableFiles.find((f) => f.record.comparison?.index === 0)!;
    expect(blocks!.blocks[0].file).toContain(file.record.file);
    expect(blocks!.blocks[0].file).toContain(file.record.sha256);
  });

  it("comparisonBlocksView shows a Welch comparison's numbers as results.json has them, and ν as the Welch–Satterthwaite formula gives it (computed here)", async () => {
    const { study, outcome } = await replicationStudy();
    const model = buildReportModel(study, outcome, META);
    const c = outcome.results.comparisons![1];
    expect(c.method).toBe("welch");
    const v = (label: string) => stepValue(model.appendix.comparisons, 1, label);
    expect(v("Mean of a")).toBe(fmt(c.mean_a));
    expect(v("Mean of b")).toBe(fmt(c.mean_b));
    expect(v("Difference of the means")).toBe(fmt(c.diff_mean));
    expect(v("Standard error")).toBe(fmt(c.standard_error));
    expect(v("Degrees of freedom (Welch–Satterthwaite)")).toBe(fmt(c.df));
    expect(v("t quantile")).toBe(fmt(c.t));
    expect(v("Half-width")).toBe(fmt(c.half_width));
    expect(v("Interval")).toBe(`[${fmt(c.ci_low)}, ${fmt(c.ci_high)}]`);
    // ν = (s_a²/n_a + s_b²/n_b)² / ((s_a²/n_a)²/(n_a − 1) + (s_b²/n_b)²/(n_b − 1)): B. L. Welch (1947),
    // Biometrika 34, 28–35; F. E. Satterthwaite (1946), Biometrics Bulletin 2, 110–114.
    const side = (i: number) => {
      const xs = outcome.results.scenarios[i].runs.map((r) => r.measures.wait.value as number);
      const m = xs.reduce((x, y) => x + y, 0) / xs.length;
      return { n: xs.length, vn: xs.reduce((s, x) => s + (x - m) ** 2, 0) / (xs.length - 1) / xs.length };
    };
    const [sa, sb] = [side(0), side(1)];
    const nu = (sa.vn + sb.vn) ** 2 / (sa.vn ** 2 / (sa.n - 1) + sb.vn ** 2 / (sb.n - 1));
    expect(v("Degrees of freedom (Welch–Satterthwaite)")).toBe(fmt(nu));
    expect(v("Squared standard error")).toBe(fmt(sa.vn + sb.vn));
    // The formula of ν is written out with the two terms it adds.
    const df = model.appendix.comparisons!.blocks[1].steps.find((s) => s.label.startsWith("Degrees of freedom"))!;
    expect(df.formula).toBe(`ν = 1 / (w_a²/(n_a − 1) + w_b²/(n_b − 1)) = 1 / (${v("Term of a in ν")} + ${v("Term of b in ν")})`);
    // Each side's values in a table of its own.
    expect(model.appendix.comparisons!.blocks[1].values.map((t) => t.rows.length)).toEqual([6, 6]);
  });

  it("comparisonsView says what a comparison of two long runs was made on and assumes, and why the refused paired one has no arithmetic", async () => {
    const { study, outcome } = await longRunStudy();
    const model = buildReportModel(study, outcome, META);
    const [welch, paired] = outcome.results.comparisons!;
    expect(welch.basis).toBe("batch-means");
    expect(paired.ci_low).toBeNull();
    // The refused paired comparison: no arithmetic, no links, its reason under the table.
    expect(outcome.comparisons.map((c) => c.index)).toEqual([0]);
    expect(model.comparisons!.table.rows[1].every((c) => c.href === null)).toBe(true);
    expect(model.comparisons!.notes.some((n) => n.includes(paired.verdict))).toBe(true);
    expect(model.comparisons!.notes.some((n) => n.includes(welch.values!) && n.includes(welch.assumes!))).toBe(true);
    const [block] = model.appendix.comparisons!.blocks;
    expect(model.appendix.comparisons!.blocks).toHaveLength(1);
    expect(block.assumes).toBe(welch.assumes);
    expect(block.compared).toContain(welch.values);
    // The batch means are the values, each linked to the run's batch means in the appendix.
    const batches = model.appendix.batchValues!.items.map((i) => `#${i.id}`);
    expect(block.values.map((t) => t.rows.length)).toEqual([5, 5]);
    for (const t of block.values) for (const r of t.rows) expect(batches).toContain(r.cells![1].href);
    expect(stepValue(model.appendix.comparisons, 0, "Degrees of freedom (Welch–Satterthwaite)")).toBe(fmt(welch.df));
  });

  it("renderHtml escapes a scenario name with HTML's special characters in the comparison notes and the arithmetic blocks", async () => {
    for (const made of [await replicationStudy(), await longRunStudy()]) {
      const model = buildReportModel(made.study, made.outcome, META);
      const html = await renderHtml(model);
      const parts = [
        pagePart(html, "comparisons", "</section>"),
        ...model.appendix.comparisons!.blocks.map((b) => pagePart(html, b.id, "</article>")),
      ];
      for (const part of parts) {
        expect(part).toContain(FAST_ESCAPED);
        expect(part).not.toContain("<b>");
        expect(part).not.toContain(FAST);
      }
    }
  });
});

describe("the closing line of a run's table", () => {
  it("calcTable closes a utilization table, shortened on the page, with busy area ÷ capacity area = the run's value (contract section 4)", async () => {
    const { study, outcome } = await replicationStudy();
    const model = buildReportModel(study, outcome, META);
    const html = await renderHtml(model);
    const sr = outcome.results.scenarios[1];
    const run = sr.runs[0];
    const fig = run.measures.use;
    if (fig.kind !== "utilization") throw new Error("use is a utilization");
    const t = model.appendix.tables.find((x) => x.heading === `use — slow — run ${run.id}`)!;
    expect(t.rows.some((r) => r.gap !== null)).toBe(true); // the page shows head and tail only
    expect(t.closing!.text).toBe(`busy area ${fmt(fig.area)} ÷ capacity area ${fmt(fig.capacity_area)}`);
    expect(t.closing!.value.text).toBe(fmt(fig.value));
    // The quotient of the two areas is the run's value (utilization = area(busy) / area(capacity)).
    expect(fmt(fig.area / fig.capacity_area)).toBe(t.closing!.value.text);
    // It links to the interval arithmetic that lists the run value, and is the table's last row.
    const derivation = model.appendix.intervals.find((i) => i.heading === "use — utilization — slow")!;
    expect(t.closing!.value.href).toBe(`#${derivation.id}`);
    const body = pagePart(html, t.id, "</tbody>");
    expect(body.slice(body.lastIndexOf("<tr")).replace(/\s+/g, " ")).toContain(
      `<tr class="closing"><td colspan="${t.columns.length}">${t.closing!.text} = <a href="#${derivation.id}">${fmt(fig.value)}</a> (the run&#x27;s utilization)</td></tr>`);
  });

  it("calcTable closes a run's level table with area ÷ duration = its time average, and leaves other tables without", async () => {
    const { study, outcome } = await longRunStudy();
    const model = buildReportModel(study, outcome, META);
    const fig = outcome.results.scenarios[1].runs[0].measures.q;
    if (fig.kind !== "level") throw new Error("q is a level");
    const t = model.appendix.tables.find((x) => x.heading === "q — slow — run long")!;
    expect(t.closing).toEqual({ text: `area ${fmt(fig.area)} ÷ duration ${fmt(fig.duration)}`, value: expect.objectContaining({ text: fmt(fig.value) }), what: "(the run's time average)" });
    expect(fmt(fig.area / fig.duration)).toBe(fmt(fig.value));
    const others = (await replicationStudy());
    const wait = buildReportModel(others.study, others.outcome, META).appendix.tables.filter((x) => x.heading.startsWith("wait — "));
    expect(wait.length).toBeGreaterThan(0);
    for (const w of wait) expect(w.closing).toBeNull();
  });
});
