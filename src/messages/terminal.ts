/**
 * Text on its way to a terminal. Names come from files and manifests (scenario, run, series and
 * file names), and a name may hold control characters: an escape sequence could recolour the
 * terminal, clear it, move the cursor or set its title, a carriage return could overwrite what
 * is shown, a bidirectional override could show text in another order than it has. Every such
 * character is written as `\uXXXX`, the form JSON uses, so `--json` output stays valid JSON with
 * the same values.
 *
 * Escaped: C0 controls (U+0000–U+001F, the line feed too unless kept), DEL and the C1 controls
 * (U+007F–U+009F), the line and paragraph separators U+2028 and U+2029, and the bidirectional
 * marks, embeddings, overrides and isolates (U+061C, U+200E, U+200F, U+202A–U+202E,
 * U+2066–U+2069).
 *
 * Example: `terminalText("a\u001b[2Jb")` is `a\u001b[2Jb` written with a backslash, 11 characters.
 */

/** Whether the UTF-16 code unit `c` is one of the characters escaped (the line feed aside). */
function isControl(c: number): boolean {
  return (
    (c <= 0x1f && c !== 0x0a) ||
    (c >= 0x7f && c <= 0x9f) ||
    c === 0x061c ||
    c === 0x200e ||
    c === 0x200f ||
    (c >= 0x2028 && c <= 0x202e) ||
    (c >= 0x2066 && c <= 0x2069)
  );
}

/** `text` with every control character escaped; line feeds too unless `keepNewlines`. */
export function terminalText(text: string, options: { keepNewlines?: boolean } = {}): string {
  const keepNewlines = options.keepNewlines === true;
  let out = "";
  let from = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (isControl(c) || (c === 0x0a && !keepNewlines)) {
      out += text.slice(from, i) + `\\u${c.toString(16).padStart(4, "0")}`;
      from = i + 1;
    }
  }
  return from === 0 ? text : out + text.slice(from);
}

/**
 * A catalogue message (`what\n  What to do: todo`) for a terminal: every control character
 * escaped, line feeds too, but the one before "What to do", so that a name with a line feed in it
 * cannot make a message look like two, or like something else.
 */
export function terminalMessage(message: string): string {
  const at = message.indexOf(WHAT_TO_DO);
  if (at < 0) return terminalText(message);
  return terminalText(message.slice(0, at)) + WHAT_TO_DO + terminalText(message.slice(at + WHAT_TO_DO.length));
}

const WHAT_TO_DO = "\n  What to do: ";

/**
 * `value` as JSON for a terminal: JSON.stringify escapes U+0000–U+001F inside strings but writes
 * DEL, C1 and the bidirectional characters as they are; these occur only inside strings, where
 * `\uXXXX` stands for the same character.
 */
export function terminalJson(value: unknown, indent?: number): string {
  return terminalText(JSON.stringify(value, null, indent), { keepNewlines: true });
}
