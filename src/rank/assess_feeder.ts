/**
 * A feeder's needs, from the findings of its study: classified, each with the remedy that
 * removes it, and the feeder's generation headroom. Runs where the feeder's form is (a
 * worker), since remedies are checked by studying the changed feeder again.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { Finding } from "../checks/finding.ts";
import type { StudySettings } from "../pipeline/study_feeder.ts";
import type { DgHeadroom, Need } from "./need.ts";
import { classifyNeeds } from "./classify_needs.ts";
import { designRemedies } from "./design_remedies.ts";
import { computeDgHeadroom } from "./dg_headroom.ts";
import type { FeederHosting } from "../hosting/host_feeder.ts";

export function assessFeeder(
  form: FeederForm,
  settings: StudySettings,
  findings: readonly Finding[],
  hosting: FeederHosting | null = null,
): { needs: Need[]; headroom: DgHeadroom | null } {
  const headroom = computeDgHeadroom(form, settings, settings.remedies.headroomMaxFactor);
  const drafts = classifyNeeds(form, findings);
  const needs = designRemedies(form, drafts, {
    settings,
    costs: settings.costs,
    options: settings.remedies,
    headroom,
    hosting,
  });
  return { needs, headroom };
}
