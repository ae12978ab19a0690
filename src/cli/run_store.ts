/**
 * The run store: an embedded SQLite database (node:sqlite, WAL mode) of runs and of each
 * feeder's result in each run — input and config hashes, tool version, status, key
 * figures, findings and study diagnostics — and the cache lookup built on it.
 */
import { DatabaseSync } from "node:sqlite";
import { dirname } from "node:path";
import type { PackedStudy } from "../pipeline/pack_study.ts";

/** A feeder's result in a run: the packed study's figures, where its file is, its status. */
export interface FeederRecord extends Omit<PackedStudy, "fileText" | "status"> {
  readonly feederId: string;
  readonly formHash: string;
  /** "studied", "failed" or "set_aside". */
  readonly status: string;
  readonly resultFile: string;
}

export interface RunStore {
  beginRun(meta: {
    network: string;
    pipeline: string;
    outDir: string;
    inputHash: string;
    configHash: string;
    version: string;
    startedAt: string;
  }): number;
  finishRun(runId: number, finishedAt: string, counts: unknown): void;
  recordFeeder(runId: number, configHash: string, version: string, r: FeederRecord): void;
  /** The latest studied result of this feeder with the same form, config and version. */
  findCached(
    feederId: string,
    formHash: string,
    configHash: string,
    version: string,
  ): FeederRecord | undefined;
  /** The latest finished run written to this folder, with its feeders. */
  latestRun(outDir: string):
    | { runId: number; configHash: string; version: string; feeders: Map<string, FeederRecord> }
    | undefined;
  close(): void;
}

const SCHEMA = `
CREATE TABLE IF NOT EXISTS runs (
  run_id INTEGER PRIMARY KEY AUTOINCREMENT,
  network TEXT NOT NULL, pipeline TEXT NOT NULL, out_dir TEXT NOT NULL,
  input_hash TEXT NOT NULL, config_hash TEXT NOT NULL, tool_version TEXT NOT NULL,
  started_at TEXT NOT NULL, finished_at TEXT, counts TEXT
);
CREATE TABLE IF NOT EXISTS feeder_results (
  run_id INTEGER NOT NULL REFERENCES runs(run_id),
  feeder_id TEXT NOT NULL, form_hash TEXT NOT NULL, config_hash TEXT NOT NULL,
  tool_version TEXT NOT NULL, status TEXT NOT NULL, result_file TEXT NOT NULL,
  findings TEXT NOT NULL, diagnostics TEXT NOT NULL,
  v_min_pu REAL, v_max_pu REAL, max_loading_percent REAL, max_dg_change_percent REAL,
  needs TEXT NOT NULL DEFAULT '[]', headroom TEXT,
  PRIMARY KEY (run_id, feeder_id)
);
CREATE INDEX IF NOT EXISTS feeder_results_cache
  ON feeder_results (feeder_id, form_hash, config_hash, tool_version);
`;

type Row = Record<string, string | number | null>;

function toRecord(r: Row): FeederRecord {
  return {
    feederId: String(r.feeder_id),
    formHash: String(r.form_hash),
    status: String(r.status),
    resultFile: String(r.result_file),
    findings: JSON.parse(String(r.findings)),
    diagnostics: JSON.parse(String(r.diagnostics)),
    vMinPu: r.v_min_pu as number | null,
    vMaxPu: r.v_max_pu as number | null,
    maxLoadingPercent: r.max_loading_percent as number | null,
    maxDgChangePercent: r.max_dg_change_percent as number | null,
    needs: JSON.parse(String(r.needs ?? "[]")),
    headroom: r.headroom === null || r.headroom === undefined
      ? null
      : JSON.parse(String(r.headroom)),
  };
}

/** Stores made before the ranking stage lack its columns: add them. */
function addMissingColumns(db: DatabaseSync): void {
  const have = new Set(
    (db.prepare("PRAGMA table_info(feeder_results)").all() as Row[]).map((r) => String(r.name)),
  );
  if (!have.has("needs")) {
    db.exec("ALTER TABLE feeder_results ADD COLUMN needs TEXT NOT NULL DEFAULT '[]'");
  }
  if (!have.has("headroom")) db.exec("ALTER TABLE feeder_results ADD COLUMN headroom TEXT");
}

