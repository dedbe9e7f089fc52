// A reproducible invented shelf for the solver benchmark: SMA cables of many lengths (male/male), female/female
// barrels, male/female attenuators, adapters and DC blocks, from a seeded generator.
import { lineDelayPs } from '../../shared/domain/cable.js';
import type { ConnectorEnd } from '../../shared/domain/connectors.js';
import type { SolverPart } from '../../shared/domain/solver.js';

/** Mulberry32: a small seeded generator, so every run measures the same shelf. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const male: ConnectorEnd = { type: 'sma', gender: 'male' };
const female: ConnectorEnd = { type: 'sma', gender: 'female' };

/** `count` parts: about 2/3 cables, the rest barrels, attenuators, adapters and DC blocks. */
export function benchShelf(count: number, seed = 7): SolverPart[] {
  const rand = seeded(seed);
  const parts: SolverPart[] = [];
  for (let i = 0; i < count; i++) {
    const id = i + 1;
    const r = i % 15;
    if (r < 10) {
      const lengthMm = Math.round(100 + rand() * 1400);
      parts.push({ id, tag: `CB-${id}`, kind: 'cable', ends: [male, male], delayPs: lineDelayPs(lengthMm, 0.695) + (rand() - 0.5) * 2, delaySource: rand() < 0.3 ? 'measured' : 'computed', lengthMm, loss: { dbPerM: 0.9 + rand() * 0.6, refHz: 6e9 } });
    } else if (r < 12) {
      parts.push({ id, tag: `BR-${id}`, kind: 'adapter', ends: [female, female], delayPs: 30 + rand() * 15, delaySource: 'entered', lengthMm: 0, loss: { db: 0.05 + rand() * 0.05 } });
    } else if (r < 14) {
      parts.push({ id, tag: `AT-${id}`, kind: 'attenuator', ends: [male, female], delayPs: 20 + rand() * 20, delaySource: 'entered', lengthMm: 0, loss: { db: [3, 6, 10, 20][Math.floor(rand() * 4)]! } });
    } else {
      parts.push({ id, tag: `DC-${id}`, kind: 'dc-block', ends: [male, female], delayPs: 25 + rand() * 20, delaySource: 'entered', lengthMm: 0, loss: { db: 0.2 } });
    }
  }
  return parts;
}
