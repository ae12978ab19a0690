/** The switching devices of a feeder with the settings their time–current curves need. */
import type { FeederForm } from "../model/feeder_form.ts";
import type { DeviceCurves } from "./feeder_file.ts";

export function describeDevices(form: FeederForm): DeviceCurves[] {
  return form.devices.map((d) => ({
    id: d.id,
    kind: d.kind,
    branchId: form.branchIds[d.branch]!,
    toBus: form.busIds[form.branchTo[d.branch]!]!,
    isHead: d.isHead,
    ratedCurrentA: d.ratedCurrentA ?? null,
    breakingCurrentA: d.breakingCurrentA ?? null,
    relays: d.relays.map((r) => ({ id: r.id, stages: r.stages })),
    fuseCurve: d.fuseCurve === undefined
      ? null
      : { id: d.fuseCurve.id, melt: d.fuseCurve.melt, clear: d.fuseCurve.clear },
  }));
}
