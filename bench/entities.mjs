// Bench part `entities` (docs/performance.md): one run as an entity table of 2 million rows in
// departure order (id, arrived, started, left, server, class: three event and two attribute
// columns), against the same events as an event table (time, series, value, entity). The same
// five measures read both; the figures must agree. Invented data: a seeded two-server queue.
/* global console, Buffer, process, URL */
import { closeSync, createWriteStream, existsSync, openSync, readFileSync, readSync, renameSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
// The demo's seeded generator (mulberry32); `npm run bench` builds dist/ first.
const { uniform: random } = await import(new URL("../dist/demo/random.js", import.meta.url).href);

/** `n` customers of a two-server FCFS queue (0.9 arrivals and 0.5 services per minute per server), times to 4 decimals. */
function customers(n, seed) {
  const u = random(seed);
  const exp = (rate) => -Math.log(1 - u()) / rate;
  const r4 = (t) => Math.round(t * 1e4) / 1e4;
  const arrived = new Float64Array(n);
  const started = new Float64Array(n);
  const left = new Float64Array(n);
  const server = new Uint8Array(n);
  const gold = new Uint8Array(n);
  const free = [0, 0];
  let t = 0;
  for (let i = 0; i < n; i++) {
    t = r4(t + exp(0.9));
    const s = free[1] < free[0] ? 1 : 0;
    arrived[i] = t;
    started[i] = Math.max(t, free[s]);
    left[i] = r4(started[i] + Math.max(1e-4, r4(exp(0.5))));
    free[s] = left[i];
    server[i] = s;
    gold[i] = u() < 0.3 ? 1 : 0;
  }
  return { n, arrived, started, left, server, gold };
}

async function writeLines(path, produce) {
  const tmp = `${path}.tmp`;
  const out = createWriteStream(tmp);
  let buf = "";
  const put = async (line) => {
    buf += line;
    if (buf.length > 1 << 20) {
      if (!out.write(buf)) await new Promise((done) => out.once("drain", done));
      buf = "";
    }
  };
  await produce(put);
  out.end(buf);
  await new Promise((done) => out.once("finish", done));
  renameSync(tmp, path);
}

/** The entity table (departure order) and the event table (time order; at one time, row order, then arrived, started, left). */
async function writeFiles(c, entityPath, eventPath) {
  const order = Uint32Array.from({ length: c.n }, (_, i) => i).sort((a, b) => c.left[a] - c.left[b] || a - b);
  const cls = (i) => (c.gold[i] ? "gold" : "basic");
  await writeLines(entityPath, async (put) => {
    await put("id,arrived,started,left,server,class\n");
    for (const i of order) await put(`${i + 1},${c.arrived[i]},${c.started[i]},${c.left[i]},${c.server[i]},${cls(i)}\n`);
  });
  // The events in the order Sojourn puts the entity table's events in: (time, row, column).
  const rowOf = new Uint32Array(c.n);
  order.forEach((i, k) => (rowOf[i] = k));
  const m = 3 * c.n;
  const time = new Float64Array(m);
  for (let i = 0; i < c.n; i++) {
    time[3 * i] = c.arrived[i];
    time[3 * i + 1] = c.started[i];
    time[3 * i + 2] = c.left[i];
  }
  const ev = Uint32Array.from({ length: m }, (_, k) => k).sort((a, b) => time[a] - time[b] || rowOf[Math.floor(a / 3)] - rowOf[Math.floor(b / 3)] || (a % 3) - (b % 3));
  const names = ["arrived", "started", "left"];
  await writeLines(eventPath, async (put) => {
    await put("time,series,value,id,server,class\n");
    for (const k of ev) {
      const i = Math.floor(k / 3);
      await put(`${time[k]},${names[k % 3]},,${i + 1},${c.server[i]},${cls(i)}\n`);
    }
  });
}

const MEASURES = [
  "measures:",
  "  - {name: in_queue, kind: level, from: {enter: arrived, leave: started}}",
  "  - {name: wait, kind: observation, from: {start: arrived, end: started}}",
  "  - {name: sojourn, kind: observation, from: {start: arrived, end: left}}",
  "  - {name: served, kind: count, series: left}",
  "  - {name: use, kind: utilization, from: {enter: started, leave: left}, capacity: 2}",
  "",
];

export async function entitiesPart({ dir, scale, out, timed, peakRss, report, f2, mb }) {
  const n = Math.round(2_000_000 * scale);
  const entityPath = join(dir, `customers-${n}.csv`);
  const eventPath = join(dir, `customer-events-${n}.csv`);
  if (!existsSync(entityPath) || !existsSync(eventPath)) {
    console.error(`generating ${n} customers (once) ...`);
    await writeFiles(customers(n, 11), entityPath, eventPath);
  }
  // The window ends at the last event (the event table's last row).
  const fd = openSync(eventPath, "r");
  const tail = Buffer.alloc(200);
  const got = readSync(fd, tail, 0, 200, Math.max(0, statSync(eventPath).size - 200));
  closeSync(fd);
  const end = Math.ceil(Number(tail.toString("utf8", 0, got).trim().split("\n").pop().split(",")[0]));
  const manifestOf = (name, layout, file) => {
    const path = join(dir, name);
    writeFileSync(path, [`title: ${layout} table`, "time_unit: min", `layout: ${layout}`, "columns: {entity: id}", "scenarios:", `  - {name: long, end: ${end}, runs: [${file}]}`, ...MEASURES].join("\n"));
    return path;
  };
  const mEvents = manifestOf("customers-events.yaml", "events", eventPath);
  const mEntities = manifestOf("customers-entities.yaml", "entities", entityPath);
  const a = timed(process.execPath, report(mEvents, join(dir, "cust-events")));
  const b = timed(process.execPath, report(mEntities, join(dir, "cust-entities")));
  const ra = JSON.parse(readFileSync(join(dir, "cust-events", "results.json"), "utf8")).scenarios[0].runs[0].measures;
  const rb = JSON.parse(readFileSync(join(dir, "cust-entities", "results.json"), "utf8")).scenarios[0].runs[0].measures;
  const same = JSON.stringify(ra) === JSON.stringify(rb);
  const rssA = peakRss(report(mEvents, join(dir, "cust-events")));
  const rssB = peakRss(report(mEntities, join(dir, "cust-entities")));
  out(`## An entity table of ${n.toLocaleString("en")} rows against the same events as an event table`);
  out();
  out("| layout | file | MB | wall time (s) | CPU time (s) | peak RSS (MB) |");
  out("|---|---|---|---|---|---|");
  out(`| events (${(3 * n).toLocaleString("en")} rows) | ${eventPath.split("/").pop()} | ${f2(mb(eventPath))} | ${f2(a.seconds)} | ${f2(a.cpu)} | ${rssA.toFixed(0)} |`);
  out(`| entities (${n.toLocaleString("en")} rows, departure order) | ${entityPath.split("/").pop()} | ${f2(mb(entityPath))} | ${f2(b.seconds)} | ${f2(b.cpu)} | ${rssB.toFixed(0)} |`);
  out();
  out(`Time ratio entities / events: ${f2(b.seconds / a.seconds)} (goal at most 1.5); run figures identical: ${same ? "yes" : "NO"}.`);
  out();
}
