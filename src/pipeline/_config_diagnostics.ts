/**
 * From JSON-with-comments text and zod issues to located diagnostics: syntax errors,
 * duplicate keys, unknown keys and schema issues, each at its line and character column.
 * Private to the pipeline configuration reader.
 */
import { findNodeAtLocation, type Node, printParseErrorCode } from "jsonc-parser";
import type { ParseError } from "jsonc-parser";
import type { z } from "zod";
import { type Diagnostic, makeDiagnostic, type SourceLocation } from "../model/diagnostic.ts";

export type Path = readonly PropertyKey[];
export type Locate = (offset: number, path: Path) => SourceLocation;

export interface FlatIssue {
  readonly path: Path;
  readonly issue: z.core.$ZodIssue;
}

/** Rule text for zod's own checks, phrased to follow `path "value"`. */
export function ruleFor(iss: z.core.$ZodRawIssue): string | undefined {
  switch (iss.code) {
    case "invalid_type":
      if (iss.input === undefined) return "is required";
      if (iss.expected === "int") return "must be a whole number";
      if (typeof iss.input === "number") return "must be a finite number";
      return `must be ${article(iss.expected)}, not ${article(jsonType(iss.input))}`;
    case "too_small":
    case "too_big": {
      const small = iss.code === "too_small";
      const bound = String(small ? iss.minimum : iss.maximum);
      if (iss.origin === "string") return "must not be empty";
      if (iss.origin === "array") {
        return `must hold ${small ? "at least" : "at most"} ${bound} entries`;
      }
      const word = iss.inclusive ? (small ? "at least" : "at most") : (small ? "above" : "below");
      return `must be ${word} ${bound}`;
    }
    case "invalid_value":
      return `must be one of ${quoteList(iss.values.map(String))}`;
    default:
      return undefined;
  }
}

export function article(type: string): string {
  return type === "null" ? "null" : `${/^[aeiou]/.test(type) ? "an" : "a"} ${type}`;
}

export function jsonType(value: unknown): string {
  return value === null ? "null" : Array.isArray(value) ? "array" : typeof value;
}

/** What was expected, in words, for the `expected` field of a diagnostic. */
export function expectedFor(issue: z.core.$ZodIssue): string {
  if (issue.code === "invalid_type") {
    return issue.expected === "int" ? "a whole number" : article(issue.expected);
  }
  const given = issue.code === "custom" ? issue.params?.["expected"] : undefined;
  return typeof given === "string" ? given : issue.message.replace(/^(must be|must|is) /, "");
}

export function quoteList(names: readonly string[]): string {
  return names.map((n) => `"${n}"`).join(", ");
}

/** Spreads union issues into the issues of the branch that fits the value's type. */
export function flatten(issues: readonly z.core.$ZodIssue[], prefix: Path): FlatIssue[] {
  const out: FlatIssue[] = [];
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    if (issue.code === "invalid_union") {
      const fitting = issue.errors.filter((b) =>
        !(b.length === 1 && b[0]!.code === "invalid_type" && b[0]!.path.length === 0)
      );
      if (fitting.length === 1) {
        out.push(...flatten(fitting[0]!, path));
        continue;
      }
    }
    out.push({ path, issue });
  }
  return out;
}

export function pathText(path: Path): string {
  let s = "";
  for (const p of path) {
    s += typeof p === "number" ? `[${p}]` : `${s === "" ? "" : "."}${String(p)}`;
  }
  return s;
}

export function valueAt(value: unknown, path: Path): Record<PropertyKey, unknown> {
  let v = value;
  for (const p of path) v = (v as Record<PropertyKey, unknown>)[p];
  return v as Record<PropertyKey, unknown>;
}

/** The node at `path`, or else its nearest ancestor that exists. */
export function nearestNode(root: Node, path: Path): { node: Node; exact: boolean } {
  for (let n = path.length; n >= 0; n--) {
    const node = findNodeAtLocation(root, path.slice(0, n) as (string | number)[]);
    if (node !== undefined) return { node, exact: n === path.length };
  }
  return { node: root, exact: false };
}

export function foundText(body: string, node: Node): string {
  if (node.type === "object") return "{…}";
  if (node.type === "array") return "[…]";
  const s = node.type === "string"
    ? String(node.value)
    : body.slice(node.offset, node.offset + node.length);
  return s.length > 60 ? `${s.slice(0, 59)}…` : s;
}

export function issueDiagnostic(
  root: Node,
  body: string,
  f: FlatIssue,
  locate: Locate,
): Diagnostic {
  const { node, exact } = nearestNode(root, f.path);
  const what = f.path.length === 0 ? "the top level" : pathText(f.path);
  const found = exact ? foundText(body, node) : undefined;
  const rule = f.issue.message;
  const preset = f.issue.code === "custom" && f.issue.params?.["code"] === "config.preset";
  return makeDiagnostic(
    preset ? "config.preset" : "config.invalid",
    "error",
    `Cannot use pipeline config: ${what}${found === undefined ? "" : ` "${found}"`} ${rule}`,
    {
      at: locate(node.offset, f.path),
      found,
      expected: expectedFor(f.issue),
    },
  );
}

