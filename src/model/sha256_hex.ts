/** SHA-256 of byte chunks taken in order, as lowercase hex. */
export async function sha256Hex(parts: readonly Uint8Array[]): Promise<string> {
  let total = 0;
  for (const p of parts) total += p.length;
  const all = new Uint8Array(total);
  let at = 0;
  for (const p of parts) {
    all.set(p, at);
    at += p.length;
  }
  const digest = await crypto.subtle.digest("SHA-256", all);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}
