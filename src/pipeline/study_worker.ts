/**
 * Worker entry of the fleet study: receives the study settings once, then feeder forms,
 * and answers each with the feeder's study. A test-only fault hook (init.faults) makes it
 * crash or hang on named feeders, to exercise the pool's recovery.
 */
/// <reference lib="deno.worker" />
import type { FeederForm } from "../model/feeder_form.ts";
import { studyFeeder, type StudySettings } from "./study_feeder.ts";

export interface StudyWorkerInit {
  readonly settings: StudySettings;
  readonly faults?: { readonly crash?: readonly string[]; readonly hang?: readonly string[] };
}

let init: StudyWorkerInit | undefined;

self.onmessage = (e: MessageEvent) => {
  const m = e.data as
    | { kind: "init"; init: StudyWorkerInit }
    | { kind: "task"; id: string; payload: FeederForm };
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
  const feederId = m.payload.feederId;
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
    const value = studyFeeder(m.payload, init.settings);
    self.postMessage({ kind: "done", id: m.id, value, ms: performance.now() - t0 });
  } catch (err) {
    self.postMessage({
      kind: "failed",
      id: m.id,
      message: err instanceof Error ? err.message : String(err),
    });
  }
};
