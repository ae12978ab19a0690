/** Limits the checks apply; filled from the pipeline configuration. */

export interface VoltageBand {
  readonly vMinPu: number;
  readonly vMaxPu: number;
}

export interface CheckLimits {
  readonly voltageBand: { readonly mv: VoltageBand; readonly lv: VoltageBand };
  /** Buses at or below this nominal voltage are LV. */
  readonly lvMaxKv: number;
  readonly voltageChange: { readonly mvLimitPercent: number; readonly lvLimitPercent: number };
  readonly thermal: { readonly limitPercent: number; readonly warnPercent: number };
  readonly reversePower: { readonly headLimitKw: number; readonly transformerLimitKw: number };
  readonly losses: { readonly warnPercent: number };
}

export interface CheckSelection {
  readonly voltageBand: boolean;
  readonly voltageChange: boolean;
  readonly thermal: boolean;
  readonly reversePower: boolean;
  readonly losses: boolean;
}
