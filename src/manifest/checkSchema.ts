/**
 * The structural check: the manifest against `docs/manifest.schema.json` (JSON Schema draft-07),
 * with the first problem turned into a located message a user can act on.
 */
import { sha256 } from "../digest.js";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import type { Ajv as AjvClass, ErrorObject, ValidateFunction } from "ajv";
import { manifestMessages } from "../messages/index.js";
import { closest } from "./didYouMean.js";
import { formatKeyPath, pointerToKeyPath } from "./keyPath.js";
import type { ManifestSource } from "./manifestSource.js";
import { precompiled } from "../precompiled.js";
import { OVERRIDABLE_KEYS, type StudySpec } from "./spec.js";

const SCHEMA_URL = new URL("../../docs/manifest.schema.json", import.meta.url);

let validator: ValidateFunction | undefined;
let firstErrorValidator: ValidateFunction | undefined;
let schemaRoot: SchemaNode = {};

/** The ajv options of the schema check; `scripts/precompile.mjs` compiles with the same. */
export const AJV_OPTIONS = { allErrors: true, verbose: true, strictNumbers: true, allowUnionTypes: true, strictTypes: false } as const;

/**
 * The compiled schema, on first use only: the validator `npm run build` compiled into
 * `dist/manifest/manifestValidator.cjs` when it was made from this very schema text, else
 * compiled here (from the sources, or after the schema was edited without a rebuild).
 */
function validate(): ValidateFunction {
  if (validator === undefined) {
    const text = readFileSync(SCHEMA_URL, "utf8");
    schemaRoot = JSON.parse(text) as SchemaNode;
    const built = precompiled<ValidateFunction & { sourceSha256?: string }>(import.meta.url, "./manifestValidator.cjs");
    if (built !== null && built.sourceSha256 === sha256(text)) validator = built;
    else {
      // ajv itself loads only here (about 0.04 s): the built validator needs just its runtime helpers.
      const { Ajv } = createRequire(import.meta.url)("ajv") as { Ajv: typeof AjvClass };
      validator = new Ajv(AJV_OPTIONS).compile(schemaRoot);
    }
  }
  return validator;
}

/**
 * The schema checked with ajv stopping at its first error, for large manifests: collecting every
 * error costs time in the square of their number (ajv joins the error lists of each sub-schema),
 * 34 s for a list of 40000 wrong scenarios. Compiled on first use only.
 */
function validateToFirstError(): ValidateFunction {
  if (firstErrorValidator === undefined) {
    validate();
    const { Ajv } = createRequire(import.meta.url)("ajv") as { Ajv: typeof AjvClass };
    firstErrorValidator = new Ajv({ ...AJV_OPTIONS, allErrors: false }).compile(schemaRoot);
  }
  return firstErrorValidator;
}

/** Manifests with more values than this are checked to their first error only (see above). */
export const ALL_ERRORS_UP_TO = 20_000;

/**
 * Throws the message for the first structural problem; returns the data typed when there is none.
 * The problem shown is the one written earliest in the file; in a manifest of more than
 * `ALL_ERRORS_UP_TO` values, the first one the schema check meets (in a list, the first wrong item).
 */
export function checkSchema(source: ManifestSource): StudySpec {
  const data = source.data;
  if (data === null || data === undefined) throw manifestMessages.manifestEmpty(source.file);
  if (typeof data !== "object" || Array.isArray(data)) {
    throw manifestMessages.notAMapping(source.place([]), describeValue(data));
  }
  const check = source.size > ALL_ERRORS_UP_TO ? validateToFirstError() : validate();
  if (check(data)) return data as StudySpec;
  throw toMessage(firstError(check.errors ?? [], source), source);
}

/** Keyword order for problems found at the same place: the most telling first. */
const RANK: Record<string, number> = { additionalProperties: 0, required: 1, type: 2, enum: 3 };

/**
 * The problem a user should see first: the one written earliest in the file. `if` errors only
 * wrap their branch's errors and are dropped; a missing key is not reported for a mapping that
 * also has an unknown key, since the unknown key is most likely the missing one misspelt.
 */
