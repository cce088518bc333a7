// The scale benchmark (docs/performance.md): `npm run bench` builds, then runs this.
//
//   1. one run of about 10 million rows, three measures, default settings: `sojourn report`
//      against a one-pass mawk program computing the same three numbers, alternating tries;
//   2. peak memory (RSS) of that report at two file lengths;
//   3. the same run gzip-compressed;
//   4. 16 runs of about 600 000 rows with 1 and 2 worker threads (results compared byte for byte);
//   5. the ferry demo (16 runs x 6 measures): HTML, and HTML + PDF when Chromium is there;
//   6. 1000 small runs x 5 measures: wall time and peak memory (RSS) of `sojourn report` against
//      100 runs, the page's size, and `sojourn verify` on the result;
//   7. an entity table of 2 million rows (layout: entities) against the same events as an event
//      table: time ratio and peak memory (bench/entities.mjs).
//
// Data is invented by the demo's seeded queue simulation and written once to $SOJOURN_BENCH_DIR
// (default /tmp/sojourn-bench), never into the repository. REPEAT=n repeats each timing (default 3;
// the fastest is reported, the machine may be shared). QUICK=1 uses files a tenth as long.
// PARTS=long,parquet,workers,demo,runs1000,entities runs only those parts (long is 1 to 3).
/* global console, URL */
import { execFileSync, spawnSync } from "node:child_process";
import { createReadStream, createWriteStream, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { availableParallelism, cpus } from "node:os";
import { join, resolve } from "node:path";
import process from "node:process";
import { pipeline } from "node:stream/promises";
import { createGzip } from "node:zlib";
import { fileURLToPath } from "node:url";

const root = resolve(fileURLToPath(new URL("..", import.meta.url)));
const cli = join(root, "dist/cli/main.js");
const { simulateQueue } = await import(join(root, "dist/demo/queue.js"));
const { writeRunCsv } = await import(join(root, "dist/demo/ferry.js"));

const dir = process.env.SOJOURN_BENCH_DIR ?? "/tmp/sojourn-bench";
const REPEAT = Number(process.env.REPEAT ?? 3);
const scale = process.env.QUICK ? 0.1 : 1;
const PARTS = process.env.PARTS === undefined ? null : new Set(process.env.PARTS.split(",").map((p) => p.trim()));
const want = (part) => PARTS === null || PARTS.has(part);
mkdirSync(dir, { recursive: true });
const env = { ...process.env, SOURCE_DATE_EPOCH: "1780000000" };
delete env.SOJOURN_WORKERS;
const lines = [];
const out = (line = "") => {
  console.log(line);
  lines.push(line);
};

/** About 4.5 rows per time unit at 0.9 arrivals per minute, 2 servers (utilization 0.9). */
const model = (horizon, seed, decimals) => ({ arrivalRate: 0.9, serviceRate: 0.5, servers: 2, horizon, seed, decimals });

/** Writes the run file once; `decimals` null prints times in full (up to 17 significant digits). */
async function runFile(path, horizon, seed, decimals = 4) {
  if (existsSync(path)) return;
  const tmp = `${path}.tmp`;
  await writeRunCsv(tmp, simulateQueue(model(horizon, seed, decimals)));
  execFileSync("mv", [tmp, path]);
}

/**
 * Writes a run CSV (time,series,value,entity, as `writeRunCsv` writes it) as Parquet: time and
 * value DOUBLE, series and entity STRING, snappy pages, `group` rows per row group.
 */
async function csvToParquet(csvPath, path, group) {
  const { ParquetWriter, fileWriter, schemaFromColumnData } = await import("hyparquet-writer");
  const tmp = `${path}.tmp`;
  const writer = fileWriter(tmp);
  let pq = null;
  let time = new Float64Array(group);
  let series = [];
  let value = [];
  let entity = [];
  const flush = () => {
    const n = series.length;
    if (n === 0) return;
    const columnData = [
      { name: "time", data: time.subarray(0, n), type: "DOUBLE", nullable: false },
      { name: "series", data: series, type: "STRING" },
      { name: "value", data: value, type: "DOUBLE" },
      { name: "entity", data: entity, type: "STRING" },
    ];
    pq ??= new ParquetWriter({ writer, schema: schemaFromColumnData({ columnData }), codec: "SNAPPY" });
    pq.write({ columnData, rowGroupSize: group });
    time = new Float64Array(group);
    series = [];
    value = [];
    entity = [];
  };
  const { createInterface } = await import("node:readline");
  let header = true;
  for await (const line of createInterface({ input: createReadStream(csvPath), crlfDelay: Infinity })) {
    if (header || line === "") {
      header = false;
      continue;
    }
    const [t, s, v, e] = line.split(",");
    time[series.length] = Number(t);
    series.push(s);
    value.push(v === "" || v === undefined ? null : Number(v));
    entity.push(e === "" || e === undefined ? null : e);
    if (series.length === group) flush();
  }
  flush();
  pq.finish();
  execFileSync("mv", [tmp, path]);
}

function manifest(name, runs, end) {
  const path = join(dir, name);
  writeFileSync(
    path,
    [
      "version: 1",
      `title: Scale benchmark ${name}`,
      "time_unit: min",
      "scenarios:",
      "  - name: long",
      `    end: ${end}`,
      `    runs: [${runs.join(", ")}]`,
      "measures:",
      "  - {name: queue_len, kind: level, series: queue}",
      "  - {name: wait, kind: observation, series: wait}",
      "  - {name: departures, kind: count, series: depart}",
      "",
    ].join("\n"),
  );
  return path;
}

/** Wall seconds of a command (fastest of REPEAT), its CPU seconds (user + system) then, and its output. */
function timed(cmd, args, repeat = REPEAT) {
  let best = Infinity;
  let cpu = NaN;
  let last = null;
  const withTime = existsSync("/usr/bin/time");
  for (let i = 0; i < repeat; i++) {
    const t0 = process.hrtime.bigint();
    last = withTime ? spawnSync("/usr/bin/time", ["-f", "CPU %U %S", cmd, ...args], { env, encoding: "utf8", maxBuffer: 1 << 26 }) : spawnSync(cmd, args, { env, encoding: "utf8", maxBuffer: 1 << 26 });
    const s = Number(process.hrtime.bigint() - t0) / 1e9;
    if (last.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed:\n${last.stderr}`);
    if (s < best) {
      best = s;
      const m = /CPU ([\d.]+) ([\d.]+)\s*$/.exec(last.stderr);
      cpu = m ? Number(m[1]) + Number(m[2]) : NaN;
    }
  }
  return { seconds: best, cpu, stdout: last.stdout };
}

/** Peak RSS in MB of a command: /usr/bin/time -v when present, else the child's own figure. */
function peakRss(args) {
  if (existsSync("/usr/bin/time")) {
    const r = spawnSync("/usr/bin/time", ["-v", process.execPath, ...args], { env, encoding: "utf8" });
    const m = /Maximum resident set size \(kbytes\): (\d+)/.exec(r.stderr);
    if (r.status === 0 && m) return Number(m[1]) / 1024;
  }
  // A wrapper file, not `node -e`: options of the node command would pass on to worker threads.
  const wrapper = join(dir, "peak-rss.mjs");
  writeFileSync(wrapper, `process.argv.splice(1, 1, ${JSON.stringify(cli)});
process.on("exit", () => process.stderr.write("RSS " + process.resourceUsage().maxRSS + "\\n"));
await import(${JSON.stringify(cli)});\n`);
  const r = spawnSync(process.execPath, [wrapper, ...args.slice(1)], { env, encoding: "utf8" });
  const m = /RSS (\d+)/.exec(r.stderr);
  return m ? Number(m[1]) / 1024 : NaN;
}

const report = (m, outDir, extra = []) => [cli, "report", m, "--out", outDir, "--force", "--quiet", ...extra];
const mb = (p) => statSync(p).size / 1e6;
const f2 = (x) => x.toFixed(2);

out(`# Sojourn benchmark, ${new Date().toISOString().slice(0, 10)}`);
out();
out(`Machine: ${cpus()[0]?.model ?? "?"}, ${availableParallelism()} cores available, Node ${process.version}; fastest of ${REPEAT} tries; the machine may be shared with other jobs.`);
out();

if (want("long")) {
  // --- 1. one long run -------------------------------------------------------------------------
  const H10 = Math.round(2_220_000 * scale);
  const H5 = Math.round(H10 / 2);
  const big10 = join(dir, `long-${H10}.csv`);
  const big5 = join(dir, `long-${H5}.csv`);
  console.error("generating data (once) ...");
  await runFile(big10, H10, 7);
  await runFile(big5, H5, 7);
  if (!existsSync(`${big10}.gz`)) await pipeline(createReadStream(big10), createGzip(), createWriteStream(`${big10}.gz`));
  const m10 = manifest("long10.yaml", [big10], H10);
  const m5 = manifest("long5.yaml", [big5], H5);
  const mgz = manifest("long10gz.yaml", [`${big10}.gz`], H10);

  // The peer: one pass of mawk over the same file, converting only the fields it uses (a
  // hand-written script would not convert the time of rows it skips), the level's intervals
  // closed at the window end. The file's last time is below the end, so no row is outside.
  const AWK = `BEGIN { FS = ","; end = ${H10} }
NR > 1 {
  if ($2 == "queue") { area += lv * ($1 - lt); lt = $1; lv = $3 }
  else if ($2 == "wait") { ws += $3; wn++ }
  else if ($2 == "depart") { dn++ }
}
END { area += lv * (end - lt); printf "%.10f %.10f %d\\n", area / end, ws / wn, dn }`;
  writeFileSync(join(dir, "three.awk"), AWK + "\n");
  const awkProgram = existsSync("/usr/bin/mawk") ? "mawk" : "awk";

  /**
   * sojourn report against the awk program on one file, side by side: the two alternate, REPEAT
   * tries each, so a slow moment of the machine falls on both. Returns sojourn's fastest timing.
   */
  function sideBySide(title, file, manifestPath, outDir) {
    const rows = Number(execFileSync("wc", ["-l", file], { encoding: "utf8" }).split(" ")[0]) - 1;
    let awk = null;
    let sj = null;
    const ratios = [];
    for (let i = 0; i < REPEAT; i++) {
      const a = timed(awkProgram, ["-f", join(dir, "three.awk"), file], 1);
      const s = timed(process.execPath, report(manifestPath, join(dir, outDir)), 1);
      ratios.push(s.seconds / a.seconds);
      if (awk === null || a.seconds < awk.seconds) awk = a;
      if (sj === null || s.seconds < sj.seconds) sj = s;
    }
    const r = JSON.parse(readFileSync(join(dir, outDir, "results.json"), "utf8")).scenarios[0].runs[0].measures;
    out(`## ${title}: ${rows.toLocaleString("en")} rows, ${f2(mb(file))} MB of CSV, 3 measures`);
    out();
    out("| program | wall time (s) | CPU time (s) | level time average | observation mean | count |");
    out("|---|---|---|---|---|---|");
    const [aL, aO, aC] = awk.stdout.trim().split(" ");
    out(`| ${awkProgram} (one pass, same three numbers) | ${f2(awk.seconds)} | ${f2(awk.cpu)} | ${aL} | ${aO} | ${aC} |`);
    out(`| sojourn report (results, tables, HTML) | ${f2(sj.seconds)} | ${f2(sj.cpu)} | ${r.queue_len.value} | ${r.wait.value} | ${r.departures.value} |`);
    out();
    out(`Ratio sojourn / ${awkProgram}, fastest against fastest: wall ${f2(sj.seconds / awk.seconds)} (target at most 0.5), CPU ${f2(sj.cpu / awk.cpu)}; per alternating try ${f2(Math.min(...ratios))}-${f2(Math.max(...ratios))}.`);
    out();
    return { sj, rows };
  }

  const { sj, rows: rows10 } = sideBySide("One run, times to 4 decimals", big10, m10, "out10");
  const bigFull = join(dir, `long-full-${H10}.csv`);
  await runFile(bigFull, H10, 7, null);
  sideBySide("The same run, times printed in full (up to 17 significant digits)", bigFull, manifest("longfull.yaml", [bigFull], H10), "outfull");

  // --- 2. memory at two lengths --------------------------------------------------------------
  const rss5 = peakRss(report(m5, join(dir, "out5")));
  const rss10 = peakRss(report(m10, join(dir, "out10")));
  out("## Peak memory (RSS) of `sojourn report`");
  out();
  out("| file | rows | MB | peak RSS (MB) |");
  out("|---|---|---|---|");
  out(`| ${big5.split("/").pop()} | ${(Number(execFileSync("wc", ["-l", big5], { encoding: "utf8" }).split(" ")[0]) - 1).toLocaleString("en")} | ${f2(mb(big5))} | ${rss5.toFixed(0)} |`);
  out(`| ${big10.split("/").pop()} | ${rows10.toLocaleString("en")} | ${f2(mb(big10))} | ${rss10.toFixed(0)} |`);
  out();

  // --- 3. gzip -----------------------------------------------------------------------------
  const gz = timed(process.execPath, report(mgz, join(dir, "outgz")));
  out("## gzip input");
  out();
  out(`${f2(mb(`${big10}.gz`))} MB gzip: ${f2(gz.seconds)} s against ${f2(sj.seconds)} s for the plain CSV: ratio ${f2(gz.seconds / sj.seconds)} (target at most 1.5).`);
  out();
}

if (want("parquet")) {
  // --- 3b. the long run as Parquet ------------------------------------------------------------
  const H10 = Math.round(2_220_000 * scale);
  const big10 = join(dir, `long-${H10}.csv`);
  const pq10 = join(dir, `long-${H10}.parquet`);
  console.error("generating data (once) ...");
  await runFile(big10, H10, 7);
  const GROUP = 1 << 20;
  if (!existsSync(pq10)) await csvToParquet(big10, pq10, GROUP);
  const mcsv = manifest("long10.yaml", [big10], H10);
  const mpq = manifest("long10pq.yaml", [pq10], H10);
  const c = timed(process.execPath, report(mcsv, join(dir, "out10")));
  const p = timed(process.execPath, report(mpq, join(dir, "outpq")));
  const figures = (d) => JSON.stringify(JSON.parse(readFileSync(join(dir, d, "results.json"), "utf8")).scenarios[0].runs[0].measures);
  const same = figures("out10") === figures("outpq");
  const rssPq = peakRss(report(mpq, join(dir, "outpq")));
  out(`## Parquet input: the same long run`);
  out();
  out(`${f2(mb(pq10))} MB of Parquet (snappy pages, row groups of ${GROUP.toLocaleString("en")} rows, written by hyparquet-writer from the CSV) against ${f2(mb(big10))} MB of CSV.`);
  out();
  out("| input | wall time (s) | CPU time (s) |");
  out("|---|---|---|");
  out(`| CSV | ${f2(c.seconds)} | ${f2(c.cpu)} |`);
  out(`| Parquet | ${f2(p.seconds)} | ${f2(p.cpu)} |`);
  out();
  out(`Ratio Parquet / CSV: ${f2(p.seconds / c.seconds)} (target at most 1.5); same run figures: ${same ? "yes" : "NO"}; peak RSS with Parquet ${rssPq.toFixed(0)} MB.`);
  out();
}

if (want("workers")) {
  // --- 4. many runs on worker threads -------------------------------------------------------
  const HM = Math.round(133_000 * scale);
  const many = [];
  for (let k = 1; k <= 16; k++) {
    const p = join(dir, `rep-${HM}-${String(k).padStart(2, "0")}.csv`);
    await runFile(p, HM, 100 + k);
    many.push(p);
  }
  const mm = manifest("many.yaml", many, HM);
  const manyRows = many.reduce((n, p) => n + statSync(p).size, 0);
  const w1 = timed(process.execPath, report(mm, join(dir, "many1"), ["--workers", "1"]));
  const w2 = timed(process.execPath, report(mm, join(dir, "many2"), ["--workers", "2"]));
  const same = spawnSync("diff", ["-r", "-x", "record.json", join(dir, "many1"), join(dir, "many2")]).status === 0;
  out(`## 16 runs (${f2(manyRows / 1e6)} MB in all), worker threads`);
  out();
  out("| workers | wall time (s) | CPU time (s) |");
  out("|---|---|---|");
  out(`| 1 (in process) | ${f2(w1.seconds)} | ${f2(w1.cpu)} |`);
  out(`| 2 | ${f2(w2.seconds)} | ${f2(w2.cpu)} |`);
  out();
  out(`Speed-up ${f2(w1.seconds / w2.seconds)} (target at least 1.7); results.json, tables and report.html identical: ${same ? "yes" : "NO"}.`);
  out();
}

if (want("demo")) {
  // --- 5. the ferry demo's report ------------------------------------------------------------
  const demoDir = join(dir, "ferry");
  if (!existsSync(join(demoDir, "ferry-study.yaml"))) execFileSync(process.execPath, [cli, "demo", demoDir, "--quiet"], { env });
  const ferry = join(demoDir, "ferry-study.yaml");
  const html = timed(process.execPath, report(ferry, join(dir, "ferry-html")));
  out("## Ferry demo (16 runs x 6 measures)");
  out();
  out(`HTML: ${f2(html.seconds)} s (target under 3 s).`);
  const chromium = ["/usr/bin/chromium", "/usr/bin/chromium-browser"].find((p) => existsSync(p));
  if (chromium !== undefined) {
    const pdf = timed(process.execPath, report(ferry, join(dir, "ferry-pdf"), ["--pdf", "--chrome", chromium]));
    out(`HTML + PDF: ${f2(pdf.seconds)} s (target under 15 s).`);
  } else out("HTML + PDF: skipped, no Chromium at /usr/bin/chromium.");
  out();
}

// --- 6. a thousand small runs -------------------------------------------------------------
if (want("runs1000")) {
  const smallRun = (k) => join(dir, "small", `rep-${String(k).padStart(4, "0")}.csv`);
  mkdirSync(join(dir, "small"), { recursive: true });
  for (let k = 1; k <= 1000; k++) await runFile(smallRun(k), 200, 5000 + k);
  const smallManifest = (name, count) => {
    const path = join(dir, name);
    writeFileSync(
      path,
      [
        "version: 1",
        `title: ${count} small runs`,
        "time_unit: min",
        "scenarios:",
        "  - name: small",
        "    end: 200",
        `    runs: [${Array.from({ length: count }, (_, i) => smallRun(i + 1)).join(", ")}]`,
        "measures:",
        "  - {name: queue_len, kind: level, series: queue}",
        "  - {name: busy_use, kind: utilization, series: busy, capacity: 2}",
        "  - {name: wait, kind: observation, series: wait}",
        "  - {name: departures, kind: count, series: depart}",
        "  - {name: in_system, kind: level, from: {enter: arrive, leave: depart}}",
        "",
      ].join("\n"),
    );
    return path;
  };
  const rows = (count) => {
    let n = 0;
    for (let k = 1; k <= count; k++) n += readFileSync(smallRun(k), "utf8").split("\n").length - 2;
    return n;
  };
  out("## 1000 small runs (5 measures each, default tables)");
  out();
  out("| runs | rows in all | wall time (s) | CPU time (s) | peak RSS (MB) | report.html (MB) | calculation tables | `sojourn verify` (s) |");
  out("|---|---|---|---|---|---|---|---|");
  for (const count of [100, 1000]) {
    const m = smallManifest(`small${count}.yaml`, count);
    const outDir = join(dir, `small${count}`);
    const t = timed(process.execPath, report(m, outDir));
    const rss = peakRss(report(m, outDir));
    const tables = JSON.parse(readFileSync(join(outDir, "record.json"), "utf8")).outputs.filter((o) => o.file.startsWith("tables/")).length;
    const v = timed(process.execPath, [cli, "verify", outDir], 1);
    if (!v.stdout.includes("VERIFIED:")) throw new Error(`verify of ${count} runs failed:\n${v.stdout}`);
    out(`| ${count} | ${rows(count).toLocaleString("en")} | ${f2(t.seconds)} | ${f2(t.cpu)} | ${rss.toFixed(0)} | ${f2(mb(join(outDir, "report.html")))} | ${tables.toLocaleString("en")} | ${f2(v.seconds)} |`);
  }
  out();
}

// --- 7. an entity table --------------------------------------------------------------------
if (want("entities")) {
  const { entitiesPart } = await import("./entities.mjs");
  await entitiesPart({ dir, scale, out, timed, peakRss, report, f2, mb });
}

writeFileSync(join(dir, "results.md"), lines.join("\n") + "\n");
console.error(`figures also written to ${join(dir, "results.md")}`);
for (const d of readdirSync(dir)) if (d.endsWith(".tmp")) rmSync(join(dir, d));
