/**
 * The HTML id of a feeder's section: "feeder-" and the id with every character outside
 * [A-Za-z0-9-] written as "_<hex code point>_". Distinct ids give distinct anchors, and the
 * anchor needs no escaping in an attribute, a URL fragment or a CSS selector.
 */
export function feederAnchor(feederId: string): string {
  let out = "feeder-";
  for (const ch of feederId) {
    out += /[A-Za-z0-9-]/.test(ch) ? ch : `_${ch.codePointAt(0)!.toString(16)}_`;
  }
  return out;
}
