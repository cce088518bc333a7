/**
 * The yaml and tinyglobby packages as the manifest reader uses them: from the single files
 * `npm run build` bundles them into (`dist/manifest/yamlBundle.cjs`, `globBundle.cjs`,
 * scripts/precompile.mjs), else the packages themselves. yaml is about 70 small CommonJS files,
 * about 0.03 s of CPU to load before a manifest can be read, its one file about 0.01 s;
 * tinyglobby with its two dependencies about 0.01 s, its one file half that. Run from the
 * TypeScript sources (the tests) the bundles are not there and the packages are used;
 * test/scale/precompiled.test.ts holds the bundles to the packages' answers.
 */
import { createRequire } from "node:module";
import type * as Tinyglobby from "tinyglobby";
import type * as Yaml from "yaml";
import { precompiled } from "../precompiled.js";

const require = createRequire(import.meta.url);

export const yaml: typeof Yaml = precompiled<typeof Yaml>(import.meta.url, "./yamlBundle.cjs") ?? (require("yaml") as typeof Yaml);

export const tinyglobby: typeof Tinyglobby = precompiled<typeof Tinyglobby>(import.meta.url, "./globBundle.cjs") ?? (require("tinyglobby") as typeof Tinyglobby);
