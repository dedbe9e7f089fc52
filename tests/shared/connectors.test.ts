import { describe, expect, it } from 'vitest';
import {
  connectors,
  describeEnd,
  describeEnds,
  genders,
  mates,
  matingWarning,
  partEnds,
  typesIntermate,
  type Connector,
  type ConnectorEnd,
} from '../../shared/domain/connectors.js';
import { connectors as schemaConnectors, partInputSchema, typicalGenders } from '../../shared/schemas/parts.js';

const m = (type: Connector): ConnectorEnd => ({ type, gender: 'male' });
const f = (type: Connector): ConnectorEnd => ({ type, gender: 'female' });

/**
 * Which connector types screw together, written out by hand rather than derived from the code: every type
 * with itself; SMA, 3.5 mm and 2.92 mm with each other (common practice; for 3.5 mm and SMA also IEEE Std 287,
 * from memory); N, BNC and `other` with nothing else (common practice).
 */
const intermating: Record<Connector, Connector[]> = {
  sma: ['sma', '3.5mm', '2.92mm'],
  '3.5mm': ['sma', '3.5mm', '2.92mm'],
  '2.92mm': ['sma', '3.5mm', '2.92mm'],
  n: ['n'],
  bnc: ['bnc'],
  other: ['other'],
};

describe('typesIntermate (common practice)', () => {
  const pairs = connectors.flatMap((a) => connectors.map((b) => [a, b, intermating[a].includes(b)] as const));
  it.each(pairs)('%s with %s → %s', (a, b, expected) => {
    expect(typesIntermate(a, b)).toBe(expected);
  });

  it('is symmetric for every pair', () => {
    for (const a of connectors) for (const b of connectors) expect(typesIntermate(a, b)).toBe(typesIntermate(b, a));
  });
});

describe('mates: opposite genders and compatible types (common practice)', () => {
  it.each([
    ['SMA m into SMA f', m('sma'), f('sma'), true],
    ['SMA f onto SMA m', f('sma'), m('sma'), true],
    ['SMA m against SMA m', m('sma'), m('sma'), false],
    ['SMA f against SMA f', f('sma'), f('sma'), false],
    // SMA, 3.5 mm and 2.92 mm intermate (common practice; 3.5 mm/SMA also IEEE Std 287, from memory)
    ['SMA m into 3.5 mm f', m('sma'), f('3.5mm'), true],
    ['3.5 mm m into SMA f', m('3.5mm'), f('sma'), true],
    ['SMA m into 2.92 mm f', m('sma'), f('2.92mm'), true],
    ['2.92 mm m into SMA f', m('2.92mm'), f('sma'), true],
    ['3.5 mm m into 2.92 mm f', m('3.5mm'), f('2.92mm'), true],
    ['2.92 mm m into 3.5 mm f', m('2.92mm'), f('3.5mm'), true],
    ['2.92 mm m against 3.5 mm m', m('2.92mm'), m('3.5mm'), false],
    // N, BNC and other only with themselves (common practice)
    ['N m into N f', m('n'), f('n'), true],
    ['N m into SMA f', m('n'), f('sma'), false],
    ['BNC m into BNC f', m('bnc'), f('bnc'), true],
    ['BNC m into N f', m('bnc'), f('n'), false],
    ['SMA m into BNC f', m('sma'), f('bnc'), false],
    ['other m into other f', m('other'), f('other'), true],
    ['other m into SMA f', m('other'), f('sma'), false],
    ['SMA m into other f', m('sma'), f('other'), false],
  ])('%s → %s', (_name, a, b, expected) => {
    expect(mates(a, b)).toBe(expected);
    expect(mates(b, a)).toBe(expected);
  });

  it('never mates two ends of the same gender, whatever the types', () => {
    for (const a of connectors) for (const b of connectors) for (const g of genders) expect(mates({ type: a, gender: g }, { type: b, gender: g })).toBe(false);
  });
});

