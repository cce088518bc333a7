/**
 * What happens on Ctrl-C (SIGINT) or SIGTERM while Sojourn has something half-done on disk: a
 * report folder being built, a PDF being printed, a browser profile in the temporary folder.
 *
 * Each piece of work registers a cleanup while it runs and releases it when done. On a signal
 * the cleanups run newest first (a failing one does not stop the others), the newest message
 * that was given is printed, and the process exits with 128 + the signal's number (130 for
 * SIGINT, 143 for SIGTERM: common practice of shells).
 *
 * Node runs a signal handler only between two pieces of JavaScript, so synchronous work (such as
 * the two renames that put a finished report folder in place) is never cut in half by it; only a
 * SIGKILL or a power loss can, and src/record/outputDir.ts repairs that on the next run.
 */

interface Cleanup {
  run: () => void;
  message?: () => string;
}

const cleanups: Cleanup[] = [];

const EXIT: Record<string, number> = { SIGINT: 130, SIGTERM: 143 };

function onSignal(signal: NodeJS.Signals): never {
  let message: string | undefined;
  for (const c of [...cleanups].reverse()) {
    message ??= c.message?.();
    try {
      c.run();
    } catch {
      // the next cleanup still runs
    }
  }
  if (message !== undefined) process.stderr.write(message + "\n");
  process.exit(EXIT[signal] ?? 1);
}

function listen(on: boolean): void {
  for (const s of ["SIGINT", "SIGTERM"] as const) {
    if (on) process.on(s, onSignal);
    else process.off(s, onSignal);
  }
}

/**
 * Runs `cleanup` (synchronous) if the process is interrupted before the returned release is
 * called; `message` is what the user reads then. Releasing twice is harmless.
 */
export function onInterrupt(cleanup: () => void, message?: () => string): () => void {
  const entry: Cleanup = { run: cleanup, message };
  cleanups.push(entry);
  if (cleanups.length === 1) listen(true);
  return () => {
    const i = cleanups.indexOf(entry);
    if (i < 0) return;
    cleanups.splice(i, 1);
    if (cleanups.length === 0) listen(false);
  };
}