export function unknownKeyDiagnostics(root: Node, f: FlatIssue, locate: Locate): Diagnostic[] {
  const keys = (f.issue as z.core.$ZodIssueUnrecognizedKeys).keys;
  return keys.map((key) => {
    const value = findNodeAtLocation(root, [...f.path, key] as (string | number)[]);
    const keyNode = value?.parent?.children?.[0] ?? root;
    const where = f.path.length === 0 ? "at the top level" : `in ${pathText(f.path)}`;
    return makeDiagnostic(
      "config.unknown_key",
      "warning",
      `Pipeline config: unknown key "${key}" ${where} is ignored`,
      {
        at: locate(keyNode.offset, [...f.path, key]),
        found: key,
        expected: "a key listed in docs/pipeline.md",
      },
    );
  });
}

/** A key written twice in one object: JSON keeps the last silently, so it is an error. */
export function duplicateKeys(root: Node, locate: Locate): Diagnostic[] {
  const out: Diagnostic[] = [];
  const walk = (node: Node, path: Path): void => {
    const first = new Map<string, Node>();
    for (const [i, child] of (node.children ?? []).entries()) {
      if (node.type === "array") walk(child, [...path, i]);
      if (node.type !== "object") continue;
      const [keyNode, valueNode] = child.children ?? [];
      if (keyNode === undefined) continue;
      const key = String(keyNode.value);
      const earlier = first.get(key);
      if (earlier === undefined) first.set(key, keyNode);
      else {
        const at = locate(keyNode.offset, [...path, key]);
        out.push(makeDiagnostic(
          "config.invalid",
          "error",
          `Cannot use pipeline config: key "${key}" appears twice in ${
            path.length === 0 ? "the top level" : pathText(path)
          } (first on line ${locate(earlier.offset, []).line})`,
          { at, found: key, expected: "each key once per object" },
        ));
      }
      if (valueNode !== undefined) walk(valueNode, [...path, key]);
    }
  };
  walk(root, []);
  return out;
}

/** What each JSON syntax error means, and what was expected instead. */
export const SYNTAX_WORDS: Readonly<Record<string, readonly [string, string]>> = {
  InvalidSymbol: ["unexpected character", "a JSON value, key or punctuation"],
  InvalidNumberFormat: ["malformed number", "a JSON number such as 0.5 or 1e-9"],
  PropertyNameExpected: ["expected a key in double quotes", "a key in double quotes"],
  ValueExpected: ["expected a value", "a value"],
  ColonExpected: ["expected a colon after the key", "a colon"],
  CommaExpected: ["expected a comma", "a comma"],
  CloseBraceExpected: ["expected a closing brace", "}"],
  CloseBracketExpected: ["expected a closing bracket", "]"],
  EndOfFileExpected: ["expected the end of the file", "the end of the file"],
  InvalidCommentToken: ["malformed comment", "a // or /* */ comment"],
  UnexpectedEndOfComment: ["comment not closed", "*/ to close the comment"],
  UnexpectedEndOfString: ["string not closed", "a closing double quote"],
  UnexpectedEndOfNumber: ["number ends too early", "digits to end the number"],
  InvalidUnicode: ["malformed unicode escape", "\\u and four hex digits"],
  InvalidEscapeCharacter: [
    "unknown escape in a string",
    'one of \\" \\\\ \\/ \\b \\f \\n \\r \\t \\u',
  ],
  InvalidCharacter: ["control character in a string", "an escape such as \\t instead"],
};

/**
 * The syntax errors worth reporting: after an error the parser guesses, so a later error on
 * the same line, or inside the span of the previous one (an unclosed comment or string runs
 * to the end), is left out as an echo of it.
 */
export function syntaxDiagnostics(
  body: string,
  errors: readonly ParseError[],
  locate: Locate,
): Diagnostic[] {
  const out: Diagnostic[] = [];
  let lastLine = 0, lastEnd = -1;
  for (const e of errors) {
    const at = locate(e.offset, []);
    if (at.line === lastLine || e.offset <= lastEnd) continue;
    lastLine = at.line ?? 0;
    lastEnd = e.offset + e.length;
    const [words, expected] = SYNTAX_WORDS[printParseErrorCode(e.error)] ??
      ["malformed JSON", "JSON with comments"];
    const end = e.offset >= body.length;
    const span = body.slice(e.offset, e.offset + Math.max(e.length, 1)).split(/\r\n|\r|\n/)[0]!;
    const found = end ? "end of file" : span.length > 40 ? `${span.slice(0, 39)}…` : span;
    const shown = end ? "the end of the file" : found.startsWith('"') ? found : `"${found}"`;
    out.push(makeDiagnostic(
      "config.syntax",
      "error",
      `Cannot read pipeline config: ${words}, found ${shown}`,
      { at, found, expected },
    ));
  }
  return out;
}

/** Offset → 1-based line and character column (code points; CR, LF and CRLF end lines). */
export function locator(body: string, file: string): Locate {
  const starts = [0];
  for (let i = 0; i < body.length; i++) {
    const c = body.charCodeAt(i);
    if (c === 10 || (c === 13 && body.charCodeAt(i + 1) !== 10)) starts.push(i + 1);
  }
  return (offset, path) => {
    let lo = 0, hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid]! <= offset) lo = mid;
      else hi = mid - 1;
    }
    const column = [...body.slice(starts[lo]!, offset)].length + 1;
    const field = pathText(path);
    return field === "" ? { file, line: lo + 1, column } : { file, line: lo + 1, column, field };
  };
}
