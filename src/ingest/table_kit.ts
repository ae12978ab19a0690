/**
 * Building blocks for table schemas. A table is declared once (file name, quantity
 * columns with their internal units, a zod row schema); the reader uses the declaration
 * to check the header, resolve unit factors and validate every row.
 *
 * Column schemas take the trimmed cell text, or undefined when the cell is empty or the
 * column is absent, and produce typed values in internal units.
 */
import { z } from "zod";
import type { InternalUnit } from "./units.ts";
import { phaseMask } from "../model/phases.ts";

export type Cell = string | undefined;

/** Unit conversion factors of one file, by column; filled from its header. */
export type UnitFactors = Readonly<Record<string, number>>;

export interface TableSpec<U extends string, T> {
  /** File name inside the network folder, e.g. `lines.csv`. */
  readonly file: string;
  readonly required: boolean;
  /** Columns that together identify a row (duplicates are errors). */
  readonly key: readonly string[];
  /** Further columns whose values must each differ from row to row (duplicates are errors). */
  readonly unique?: readonly string[];
  /** Columns that name buses, used to attribute a rejected row to its feeder. */
  readonly busColumns: readonly string[];
  /** Quantity columns and the unit each is converted to. */
  readonly units: Readonly<Record<U, InternalUnit>>;
  /** The row schema, given the unit factors of the file being read. */
  readonly row: (q: QuantityColumns<U>) => z.ZodType<T, Record<string, Cell>>;
}

export type QuantityColumns<U extends string> = Readonly<
  Record<U, z.ZodType<number, string>>
>;

export function defineTable<U extends string, T>(spec: TableSpec<U, T>): TableSpec<U, T> {
  return spec;
}

const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** A plain decimal number ("1.5", "-2e3"); decimal commas and hex are refused. */
export const numberText: z.ZodType<number, string> = z.string().transform((s, ctx) => {
  if (!NUMBER_PATTERN.test(s)) {
    ctx.issues.push({
      code: "custom",
      input: s,
      message: /^\d+,\d+$/.test(s) ? "must use a decimal point, not a comma" : "must be a number",
    });
    return z.NEVER;
  }
  const v = Number(s);
  if (!Number.isFinite(v)) {
    ctx.issues.push({ code: "custom", input: s, message: "must be a finite number" });
    return z.NEVER;
  }
  return v;
});

/** Quantity column schemas for a file: the number times the column's unit factor. */
export function quantityColumns<U extends string>(
  units: Readonly<Record<U, InternalUnit>>,
  factors: UnitFactors,
): QuantityColumns<U> {
  const out: Partial<Record<U, z.ZodType<number, string>>> = {};
  for (const name of Object.keys(units) as U[]) {
    const factor = factors[name] ?? 1;
    out[name] = numberText.transform((v) => v * factor);
  }
  return out as QuantityColumns<U>;
}

/** A required cell. */
export function required<T>(schema: z.ZodType<T, string>): z.ZodType<T, Cell> {
  return z.string({ error: "is required" }).pipe(schema);
}

/** An optional cell (empty or absent gives undefined). */
export function optional<T>(schema: z.ZodType<T, string>): z.ZodType<T | undefined, Cell> {
  return z.string().pipe(schema).optional();
}

/** An optional cell with a default. */
export function withDefault<T>(schema: z.ZodType<T, string>, value: T): z.ZodType<T, Cell> {
  return z.string().pipe(schema).optional().transform((v) => v === undefined ? value : v);
}

/** An identifier: printable, no leading or trailing space, at most 100 characters. */
export const idText: z.ZodType<string, string> = z.string()
  .max(100, { error: "must be at most 100 characters" })
  .regex(/^[^\s,;"'][^,;"']*$/, { error: "must be an identifier without commas or quotes" });

/** Free text (names, notes). */
export const freeText: z.ZodType<string, string> = z.string().max(500, {
  error: "must be at most 500 characters",
});

/** A case-insensitive choice among fixed words. */
export function choice<const V extends string>(values: readonly V[]): z.ZodType<V, string> {
  return z.string().transform((s, ctx) => {
    const v = s.toLowerCase().replace(/[\s-]+/g, "_");
    if ((values as readonly string[]).includes(v)) return v as V;
    ctx.issues.push({ code: "custom", input: s, message: `must be one of ${values.join(", ")}` });
    return z.NEVER;
  });
}

/** yes/no, true/false, 1/0. */
export const yesNo: z.ZodType<boolean, string> = z.string().transform((s, ctx) => {
  const v = s.toLowerCase();
  if (v === "yes" || v === "true" || v === "1") return true;
  if (v === "no" || v === "false" || v === "0") return false;
  ctx.issues.push({ code: "custom", input: s, message: "must be yes or no" });
  return z.NEVER;
});

/** Whole number. */
export const integerText: z.ZodType<number, string> = numberText.pipe(
  z.number().int({ error: "must be a whole number" }),
);

/** Phases as letters from A, B, C in any order ("ABC", "CA", "B"); stored as a bitmask. */
export const phasesText: z.ZodType<number, string> = z.string().transform((s, ctx) => {
  const t = s.toUpperCase();
  if (!/^[ABC]{1,3}$/.test(t) || new Set(t).size !== t.length) {
    ctx.issues.push({
      code: "custom",
      input: s,
      message: "must be phase letters from A, B, C, each at most once",
    });
    return z.NEVER;
  }
  return phaseMask(t);
});

export const positive = (schema: z.ZodType<number, string>) =>
  schema.pipe(z.number().positive({ error: "must be positive" }));
export const nonNegative = (schema: z.ZodType<number, string>) =>
  schema.pipe(z.number().nonnegative({ error: "must not be negative" }));
export const between = (schema: z.ZodType<number, string>, min: number, max: number) =>
  schema.pipe(
    z.number().min(min, { error: `must be between ${min} and ${max}` })
      .max(max, { error: `must be between ${min} and ${max}` }),
  );
