/**
 * The matching rule of a measure's `where` (contract section 9, docs/manifest.md "where"):
 *
 * - a number in the manifest (`server: 0`) matches a cell that reads as the same number: the CSV
 *   cells `0`, `0.0`, `00` and `0e0`, the JSON number 0 and the JSON string "0";
 * - a text in the manifest (`class: gold`, `server: "07"`) matches a cell with exactly that text,
 *   case counted, surrounding spaces ignored; a JSON number or boolean cell is compared by the
 *   text JSON writes for it (7 is "7", true is "true");
 * - an empty or absent cell matches nothing.
 *
 * @example cellMatches("0.0", 0) // true
 * @example cellMatches("07", "7") // false: a quoted value compares as text
 */
import { parseDecimalText } from "./decimal.js";
import type { Cell } from "./records.js";

export function cellMatches(cell: Cell, value: number | string): boolean {
  if (cell === null) return false;
  if (typeof value === "number") {
    if (typeof cell === "number") return cell === value;
    if (typeof cell === "string") return parseDecimalText(cell) === value;
    return false;
  }
  return (typeof cell === "string" ? cell.trim() : String(cell)) === value.trim();
}

/** Whether the cell matches any of `values`. */
export function cellMatchesAny(cell: Cell, values: readonly (number | string)[]): boolean {
  for (const v of values) if (cellMatches(cell, v)) return true;
  return false;
}
