import js from "@eslint/js";
import tseslint from "typescript-eslint";

/**
 * Which phase may import which (the data path of src/): a folder
 * never imports the phases after it. Each entry: the folder, and the folders it must not import.
 * Patterns match the import path as written, so `../study/x.js` and `../../study/x.js` both count.
 */
export const IMPORT_DIRECTIONS = {
  outcome: ["measures", "study", "report", "record", "story", "cli"],
  measures: ["study", "report", "record", "story", "cli"],
  stats: ["study", "report", "record", "story", "cli"],
  study: ["report", "record", "story", "cli"],
  report: ["record", "story", "cli", "ingest"],
  // The story of a command (src/story/) uses the folders above; only the command line uses it.
  record: ["story", "cli"],
  // Running a study on a cluster (src/cluster/) uses the story of a report; only the command line uses it.
  cluster: ["cli"],
};

const directions = Object.entries(IMPORT_DIRECTIONS).map(([folder, banned]) => ({
  files: [`src/${folder}/**/*.ts`],
  rules: {
    "no-restricted-imports": ["error", {
      patterns: banned.map((b) => ({
        group: [`**/${b}/*`, `**/${b}/**`],
        message: `src/${folder}/ must not import src/${b}/ (eslint.config.js IMPORT_DIRECTIONS).`,
      })),
    }],
  },
}));

export default tseslint.config(
  { ignores: ["dist/**", "node_modules/**", "demo-study/**", "coverage/**"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "no-constant-condition": ["error", { checkLoops: false }],
    },
  },
  ...directions,
);