export async function openRunStore(path: string): Promise<RunStore> {
  await Deno.mkdir(dirname(path), { recursive: true });
  const db = new DatabaseSync(path);
  // Several processes (shards on one machine) may share a store: wait for the writer lock.
  db.exec("PRAGMA busy_timeout = 60000; PRAGMA journal_mode = WAL; PRAGMA synchronous = NORMAL;");
  db.exec(SCHEMA);
  addMissingColumns(db);
  const insertRun = db.prepare(
    `INSERT INTO runs (network, pipeline, out_dir, input_hash, config_hash, tool_version, started_at)
     VALUES (?, ?, ?, ?, ?, ?, ?)`,
  );
  const endRun = db.prepare(`UPDATE runs SET finished_at = ?, counts = ? WHERE run_id = ?`);
  const insertFeeder = db.prepare(
    `INSERT OR REPLACE INTO feeder_results (run_id, feeder_id, form_hash, config_hash, tool_version,
       status, result_file, findings, diagnostics, v_min_pu, v_max_pu, max_loading_percent,
       max_dg_change_percent, needs, headroom) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const cached = db.prepare(
    `SELECT * FROM feeder_results WHERE feeder_id = ? AND form_hash = ? AND config_hash = ?
       AND tool_version = ? AND status = 'studied' ORDER BY run_id DESC LIMIT 1`,
  );
  const lastRun = db.prepare(
    `SELECT run_id, config_hash, tool_version FROM runs WHERE out_dir = ? AND finished_at IS NOT NULL
       ORDER BY run_id DESC LIMIT 1`,
  );
  const runFeeders = db.prepare(`SELECT * FROM feeder_results WHERE run_id = ?`);
  // Feeder rows are written in batches of one transaction each: one commit per row would
  // cost more than the study of a small feeder.
  // A batch also ends after half a second, so that other writers are not held up.
  let pendingRows = 0;
  let batchStart = 0;
  const flush = () => {
    if (pendingRows > 0) db.exec("COMMIT");
    pendingRows = 0;
  };
  // While workers study a long feeder no row arrives: commit what is pending anyway.
  const ticker = setInterval(() => {
    if (pendingRows > 0 && performance.now() - batchStart > 500) flush();
  }, 250);
  return {
    beginRun(m) {
      const r = insertRun.run(
        m.network,
        m.pipeline,
        m.outDir,
        m.inputHash,
        m.configHash,
        m.version,
        m.startedAt,
      );
      return Number(r.lastInsertRowid);
    },
    finishRun(runId, finishedAt, counts) {
      flush();
      endRun.run(finishedAt, JSON.stringify(counts), runId);
    },
    recordFeeder(runId, configHash, version, r) {
      if (pendingRows === 0) {
        db.exec("BEGIN IMMEDIATE");
        batchStart = performance.now();
      }
      insertFeeder.run(
        runId,
        r.feederId,
        r.formHash,
        configHash,
        version,
        r.status,
        r.resultFile,
        JSON.stringify(r.findings),
        JSON.stringify(r.diagnostics),
        r.vMinPu,
        r.vMaxPu,
        r.maxLoadingPercent,
        r.maxDgChangePercent,
        JSON.stringify(r.needs),
        r.headroom === null ? null : JSON.stringify(r.headroom),
      );
      if (++pendingRows >= 500 || performance.now() - batchStart > 500) flush();
    },
    findCached(feederId, formHash, configHash, version) {
      const r = cached.get(feederId, formHash, configHash, version) as Row | undefined;
      return r === undefined ? undefined : toRecord(r);
    },
    latestRun(outDir) {
      const r = lastRun.get(outDir) as Row | undefined;
      if (r === undefined) return undefined;
      const runId = Number(r.run_id);
      const feeders = new Map<string, FeederRecord>();
      for (const row of runFeeders.all(runId) as Row[]) {
        feeders.set(String(row.feeder_id), toRecord(row));
      }
      return {
        runId,
        configHash: String(r.config_hash),
        version: String(r.tool_version),
        feeders,
      };
    },
    close() {
      clearInterval(ticker);
      flush();
      db.close();
    },
  };
}
