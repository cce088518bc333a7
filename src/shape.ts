/**
 * Checks that JSON read back from a file Sojourn wrote (record.json, a run summary) has the shape
 * Sojourn writes, so that a damaged or hand-edited file gets a message naming the key path and
 * what was expected, never an internal error further on.
 *
 *   checkShape({a: [1, "x"]}, {object: {a: {array: "number"}}})
 *     -> {path: ["a", 1], expected: "a number", found: "the string \"x\""}
 */
import { formatKeyPath, type KeyPath } from "./manifest/keyPath.js";

export type Shape =
  | "string"
  | "number"
  | "boolean"
  | "null"
  | "sha256"
  | "any"
  | { object: Record<string, Shape>; optional?: readonly string[] }
  | { array: Shape }
  | { record: Shape }
  | { oneOf: readonly Shape[] }
  | { test: (v: unknown) => boolean; expected: string };

export interface ShapeProblem {
  path: KeyPath;
  expected: string;
  found: string;
}

const SHA256 = /^[0-9a-f]{64}$/;

const EXPECTED = {
  string: "a string",
  number: "a finite number",
  boolean: "true or false",
  null: "null",
  sha256: "a SHA-256 digest (64 lower-case hex digits)",
  any: "a value",
} as const;

function expectedOf(shape: Shape): string {
  if (typeof shape === "string") return EXPECTED[shape];
  if ("object" in shape || "record" in shape) return "an object";
  if ("array" in shape) return "a list";
  if ("oneOf" in shape) return shape.oneOf.map(expectedOf).join(" or ");
  return shape.expected;
}

/** A short description of a JSON value, for messages (no long text is repeated). */
export function describeValue(v: unknown): string {
  if (v === undefined) return "nothing (the key is missing)";
  if (v === null) return "null";
  if (Array.isArray(v)) return "a list";
  if (typeof v === "string") return v.length <= 40 ? `the string ${JSON.stringify(v)}` : "a string";
  if (typeof v === "number" || typeof v === "boolean") return `${typeof v === "number" ? "the number" : ""} ${String(v)}`.trim();
  if (typeof v === "object") return "an object";
  return typeof v;
}

/** The first place where `value` differs from `shape`, or null when it fits. */
export function checkShape(value: unknown, shape: Shape, path: KeyPath = []): ShapeProblem | null {
  const problem = (): ShapeProblem => ({ path, expected: expectedOf(shape), found: describeValue(value) });
  if (typeof shape === "string") {
    switch (shape) {
      case "any":
        return value === undefined ? problem() : null;
      case "null":
        return value === null ? null : problem();
      case "number":
        return typeof value === "number" && Number.isFinite(value) ? null : problem();
      case "sha256":
        return typeof value === "string" && SHA256.test(value) ? null : problem();
      default:
        return typeof value === shape ? null : problem();
    }
  }
  if ("test" in shape) return shape.test(value) ? null : problem();
  if ("oneOf" in shape) {
    if (shape.oneOf.some((s) => checkShape(value, s, path) === null)) return null;
    // One alternative that is the same kind of thing says more than the list of all of them.
    for (const s of shape.oneOf) {
      const p = checkShape(value, s, path);
      if (p !== null && p.path.length > path.length) return p;
    }
    return problem();
  }
  if ("array" in shape) {
    if (!Array.isArray(value)) return problem();
    for (let i = 0; i < value.length; i++) {
      const p = checkShape(value[i], shape.array, [...path, i]);
      if (p !== null) return p;
    }
    return null;
  }
  if (value === null || typeof value !== "object" || Array.isArray(value)) return problem();
  const o = value as Record<string, unknown>;
  if ("record" in shape) {
    for (const k of Object.keys(o)) {
      const p = checkShape(o[k], shape.record, [...path, k]);
      if (p !== null) return p;
    }
    return null;
  }
  for (const [k, s] of Object.entries(shape.object)) {
    if (!Object.hasOwn(o, k)) {
      if (shape.optional?.includes(k)) continue;
      return { path: [...path, k], expected: expectedOf(s), found: describeValue(undefined) };
    }
    const p = checkShape(o[k], s, [...path, k]);
    if (p !== null) return p;
  }
  return null;
}

/** `at inputs[2].sha256: expected a SHA-256 digest ..., found the number 7` */
export function shapeText(p: ShapeProblem): string {
  return `${p.path.length === 0 ? "the whole file" : `at ${formatKeyPath(p.path)}`}: expected ${p.expected}, found ${p.found}`;
}
