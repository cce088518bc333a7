/**
 * Names with control characters (escape sequences, a bell, a carriage return, C1 controls,
 * bidirectional overrides, line feeds) from manifests, run files and file names reach the
 * terminal escaped as `\uXXXX` in every command's output, messages and progress; `--json` stays
 * valid JSON that reads back to the names as written. Through the built command line.
 */
import { spawnSync } from "node:child_process";
import { rmSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { terminalJson, terminalMessage, terminalText } from "../../src/messages/terminal.js";
import { sojourn } from "../helpers/cli.js";
import { csv, tempFolder } from "../helpers/tempStudy.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

/** The characters a terminal acts on or reorders (messages/terminal.ts), the line feed aside. */
function rawControls(text: string): string[] {
  const found: string[] = [];
  for (const ch of text) {
    const c = ch.charCodeAt(0);
    const control = (c <= 0x1f && c !== 0x0a) || (c >= 0x7f && c <= 0x9f) || c === 0x061c || c === 0x200e || c === 0x200f || (c >= 0x2028 && c <= 0x202e) || (c >= 0x2066 && c <= 0x2069);
    if (control) found.push(`U+${c.toString(16).padStart(4, "0")}`);
  }
  return found;
}

const ESC = "\u001b";
// Names as a hostile or careless file could write them (invented for this test).
const SCENARIO = `two${ESC}[2Jbooths`; // clear screen
const MEASURE = `wait\u009b31m\u202etime`; // C1 CSI, right-to-left override
const SERIES = `q${ESC}[31m`;
const RUN = `rep${ESC}]0;owned\u0007-1`; // set the window title, ended by a bell
const yamlText = (s: string) => JSON.stringify(s); // YAML reads a JSON string as the same text

const manifest = `title: ${yamlText(`Ferry\r${ESC}[1mbold`)}
scenarios:
  - {name: ${yamlText(SCENARIO)}, end: 10, runs: "runs/*.csv"}
measures:
  - {name: ${yamlText(MEASURE)}, kind: level, series: ${yamlText(SERIES)}}
`;
const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

function study(files: Record<string, string> = {}): string {
  const dir = tempFolder({ "study.yaml": manifest, [`runs/${RUN}.csv`]: csv([[0, SERIES, 1], [4, SERIES, 3]]), ...files });
  dirs.push(dir);
  return dir;
}

describe("terminalText / terminalJson", () => {
  it("escapes control, C1 and bidirectional characters as \\uXXXX and keeps other text", () => {
    expect(terminalText(`a${ESC}[2Jb`)).toBe("a\\u001b[2Jb");
    expect(terminalText("a\nb\rc\td")).toBe("a\\u000ab\\u000dc\\u0009d");
    expect(terminalText("a\nb", { keepNewlines: true })).toBe("a\nb");
    expect(terminalText("\u007f\u0085\u009b\u061c\u200e\u200f\u2028\u2029\u202a\u202e\u2066\u2069")).toBe(
      "\\u007f\\u0085\\u009b\\u061c\\u200e\\u200f\\u2028\\u2029\\u202a\\u202e\\u2066\\u2069",
    );
    expect(terminalText("élan 队列 🚲 <b>")).toBe("élan 队列 🚲 <b>");
  });

  it("terminalMessage keeps only the line feed before What to do", () => {
    expect(terminalMessage("a: x\ny\n  What to do: z\nw")).toBe("a: x\\u000ay\n  What to do: z\\u000aw");
    expect(terminalMessage(`no marker\n${ESC}`)).toBe("no marker\\u000a\\u001b");
  });

  it("terminalJson is valid JSON with the same values and no raw control character", () => {
    const value = { name: MEASURE, run: RUN, list: [SCENARIO, "\u2028"] };
    const text = terminalJson(value, 2);
    expect(rawControls(text)).toEqual([]);
    expect(JSON.parse(text)).toEqual(value);
  });
});

describe("command output with control characters in names", () => {
  it("check: the plan shows every name escaped, on its own lines", () => {
    const r = sojourn(["check", "study.yaml"], study());
    expect(r.status, r.stderr).toBe(0);
    expect(rawControls(r.stdout + r.stderr)).toEqual([]);
    expect(r.stdout).toContain(terminalText(SCENARIO));
    expect(r.stdout).toContain(terminalText(MEASURE));
    expect(r.stdout).toContain(terminalText(RUN));
    expect(r.stdout).toContain(terminalText(`Ferry\r${ESC}[1mbold`));
  });

  it("check --json: valid JSON that reads back to the names as written", () => {
    const r = sojourn(["check", "study.yaml", "--json"], study());
    expect(r.status, r.stderr).toBe(0);
    expect(rawControls(r.stdout)).toEqual([]);
    const plan = JSON.parse(r.stdout) as { title: string; scenarios: { name: string; runs: { id: string }[]; measures: { name: string }[] }[] };
    expect(plan.title).toBe(`Ferry\r${ESC}[1mbold`);
    expect(plan.scenarios[0].name).toBe(SCENARIO);
    expect(plan.scenarios[0].runs[0].id).toBe(RUN);
    expect(plan.scenarios[0].measures[0].name).toBe(MEASURE);
  });

  it("report progress, at, at --json and verify show names escaped", () => {
    const dir = study();
    const report = sojourn(["report", "study.yaml", "--out", "out"], dir);
    expect(report.status, report.stderr).toBe(0);
    expect(rawControls(report.stdout + report.stderr)).toEqual([]);
    expect(report.stderr).toContain(terminalText(RUN)); // "read run 1/1: <scenario> / <run>"

    const at = sojourn(["at", "study.yaml", "--scenario", SCENARIO, "--run", RUN, "--measure", MEASURE, "--time", "6"], dir);
    expect(at.status, at.stderr).toBe(0);
    expect(rawControls(at.stdout + at.stderr)).toEqual([]);
    expect(at.stdout).toContain(terminalText(MEASURE));
    // level 1 on [0, 4], 3 on [4, 6]: area 4 + 6 = 10 over 6 (computed by hand)
    expect(at.stdout).toContain("= 10 / 6 =");
    const atJson = sojourn(["at", "study.yaml", "--scenario", SCENARIO, "--run", RUN, "--measure", MEASURE, "--time", "6", "--json"], dir);
    expect(JSON.parse(atJson.stdout)).toMatchObject({ time: 6, area: 10, duration: 6 });

    const verify = sojourn(["verify", "out"], dir);
    expect(verify.status, verify.stdout).toBe(0);
    expect(rawControls(verify.stdout + verify.stderr)).toEqual([]);
    expect(verify.stdout).toContain(terminalText(`runs/${RUN}.csv`));
  });

  it("an error message naming a run file and a series with control characters keeps them escaped and on one line", () => {
    const file = `bad\n${ESC}[2K.csv`; // a line feed and "erase line" in the file name
    const dir = study({ [`runs/${file}`]: `time,series,value\n0,${SERIES},1\n-,${SERIES},2\n` });
    const r = sojourn(["check", "study.yaml"], dir);
    expect(r.status).toBe(1);
    expect(rawControls(r.stderr)).toEqual([]);
    const first = r.stderr.split("\n")[0];
    expect(first).toContain(terminalText(`runs/${file}`));
    expect(first).toMatch(/^sojourn: runs\/bad\\u000a\\u001b\[2K\.csv:3/);
    expect(r.stderr).toContain("\n  What to do: ");
  });

  it("a message quoting a series name with a line feed stays two lines: what, and what to do", () => {
    const series = "q\nWhat to do: nothing";
    const text = `scenarios:\n  - {name: s, end: 10, runs: "runs/*.csv"}\nmeasures:\n  - {name: m, kind: level, series: ${yamlText(series)}}\n`;
    const dir = tempFolder({ "study.yaml": text, "runs/r.csv": `time,series,value\n1,"${series}",\n` });
    dirs.push(dir);
    const r = sojourn(["check", "study.yaml"], dir);
    expect(r.status).toBe(1);
    const lines = r.stderr.split("\n");
    expect(lines).toHaveLength(3); // the message's two lines and the final line feed
    expect(lines[0]).toContain(`series "q\\u000aWhat to do: nothing"`);
    expect(lines[1].startsWith("  What to do: ")).toBe(true);
    expect(lines[2]).toBe("");
  });

  it("a usage error repeats a typed flag with its control characters escaped", () => {
    const r = spawnSync(process.execPath, [MAIN, "check", "study.yaml", `--x${ESC}[31m`], { encoding: "utf8" });
    expect(r.status).toBe(2);
    expect(rawControls(r.stderr)).toEqual([]);
    expect(r.stderr).toContain("--x\\u001b[31m");
  });

  it("table writes the CSV as data when standard output is not a terminal", () => {
    const dir = study();
    const r = sojourn(["table", "study.yaml", "--scenario", SCENARIO, "--run", RUN, "--measure", MEASURE], dir);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.split("\n")[0]).toBe("index,value,from,to,duration,area,running_area,running_mean,line");
    expect(rawControls(r.stdout)).toEqual([]); // a level table holds numbers only
  });
});
