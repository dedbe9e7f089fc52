import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { analyseSetup, type AnalysisDocument } from '../../shared/domain/analysis.js';
import { SPEED_OF_LIGHT_M_PER_S as C } from '../../shared/domain/constants.js';
import { AnalysisSummary, POWER_CAUTION } from '../../src/features/analysis/components/analysis-summary.js';
import { BeamPattern } from '../../src/features/analysis/components/beam-pattern.js';

// Static markup (react-dom/server) in node: what the components put on the page before any interaction.

const f = 5e9;
const d = (C / (2 * f)) * 1e3; // λ/2 at 5 GHz, mm
const steerPs = (deg: number) => ((d * 1e-3 * Math.sin((deg * Math.PI) / 180)) / C) * 1e12;
const delay = (ps: number) => [{ kind: 'adapter' as const, delayPs: 1000 + ps }];

/** RF-PRIMER W-07: two inputs, 5 GHz, d = λ/2, chip steered to 20°, the interferer at −30° (−12.19490 dB). */
function w07(extra: Partial<AnalysisDocument> = {}): AnalysisDocument {
  return {
    array: { elements: 2, spacingMm: d },
    sources: [
      { key: 'want', role: 'desired', frequencyHz: f, powerDbm: -10 },
      { key: 'jam', role: 'interferer', frequencyHz: f, powerDbm: -10 },
      // 200 ps between the inputs: c·Δτ/d = 59.96 mm / 29.98 mm = 2, which no real angle gives.
      { key: 'spur', role: 'other', frequencyHz: 4.8e9, powerDbm: -20 },
    ],
    paths: [
      { source: 'want', channel: 0, segments: delay(0) },
      { source: 'want', channel: 1, segments: delay(steerPs(20)) },
      { source: 'jam', channel: 0, segments: delay(0) },
      { source: 'jam', channel: 1, segments: delay(steerPs(-30)) },
      { source: 'spur', channel: 0, segments: delay(0) },
      { source: 'spur', channel: 1, segments: delay(200) },
    ],
    combiner: { delaysPs: [steerPs(20), 0] },
    ...extra,
  };
}

const render = (element: Parameters<typeof renderToStaticMarkup>[0]) => renderToStaticMarkup(element);
/** React escapes ' in text as &#x27;; compare with the text as a reader sees it. */
const text = (html: string) => html.replace(/&#x27;/g, "'").replace(/&quot;/g, '"').replace(/&amp;/g, '&');
const ariaLabelOf = (html: string) => text(/<svg[^>]*role="img"[^>]*aria-label="([^"]*)"/.exec(html)?.[1] ?? '');

