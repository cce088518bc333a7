/**
 * The import directions of eslint.config.js hold: for each folder, an import of each folder it
 * must not use is reported by ESLint (its Node API, the project's own config), and an allowed one
 * is not.
 */
import { ESLint } from "eslint";
import { describe, expect, it } from "vitest";

// eslint.config.js is plain JavaScript (no declarations): its export is typed here.
const configPath: string = "../../eslint.config.js";
const { IMPORT_DIRECTIONS } = (await import(configPath)) as { IMPORT_DIRECTIONS: Record<string, string[]> };

const eslint = new ESLint({ cwd: process.cwd() });

/** The no-restricted-imports messages ESLint gives for `code` as if it were the file `path`. */
async function restricted(code: string, path: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: path });
  return result.messages.filter((m) => m.ruleId === "no-restricted-imports").map((m) => m.message);
}

describe("eslint.config.js import directions", () => {
  it("IMPORT_DIRECTIONS names the directions of the data path", () => {
    expect(IMPORT_DIRECTIONS).toEqual({
      outcome: ["measures", "study", "report", "record", "story", "cli"],
      measures: ["study", "report", "record", "story", "cli"],
      stats: ["study", "report", "record", "story", "cli"],
      study: ["report", "record", "story", "cli"],
      report: ["record", "story", "cli", "ingest"],
      record: ["story", "cli"],
      cluster: ["cli"],
    });
  });

  for (const [folder, banned] of Object.entries(IMPORT_DIRECTIONS)) {
    for (const b of banned) {
      it(`an import of src/${b}/ from src/${folder}/ is reported, one and two folders up`, async () => {
        const code = `import type { X } from "../${b}/x.js";\nimport type { Y } from "../../${b}/y.js";\nexport type Z = X | Y;\n`;
        const messages = await restricted(code, `src/${folder}/sub/probe.ts`);
        expect(messages).toHaveLength(2);
        expect(messages[0]).toContain(`src/${folder}/ must not import src/${b}/`);
      });
    }
  }

  it("an allowed import is not reported (study may import measures, report may import study)", async () => {
    expect(await restricted(`import type { X } from "../measures/x.js";\nexport type Y = X;\n`, "src/study/probe.ts")).toEqual([]);
    expect(await restricted(`import type { X } from "../../study/x.js";\nexport type Y = X;\n`, "src/report/model/probe.ts")).toEqual([]);
  });
});
