/**
 * The one home of the study's figure types: results.json (`results.ts`, with a run's measure
 * figures in `runFigures.ts`) and the rest of a study's outcome (`studyOutcome.ts`). Closed types:
 * no index signatures. `measures/`, `study/`, `report/` and `record/` import them from here; this
 * folder imports nothing from those (eslint.config.js holds the directions).
 */
export type * from "./results.js";
export type * from "./runFigures.js";
export type * from "./studyOutcome.js";
export type * from "./trace.js";
