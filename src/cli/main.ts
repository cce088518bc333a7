#!/usr/bin/env node
import { run } from "./program.js";

// Output piped into a reader that stops early (`sojourn check --json | head -1`) ends the
// command quietly, as other command-line tools do, instead of with a stack trace.
for (const stream of [process.stdout, process.stderr]) {
  stream.on("error", (e: NodeJS.ErrnoException) => {
    if (e.code !== "EPIPE") throw e;
    process.exit(process.exitCode ?? 0);
  });
}

process.exitCode = await run(process.argv.slice(2));
