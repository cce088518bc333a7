/**
 * `sojourn init` with hostile names: series, column, scenario and run names that hold line
 * breaks, `#`, quotes and YAML indicators (`: `, `- `, `&`, `*`, `{`, `[`). The manifest it writes
 * must load (`sojourn check`, exit 0) with every name intact and no key injected, and no name may
 * end a comment line early. Sources: YAML 1.2.2 section 7.3.1 (a double-quoted scalar with JSON's
 * escapes; JSON text is a double-quoted YAML scalar), section 6.6 (a comment runs to the end of
 * its line); RFC 4180 (a quoted CSV cell may hold line breaks and doubled quotes).
 */
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import { initStudy } from "../../src/init/initStudy.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { sojourn } from "../helpers/cli.js";

/** Series names: a level, an observation, a count and an entity pair, each hostile. */
const LEVEL = 'queue #1: "x"\nversion: 9';
const OBSERVED = "- [wait] & *b 'c'\r\ntitle: injected";
const ARRIVE = "{arrive}: #";
const LEAVE = "leave\u2028: ?";
/** A column that is neither time, series, value nor entity (an attribute), with few values. */
const DESK = 'desk #: "d"\nmeasures: []';
const DESK_VALUES = ["a: b", "c #d"];
/** A scenario folder and run file names. */
const SCENARIO = 'night "#1": {x}\n- y';
const RUN = 'r"1 #x';

/** RFC 4180: a cell in quotes, its quotes doubled. */
const cell = (s: string) => `"${s.replaceAll('"', '""')}"`;

function hostileFolder(): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-init-hostile-"));
  const scenario = join(dir, "runs", SCENARIO);
  mkdirSync(scenario, { recursive: true });
  for (const [k, id] of [RUN, `${RUN}\n2`].entries()) {
    const rows = [["time", "series", "value", "entity", DESK]];
    for (let i = 0; i < 6; i++) {
      const t = 10 * i + k;
      rows.push([String(t), LEVEL, String(i % 3), "", DESK_VALUES[i % 2]]);
      rows.push([String(t + 1), ARRIVE, "", `e${i}`, DESK_VALUES[i % 2]]);
      rows.push([String(t + 2), OBSERVED, String(1.5 + i), "", DESK_VALUES[i % 2]]);
      rows.push([String(t + 4), LEAVE, "", `e${i}`, DESK_VALUES[i % 2]]);
    }
    writeFileSync(join(scenario, `${id}.csv`), rows.map((r) => r.map(cell).join(",")).join("\n") + "\n");
  }
  return dir;
}

describe("sojourn init with hostile names", () => {
  it("writes a manifest that `sojourn check` accepts, with the names intact and no key injected", async () => {
    const dir = hostileFolder();
    const r = await initStudy(join(dir, "runs"));
    // YAML 1.2.2 section 6.6: a comment ends at the line break, so every line of the file must be
    // a comment, blank, or part of the manifest's own structure: no name may start a line.
    for (const line of r.text.split("\n")) expect(line, line).toMatch(/^(\s*#.*|\s*- .*|\s*[A-Za-z0-9_]+:.*|)$/);
    const written = parse(r.text) as Record<string, unknown>;
    // Common practice: init writes these top-level keys and no other.
    expect(Object.keys(written).sort()).toEqual(["confidence", "layout", "measures", "scenarios", "time_unit", "title", "version"]);
    expect(written.version).toBe(1);
    const scenarios = written.scenarios as { name: string; runs: unknown }[];
    expect(scenarios.map((s) => s.name)).toEqual([SCENARIO]);
    const measures = written.measures as { series?: string; from?: Record<string, string> }[];
    const read = new Set(measures.flatMap((m) => [m.series, ...Object.values(m.from ?? {})]).filter((x) => x !== undefined));
    expect([...read].sort()).toEqual([ARRIVE, LEAVE, LEVEL, OBSERVED].sort());

    // The `where` suggestion in a comment, uncommented, is the attribute column and one of its values.
    const suggestion = r.text.split("\n").find((l) => l.startsWith("#   where: "));
    expect(suggestion).toBeDefined();
    const where = (parse(suggestion!.slice("#   ".length)) as { where: Record<string, string> }).where;
    expect(Object.keys(where)).toEqual([DESK]);
    expect(DESK_VALUES).toContain(where[DESK]);

    // The manifest loads through the command line and the library with the same names.
    const check = sojourn(["check", r.manifest]);
    expect(check.status, check.stderr).toBe(0);
    const study = await loadStudy(r.manifest);
    expect(study.scenarios.map((s) => s.name)).toEqual([SCENARIO]);
    expect(study.scenarios[0].runs.map((x) => x.id).sort()).toEqual([RUN, `${RUN}\n2`].sort());
  });

  it("an entity table whose id and event columns have hostile names: the columns are read under those names", async () => {
    const dir = mkdtempSync(join(tmpdir(), "sojourn-init-hostile-"));
    mkdirSync(join(dir, "runs", "day"), { recursive: true });
    const ID = "id #: x\nlayout: levels";
    const EVENTS = ["in\n: [a]", 'served "#"', "out\u0085 - *z"];
    for (const run of ["r1", "r2"]) {
      const rows = [[ID, ...EVENTS]];
      for (let i = 0; i < 8; i++) rows.push([`c${i}`, String(i), String(i + 0.5), String(i + 2)]);
      writeFileSync(join(dir, "runs", "day", `${run}.csv`), rows.map((r) => r.map(cell).join(",")).join("\n") + "\n");
    }
    const r = await initStudy(join(dir, "runs"));
    for (const line of r.text.split("\n")) expect(line, line).toMatch(/^(\s*#.*|\s*- .*|\s*[A-Za-z0-9_]+:.*|)$/);
    const written = parse(r.text) as { layout: string; columns: Record<string, string>; measures: { series?: string; from?: Record<string, string> }[] };
    expect(written.layout).toBe("entities");
    expect(written.columns).toEqual({ entity: ID });
    const read = new Set(written.measures.flatMap((m) => [m.series, ...Object.values(m.from ?? {})]).filter((x) => x !== undefined));
    // Every name a measure reads is one of the file's event columns, as written.
    expect([...read].every((x) => EVENTS.includes(x!)), [...read].join(" | ")).toBe(true);
    expect(read.size).toBeGreaterThan(1);
    const check = sojourn(["check", r.manifest]);
    expect(check.status, check.stderr).toBe(0);
  });
});
