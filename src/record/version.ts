import { readFileSync } from "node:fs";

/** The tool's name and version, read from package.json next to src/ or dist/. */
export function toolVersion(): { name: string; version: string } {
  const pkg = JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8")) as { name: string; version: string };
  return { name: pkg.name, version: pkg.version };
}
