import { describe, expect, it } from "vitest";
import { simulateQueue } from "../../src/demo/queue.js";
import { writeRunCsv } from "../../src/demo/ferry.js";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import { runStudy } from "../../src/study/runStudy.js";
import { tempFolder } from "../helpers/tempStudy.js";
import { join } from "node:path";

describe("M/M/1 against its formulas (Kleinrock 1975, Queueing Systems vol. 1: L_q = ρ²/(1−ρ), utilization ρ)", () => {
  it("long seeded runs of the demo generator agree with ρ and ρ²/(1−ρ)", async () => {
    const lambda = 0.5;
    const mu = 1;
    const rho = lambda / mu;
    const horizon = 40_000;
    const dir = tempFolder({
      "study.yaml": `title: mm1
warmup: 500
scenarios:
  - {name: mm1, end: ${horizon}, runs: runs/*.csv}
measures:
  - {name: waiting, kind: level, series: queue}
  - {name: server, kind: utilization, series: busy, capacity: 1}
`,
    });
    const { mkdirSync } = await import("node:fs");
    mkdirSync(join(dir, "runs"));
    for (let k = 1; k <= 6; k++) {
      await writeRunCsv(join(dir, "runs", `rep-${k}.csv`), simulateQueue({ arrivalRate: lambda, serviceRate: mu, servers: 1, horizon, seed: 500 + k, decimals: 6 }));
    }
    const { outcome } = await runStudy(await loadStudy(join(dir, "study.yaml")));
    const s = outcome.results.scenarios[0].summary;
    const lq = rho ** 2 / (1 - rho); // 0.5
    // stated tolerance: within the 95 % interval widened by half its width, or 4 % relative, whichever is larger
    const within = (mean: number, hw: number, truth: number, rel: number) => Math.abs(mean - truth) <= Math.max(1.5 * hw, rel * truth);
    expect(within(s.waiting.mean!, s.waiting.half_width!, lq, 0.04)).toBe(true);
    expect(within(s.server.mean!, s.server.half_width!, rho, 0.02)).toBe(true);
  }, 120_000);
});
