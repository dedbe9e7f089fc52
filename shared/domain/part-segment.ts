import type { Part } from '../schemas/parts.js';
import type { Segment } from './analysis.js';

/** An inventory part as an analysis segment: a cable with its facts, other parts with their loss and delay. */
export function partToSegment(part: Part): Segment {
  if (part.kind === 'cable') {
    return {
      kind: 'cable',
      lengthMm: part.lengthMm!,
      velocityFactor: part.velocityFactor,
      dielectric: part.dielectric,
      measuredDelayPs: part.measuredDelayPs,
      lossDbPerM: part.lossDbPerM,
      lossRefHz: part.lossRefHz,
      tag: part.tag,
    };
  }
  if (part.kind === 'attenuator') return { kind: 'attenuator', lossDb: part.lossDb ?? 0, delayPs: part.delayPs, tag: part.tag };
  return { kind: part.kind, lossDb: part.lossDb, delayPs: part.delayPs, tag: part.tag };
}
