import type { Measure } from "../manifest/types.js";
import type { MeasureAccumulator } from "./accumulator.js";
import { Count } from "./count.js";
import { EntityLevel, SeriesLevel } from "./level.js";
import { EntityObservation, SeriesObservation } from "./observation.js";
import type { MeasureSetup } from "./setup.js";
import { Utilization } from "./utilization.js";

/** The accumulator for one measure and one run. */
export function createAccumulator(measure: Measure, setup: MeasureSetup): MeasureAccumulator {
  switch (measure.kind) {
    case "level":
      return measure.source.type === "series"
        ? new SeriesLevel(measure as LevelOf<"series">, setup)
        : new EntityLevel(measure as LevelOf<"entities">, setup);
    case "utilization":
      return new Utilization(measure, setup);
    case "observation":
      return measure.source.type === "series"
        ? new SeriesObservation(measure as ObservationOf<"series">, setup)
        : new EntityObservation(measure as ObservationOf<"entities">, setup);
    case "count":
      return new Count(measure, setup);
  }
}

type LevelOf<T extends string> = Extract<Measure, { kind: "level" }> & { source: { type: T } };
type ObservationOf<T extends string> = Extract<Measure, { kind: "observation" }> & { source: { type: T } };
