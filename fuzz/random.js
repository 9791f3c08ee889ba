/**
 * Seeded pseudo-random numbers for the fuzzer (no Math.random anywhere): sfc32 seeded through splitmix32.
 * Every call of a run gets its own stream from (seed, call index), so a call's input depends on nothing
 * but those two numbers: the same seed gives the same calls whatever the number of child processes, the
 * order they finish in, or `--only`.
 */
'use strict';

/** A 32-bit hash of a text or a number (FNV-1a over the text's UTF-16 units), for seeds given as words. */
function hashSeed(seed) {
  const text = String(seed);
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** splitmix32: spreads one 32-bit state into well-mixed words (used only to seed sfc32). */
function splitmix32(state) {
  let s = state >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/**
 * A random stream for call `index` of a run with `seed`.
 * @returns {Rng}
 */
function streamFor(seed, index) {
  const mix = splitmix32(hashSeed(seed) ^ Math.imul(index + 1, 0x9e3779b1));
  let a = mix();
  let b = mix();
  let c = mix();
  let d = mix();
  const next = () => {
    // sfc32 (Chris Doty-Humphrey's Small Fast Counting generator)
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) >>> 0;
    return t >>> 0;
  };
  for (let i = 0; i < 12; i++) next();
  return new Rng(next);
}

/** Helpers over a stream of 32-bit words. */
class Rng {
  constructor(next) {
    this.next = next;
  }

  /** Uniform in [0, 1) with 53 random bits. */
  float() {
    const hi = this.next() >>> 5;
    const lo = this.next() >>> 6;
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform in [lo, hi). */
  uniform(lo, hi) {
    return lo + (hi - lo) * this.float();
  }

  /** Whole number in [lo, hi] (both inclusive). */
  int(lo, hi) {
    return lo + Math.floor(this.float() * (hi - lo + 1));
  }

  /** Log-uniform in [lo, hi] for 0 < lo < hi. */
  logUniform(lo, hi) {
    return Math.exp(this.uniform(Math.log(lo), Math.log(hi)));
  }

  /** Whole number, log-uniform in [lo, hi] (lo ≥ 1). */
  logInt(lo, hi) {
    return Math.min(hi, Math.max(lo, Math.round(this.logUniform(lo, hi))));
  }

  /** True with probability p. */
  chance(p) {
    return this.float() < p;
  }

  /** One element of a list. */
  pick(list) {
    return list[Math.floor(this.float() * list.length)];
  }

  /** One key of `weights` ({ key: weight }), with probability proportional to its weight. */
  weighted(weights) {
    const entries = Object.entries(weights);
    const total = entries.reduce((s, [, w]) => s + w, 0);
    let r = this.float() * total;
    for (const [key, w] of entries) {
      r -= w;
      if (r < 0) return key;
    }
    return entries[entries.length - 1][0];
  }

  /** Standard normal (Box–Muller, one of the pair). */
  normal() {
    const u = 1 - this.float();
    const v = this.float();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }
}

module.exports = { streamFor, hashSeed, Rng };
