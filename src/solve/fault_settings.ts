/**
 * Settings of the short-circuit study (IEC 60909-0:2016, equivalent voltage source at the
 * fault location): voltage factors per level, the conductor temperature for minimum
 * currents, defaults for machine data an export leaves out, and the limits of the checks.
 * Values marked [memory] are recalled from the standard, not read from it
 * (../shared/guide/REFERENCES.md D).
 */

export interface FaultSettings {
  /** Run the short-circuit study. */
  readonly enabled: boolean;
  /** Voltage factor c for maximum and minimum currents, MV and HV (above lvMaxKv). */
  readonly cMaxMv: number;
  readonly cMinMv: number;
  /** Voltage factor c for LV (at or below lvMaxKv). */
  readonly cMaxLv: number;
  readonly cMinLv: number;
  /** Conductor temperature at the end of a short circuit, for minimum currents, °C. */
  readonly lineEndTemperatureC: number;
  /** Generation in service for minimum currents (default out: the lowest current). */
  readonly minWithGeneration: boolean;
  /** Converter fault current where a generator does not state one, pu of rated current. */
  readonly converterLimitPu: number;
  /** Rated power factor of synchronous generators for the KG correction. */
  readonly synchronousPowerFactor: number;
  /** Breaking or making duty above this share of the device's rating is a warning, %. */
  readonly dutyWarnPercent: number;
  /** Rise of a bus's maximum three-phase current caused by generation that is reported, %. */
  readonly generationIncreaseLimitPercent: number;
  /** Meshed feeders up to this many buses are solved with the full impedance matrix. */
  readonly meshedMaxBuses: number;
}

export const DEFAULT_FAULT_SETTINGS: FaultSettings = {
  enabled: true,
  cMaxMv: 1.1, // IEC 60909-0 table 1 [memory]
  cMinMv: 1.0, // [memory]
  cMaxLv: 1.1, // 1.10 for systems with +10 % tolerance; 1.05 for +6 % [memory]
  cMinLv: 0.95, // [memory]
  lineEndTemperatureC: 80, // common practice for PVC/XLPE-insulated and bare conductors
  minWithGeneration: false,
  converterLimitPu: 1.2, // common practice: 1.1–1.5 (REFERENCES.md F)
  synchronousPowerFactor: 0.8, // common practice for small units
  dutyWarnPercent: 90, // common practice
  generationIncreaseLimitPercent: 10, // a common screening criterion
  meshedMaxBuses: 1500,
};