describe('describeEnd and describeEnds', () => {
  it.each([
    [m('sma'), 'SMA m'],
    [f('sma'), 'SMA f'],
    [m('2.92mm'), '2.92 mm m'],
    [f('3.5mm'), '3.5 mm f'],
    [m('n'), 'N m'],
    [f('bnc'), 'BNC f'],
    [m('other'), 'Other m'],
  ])('%o → %s', (end, text) => {
    expect(describeEnd(end)).toBe(text);
  });

  it('a part reads "end A → end B"', () => {
    const adapter = { connectorA: '2.92mm', genderA: 'male', connectorB: 'sma', genderB: 'female' } as const;
    expect(describeEnds(adapter)).toBe('2.92 mm m → SMA f');
    expect(partEnds(adapter)).toEqual([m('2.92mm'), f('sma')]);
  });
});

describe('matingWarning: SMA against a precision 3.5 mm or 2.92 mm connector (common practice)', () => {
  it.each([
    [m('sma'), f('3.5mm'), /SMA plug into a 3\.5 mm jack.*Gauge the SMA plug/],
    [f('3.5mm'), m('sma'), /SMA plug into a 3\.5 mm jack.*Gauge the SMA plug/],
    [m('sma'), f('2.92mm'), /SMA plug into a 2\.92 mm jack.*Gauge the SMA plug/],
    [m('2.92mm'), f('sma'), /2\.92 mm plug into an SMA jack.*Gauge the SMA jack/],
    [f('sma'), m('3.5mm'), /3\.5 mm plug into an SMA jack.*Gauge the SMA jack/],
  ])('%o with %o cautions', (a, b, text) => {
    expect(matingWarning(a, b)).toMatch(text);
  });

  it.each([
    ['SMA with SMA', m('sma'), f('sma')],
    ['3.5 mm with 2.92 mm (both precision)', m('3.5mm'), f('2.92mm')],
    ['N with N', m('n'), f('n')],
    ['ends that do not mate (same gender)', m('sma'), m('3.5mm')],
    ['ends that do not mate (N and SMA)', m('n'), f('sma')],
  ])('%s → null', (_name, a, b) => {
    expect(matingWarning(a, b)).toBeNull();
  });
});

describe('part schema genders', () => {
  const cable = { tag: 'C-1', kind: 'cable', connectorA: 'sma', connectorB: 'sma', lengthMm: 100, dielectric: 'ptfe' };

  it('re-exports the domain connector list', () => {
    expect(schemaConnectors).toBe(connectors);
  });

  it('requires a gender on each end, with a message on that field', () => {
    const result = partInputSchema.safeParse(cable);
    expect(result.success).toBe(false);
    const issues = result.error!.issues.map((i) => [i.path.join('.'), i.message]);
    expect(issues).toContainEqual(['genderA', 'Choose male (plug) or female (jack)']);
    expect(issues).toContainEqual(['genderB', 'Choose male (plug) or female (jack)']);
  });

  it('refuses a gender that is neither male nor female', () => {
    const result = partInputSchema.safeParse({ ...cable, genderA: 'plug', genderB: 'female' });
    expect(result.error!.issues.map((i) => i.path.join('.'))).toEqual(['genderA']);
  });

  it('accepts male and female', () => {
    expect(partInputSchema.parse({ ...cable, genderA: 'male', genderB: 'female' })).toMatchObject({ genderA: 'male', genderB: 'female' });
  });

  it('proposes the usual genders by kind (common practice)', () => {
    expect(typicalGenders).toEqual({
      cable: { genderA: 'male', genderB: 'male' },
      attenuator: { genderA: 'male', genderB: 'female' },
      adapter: { genderA: 'female', genderB: 'female' },
      splitter: { genderA: 'female', genderB: 'female' },
      'dc-block': { genderA: 'male', genderB: 'female' },
      other: { genderA: 'male', genderB: 'female' },
    });
  });
});
