/** Limits the checks apply and which checks run; filled from the pipeline configuration. */

/** A voltage range in pu of the bus's nominal voltage. */
export interface VoltageRange {
  readonly vMinPu: number;
  readonly vMaxPu: number;
}

export interface CheckLimits {
  /** Steady-state voltage band at MV and LV buses. */
  readonly voltageBand: { readonly mv: VoltageRange; readonly lv: VoltageRange };
  /** Buses at or below this nominal voltage count as LV, kV. */
  readonly lvMaxKv: number;
  /** Voltage change caused by generation, planning limits in % of nominal. */
  readonly voltageChange: { readonly mvLimitPercent: number; readonly lvLimitPercent: number };
  /** Branch loading in % of rating: a finding above limitPercent, a warning above warnPercent. */
  readonly thermal: { readonly limitPercent: number; readonly warnPercent: number };
  /** Reverse active power above which a finding is raised, kW. */
  readonly reversePower: { readonly headLimitKw: number; readonly transformerLimitKw: number };
  /** Losses as a share of the power fed in (source import plus generation), %. */
  readonly losses: { readonly warnPercent: number };
}

export interface CheckSelection {
  readonly voltageBand: boolean;
  readonly voltageChange: boolean;
  readonly thermal: boolean;
  readonly reversePower: boolean;
  readonly losses: boolean;
}
