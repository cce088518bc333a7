/**
 * What the user wrote, once the JSON Schema (`docs/manifest.schema.json`) has accepted it.
 *
 * These types mirror the schema key for key; they are only trusted after `checkSchema` passed.
 * `buildStudy` turns them into the normalized `Study` (`types.ts`).
 */
import type { MeasureKind } from "./types.js";

export interface StudySpec {
  version?: 1;
  title?: string;
  time_unit?: string;
  confidence?: number;
  warmup?: WarmupSpec;
  columns?: ColumnsSpec;
  layout?: "events" | "entities" | "levels";
  analysis?: AnalysisSpec;
  tables?: { max_rows?: number; edge_rows?: number };
  max_row_bytes?: number;
  scenarios: ScenarioSpec[];
  measures: MeasureSpec[];
  compare?: ComparisonSpec[];
  select?: SelectionSpec[];
}

export type WarmupSpec = number | { method: "mser-5"; measure: string; slice: number };

export interface ColumnsSpec {
  time?: string;
  series?: string;
  value?: string;
  entity?: string;
}

export type AnalysisSpec = { method: "replications" } | { method: "batch-means"; batches: number };

export interface RunSpec {
  path: string;
  start?: number;
  end?: number;
}

export interface ScenarioSpec {
  name: string;
  start?: number;
  end?: number;
  warmup?: WarmupSpec;
  columns?: ColumnsSpec;
  layout?: "events" | "entities" | "levels";
  analysis?: AnalysisSpec;
  max_row_bytes?: number;
  runs: string | (string | RunSpec)[];
  /** The scenario's value of each factor of the study (response curves, docs/manifest.md). */
  factors?: Record<string, number>;
  /** Overrides of measure options, by measure name. */
  measures?: Record<string, OverrideSpec>;
}

export type TargetSpec = { half_width: number } | { relative: number };

/** The measure options a scenario may override. */
export interface OverrideSpec {
  capacity?: number | string;
  capacity_initial?: number;
  initial?: number;
  quantiles?: number[];
  within?: number[];
  at_least?: number[];
  target?: TargetSpec;
}

export const OVERRIDABLE_KEYS = [
  "capacity",
  "capacity_initial",
  "initial",
  "quantiles",
  "within",
  "at_least",
  "target",
] as const satisfies readonly (keyof OverrideSpec)[];

/** The overridable keys each measure kind accepts. */
export const KEYS_FOR_KIND: Record<MeasureKind, readonly (keyof OverrideSpec)[]> = {
  level: ["initial", "at_least", "target"],
  utilization: ["capacity", "capacity_initial", "initial", "at_least", "target"],
  observation: ["quantiles", "within", "target"],
  count: ["target"],
};

export interface MeasureSpec extends OverrideSpec {
  name: string;
  kind: MeasureKind;
  series?: string;
  from?: { enter?: string; leave?: string; start?: string; end?: string };
  /** Overrides of this measure's options, by scenario name. */
  scenarios?: Record<string, OverrideSpec>;
  /** The measure's series may appear in none of a scenario's runs (a rare event). */
  may_be_absent?: boolean;
  /** The name the report shows (free text); the same in every scenario. */
  label?: string;
  /** The unit of the measure's values (free text); the same in every scenario. */
  unit?: string;
  /** Only rows whose attribute column holds one of these values count. */
  where?: Record<string, number | string | (number | string)[]>;
}

export interface ComparisonSpec {
  measure: string;
  scenarios: [string, string];
  method?: "paired" | "welch";
}

/** A selection of the best scenario (docs/manifest.md, "Selecting the best"). */
export interface SelectionSpec {
  measure: string;
  better: "larger" | "smaller";
  indifference: number;
  probability?: number;
  method?: "independent" | "paired";
  first_stage?: number;
  scenarios?: string[];
}
