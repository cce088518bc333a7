/**
 * The figures of a study that do not depend on its layout (contract section 9): run figures,
 * summaries and calculation tables of named measures, the tables without their columns of
 * run-file lines (`line`, `start_line`), which point at each file's own rows.
 */
import type { studyOf } from "./runStudyFrom.js";

type Study = Awaited<ReturnType<typeof studyOf>>;

/** The measures of `entityMeasures` (layoutModel.ts). */
export const ENTITY_NAMES = ["in_queue", "in_system", "wait", "sojourn", "served", "use", "busy_server0", "wait_server1", "gold_wait", "gold_done"];
/** The measures of `LEVEL_MEASURES` (layoutModel.ts). */
export const LEVEL_NAMES = ["queue", "busy", "busy_share"];

/** A calculation table's CSV text without its columns of run-file lines (`line`, `start_line`). */
export function withoutLine(csv: string): string {
  const rows = csv.split("\n");
  const drop = new Set(rows[0].split(",").flatMap((name, j) => (name === "line" || name === "start_line" ? [j] : [])));
  return rows.map((r) => r.split(",").filter((_, j) => !drop.has(j)).join(",")).join("\n");
}

/** Run figures, summaries and tables (without `line`) of the named measures. */
export function numbersOf(s: Study, measures: string[]) {
  const sc = s.outcome.results.scenarios[0];
  const pick = (m: Record<string, unknown>) => Object.fromEntries(measures.map((k) => [k, m[k]]));
  const tables = s.tableFiles
    .filter((t) => measures.some((m) => t.record.file.split("/").pop()!.startsWith(`${m}.`)))
    .map((t) => [t.record.file, withoutLine(t.csv)])
    .sort();
  return { runs: sc.runs.map((r) => pick(r.measures)), summary: pick(sc.summary as Record<string, unknown>), tables };
}

/** A one-scenario manifest of `layout` over `runs`, with `measures` (YAML text) and `extra` top-level lines. */
export function layoutManifest(layout: string, end: number, runs: string[], measures: string, extra = ""): string {
  return `layout: ${layout}\n${extra}scenarios:\n  - {name: s, end: ${end}, runs: [${runs.join(", ")}]}\n${measures}`;
}
