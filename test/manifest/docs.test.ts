/** The manifest reference (docs/manifest.md) must describe what loadStudy accepts. */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { afterEach, describe, expect, test } from "vitest";
import { loadStudy } from "../../src/manifest/loadStudy.js";
import type { ObservationMeasure, UtilizationMeasure } from "../../src/manifest/types.js";
import { removeFolder, studyFolder } from "./helpers.js";

const reference = readFileSync(new URL("../../docs/manifest.md", import.meta.url), "utf8");
const schema = JSON.parse(readFileSync(new URL("../../docs/manifest.schema.json", import.meta.url), "utf8")) as {
  properties: Record<string, unknown>;
  definitions: Record<string, { properties?: Record<string, unknown> }>;
};

/** The first ```yaml block after the heading `title`. */
function exampleAfter(title: string): string {
  const section = reference.slice(reference.indexOf(`## ${title}`));
  const match = /```yaml\n([\s\S]*?)```/.exec(section);
  if (match === null) throw new Error(`test setup: no yaml block after ${title}`);
  return match[1];
}

const folders: string[] = [];
afterEach(() => {
  while (folders.length > 0) removeFolder(folders.pop() as string);
});

describe("docs/manifest.md", () => {
  test("loadStudy accepts the reference's complete example and applies its overrides", async () => {
    const dir = studyFolder({
      "runs/two-booths/rep-01.csv": "",
      "runs/two-booths/rep-02.csv": "",
      "runs/three-booths/rep-01.csv": "",
      "runs/three-booths-late/rep-11.csv.gz": "",
    });
    folders.push(dir);
    const study = await loadStudy(join(dir, "ferry.yaml"), { text: exampleAfter("A complete example") });
    const three = study.scenarios[1];
    expect(three.runs.map((r) => [r.id, r.end])).toEqual([["rep-01", 600], ["rep-11", 540]]); // docs: a run mapping's end wins
    expect((three.measures[1] as UtilizationMeasure).capacity).toEqual({ type: "constant", value: 3 }); // docs: scenario override
    expect((three.measures[5] as ObservationMeasure).target).toEqual({ type: "relative", value: 0.1 }); // docs: measure's scenarios: override
    expect(three.warmup).toEqual({ type: "fixed", time: 45 });
    expect(three.columns).toEqual({ time: "t", series: "kind", value: "v", entity: "id" });
  });

  test("the reference names every key of the JSON Schema", () => {
    const keys = new Set(Object.keys(schema.properties));
    for (const definition of Object.values(schema.definitions)) for (const key of Object.keys(definition.properties ?? {})) keys.add(key);
    const missing = [...keys].filter((key) => !reference.includes(`\`${key}\``));
    expect(missing).toEqual([]); // brief: document EVERY key
  });
});
