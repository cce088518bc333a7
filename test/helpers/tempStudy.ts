import { mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, relative } from "node:path";
import { gzipSync } from "node:zlib";

/** Writes files (text, or Buffer for gzip) into a fresh temp folder; returns the folder. */
export function tempFolder(files: Record<string, string | Buffer>): string {
  const dir = mkdtempSync(join(tmpdir(), "sojourn-test-"));
  for (const [rel, content] of Object.entries(files)) {
    const p = join(dir, rel);
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, content);
  }
  return dir;
}

/** CSV text from rows [time, series, value?, entity?]. */
export function csv(rows: [number, string, (number | null)?, (string | null)?][]): string {
  return "time,series,value,entity\n" + rows.map(([t, s, v, e]) => `${t},${s},${v ?? ""},${e ?? ""}`).join("\n") + "\n";
}

/** JSON Lines text of the same rows. */
export function jsonl(rows: [number, string, (number | null)?, (string | null)?][]): string {
  return rows.map(([t, s, v, e]) => JSON.stringify({ time: t, series: s, ...(v != null ? { value: v } : {}), ...(e != null ? { entity: e } : {}) })).join("\n") + "\n";
}

export const gz = (text: string): Buffer => gzipSync(Buffer.from(text));

/** Every file below `dir`, by its path relative to `dir`, with its bytes as latin1 text (one character a byte). */
export function folderSnapshot(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (at: string) => {
    for (const name of readdirSync(at).sort()) {
      const p = join(at, name);
      if (statSync(p).isDirectory()) walk(p);
      else out[relative(dir, p)] = readFileSync(p, "latin1");
    }
  };
  walk(dir);
  return out;
}
