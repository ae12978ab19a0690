/**
 * HTML text built by a tagged template that escapes every interpolated value unless it is
 * already Html: `html\`<td>${feederId}</td>\`` is safe whatever the id holds.
 */

/** Markup that is already safe to insert. */
export interface Html {
  readonly __html: string;
}

export type HtmlValue =
  | string
  | number
  | Html
  | null
  | undefined
  | false
  | readonly HtmlValue[];

const ENTITIES: Readonly<Record<string, string>> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/** Text (or an attribute value) with `& < > " '` replaced by entities. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ENTITIES[c]!);
}

/** Markup taken as it is (for text this module or a trusted renderer produced). */
export function raw(markup: string): Html {
  return { __html: markup };
}

function part(v: HtmlValue): string {
  if (v === null || v === undefined || v === false) return "";
  if (typeof v === "string") return escapeHtml(v);
  if (typeof v === "number") return escapeHtml(String(v));
  if (Array.isArray(v)) return (v as readonly HtmlValue[]).map(part).join("");
  return (v as Html).__html;
}

export function html(strings: TemplateStringsArray, ...values: readonly HtmlValue[]): Html {
  let out = strings[0]!;
  for (let i = 0; i < values.length; i++) out += part(values[i]) + strings[i + 1]!;
  return { __html: out };
}
