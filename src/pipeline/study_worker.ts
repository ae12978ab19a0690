/**
 * Worker entry of the fleet study: receives the study settings once, then feeder forms
 * with their summaries, and answers each with the packed study (result file text
 * included). A test-only fault hook (init.faults) makes it crash or hang on named
 * feeders, to exercise the pool's recovery.
 *
 * The study modules are imported dynamically: some finish loading asynchronously (the
 * linear-programming solver is WebAssembly), and a message that arrives before the handler
 * is installed would be lost. The handler is installed first; it waits for the modules.
 */
/// <reference lib="deno.worker" />
import type { FeederForm } from "../model/feeder_form.ts";
import type { FeederSummary } from "../model/summarize_feeder.ts";
import type { StudySettings } from "./study_feeder.ts";
import type { FeederProvenance } from "../report/run_files.ts";

/** What the pool sends per feeder: its solver form and its validation summary. */
export interface StudyTask {
  readonly form: FeederForm;
  readonly summary: FeederSummary;
  /** Hash of the form (the cache key), for the file's provenance. */
  readonly formHash: string;
}

export interface StudyWorkerInit {
  readonly settings: StudySettings;
  /** Tool, version and config hash, for each feeder file's provenance. */
  readonly provenance: Omit<FeederProvenance, "formHash">;
  readonly faults?: { readonly crash?: readonly string[]; readonly hang?: readonly string[] };
}

let init: StudyWorkerInit | undefined;
const modules = Promise.all([import("./study_feeder.ts"), import("./pack_study.ts")]);

self.onmessage = async (e: MessageEvent) => {
  const [{ studyFeeder }, { packStudy }] = await modules;
  const m = e.data as
    | { kind: "init"; init: StudyWorkerInit }
    | { kind: "task"; id: string; payload: StudyTask };
  if (m.kind === "init") {
    init = m.init;
    return;
  }
  if (init === undefined) {
    self.postMessage({
      kind: "failed",
      id: m.id,
      message: "worker received a task before its settings",
    });
    return;
  }
  const feederId = m.payload.form.feederId;
  if (init.faults?.crash?.includes(feederId)) {
    setTimeout(() => {
      throw new Error(`injected crash on feeder "${feederId}"`);
    });
    return;
  }
  if (init.faults?.hang?.includes(feederId)) {
    const until = Date.now() + 60_000;
    while (Date.now() < until) { /* hang until terminated */ }
    return;
  }
  try {
    const t0 = performance.now();
    const value = packStudy(m.payload.summary, studyFeeder(m.payload.form, init.settings), {
      ...init.provenance,
      formHash: m.payload.formHash,
    });
    self.postMessage({ kind: "done", id: m.id, value, ms: performance.now() - t0 });
  } catch (err) {
    self.postMessage({
      kind: "failed",
      id: m.id,
      message: err instanceof Error ? err.message : String(err),
    });
  }
};
