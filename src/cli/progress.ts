/**
 * Progress on stderr: on a terminal one line rewritten in place (done/total, feeders per
 * second, time left, failures); elsewhere a log line every few seconds; nothing when quiet.
 */

export interface ProgressSink {
  /** A one-off message (a phase starting), on a line of its own. */
  note(text: string): void;
  update(done: number, total: number, failed: number): void;
  finish(): void;
}

const enc = new TextEncoder();

function columns(): number {
  try {
    const c = Deno.consoleSize().columns;
    return c > 0 ? c : 80; // some terminals report zero columns
  } catch {
    return 80;
  }
}

function formatSeconds(s: number): string {
  if (!Number.isFinite(s)) return "–";
  if (s < 60) return `${Math.round(s)} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${Math.round(s % 60)} s`;
  return `${Math.floor(s / 3600)} h ${Math.round((s % 3600) / 60)} min`;
}

export function progressLine(
  done: number,
  total: number,
  failed: number,
  elapsedS: number,
): string {
  const rate = elapsedS > 0 ? done / elapsedS : 0;
  const left = rate > 0 ? (total - done) / rate : Infinity;
  return `studied ${done}/${total} feeders · ${rate.toFixed(1)}/s · ${formatSeconds(left)} left` +
    (failed > 0 ? ` · ${failed} failed` : "");
}

export function createProgress(
  mode: "tty" | "log" | "quiet",
  write: (text: string) => void = (t) => Deno.stderr.writeSync(enc.encode(t)),
  now: () => number = () => performance.now(),
  logEveryMs = 5000,
): ProgressSink {
  const start = now();
  let lastLog = start;
  let drawn = false;
  return {
    note(text) {
      if (mode === "quiet") return;
      if (mode === "tty" && drawn) write("\r\x1b[K");
      drawn = false;
      write(`${text}\n`);
    },
    update(done, total, failed) {
      if (mode === "quiet") return;
      const t = now();
      const line = progressLine(done, total, failed, (t - start) / 1000);
      if (mode === "tty") {
        write(
          `\r${line.slice(0, columns() - 1).padEnd(Math.min(columns() - 1, line.length))}\x1b[K`,
        );
        drawn = true;
      } else if (t - lastLog >= logEveryMs || done === total) {
        write(`${line}\n`);
        lastLog = t;
      }
    },
    finish() {
      if (mode === "tty" && drawn) write("\r\x1b[K");
    },
  };
}
