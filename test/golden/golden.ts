/**
 * Helpers of the example goldens (golden.test.ts): how the report model is stored, and how a
 * stored file and a fresh one are compared so that a failure names the first difference.
 *
 *   report model ──abridgeModel──▶ JSON with its large arrays replaced by digests ──▶ model.json
 *   stored text + fresh text ──goldenDifference──▶ null, or "first difference at $.a.b[3]: ..."
 */
import { createHash } from "node:crypto";

/** Arrays whose compact JSON is longer than this many characters are stored by digest. */
export const LARGE_ARRAY_CHARS = 2000;

/** What a large array is replaced by in model.json. */
export interface AbridgedArray {
  abridged_array: { sha256: string; length: number; json_chars: number };
}

/** The stand-in for `array`: its number of items, the length and the SHA-256 of its compact JSON. */
export function digestOf(array: unknown[]): AbridgedArray {
  const json = JSON.stringify(array);
  return { abridged_array: { sha256: createHash("sha256").update(json).digest("hex"), length: array.length, json_chars: json.length } };
}

/**
 * A copy of a report model (any JSON value) fit to store: every array longer than
 * `LARGE_ARRAY_CHARS` characters of compact JSON that is
 *
 * - the `values` of a chart's data: a key `values` anywhere inside a key `spec` (vega-lite
 *   `data.values`, also inside `layer`s), or
 * - the `rows` of a calculation table: the key `rows` of an item of `appendix.tables`,
 *
 * is replaced by `digestOf(array)`. Everything else is kept as it is, so a change anywhere still
 * changes the stored text: in a digested array through its digest.
 */
export function abridgeModel(model: unknown): unknown {
  const walk = (v: unknown, inSpec: boolean, calcTable: boolean): unknown => {
    if (Array.isArray(v)) return v.map((x) => walk(x, inSpec, false));
    if (v === null || typeof v !== "object") return v;
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
      const large = Array.isArray(x) && ((inSpec && k === "values") || (calcTable && k === "rows")) && JSON.stringify(x).length > LARGE_ARRAY_CHARS;
      out[k] = large ? digestOf(x as unknown[]) : walk(x, inSpec || k === "spec", false);
    }
    return out;
  };
  const top = walk(model, false, false) as Record<string, unknown>;
  const appendix = (model as { appendix?: { tables?: unknown } }).appendix;
  if (Array.isArray(appendix?.tables)) {
    (top.appendix as Record<string, unknown>).tables = appendix.tables.map((t) => walk(t, false, true));
  }
  return top;
}

/** Longest compact JSON of an array or object that `prettyJson` keeps on one line. */
export const ONE_LINE_CHARS = 100;

/**
 * JSON indented by two spaces, except that an array or object whose compact JSON has at most
 * `ONE_LINE_CHARS` characters stays on one line (a table cell, a row of a small table), so the
 * file stays short and a diff still shows each changed part on its own line.
 */
export function prettyJson(v: unknown, indent = ""): string {
  const flat = JSON.stringify(v);
  if (v === null || typeof v !== "object" || flat.length <= ONE_LINE_CHARS) return flat;
  const inner = indent + "  ";
  if (Array.isArray(v)) {
    if (v.length === 0) return "[]";
    return `[\n${v.map((x) => inner + (x === undefined ? "null" : prettyJson(x, inner))).join(",\n")}\n${indent}]`;
  }
  const entries = Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined);
  if (entries.length === 0) return "{}";
  return `{\n${entries.map(([k, x]) => `${inner}${JSON.stringify(k)}: ${prettyJson(x, inner)}`).join(",\n")}\n${indent}}`;
}

/** model.json's exact text: `prettyJson` of the abridged model, with a final newline. */
export function modelJson(model: unknown): string {
  return prettyJson(abridgeModel(model)) + "\n";
}

/** A JSON path step: `.key` for an identifier, `["key"]` otherwise, `[i]` for an index. */
function step(key: string | number): string {
  if (typeof key === "number") return `[${key}]`;
  return /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(key) ? `.${key}` : `[${JSON.stringify(key)}]`;
}

/** A value as one short line for a message (JSON, cut at `max` characters). */
export function shortValue(v: unknown, max = 160): string {
  if (v === undefined) return "(absent)";
  const json = JSON.stringify(v);
  return json.length <= max ? json : `${json.slice(0, max)}… (${json.length} characters)`;
}

/**
 * The first place, in document order of `stored`, where two JSON values differ: its path
 * (`$.scenarios[0].runs[2].measures.queue.mean`) and both values, or null when they are equal.
 * A key present on one side only counts as a difference at that key; a different array length
 * as one at the first index past the shorter one.
 */
export function firstDifference(stored: unknown, fresh: unknown, path = "$"): { path: string; stored: unknown; fresh: unknown } | null {
  if (Object.is(stored, fresh)) return null;
  const bothArrays = Array.isArray(stored) && Array.isArray(fresh);
  const bothObjects = !Array.isArray(stored) && !Array.isArray(fresh) && isObject(stored) && isObject(fresh);
  if (bothArrays) {
    const n = Math.max(stored.length, fresh.length);
    for (let i = 0; i < n; i++) {
      const d = i < stored.length && i < fresh.length ? firstDifference(stored[i], fresh[i], path + step(i)) : { path: path + step(i), stored: stored[i], fresh: fresh[i] };
      if (d !== null) return d;
    }
    return null;
  }
  if (bothObjects) {
    const keys = [...Object.keys(stored), ...Object.keys(fresh).filter((k) => !Object.hasOwn(stored, k))];
    for (const k of keys) {
      const d = Object.hasOwn(stored, k) && Object.hasOwn(fresh, k) ? firstDifference(stored[k], fresh[k], path + step(k)) : { path: path + step(k), stored: stored[k], fresh: fresh[k] };
      if (d !== null) return d;
    }
    return null;
  }
  return { path, stored, fresh };
}

function isObject(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === "object";
}

/**
 * Why the text of a stored golden file and a fresh one differ, in one short paragraph, or null
 * when they are the same text. `where` names the file in the message. When both texts are JSON
 * the message gives the first differing JSON path and its two values; when the values are equal
 * but the text is not (key order, spacing), or a text is not JSON, it gives the first differing line.
 */
export function goldenDifference(where: string, stored: string | null, fresh: string): string | null {
  if (stored === fresh) return null;
  const update = "If the change is intended, run `npm run golden:update` and review `git diff test/golden` (docs/testing.md).";
  if (stored === null) return `${where}: no golden file yet. ${update}`;
  const s = parseOrNull(stored);
  const f = parseOrNull(fresh);
  if (s.ok && f.ok) {
    const d = firstDifference(s.value, f.value);
    if (d !== null) {
      const digest = /\.abridged_array\.\w+$/.test(d.path) ? " (an array stored by its digest: its items changed)" : "";
      return `${where}: first difference at ${d.path}${digest}\n  stored: ${shortValue(d.stored)}\n  now:    ${shortValue(d.fresh)}\n${update}`;
    }
  }
  const a = stored.split("\n");
  const b = fresh.split("\n");
  let i = 0;
  while (i < a.length && i < b.length && a[i] === b[i]) i++;
  const same = s.ok && f.ok ? "the same JSON values, but the text differs" : "the text differs";
  return `${where}: ${same}; first differing line ${i + 1}\n  stored: ${shortValue(a[i])}\n  now:    ${shortValue(b[i])}\n${update}`;
}

function parseOrNull(text: string): { ok: true; value: unknown } | { ok: false } {
  try {
    return { ok: true, value: JSON.parse(text) as unknown };
  } catch {
    return { ok: false };
  }
}
