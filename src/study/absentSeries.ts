/**
 * A measure's series that never appears in any run of a scenario is an input error (usually a
 * misspelt name, which would otherwise give a confident 0 ± 0), unless the measure says
 * `may_be_absent: true`; then it is a warning. A series missing from only some runs is a warning
 * on each of those runs (analyzeRun.ts).
 */
import { closest } from "../manifest/didYouMean.js";
import type { Measure, Scenario, Study } from "../manifest/types.js";
import * as studyMessages from "../messages/study.js";
import type { InputRecord, Warning } from "../outcome/index.js";

/** The series a measure reads, in the order its definition names them. */
export function seriesOf(m: Measure): string[] {
  switch (m.kind) {
    case "level":
      return m.source.type === "series" ? [m.source.series] : [m.source.enter, m.source.leave];
    case "observation":
      return m.source.type === "series" ? [m.source.series] : [m.source.start, m.source.end];
    case "utilization": {
      const busy = m.source.type === "series" ? [m.source.series] : [m.source.enter, m.source.leave];
      return m.capacity.type === "series" ? [...busy, m.capacity.series] : busy;
    }
    case "count":
      return [m.series];
  }
}

/**
 * Checks that every series each measure reads appears in at least one of the scenario's runs
 * (`inputs`: their input records). Throws the first absent series, in measure order; returns the
 * warnings for absent series of measures that allow it.
 */
export function checkSeriesPresent(study: Study, scenario: Scenario, inputs: readonly InputRecord[]): Warning[] {
  const seen = (series: string) => inputs.some((r) => Object.hasOwn(r.series_rows, series));
  const warnings: Warning[] = [];
  for (const m of scenario.measures) {
    for (const series of new Set(seriesOf(m))) {
      if (seen(series)) continue;
      const source = study.measureSources.get(m.name)!;
      if (source.mayBeAbsent) {
        warnings.push({
          scenario: scenario.name,
          run: null,
          measure: m.name,
          message: `series "${series}" appears in none of the ${inputs.length} runs; the measure allows it (may_be_absent), so its figures describe a series with no rows`,
        });
        continue;
      }
      const names = [...new Set(inputs.flatMap((r) => Object.keys(r.series_rows)))].sort();
      throw studyMessages.seriesInNoRun(source.place, m.name, series, scenario.name, inputs.length, closest(series, names), names);
    }
  }
  return warnings;
}
