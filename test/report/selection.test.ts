/**
 * The report's selection of the best (select:): the sentence in the opening summary and in its
 * section, the table, the chart, the arithmetic in the appendix, the caution, and user text
 * escaped in the HTML and in the CSV table. Through the built command line, on a small invented
 * study whose run values are known.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { sojourn } from "../helpers/cli.js";
import { csv, tempFolder } from "../helpers/tempStudy.js";

const ODD = '<b>"x"&';
// One observation of `wait` per run: the run's value. Runs paired by id.
const WAITS: [string, number[]][] = [
  ["calm", [1.0, 1.1, 0.9, 1.0]],
  [ODD, [3.0, 3.2, 2.9, 3.1]],
  ["late", [2.0, 2.1, 1.8, 2.2]],
];
const manifest = `title: Bakery counter
time_unit: min
scenarios:
${WAITS.map(([name], i) => `  - {name: ${JSON.stringify(name)}, runs: "runs/s${i}/*.csv"}`).join("\n")}
measures:
  - {name: wait, kind: observation, series: wait, unit: min}
select:
  - {measure: wait, better: smaller, indifference: 0.5, probability: 0.9, method: paired}
`;

function report(): { html: string; results: Record<string, unknown> & { selections: { selected: string; comparisons_with_best: { scenario: string; ruled_out: boolean }[] }[] }; table: string; dir: string } {
  const files: Record<string, string> = { "study.yaml": manifest };
  WAITS.forEach(([, waits], i) => waits.forEach((w, k) => (files[`runs/s${i}/day-${k + 1}.csv`] = csv([[1, "wait", w]]))));
  const dir = tempFolder(files);
  const r = sojourn(["report", join(dir, "study.yaml"), "--out", join(dir, "out"), "--quiet"]);
  expect(r.stderr).toBe("");
  expect(r.status).toBe(0);
  return {
    html: readFileSync(join(dir, "out", "report.html"), "utf8"),
    results: JSON.parse(readFileSync(join(dir, "out", "results.json"), "utf8")),
    table: readFileSync(join(dir, "out", "tables", "selections.best", "1-wait.csv"), "utf8"),
    dir,
  };
}

describe("report: selecting the best", () => {
  it("names the selected scenario, its assurance, the runs it took and those ruled out, in the summary and in its section", () => {
    const { html, results } = report();
    const [s] = results.selections;
    // Computed by hand: calm's mean 1.0 is lowest by 1.0 > δ = 0.5, with spread far below δ (N = n0 = 4).
    expect(s.selected).toBe("calm");
    expect(s.comparisons_with_best.filter((c) => c.ruled_out).map((c) => c.scenario)).toEqual([ODD, "late"]);
    const sentence = "“calm” is best in wait (smaller is better), or within 0.5 min of the best, with probability at least 0.9; it took 12 runs in all (Nelson and Matejcik (1995)).";
    const brief = html.slice(html.indexOf('id="summary"'), html.indexOf('id="selections"'));
    expect(brief).toContain(sentence); // brief: the sentence in the opening summary
    expect(brief).toContain("“&lt;b&gt;&quot;x&quot;&amp;” and “late” can be ruled out.");
    const section = html.slice(html.indexOf('id="selections"'));
    expect(section).toContain(sentence);
    expect(section).toContain("<svg"); // the chart of the comparisons with the best, once complete
    expect(html).toContain('id="selection-arithmetic"'); // the arithmetic in the appendix
    expect(html).toContain("A selection of the best assumes that each scenario&#x27;s run values are normally distributed"); // brief: the caution
  });

  it("escapes a scenario's name in the HTML and quotes it in the CSV table", () => {
    const { html, table } = report();
    expect(html).not.toContain(ODD); // brief: user text is data
    expect(html).toContain("&lt;b&gt;&quot;x&quot;&amp;");
    // RFC 4180: a field holding a quote is quoted, its quotes doubled
    const rows = table.trim().split("\n");
    expect(rows[0]).toBe("scenario,first_stage_runs,first_stage_mean,first_stage_variance,first_stage_sd,runs_needed,runs_present,runs_missing,mean,mcb_lower,mcb_upper,ruled_out,in_subset");
    expect(rows[2].startsWith('"<b>""x""&",4,')).toBe(true);
    expect(rows[1].endsWith(",false,true")).toBe(true); // calm: not ruled out, in the subset
  });
});