function firstError(errors: ErrorObject[], source: ManifestSource): ErrorObject {
  const real = withoutAlternatives(errors).filter((e) => e.keyword !== "if");
  const withUnknownKey = new Set(real.filter((e) => e.keyword === "additionalProperties").map((e) => e.instancePath));
  const shown = real.filter((e) => !(e.keyword === "required" && withUnknownKey.has(e.instancePath)));
  const candidates = shown.length > 0 ? shown : errors;
  const scored = candidates.map((error, index) => {
    const place = placeOf(error, source);
    return { error, index, line: place.line ?? 0, column: place.column ?? 0, rank: RANK[error.keyword] ?? 9 };
  });
  scored.sort((a, b) => a.line - b.line || a.column - b.column || a.rank - b.rank || a.index - b.index);
  return scored[0].error;
}

/**
 * The errors with each `anyOf` (a value that may take one of several forms, such as a where's
 * value: a number, a text or a list of them) replaced by the errors of the forms the value's type
 * fits: an empty list is "an empty list", not "expected a text". When the value's type fits no
 * form, one type error naming every type. ajv lists a branch's errors before the `anyOf` error
 * itself, at the `anyOf`'s value or below it.
 */
function withoutAlternatives(errors: ErrorObject[]): ErrorObject[] {
  let out = errors;
  for (const alternatives of errors.filter((e) => e.keyword === "anyOf")) {
    const at = alternatives.instancePath;
    const end = out.indexOf(alternatives);
    const group = out.slice(0, end).filter((e) => e.instancePath === at || e.instancePath.startsWith(`${at}/`));
    const wrongType = group.filter((e) => e.keyword === "type" && e.instancePath === at);
    const rest = group.filter((e) => !wrongType.includes(e));
    const types = [...new Set(wrongType.flatMap((e) => (Array.isArray(e.schema) ? e.schema.map(String) : [String(e.schema)])))];
    const replacement = rest.length > 0 ? rest : [{ ...alternatives, keyword: "type", schema: types, params: { type: types.join(",") } }];
    out = [...out.filter((e) => e !== alternatives && !group.includes(e)), ...replacement];
  }
  return out;
}

function keyPathOf(error: ErrorObject, source: ManifestSource): (string | number)[] {
  return pointerToKeyPath(error.instancePath, source.data);
}

function placeOf(error: ErrorObject, source: ManifestSource) {
  const path = keyPathOf(error, source);
  if (error.keyword === "additionalProperties") {
    return source.place([...path, String(error.params.additionalProperty)], { key: true });
  }
  return source.place(path);
}

