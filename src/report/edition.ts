/**
 * The two editions of the report (report.html and report.pdf alike):
 *
 * - `audit` (the default): every section and the audit appendix, from each summary number down
 *   to its calculation tables, the input digests and the manifest as used;
 * - `client`: the cover, the summary, the warm-up, the measures, the comparisons, the method
 *   notes and the cautions, and instead of the appendix a one-page guide to the audit files that
 *   sit beside the report (tables/, charts/, results.json, record.json) and to `sojourn verify`.
 *
 * The audit edition is the default because the report's promise is that every number can be
 * followed to its rows in the page itself; the client edition is asked for by name when the page
 * goes to a reader who will not audit it. Both are recorded in record.json and made again byte for
 * byte by `verify`.
 *
 * The edition is a view of the same report model: `editionView` drops the appendix and every link
 * that pointed into it (a number then shows as plain text), so no link of the client edition leads
 * nowhere.
 */
import type { ReportModel } from "./model/index.js";

export const EDITIONS = ["audit", "client"] as const;
export type Edition = (typeof EDITIONS)[number];
export const DEFAULT_EDITION: Edition = "audit";

export function isEdition(v: unknown): v is Edition {
  return typeof v === "string" && (EDITIONS as readonly string[]).includes(v);
}

/** One entry of the guide to the audit files. */
export interface GuideItem {
  /** The file or folder, as it is under the report folder (or a command). */
  path: string;
  text: string;
}

export interface AuditGuide {
  intro: string;
  files: GuideItem[];
  verify: { intro: string; commands: GuideItem[] };
  /** How to get the audit edition of this very study. */
  fullEdition: string;
}

/** The template's view of one edition: the model, the edition's flags and (client) its guide. */
export interface EditionView extends Omit<ReportModel, "appendix"> {
  edition: Edition;
  editionLabel: string;
  audit: boolean;
  appendix: ReportModel["appendix"] | null;
  guide: AuditGuide | null;
}

/** The guide's id in the page, listed in the contents of the client edition. */
export const GUIDE_ID = "audit-files";

/** The one-page guide to the audit files of a report folder, for the client edition. */
export function auditGuide(model: ReportModel): AuditGuide {
  const runs = model.appendix.inputs.length;
  return {
    intro:
      "This edition leaves out the audit appendix. Everything behind its numbers is in the report folder beside this page, " +
      `and every file there is listed with its SHA-256 digest in record.json. The study read ${runs} run file${runs === 1 ? "" : "s"} ` +
      `with the manifest ${model.appendix.manifest.file}.`,
    files: [
      { path: "results.json", text: "Every number of this report at full precision (JSON numbers, no rounding), scenario by scenario: each run's statistics and each measure's summary across runs." },
      { path: "tables/<scenario>/runs/<run>/<measure>.csv", text: "The calculation table behind each run's statistic: one row per interval, observation or event, with the line of the run file it came from, the running sums and the running average." },
      { path: "tables/<scenario>/intervals/<measure>.csv", text: "The interval arithmetic of each summary: every run's value, the deviations, the sum of squares, the standard deviation, the t quantile and the half-width." },
      ...(model.comparisons === null ? [] : [{ path: "tables/<a>/comparisons/<n>-<measure>-vs-<b>.csv", text: "The arithmetic of each scenario comparison a − b: the values compared (per pair, or per scenario for Welch), the steps to the degrees of freedom, the t quantile at the Bonferroni level and the interval." }]),
      { path: "charts/", text: "Every chart of the report as an SVG file, for slides and documents (charts/measures/<measure>/, charts/warm-up/<scenario>.svg)." },
      { path: "record.json", text: "The study record: the manifest's text, the digest of every run file read and of every file written, the tool's version, the report's date and this edition's name." },
      { path: "report.pdf", text: "When printed: this page on paper, with page numbers and a contents list; its digest is added to record.json." },
    ],
    verify: {
      intro: "Anyone with the run files can check the folder. The command reads record.json, checks each run file's digest, computes the study again and compares every file, this page included, byte for byte; it writes nothing.",
      commands: [
        { path: "sojourn verify DIR", text: "Check the report folder DIR; exit status 0 when every item matches, 1 otherwise, with one line per item." },
        { path: "sojourn verify DIR --inputs FOLDER", text: "The same when the run files moved: FOLDER is where the manifest's run paths now start." },
      ],
    },
    fullEdition: "The audit edition of the same study shows the appendix in the page (the manifest as used, the input digests, each summary's arithmetic step by step and the calculation tables): run the report again with --edition audit.",
  };
}

/** Every string `id` found anywhere under a value (the anchors a part of the model defines). */
function idsUnder(value: unknown, into: Set<string>): Set<string> {
  if (Array.isArray(value)) for (const v of value) idsUnder(v, into);
  else if (value !== null && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      if (k === "id" && typeof v === "string") into.add(v);
      else if (k !== "spec" && k !== "svg") idsUnder(v, into);
    }
  }
  return into;
}

/**
 * A sentence of the model that sends the reader to the appendix, as the client edition says it:
 * the numbers do not link there, and the appendix is in the audit edition and in tables/.
 */
export function withoutAppendix(text: string): string {
  return text
    .replace(/Every number links to its step-by-step derivation in the appendix\./g, "The step-by-step derivation of every number is in the audit edition and in tables/<scenario>/intervals/.")
    .replace(/\b(each|every) (\w+) links? to (?:its|their) ([^.;)]*?) in the appendix/g, (_m, each: string, who: string, what: string) => `the ${what} of ${each} ${who} are in the audit edition`)
    .replace(/in the appendix/g, "in the audit edition");
}

/**
 * A copy of a value in which every `href` to one of `gone` is null and every text is read by
 * `withoutAppendix` (charts' specs are kept as they are).
 */
function unlink<T>(value: T, gone: Set<string>): T {
  if (typeof value === "string") return withoutAppendix(value) as T;
  if (Array.isArray(value)) return value.map((v) => unlink(v, gone)) as T;
  if (value === null || typeof value !== "object") return value;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) {
    if (k === "href" && typeof v === "string" && v.startsWith("#") && gone.has(v.slice(1))) out[k] = null;
    else out[k] = k === "spec" || k === "svg" ? v : unlink(v, gone);
  }
  return out as T;
}

/** Anchors the appendix template writes itself (templates/partials/appendix.hbs). */
const APPENDIX_ANCHORS = ["appendix", "manifest", "inputs", "checks", "derivations", "batch-values", "tables"];

/** The model as one edition shows it. */
export function editionView(model: ReportModel, edition: Edition): EditionView {
  if (edition === "audit") return { ...model, edition, editionLabel: "Audit edition", audit: true, guide: null };
  const gone = idsUnder(model.appendix, new Set(APPENDIX_ANCHORS));
  const { appendix: _appendix, ...rest } = model;
  const kept = unlink(rest, gone);
  const contents = model.contents.filter((c) => !gone.has(c.href.slice(1))).map((c) => ({ ...c, label: withoutAppendix(c.label) }));
  contents.push({ href: `#${GUIDE_ID}`, label: "Guide to the audit files" });
  return { ...kept, contents, edition, editionLabel: "Client edition", audit: false, appendix: null, guide: auditGuide(model) };
}