describe('BeamPattern', () => {
  const result = analyseSetup(w07());
  const jam = result.sources.find((s) => s.key === 'jam')!;

  it('sums up each source and the null in the aria-label of its role="img" plot', () => {
    expect(jam.angleDeg).toBeCloseTo(-30, 9);
    expect(jam.responseDb).toBeCloseTo(-12.1949, 4); // W-07
    const html = render(createElement(BeamPattern, { pattern: result.pattern, sources: result.sources, nullAngleDeg: -41.14599 }));
    const label = ariaLabelOf(html);
    expect(label).toMatch(/^Beam pattern: /);
    expect(label).toContain('jam −12.2 dB at −30°');
    expect(label).toContain('want 0 dB at 20°');
    expect(label).toMatch(/spur −?[\d.]+ dB \(non-physical delays, no angle\)/);
    expect(label).toContain('null at −41.1°');
  });

  it('draws a marker at each physical source angle and at the null, in both views, and none for non-physical delays', () => {
    const spur = result.sources.find((s) => s.key === 'spur')!;
    expect(spur.physical).toBe(false);
    for (const initialView of ['cartesian', 'polar'] as const) {
      const html = render(createElement(BeamPattern, { pattern: result.pattern, sources: result.sources, nullAngleDeg: -41.14599, initialView }));
      expect(html).toContain(`data-view="${initialView}"`);
      const sourceMarkers = [...html.matchAll(/data-marker="source" data-source="([^"]+)"/g)].map((m) => m[1]);
      expect(sourceMarkers.sort()).toEqual(['jam', 'want']);
      expect(html.match(/data-marker="null"/g)).toHaveLength(1);
      // One curve per source (the grid's arcs have no stroke width of their own).
      expect(html.match(/<path d="M[^"]*" fill="none" stroke="[^"]*" stroke-width="2"/g)).toHaveLength(3);
    }
    const noNull = render(createElement(BeamPattern, { pattern: result.pattern, sources: result.sources }));
    expect(noNull).not.toContain('data-marker="null"');
  });

  it('offers the two views as toggle buttons with aria-pressed, and a legend of source keys and roles', () => {
    const html = render(createElement(BeamPattern, { pattern: result.pattern, sources: result.sources }));
    expect(html).toMatch(/<button type="button" aria-pressed="true"[^>]*>Cartesian<\/button>/);
    expect(html).toMatch(/<button type="button" aria-pressed="false"[^>]*>Polar<\/button>/);
    const legend = text(/<ul[^>]*aria-label="Legend"[^>]*>(.*?)<\/ul>/.exec(html)![1]!);
    for (const [key, role] of [['want', 'desired'], ['jam', 'interferer'], ['spur', 'other']]) expect(legend).toMatch(new RegExp(`${key}</span> · ${role}`));
  });

  it('repeats the key values in a visually hidden table', () => {
    const html = render(createElement(BeamPattern, { pattern: result.pattern, sources: result.sources, nullAngleDeg: -41.14599 }));
    const table = /<div class="sr-only"><table>(.*?)<\/table><\/div>/.exec(html)?.[1];
    expect(table).toBeDefined();
    expect(table).toContain('<th scope="row">jam</th><td>interferer</td><td>−30°</td><td>−12.19 dB</td>');
    expect(table).toContain('<td>non-physical</td>');
  });
});

describe('AnalysisSummary', () => {
  it('shows per source the angle or "non-physical", the path differences, phase lags, response and the rejection', () => {
    const result = analyseSetup(w07({ nullSearch: { interferer: 'jam', maxDelayPs: 200, stepPs: 1 } }));
    const html = text(render(createElement(AnalysisSummary, { result })));
    expect(html).toContain('data-testid="angle-jam">−30°');
    expect(html).toMatch(/data-testid="angle-spur"><span[^>]*>non-physical/);
    // The path difference of `want` on input 1 is c·Δτ = d·sin 20°.
    expect(html).toContain(`${((d * Math.sin((20 * Math.PI) / 180))).toFixed(3)} mm`);
    expect(html).toContain('data-testid="rejection">');
    expect(html).toContain('data-testid="best-null">');
    expect(html).not.toContain(POWER_CAUTION);
  });

  it('puts an input overload first, as a fault (role="alert") with the bench caution', () => {
    const result = analyseSetup(w07({ inputs: [{ channel: 0, maxInputDbm: -20 }, { channel: 1, maxInputDbm: 10 }] }));
    expect(result.warnings.map((w) => w.code)).toContain('input-overload');
    const html = text(render(createElement(AnalysisSummary, { result })));
    const alert = /<div role="alert"[^>]*>(.*?)<\/div>/.exec(html)?.[1] ?? '';
    expect(alert).toContain('Input 0 receives');
    expect(alert).toContain('Check levels before connecting: an instrument or chip input can be damaged by too much RF power.');
    expect(alert).toContain("Your lab's rules come first.");
    expect(html.indexOf('role="alert"')).toBeLessThan(html.indexOf('Rejection'));
    expect(html).toContain('overload</span>');
  });

  it('shows an input within 3 dB of its limit as a caution (role="status") with the same caution', () => {
    // want −10 dBm, jam −10 dBm, spur −20 dBm at each input: −6.7 dBm in total, 1.3 dB under a −5.4 dBm limit.
    const result = analyseSetup(w07({ inputs: [{ channel: 0, maxInputDbm: -5.4 }] }));
    expect(result.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['input-near-limit']));
    const html = text(render(createElement(AnalysisSummary, { result })));
    expect(html).not.toContain('role="alert"');
    const caution = /<div role="status"[^>]*>(.*?)<\/div>/.exec(html)?.[1] ?? '';
    expect(caution).toContain('Input 0 receives');
    expect(caution).toContain(POWER_CAUTION);
    expect(html).toContain('near the limit</span>');
  });
});
