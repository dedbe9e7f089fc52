import { describe, expect, it } from 'vitest';
import type { Part } from '../../shared/schemas/parts.js';
import {
  checkDraft,
  draftFromDocument,
  editableChain,
  emptySegment,
  newDraft,
  newSource,
  previewAnalysis,
  setElements,
  toDocument,
  type Draft,
} from '../../src/features/setups/utils/setup-draft.js';

/** A demo-like PTFE cable (VF 0.695, 1.4 dB/m at 6 GHz), as GET /api/parts returns it. */
function cable(id: number, tag: string, lengthMm: number): Part {
  return {
    id, tag, kind: 'cable', description: 'Flexible PTFE cable', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', status: 'ok', notes: '',
    lengthMm, dielectric: 'ptfe', velocityFactor: 0.695, velocityFactorSource: 'datasheet', lossDbPerM: 1.4, lossRefHz: 6e9,
    measuredDelayPs: null, measuredOn: null, measuredHow: null, lossDb: null, delayPs: (lengthMm / 1000 / (0.695 * 299_792_458)) * 1e12,
    computedDelayPs: null, delaySource: 'computed', maxInputDbm: null, minFrequencyHz: null, maxFrequencyHz: null,
    delayPerMetrePs: null, freeSpaceLengthMm: null, createdAt: '', updatedAt: '',
  };
}

const parts = new Map([cable(3, 'C-003', 250), cable(4, 'C-004', 260)].map((p) => [p.id, p]));

/** The W-04 wiring: desired at 5 GHz, 10 mm more cable on input 1, λ/2 spacing at 5 GHz. */
function w04(): Draft {
  const draft = newDraft({ title: 'W-04', generatorId: null, outputIds: [] });
  const source = draft.sources[0]!;
  editableChain(draft, source.id, 0).push({ ...emptySegment('part'), partId: 3 });
  editableChain(draft, source.id, 1).push({ ...emptySegment('part'), partId: 4 });
  return draft;
}

describe('setup editor draft', () => {
  it('resolves inventory parts for the live preview: 10 mm more at VF 0.695 emulates 28.68203° (RF-PRIMER W-04)', () => {
    const check = checkDraft(w04(), parts);
    expect([...check.errors]).toEqual([]);
    const result = previewAnalysis(check.analysisInput)!;
    expect(result.sources[0]!.relativeDelaysPs[1]).toBeCloseTo(47.99483, 4);
    expect(Math.abs(result.sources[0]!.angleDeg! - 28.68203)).toBeLessThan(1e-5);
    expect(check.document!.analysis.paths.map((p) => p.segments)).toEqual([[{ partId: 3 }], [{ partId: 4 }]]);
  });

  it('turns GHz into Hz without binary noise (5.1 GHz is 5 100 000 000 Hz, not 5 099 999 999.999999)', () => {
    const draft = w04();
    draft.sources[0]!.frequencyGhz = '5.1';
    const doc = toDocument(draft).document as { analysis: { sources: { frequencyHz: number }[] } };
    expect(doc.analysis.sources[0]!.frequencyHz).toBe(5_100_000_000);
  });

  it('names the field of an ad-hoc segment that is wrong, not only that the segment matches no kind', () => {
    const draft = w04();
    const source = draft.sources[0]!;
    editableChain(draft, source.id, 1).push({ ...emptySegment('ad-hoc'), kind: 'attenuator', lossDb: '' });
    editableChain(draft, source.id, 0).push({ ...emptySegment('ad-hoc'), kind: 'other', delayPs: '-3' });
    const check = checkDraft(draft, parts);
    expect(check.errors.get('analysis.paths.1.segments.1.lossDb')).toBe('Attenuation must be a number');
    expect(check.errors.get('analysis.paths.0.segments.1.delayPs')).toBe('Delay cannot be negative');
    expect(check.document).toBeNull();
    expect(check.analysisInput).toBeNull();
  });

  it('asks for a part where none is picked, and refuses one the inventory does not have', () => {
    const draft = w04();
    const source = draft.sources[0]!;
    editableChain(draft, source.id, 0).push(emptySegment('part'));
    editableChain(draft, source.id, 1).push({ ...emptySegment('part'), partId: 99 });
    const check = checkDraft(draft, parts);
    expect(check.errors.get('analysis.paths.0.segments.1.partId')).toMatch(/^Choose a part/);
    expect(check.errors.get('analysis.paths.1.segments.1.partId')).toBe('Part #99 is not in the inventory');
  });

  it('keeps one path per source and input, in the order the server reports paths by', () => {
    const draft = w04();
    draft.sources.push(newSource('interferer', 'jam'));
    setElements(draft, 3);
    const doc = toDocument(draft).document as { analysis: { paths: { source: string; channel: number }[]; combiner: { delaysPs: number[] } } };
    expect(doc.analysis.paths.map((p) => `${p.source}#${p.channel}`)).toEqual(['desired#0', 'desired#1', 'desired#2', 'jam#0', 'jam#1', 'jam#2']);
    expect(doc.analysis.combiner.delaysPs).toEqual([0, 0, 0]);
    // The null search looks for the first interferer.
    expect(checkDraft(draft, parts).document!.analysis.nullSearch).toEqual({ interferer: 'jam', maxDelayPs: 200, stepPs: 1 });
  });

  it('reads a saved document back into the same document', () => {
    const draft = w04();
    draft.limitsDbm = ['0', ''];
    draft.settings.push({ id: 'x', instrumentId: 6, key: 'RBW', value: '100 kHz' });
    const saved = checkDraft(draft, parts).document!;
    expect(checkDraft(draftFromDocument(saved), parts).document).toEqual(saved);
    expect(saved.analysis.inputs).toEqual([{ channel: 0, maxInputDbm: 0 }]);
  });
});
