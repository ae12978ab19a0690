/** Settings of the protection study; defaults are common practice (REFERENCES.md F). */
export interface ProtectionSettings {
  readonly enabled: boolean;
  /** Coordination time interval between a primary device and its backup, s. */
  readonly coordinationIntervalS: number;
  /** The minimum fault current in a device's zone must be this multiple of its pickup. */
  readonly sensitivityFactor: number;
  /** Time in which a fault on the busbar or a neighbouring feeder is cleared, s. */
  readonly neighbourClearingS: number;
  /** A proposed pickup is at least this multiple of the largest load current through the device. */
  readonly loadMargin: number;
  /** Range of the time multipliers a proposed scheme may use. */
  readonly minTms: number;
  readonly maxTms: number;
  /**
   * Feeders up to this many buses are checked: faults at every bus make the study grow with
   * the square of the feeder's size.
   */
  readonly maxBuses: number;
}

export const DEFAULT_PROTECTION_SETTINGS: ProtectionSettings = {
  enabled: true,
  coordinationIntervalS: 0.3, // 0.2–0.4 s, 0.3 s typical for numerical relays
  sensitivityFactor: 1.5, // 1.5–2 × pickup
  neighbourClearingS: 0.5, // a busbar or neighbour-feeder fault cleared within 0.5 s
  loadMargin: 1.25, // 1.2–1.5 × the largest load current
  minTms: 0.05,
  maxTms: 1.2,
  maxBuses: 3000,
};
