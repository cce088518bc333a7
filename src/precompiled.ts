/**
 * Artefacts `npm run build` compiles ahead of time into dist/ (`scripts/precompile.mjs`): the
 * manifest schema's validator and the report's templates. Run from the TypeScript sources (the
 * tests), they are not there, and the callers compile at run time instead.
 */
import { createRequire } from "node:module";

/** The CommonJS module `file` beside the module at `base`, or null when it is not there. */
export function precompiled<T>(base: string, file: string): T | null {
  const require = createRequire(base);
  let path: string;
  try {
    path = require.resolve(file);
  } catch {
    return null;
  }
  return require(path) as T;
}
