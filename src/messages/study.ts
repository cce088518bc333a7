/** Messages of the measures and the study runner (rows that break a measure's rules). */
import { located, type Place, UserError } from "./error.js";

export const levelRowWithoutValue = (file: string, line: number, series: string, measure: string) =>
  located(
    { file, line },
    `the row of series "${series}" has no value, but measure "${measure}" reads it as a level (each row gives the new level)`,
    "give every row of this series a number in the value column, or read the series with a count measure instead.",
  );

export const observationRowWithoutValue = (file: string, line: number, series: string, measure: string) =>
  located(
    { file, line },
    `the row of series "${series}" has no value, but measure "${measure}" reads each row as one observation`,
    "give every row of this series a number in the value column, or read it with a count measure instead.",
  );

export const rowWithoutEntity = (file: string, line: number, series: string, measure: string) =>
  located(
    { file, line },
    `the row of series "${series}" has no entity id, but measure "${measure}" follows entities through this series`,
    "fill the entity column on every row of this series (or map the right column with `columns: {entity: ...}`).",
  );

export const leaveWithoutEnter = (file: string, line: number, entity: string, series: string, measure: string, enter: string) =>
  located(
    { file, line },
    `entity "${entity}" has event "${series}" but no earlier "${enter}" event that is still open, so measure "${measure}" cannot pair it`,
    `check that every "${series}" row follows a "${enter}" row of the same entity; an entity may enter again only after it left.`,
  );

export const duplicateEnter = (file: string, line: number, entity: string, series: string, measure: string, previousLine: number) =>
  located(
    { file, line },
    `entity "${entity}" has event "${series}" again (first at line ${previousLine}) before it ended, so measure "${measure}" cannot tell which one counts`,
    "give each visit of an entity its own id, or make sure it ends before it starts again.",
  );

export const capacityNotPositive = (file: string, measure: string) =>
  located(
    { file },
    `measure "${measure}": the capacity has zero area over the window, so utilization (busy area / capacity area) is undefined`,
    "check the capacity series of this run (it must be positive for some time inside the window) or its capacity_initial.",
  );

export const capacitySeriesAbsent = (file: string, measure: string, series: string, suggestion: string | null) =>
  located(
    { file },
    `measure "${measure}": its capacity series "${series}" has no row in this run and capacity_initial is 0, so the capacity is 0 throughout and utilization is undefined`,
    `${suggestion !== null ? `did you mean "${suggestion}"? ` : ""}check the capacity series name in the manifest, or give \`capacity_initial\` for a capacity that never changes in this run.`,
  );

export const atWrongKind = (measure: string, kind: string) =>
  new UserError(
    `Measure "${measure}" is a ${kind} measure; \`at\` computes the time average of a level or utilization measure up to a time.\n  What to do: pick a level or utilization measure (see \`sojourn check MANIFEST\` for the list).`,
  );

export const atTimeOutside = (time: number, from: number, end: number | null) =>
  new UserError(
    `The time ${time} is outside the run's collection window (${from}, ${end ?? "no end"}].\n  What to do: give a time after the window start (after the warm-up) and no later than the end.`,
  );

export const unknownName = (what: string, name: string, known: string[]) =>
  new UserError(
    `There is no ${what} named "${name}".\n  What to do: use one of: ${known.map((k) => `"${k}"`).join(", ")}.`,
  );

/** A run figure came out beyond the range of double numbers (about ±1.8e308). */
export const runFigureOverflow = (file: string, measure: string, figure: string) =>
  located(
    { file },
    `measure "${measure}": its ${figure} is too large to compute (beyond about 1.8e308): the values or times of this run, or the window, are too large`,
    "write the values or the times in a larger unit (thousands instead of units, hours instead of seconds), or check the file and the window end for a misplaced exponent.",
  );

/** An across-run figure came out beyond the range of double numbers. */
export const summaryFigureOverflow = (scenario: string, measure: string, figure: string) =>
  new UserError(
    `Scenario "${scenario}", measure "${measure}": the across-run ${figure} is too large to compute (beyond about 1.8e308), because the runs' values differ by too much.\n  What to do: write the values in a larger unit, or check the runs for a misplaced exponent.`,
  );

/**
 * A measure's series appears in no run of a scenario: usually a misspelt series name, which
 * would otherwise give a confident zero.
 */
export const seriesInNoRun = (
  place: Place,
  measure: string,
  series: string,
  scenario: string,
  runs: number,
  suggestion: string | null,
  seen: readonly string[],
) => {
  const names = seen.length === 0 ? "the runs hold no rows at all" : `the series that do appear: ${seen.slice(0, 8).map((s) => `"${s}"`).join(", ")}${seen.length > 8 ? `, and ${seen.length - 8} more` : ""}`;
  return located(
    place,
    `measure "${measure}" reads series "${series}", which appears in none of the ${runs} run${runs === 1 ? "" : "s"} of scenario "${scenario}" (${names})`,
    `${suggestion !== null ? `did you mean "${suggestion}"? ` : ""}correct the series name in the manifest (or map the right column with \`columns:\`); if the series is a rare event that may truly never happen, add \`may_be_absent: true\` to the measure.`,
  );
};
