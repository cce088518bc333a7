/**
 * What one run gives an MSER-5 warm-up estimate (`WarmupPart`, src/study/warmup.ts) as a small
 * file, so that the first pass over a scenario's runs can be shared among cluster tasks and the
 * estimate made from the files (`estimateWarmup`) is the one a local report makes:
 *
 *   run file ──first-pass plan──▶ WarmupPart ──encodeWarmupPart──▶ <scenario>/<run>.json
 *   every <scenario>/<run>.json ──decodeWarmupPart (digest, plan checked)──▶ estimateWarmup
 *
 * Slice averages are kept as base64 of doubles (every bit, a negative zero too), like the
 * observation values of a run summary.
 */
import { sha256 } from "../digest.js";
import type { Scenario } from "../manifest/types.js";
import { UserError } from "../messages/index.js";
import { warmupPartUnusable } from "../messages/cluster.js";
import { analyzeRun, type RunPlan } from "./analyzeRun.js";
import { NotASummary, planDigest, replacer, reviver } from "./runSummary.js";
import { type WarmupPart, warmupPart, warmupPlans } from "./warmup.js";

export const WARMUP_PART_FORMAT = "sojourn-warmup-part/1";

interface PartFile {
  format: string;
  scenario: string;
  run: string;
  file: string;
  input_sha256: string;
  plan_sha256: string;
  part: { slices: Float64Array } | { choice: { d: number; batches: number; first: number | null; atLimit: boolean } };
  digest?: string;
}

/** The first-pass plan of one run of a scenario whose warm-up is estimated by MSER-5. */
export function warmupPlan(scenario: Scenario, runId: string): RunPlan {
  const plan = warmupPlans(scenario).find((p) => p.run.id === runId);
  if (plan === undefined) throw new Error(`warmupPlan: no run "${runId}" in scenario "${scenario.name}"`);
  return plan;
}

/** Reads one run with its first-pass plan: the part's file text and the run file's SHA-256. */
export async function makeWarmupPart(scenario: Scenario, runId: string): Promise<{ text: string; sha256: string }> {
  const plan = warmupPlan(scenario, runId);
  const a = await analyzeRun(plan);
  return { text: encodeWarmupPart(plan, a.input.sha256, warmupPart(plan, a)), sha256: a.input.sha256 };
}

export function encodeWarmupPart(plan: RunPlan, inputSha256: string, part: WarmupPart): string {
  const body: PartFile = {
    format: WARMUP_PART_FORMAT,
    scenario: plan.scenario.name,
    run: plan.run.id,
    file: plan.run.file,
    input_sha256: inputSha256,
    plan_sha256: planDigest(plan),
    part: "slices" in part ? { slices: Float64Array.from(part.slices) } : { choice: part.choice },
  };
  body.digest = sha256(JSON.stringify(body, replacer));
  return JSON.stringify(body, replacer) + "\n";
}

/**
 * A part file's contents after checking its own digest, that it is of the run the plan names
 * and that it was made with the same plan; `display` names the file in messages.
 */
export function decodeWarmupPart(text: string, plan: RunPlan, display: string): { part: WarmupPart; inputSha256: string } {
  let parsed: PartFile;
  try {
    parsed = JSON.parse(text, reviver) as PartFile;
  } catch (e) {
    if (e instanceof NotASummary) throw warmupPartUnusable(display, e.message);
    throw warmupPartUnusable(display, `not JSON: ${(e as Error).message}`);
  }
  if (parsed === null || typeof parsed !== "object" || parsed.format !== WARMUP_PART_FORMAT) throw warmupPartUnusable(display, `"format" is not "${WARMUP_PART_FORMAT}"`);
  const { digest, ...rest } = parsed;
  if (typeof digest !== "string" || sha256(JSON.stringify(rest, replacer)) !== digest) throw warmupPartUnusable(display, "its contents do not match the digest written inside it");
  const expect: [string, string, string][] = [
    ["scenario", parsed.scenario, plan.scenario.name],
    ["run id", parsed.run, plan.run.id],
    ["run file", parsed.file, plan.run.file],
  ];
  for (const [what, found, expected] of expect) if (found !== expected) throw warmupPartUnusable(display, `its ${what} is ${JSON.stringify(found)}, the manifest's is ${JSON.stringify(expected)}`);
  if (parsed.plan_sha256 !== planDigest(plan)) throw warmupPartUnusable(display, "it was made with other settings (measure, slice width, window or columns differ from the manifest's)");
  const p = parsed.part as Record<string, unknown> | null;
  if (p !== null && typeof p === "object" && p.slices instanceof Float64Array && plan.slice !== null) return { part: { slices: Array.from(p.slices) }, inputSha256: parsed.input_sha256 };
  const c = p?.choice as Record<string, unknown> | undefined;
  if (plan.slice === null && c !== undefined && typeof c.d === "number" && typeof c.batches === "number" && (c.first === null || typeof c.first === "number") && typeof c.atLimit === "boolean") {
    return { part: { choice: { d: c.d, batches: c.batches, first: c.first, atLimit: c.atLimit } }, inputSha256: parsed.input_sha256 };
  }
  throw warmupPartUnusable(display, "its part is neither the slice averages of a level measure nor MSER-5's choice on observations");
}

/** Whether `e` is a user error or a file system error (a part that cannot be used as it is). */
export function unusable(e: unknown): boolean {
  return e instanceof UserError || (e as NodeJS.ErrnoException).code !== undefined;
}
