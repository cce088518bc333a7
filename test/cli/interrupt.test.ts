import { spawn } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { writeRunCsv } from "../../src/demo/ferry.js";
import { simulateQueue } from "../../src/demo/queue.js";
import { sojourn } from "../helpers/cli.js";
import { tempFolder } from "../helpers/tempStudy.js";

const MAIN = fileURLToPath(new URL("../../dist/cli/main.js", import.meta.url));

/** A study whose report takes long enough to be interrupted. */
async function slowStudy(): Promise<string> {
  const dir = tempFolder({
    "study.yaml": `title: Long bakery day\nscenarios:\n  - {name: s, end: 400000, runs: "runs/*.csv"}\nmeasures:\n  - {name: q, kind: level, series: queue}\n  - {name: w, kind: observation, series: wait}\n`,
  });
  mkdirSync(join(dir, "runs"));
  for (let k = 1; k <= 3; k++) {
    await writeRunCsv(join(dir, "runs", `day-${k}.csv`), simulateQueue({ arrivalRate: 0.9, serviceRate: 0.5, servers: 2, horizon: 400_000, seed: k, decimals: 3 }));
  }
  return dir;
}

describe("an interrupted report (issue 5: output is never half-written)", () => {
  it("SIGINT during a report leaves the earlier report exactly as it was and no temporary folder", async () => {
    const dir = await slowStudy();
    const out = join(dir, "out");
    // a small first report into the same folder, from a shorter window
    writeFileSync(join(dir, "short.yaml"), readFileSync(join(dir, "study.yaml"), "utf8").replace("end: 400000", "end: 1000"));
    expect(sojourn(["report", join(dir, "short.yaml"), "--out", out, "--quiet"]).status).toBe(0);
    const before = readFileSync(join(out, "results.json"));
    const child = spawn(process.execPath, [MAIN, "report", join(dir, "study.yaml"), "--out", out, "--quiet"], { stdio: "pipe" });
    let stderr = "";
    child.stderr.on("data", (d) => (stderr += d));
    await new Promise((r) => setTimeout(r, 900));
    child.kill("SIGINT");
    const code = await new Promise<number | null>((r) => child.on("exit", (c) => r(c)));
    // common practice: 128 + 2 for SIGINT
    expect(code).toBe(130);
    expect(stderr).toContain("Interrupted");
    expect(readFileSync(join(out, "results.json"))).toEqual(before);
    expect(readdirSync(dir).filter((f) => f.includes(".sojourn-"))).toEqual([]);
  }, 60_000);

  it("a temporary folder left by a killed run is removed by the next report, which succeeds", async () => {
    const dir = await slowStudy();
    const out = join(dir, "out");
    const stale = join(dir, ".out.sojourn-tmp-999999");
    mkdirSync(stale);
    writeFileSync(join(stale, "results.json"), "{}");
    writeFileSync(join(dir, "short.yaml"), readFileSync(join(dir, "study.yaml"), "utf8").replace("end: 400000", "end: 1000"));
    expect(sojourn(["report", join(dir, "short.yaml"), "--out", out, "--quiet"]).status).toBe(0);
    expect(readdirSync(dir).filter((f) => f.includes(".sojourn-"))).toEqual([]);
  }, 60_000);
});
