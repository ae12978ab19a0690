/** Deterministic shares of a fleet for runs spread over several machines. */

export interface Shard {
  /** 1-based index of this share. */
  readonly index: number;
  readonly count: number;
}

/** 32-bit FNV-1a of the lower-cased feeder id (Fowler–Noll–Vo, public-domain hash). */
export function hashFeederId(id: string): number {
  let h = 0x811c9dc5;
  const s = id.toLowerCase();
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** True when the feeder belongs to the shard. */
export function inShard(feederId: string, shard: Shard): boolean {
  return hashFeederId(feederId) % shard.count === shard.index - 1;
}

/** Reads "i/N" with 1 ≤ i ≤ N; undefined when the text is not of that form. */
export function parseShard(text: string): Shard | undefined {
  const m = /^(\d+)\/(\d+)$/.exec(text.trim());
  if (!m) return undefined;
  const index = Number(m[1]), count = Number(m[2]);
  return count >= 1 && index >= 1 && index <= count ? { index, count } : undefined;
}
