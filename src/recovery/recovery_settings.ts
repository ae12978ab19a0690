/**
 * Settings of the post-fault recovery screen: the case the feeder recovers in, the voltage it
 * must get back to, how long a breaker takes to open after its relay, the ride-through
 * categories generators may name, and the motor data loads leave out.
 *
 * Ride-through presets: IEEE 1547-2018 default under-voltage trip settings, pu / clearing
 * time [memory] (../shared/guide/REFERENCES.md E gives Categories II and III): Category I
 * UV2 0.45/0.16 s, UV1 0.70/2.0 s; Category II UV2 0.45/0.16 s, UV1 0.70/10 s; Category III
 * UV2 0.50/2.0 s, UV1 0.88/21 s. Below the momentary-cessation voltage a unit stops injecting
 * during the disturbance and resumes after it: 0.50 pu for Categories I and III, 0.30 pu for
 * Category II [memory].
 */

/** A unit trips when its voltage stays below vPu for at least seconds. */
export interface TripPoint {
  readonly vPu: number;
  readonly seconds: number;
}

export interface RideThroughCategory {
  readonly label: string;
  /** Under-voltage trip points; the unit trips at the first it crosses. */
  readonly trip: readonly TripPoint[];
  /** Below this voltage the unit ceases to inject while the voltage is low (null: never). */
  readonly cessationPu: number | null;
}

export interface RecoverySettings {
  readonly enabled: boolean;
  /** The case the feeder recovers in: peak demand, scaled; generation scaled. */
  readonly demandScale: number;
  readonly generationScale: number;
  /** A bus below this voltage after the fault is cleared has not recovered, pu. */
  readonly recoveryThresholdPu: number;
  /** Breaker opening time added to a relay's operating time, s (fuses clear in their own time). */
  readonly breakerOpeningS: number;
  /** A fault no device clears is taken to last this long, s. */
  readonly unclearedS: number;
  /** Category of a generator that names none. */
  readonly defaultCategory: string;
  readonly categories: Readonly<Record<string, RideThroughCategory>>;
  /** Motor data where a load gives none. */
  readonly motor: {
    readonly stallVoltagePu: number;
    readonly stallTimeS: number;
    /** Locked-rotor apparent power over the motor's running power, and its power factor. */
    readonly lockedRotorRatio: number;
    readonly lockedRotorPowerFactor: number;
  };
  /** Feeders up to this many buses are screened (faults at every bus: grows with the square). */
  readonly maxBuses: number;
  /** Faults with consequences kept per feeder file (the worst first). */
  readonly maxFaultsListed: number;
}

export const RIDE_THROUGH_PRESETS: Readonly<Record<string, RideThroughCategory>> = {
  I: {
    label: "IEEE 1547-2018 Category I default",
    trip: [{ vPu: 0.45, seconds: 0.16 }, { vPu: 0.7, seconds: 2 }],
    cessationPu: 0.5,
  },
  II: {
    label: "IEEE 1547-2018 Category II default",
    trip: [{ vPu: 0.45, seconds: 0.16 }, { vPu: 0.7, seconds: 10 }],
    cessationPu: 0.3,
  },
  III: {
    label: "IEEE 1547-2018 Category III default",
    trip: [{ vPu: 0.5, seconds: 2 }, { vPu: 0.88, seconds: 21 }],
    cessationPu: 0.5,
  },
};

export const DEFAULT_RECOVERY_SETTINGS: RecoverySettings = {
  enabled: true,
  demandScale: 1,
  generationScale: 1,
  recoveryThresholdPu: 0.8,
  breakerOpeningS: 0.06, // three cycles at 50 Hz, common practice
  unclearedS: 5,
  defaultCategory: "II",
  categories: RIDE_THROUGH_PRESETS,
  motor: {
    // Common practice [memory]: small induction motors (compressors) stall below about
    // 0.7 pu within a few cycles; locked-rotor current 5–7 × rated at power factor 0.2–0.4.
    stallVoltagePu: 0.7,
    stallTimeS: 0.1,
    lockedRotorRatio: 6,
    lockedRotorPowerFactor: 0.3,
  },
  maxBuses: 3000,
  maxFaultsListed: 50,
};
