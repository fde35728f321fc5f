import seedrandom from 'seedrandom';

import type { Range } from './plant.ts';

/**
 * Seeded random draws for the demo generator. Each concern (elements, maintenance, environment,
 * measurement noise) gets its own stream, so adding a draw to one leaves the others unchanged.
 * Alea is seedrandom's fast generator; the same seed and stream give the same sequence everywhere.
 */
export class Rng {
  private readonly next: () => number;
  private spare: number | null = null;

  constructor(seed: string, stream: string) {
    this.next = seedrandom.alea(`${seed}/${stream}`);
  }

  /** Uniform on [0, 1). */
  uniform(): number {
    return this.next();
  }

  /** Uniform on (0, 1): safe under a logarithm. */
  open(): number {
    let u = this.next();
    while (u === 0) u = this.next();
    return u;
  }

  between(min: number, max: number): number {
    return min + (max - min) * this.next();
  }

  inRange(range: Range): number {
    return this.between(range.min, range.max);
  }

  /** Integer uniform on [min, max], both ends included. */
  int(min: number, max: number): number {
    return min + Math.floor((max - min + 1) * this.next());
  }

  chance(p: number): boolean {
    return this.next() < p;
  }

  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new Error('pick from an empty list');
    return items[Math.floor(items.length * this.next())];
  }

  /** A key drawn with probability proportional to its weight (keys in insertion order). */
  weighted<K extends string>(weights: Readonly<Record<K, number>>): K {
    const entries = Object.entries(weights) as [K, number][];
    const total = entries.reduce((sum, [, w]) => sum + w, 0);
    let u = this.next() * total;
    for (const [key, w] of entries) {
      u -= w;
      if (u < 0) return key;
    }
    return entries[entries.length - 1][0];
  }

  /** Standard normal by the Box–Muller transform (the second value of each pair is kept). */
  normal(): number {
    if (this.spare !== null) {
      const z = this.spare;
      this.spare = null;
      return z;
    }
    const r = Math.sqrt(-2 * Math.log(this.open()));
    const theta = 2 * Math.PI * this.next();
    this.spare = r * Math.sin(theta);
    return r * Math.cos(theta);
  }

  /** Lognormal with the given median and log-scale standard deviation. */
  lognormal(median: number, sigma: number): number {
    return median * Math.exp(sigma * this.normal());
  }

  exponential(mean: number): number {
    return -mean * Math.log(this.open());
  }

  /** Two-parameter Weibull by inversion: scale · (−ln U)^(1/shape). */
  weibull(shape: number, scale: number): number {
    return scale * Math.pow(-Math.log(this.open()), 1 / shape);
  }
}
