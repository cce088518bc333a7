/**
 * The one error type that reaches the user as a message instead of a stack trace.
 *
 * Every module throws `UserError` built by a function of the message catalogue
 * (`src/messages/*.ts`); the command line's top-level handler prints `message` and exits with
 * `exitCode`. Anything else that escapes is a bug and is shown as one.
 */
import { terminalText } from "./terminal.js";

export class UserError extends Error {
  override readonly name = "UserError";
  constructor(
    message: string,
    readonly exitCode: 1 | 2 = 1,
  ) {
    super(message);
  }
}

/** Where a problem is: a file, and when known a line (1-based) and a column (1-based). */
export interface Place {
  file: string;
  line?: number;
  column?: number;
  /** A key path inside a manifest, such as `scenarios[1].runs`. */
  path?: string;
}

/**
 * `file:line:column (at key.path)`: the prefix of every located message. A line feed or other
 * control character in the file name is written `\uXXXX`, so the place stays on its line.
 */
export function formatPlace(place: Place): string {
  let s = terminalText(place.file);
  if (place.line !== undefined) {
    s += `:${place.line}`;
    if (place.column !== undefined) s += `:${place.column}`;
  }
  if (place.path !== undefined && place.path !== "") s += ` (at ${terminalText(place.path)})`;
  return s;
}

/** A located message: where, what is wrong, what to do. */
export function located(place: Place, what: string, todo: string): UserError {
  return new UserError(`${formatPlace(place)}: ${what}\n  What to do: ${todo}`);
}