function toMessage(error: ErrorObject, source: ManifestSource) {
  const path = keyPathOf(error, source);
  const parent = (error.parentSchema ?? {}) as SchemaNode;
  const description = descriptionOf(parent);
  const where = typeof parent.title === "string" ? parent.title : "this mapping";
  const params = error.params as Record<string, unknown>;
  switch (error.keyword) {
    case "additionalProperties": {
      const key = String(params.additionalProperty);
      const place = placeOf(error, source);
      const allowed = Object.keys(parent.properties ?? {});
      if (parent.title === "a measure override" && (key === "label" || key === "unit")) {
        return manifestMessages.shownTheSameEverywhere(place, key);
      }
      if (parent.title === "a measure override" && key !== "__proto__" && MEASURE_KEYS.has(key)) {
        return manifestMessages.notOverridable(place, key, OVERRIDABLE_KEYS);
      }
      return manifestMessages.unknownKey(place, key, where, allowed, closest(key, allowed));
    }
    case "required": {
      const key = String(params.missingProperty);
      const keyDescription = descriptionOf(parent.properties?.[key]);
      return manifestMessages.missingKey({ ...source.place(path), path: formatKeyPath([...path, key]) }, key, where, keyDescription);
    }
    case "type": {
      const expected = typeWords(error.schema);
      const quoteHint = includesType(error.schema, "string") && typeof error.data === "number" && source.isPlainScalar(path);
      const found = typeof error.data === "number" && !Number.isFinite(error.data) ? `${error.data}, which is not a finite number` : describeValue(error.data);
      return manifestMessages.wrongType(source.place(path), expected, found, description, quoteHint);
    }
    case "enum": {
      const allowed = (params.allowedValues ?? []) as unknown[];
      const texts = allowed.filter((v): v is string => typeof v === "string");
      const suggestion = typeof error.data === "string" ? closest(error.data, texts) : null;
      return manifestMessages.notAllowedValue(source.place(path), error.data, allowed, suggestion);
    }
    case "minimum":
    case "exclusiveMinimum":
    case "maximum":
    case "exclusiveMaximum": {
      const words = { minimum: "at least", exclusiveMinimum: "greater than", maximum: "at most", exclusiveMaximum: "less than" }[error.keyword];
      return manifestMessages.numberOutOfRange(source.place(path), error.data as number, `${words} ${String(params.limit)}`, description);
    }
    case "minItems":
    case "maxItems": {
      const count = Array.isArray(error.data) ? error.data.length : 0;
      const min = parent.minItems;
      const max = parent.maxItems;
      const condition =
        min !== undefined && min === max ? `exactly ${min}` : error.keyword === "minItems" ? `at least ${min}` : `at most ${max}`;
      return manifestMessages.wrongItemCount(source.place(path), count, condition + (condition.endsWith(" 1") ? " item" : " items"), description);
    }
    case "minLength":
      return manifestMessages.emptyText(source.place(path));
    case "maxLength":
      return manifestMessages.textTooLong(source.place(path), [...String(error.data)].length, Number(params.limit));
    case "minProperties":
    case "maxProperties": {
      const count = error.data !== null && typeof error.data === "object" ? Object.keys(error.data).length : 0;
      if (parent.title === "the factors") return manifestMessages.factorCount(source.place(path), count, Number(params.limit));
      if (parent.title === "a where") return manifestMessages.whereColumnCount(source.place(path), count, Number(params.limit));
      if (parent.title === "a target") return manifestMessages.targetNeedsOneKey(source.place(path), count);
      return manifestMessages.schemaProblem(source.place(path), error.message ?? "does not have the number of keys it needs");
    }
    default:
      return manifestMessages.schemaProblem(source.place(path), error.message ?? "does not match the manifest format");
  }
}

/** The keys a measure definition may have, to tell "not overridable" from "unknown". */
const MEASURE_KEYS = new Set(["name", "kind", "series", "from", "scenarios", "label", "unit"]);

interface SchemaNode {
  title?: string;
  description?: string;
  $ref?: string;
  definitions?: Record<string, SchemaNode>;
  properties?: Record<string, SchemaNode | boolean>;
  minItems?: number;
  maxItems?: number;
}

/** A key's description, following a `#/definitions/...` reference when the key has none of its own. */
function descriptionOf(node: SchemaNode | boolean | undefined): string | null {
  if (typeof node !== "object") return null;
  if (typeof node.description === "string") return node.description;
  const ref = node.$ref?.match(/^#\/definitions\/(.+)$/)?.[1];
  return ref === undefined ? null : descriptionOf(schemaRoot.definitions?.[ref]);
}

function includesType(schema: unknown, type: string): boolean {
  return Array.isArray(schema) ? schema.includes(type) : schema === type;
}

const TYPE_WORDS: Record<string, string> = {
  number: "a number",
  integer: "a whole number",
  string: "a text",
  object: "a mapping (key: value pairs)",
  array: "a list",
  boolean: "true or false",
  null: "nothing",
};

function typeWords(schema: unknown): string {
  const types = Array.isArray(schema) ? schema.map(String) : [String(schema)];
  const words = types.map((t) => TYPE_WORDS[t] ?? t);
  return words.length === 1 ? words[0] : `${words.slice(0, -1).join(", ")} or ${words[words.length - 1]}`;
}

/** A value in words: "a text ("abc")", "a number (5)", "a list", "nothing". */
export function describeValue(value: unknown): string {
  if (value === null || value === undefined) return "nothing";
  if (Array.isArray(value)) return "a list";
  switch (typeof value) {
    case "string":
      return `a text (${JSON.stringify(value)})`;
    case "number":
      return Number.isInteger(value) ? `a whole number (${value})` : `a number (${value})`;
    case "boolean":
      return `true or false (${String(value)})`;
    case "object":
      return "a mapping";
    default:
      return typeof value;
  }
}
