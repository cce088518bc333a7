/**
 * Runs the commands of a documentation page and checks what it quotes against what they print
 * and write. The page marks its fenced blocks by their info string:
 *
 * - ```sh: commands, one a line, run in order with bash from the current folder; `sojourn` is
 *   the built command line. A line `cd DIR` changes the folder for the commands after it. Every
 *   command must exit with status 0. Lines starting with `#` are comments.
 * - ```sh not-run: commands shown but not run (the page says why).
 * - ```output: what the last command printed on standard output, as an excerpt (see below).
 * - ```LANG file=PATH: an excerpt of the file PATH (relative to the current folder) as the
 *   commands left it.
 * - ```text page=PATH: an excerpt of the visible text of the HTML page PATH (tags removed,
 *   entities decoded, every run of white space one space).
 * - any other block is an illustration: it is not checked, so it may hold no digit (no figure
 *   can go stale unseen).
 *
 * An excerpt may start and end anywhere, but its lines follow each other as they are quoted: a
 * line holding only `…` stands for any number of lines left out, and `…` inside a line for any
 * text (a path, a time in seconds). Blank lines and trailing spaces are not compared. Numbers
 * must match exactly as printed.
 */
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";

export type Block =
  | { kind: "run"; line: number; commands: { text: string; line: number }[] }
  | { kind: "illustration"; line: number; text: string }
  | { kind: "output"; line: number; lines: string[] }
  | { kind: "file" | "page"; line: number; path: string; lines: string[] };

const GAP = "…";

/** The fenced blocks of a Markdown text, with the line (1-based) of each opening fence. */
export function parseDoc(text: string): Block[] {
  const lines = text.split("\n");
  const blocks: Block[] = [];
  for (let i = 0; i < lines.length; i++) {
    // A fence may be indented (a block inside a list item); its indentation is taken off the body.
    const open = /^( *)```(.*)$/.exec(lines[i]);
    if (open === null) continue;
    const margin = open[1].length;
    const info = open[2].trim();
    const start = i + 1;
    const body: string[] = [];
    for (i++; i < lines.length && !/^ *```\s*$/.test(lines[i]); i++) body.push(lines[i].slice(Math.min(margin, lines[i].length - lines[i].trimStart().length)));
    if (i >= lines.length) throw new Error(`line ${start}: a fenced block is not closed`);
    const words = info.split(/\s+/);
    const path = (key: string) => words.find((w) => w.startsWith(key + "="))?.slice(key.length + 1);
    if (info === "sh") {
      const commands = body
        .map((t, k) => ({ text: t.trim(), line: start + 1 + k }))
        .filter((c) => c.text !== "" && !c.text.startsWith("#"));
      blocks.push({ kind: "run", line: start, commands });
    } else if (info === "output") blocks.push({ kind: "output", line: start, lines: body });
    else if (path("file") !== undefined) blocks.push({ kind: "file", line: start, path: path("file")!, lines: body });
    else if (path("page") !== undefined) blocks.push({ kind: "page", line: start, path: path("page")!, lines: body });
    else blocks.push({ kind: "illustration", line: start, text: body.join("\n") });
  }
  return blocks;
}

function lineMatches(quoted: string, actual: string): boolean {
  if (!quoted.includes(GAP)) return quoted === actual;
  return new RegExp("^" + quoted.split(GAP).map(escapeRegExp).join(".*") + "$").test(actual);
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}

/** Quoted lines cut at the `…` lines, blank lines and trailing spaces dropped. */
function segments(quoted: string[]): string[][] {
  const out: string[][] = [[]];
  for (const raw of quoted) {
    const line = raw.trimEnd();
    if (line === "") continue;
    if (line.trim() === GAP) out.push([]);
    else out[out.length - 1].push(line);
  }
  return out.filter((s) => s.length > 0);
}

/** Why `quoted` is not an excerpt of `actual` (lines), or null when it is. */
export function excerptProblem(quoted: string[], actual: string[]): string | null {
  const lines = actual.map((l) => l.trimEnd()).filter((l) => l !== "");
  let pos = 0;
  for (const seg of segments(quoted)) {
    let found = -1;
    for (let start = pos; start + seg.length <= lines.length && found < 0; start++) {
      if (seg.every((q, k) => lineMatches(q, lines[start + k]))) found = start;
    }
    if (found < 0) {
      const missing = seg.filter((q) => !lines.slice(pos).some((a) => lineMatches(q, a)));
      const what = missing.length > 0 ? `not found: ${missing.map((m) => JSON.stringify(m)).join(", ")}` : "every line is there, but not one after the other as quoted";
      const rest = lines.slice(pos);
      const shown = rest.length <= 40 ? rest : [...rest.slice(0, 20), "(…)", ...rest.slice(-20)];
      return `${what}\n  quoted:\n${indent(seg)}\n  actual, from where the search started:\n${indent(shown)}`;
    }
    pos = found + seg.length;
  }
  return null;
}

