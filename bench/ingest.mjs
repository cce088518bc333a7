// Throughput of the run-file reader (src/ingest/readRun.ts) on a generated event log.
//
// Usage: node bench/ingest.mjs [BUILD_DIR]   (or INGEST_BUILD=BUILD_DIR; default: dist)
// BUILD_DIR holds the compiled sources (BUILD_DIR/ingest/readRun.js), e.g. from
//   npx tsc --outDir /tmp/ingest-build --rootDir src --module NodeNext --moduleResolution NodeNext \
//     --target ES2022 --skipLibCheck src/ingest/readRun.ts
// ROWS=... sets the number of rows (default 2,000,000). The files are written once to /tmp.
/* global console */
import { spawnSync } from "node:child_process";
import process from "node:process";
import { createReadStream, createWriteStream, existsSync, statSync } from "node:fs";
import { pipeline } from "node:stream/promises";
import { createGzip } from "node:zlib";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";

const build = resolve(process.argv[2] ?? process.env.INGEST_BUILD ?? "dist");
const { readRun } = await import(pathToFileURL(`${build}/ingest/readRun.js`).href);
const ROWS = Number(process.env.ROWS ?? 2_000_000);
const csvPath = `/tmp/sojourn-bench-ingest-${ROWS}.csv`;
const gzPath = `${csvPath}.gz`;

/** A bike repair shop's event log: arrivals, queue level, bench use, waits, departures. */
async function generate() {
  let seed = 12345;
  const random = () => {
    seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
    return seed / 4294967296;
  };
  const out = createWriteStream(csvPath);
  let buf = "time,series,value,entity\n";
  let t = 0;
  let queue = 0;
  let busy = 0;
  let bike = 0;
  for (let i = 0; i < ROWS; ) {
    t += random() * 0.8;
    const time = t.toFixed(4);
    const r = random();
    if (r < 0.3) {
      bike++;
      buf += `${time},arrive,,b${bike}\n`;
      queue++;
      buf += `${time},queue,${queue},\n`;
      i += 2;
    } else if (r < 0.6 && queue > 0) {
      queue--;
      busy = Math.min(3, busy + 1);
      buf += `${time},queue,${queue},\n${time},bench_busy,${busy},\n${time},wait,${(random() * 12).toFixed(3)},\n`;
      i += 3;
    } else {
      busy = Math.max(0, busy - 1);
      buf += `${time},bench_busy,${busy},\n${time},depart,,b${Math.max(1, bike - Math.floor(random() * 5))}\n`;
      i += 2;
    }
    if (buf.length > 1 << 20) {
      if (!out.write(buf)) await new Promise((r) => out.once("drain", r));
      buf = "";
    }
  }
  out.end(buf);
  await new Promise((r) => out.on("finish", r));
  await pipeline(createReadStream(csvPath), createGzip(), createWriteStream(gzPath));
}

if (!existsSync(gzPath)) await generate();
const columns = { time: "time", series: "series", value: "value", entity: "entity" };
const series = [
  { name: "queue", entity: false },
  { name: "bench_busy", entity: false },
  { name: "wait", entity: false },
  { name: "arrive", entity: true },
  { name: "depart", entity: true },
];

async function measure(path) {
  let sum = 0;
  const t0 = process.hrtime.bigint();
  const report = await readRun({
    path,
    display: path,
    columns,
    series,
    onRow: (_i, time, value) => {
      if (value === value) sum += value;
    },
  });
  const seconds = Number(process.hrtime.bigint() - t0) / 1e9;
  const size = statSync(csvPath).size;
  return { seconds, rows: report.rows, size, sum, report };
}

const mb = statSync(csvPath).size / 1e6;
console.log(`file: ${csvPath} (${mb.toFixed(1)} MB, gzip ${(statSync(gzPath).size / 1e6).toFixed(1)} MB)`);
for (const [label, path] of [
  ["csv", csvPath],
  ["csv", csvPath],
  ["csv.gz", gzPath],
]) {
  const r = await measure(path);
  const rss = process.memoryUsage().rss / 1e6;
  console.log(
    `${label.padEnd(7)} ${r.rows} rows in ${r.seconds.toFixed(3)} s: ` +
      `${(r.rows / r.seconds / 1e6).toFixed(2)} M rows/s, ${(mb / r.seconds).toFixed(0)} MB/s (uncompressed), rss ${rss.toFixed(0)} MB`,
  );
}
const t0 = process.hrtime.bigint();
const awk = spawnSync("awk", ["-F,", "{n++} END {print n}", csvPath], { encoding: "utf8" });
const awkSeconds = Number(process.hrtime.bigint() - t0) / 1e9;
console.log(`awk -F, '{n++} END {print n}': ${awk.stdout.trim()} lines in ${awkSeconds.toFixed(3)} s (${(mb / awkSeconds).toFixed(0)} MB/s)`);