/** Why `quoted` is not an excerpt of a page's visible text, or null when it is. */
export function pageProblem(quoted: string[], text: string): string | null {
  let pos = 0;
  for (const seg of segments(quoted)) {
    const joined = seg.map((l) => l.trim().replace(/\s+/g, " ")).join(" ");
    const re = new RegExp(joined.split(GAP).map(escapeRegExp).join(".*?"), "g");
    re.lastIndex = pos;
    const m = re.exec(text);
    if (m === null) {
      const missing = seg.filter((q) => !new RegExp(q.trim().replace(/\s+/g, " ").split(GAP).map(escapeRegExp).join(".*?")).test(text.slice(pos)));
      return `${missing.length > 0 ? `not on the page: ${missing.map((q) => JSON.stringify(q)).join(", ")}` : "every line is on the page, but not one after the other as quoted"}\n  quoted:\n${indent(seg)}`;
    }
    pos = m.index + m[0].length;
  }
  return null;
}

/** The visible text of an HTML page: scripts and styles dropped, tags as spaces, entities decoded, white space collapsed. */
export function pageText(html: string): string {
  const named: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'", nbsp: " " };
  return html
    .replace(/<script\b[\s\S]*?<\/script>/gi, " ")
    .replace(/<style\b[\s\S]*?<\/style>/gi, " ")
    .replace(/<[^>]*>/g, " ")
    .replace(/&(#x[0-9a-f]+|#[0-9]+|[a-z]+);/gi, (all, e: string) => {
      if (e[0] === "#") return String.fromCodePoint(e[1] === "x" || e[1] === "X" ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10));
      return named[e.toLowerCase()] ?? all;
    })
    .replace(/\s+/g, " ");
}

function indent(lines: string[]): string {
  return lines.map((l) => "    " + l).join("\n");
}

export interface DocRun {
  problems: string[];
  /** Commands run and quotes checked, so that a page with nothing to check is seen. */
  commands: number;
  quotes: number;
}

/**
 * Runs the page's blocks in order from `cwd`, with `env` (its PATH must lead `sojourn` to the
 * built command line). Returns every problem, each named by the page's line.
 */
export function runDoc(name: string, markdown: string, cwd: string, env: NodeJS.ProcessEnv): DocRun {
  const out: DocRun = { problems: [], commands: 0, quotes: 0 };
  const problem = (line: number, text: string) => out.problems.push(`${name}:${line}: ${text}`);
  let last: { command: string; stdout: string } | null = null;
  let dir = cwd;
  for (const block of parseDoc(markdown)) {
    switch (block.kind) {
      case "illustration":
        if (/[0-9]/.test(block.text)) problem(block.line, "an unchecked block holds a figure: quote it as output, file= or page=, or leave the digits out");
        break;
      case "run":
        for (const c of block.commands) {
          const cd = /^cd\s+(\S+)$/.exec(c.text);
          if (cd !== null) {
            dir = resolve(dir, cd[1]);
            if (!existsSync(dir)) problem(c.line, `cd: no folder ${cd[1]}`);
            continue;
          }
          const r = spawnSync("bash", ["-c", c.text], { cwd: dir, env, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
          out.commands++;
          last = { command: c.text, stdout: r.stdout ?? "" };
          if (r.status !== 0) problem(c.line, `"${c.text}" exited with status ${r.status}\n${indent((r.stderr ?? "").split("\n").slice(0, 20))}`);
        }
        break;
      case "output": {
        out.quotes++;
        if (last === null) {
          problem(block.line, "output quoted before any command");
          break;
        }
        const p = excerptProblem(block.lines, last.stdout.split("\n"));
        if (p !== null) problem(block.line, `the output of "${last.command}": ${p}`);
        break;
      }
      case "file":
      case "page": {
        out.quotes++;
        const path = resolve(dir, block.path);
        if (!existsSync(path)) {
          problem(block.line, `no file ${block.path}`);
          break;
        }
        const text = readFileSync(path, "utf8");
        const p = block.kind === "file" ? excerptProblem(block.lines, text.split("\n")) : pageProblem(block.lines, pageText(text));
        if (p !== null) problem(block.line, `${block.path}: ${p}`);
        break;
      }
    }
  }
  return out;
}
