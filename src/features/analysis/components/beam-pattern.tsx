import { useState } from 'react';
import type { AnalysisResult } from '@shared/domain/analysis';
import { EmptyState } from '@/components/ui/feedback';
import { formatAngle, plotColours, roleLabels, seriesStyle, signed } from '../utils/display';

/** Responses below this are drawn on the plot's floor: deeper nulls say nothing more at this scale. */
export const PLOT_FLOOR_DB = -40;

type View = 'cartesian' | 'polar';

interface BeamPatternProps {
  pattern: AnalysisResult['pattern'];
  sources: AnalysisResult['sources'];
  /** An angle to mark as the null, e.g. where the tuned chip delays put it. */
  nullAngleDeg?: number | null;
  initialView?: View;
}

interface Series {
  key: string;
  role: string;
  colour: string;
  dash: string;
  points: { angleDeg: number; db: number }[];
  /** Where to draw the source's marker: its emulated angle, when the delays can come from a real angle. */
  markerDeg: number | null;
}

interface Marker {
  kind: 'source' | 'null';
  key: string;
  angleDeg: number;
  colour: string;
  label: string;
  /** Label row: markers closer than LABEL_SPAN_DEG share no row, so their labels do not overlap. */
  row: number;
}

const LABEL_SPAN_DEG = 14;

/** Give each marker, in angle order, the first label row whose last marker is far enough to its left. */
function withRows(markers: Omit<Marker, 'row'>[]): Marker[] {
  const lastInRow: number[] = [];
  return [...markers]
    .sort((a, b) => a.angleDeg - b.angleDeg)
    .map((m) => {
      let row = lastInRow.findIndex((deg) => m.angleDeg - deg >= LABEL_SPAN_DEG);
      if (row === -1) row = lastInRow.length;
      lastInRow[row] = m.angleDeg;
      return { ...m, row };
    });
}

const clip = (db: number) => Math.max(PLOT_FLOOR_DB, Math.min(0, db));
const inView = (deg: number) => deg >= -90 && deg <= 90;

/** Cartesian plot: angle −90…90° across, response 0…−40 dB down. */
const W = 640;
const H = 360;
const M = { left: 58, right: 18, top: 22, bottom: 48 };
const x = (deg: number) => M.left + ((deg + 90) / 180) * (W - M.left - M.right);
const y = (db: number) => M.top + (-clip(db) / -PLOT_FLOOR_DB) * (H - M.top - M.bottom);
const angleTicks = [-90, -60, -30, 0, 30, 60, 90];
const dbTicks = [0, -10, -20, -30, -40];

/** Polar plot: broadside up, +90° to the right; the radius is the response, from −40 dB at the centre to 0 dB. */
const CX = W / 2;
const CY = H - 34;
const R = 270;
const radius = (db: number) => ((clip(db) - PLOT_FLOOR_DB) / -PLOT_FLOOR_DB) * R;
const polar = (deg: number, r: number) => {
  const rad = (deg * Math.PI) / 180;
  return { px: CX + r * Math.sin(rad), py: CY - r * Math.cos(rad) };
};

const pathOf = (points: { px: number; py: number }[]) => points.map((p, i) => `${i === 0 ? 'M' : 'L'}${p.px.toFixed(2)} ${p.py.toFixed(2)}`).join(' ');

function CartesianPlot({ series, markers }: { series: Series[]; markers: Marker[] }) {
  return (
    <>
      {angleTicks.map((deg) => (
        <g key={`x${deg}`}>
          <line x1={x(deg)} x2={x(deg)} y1={M.top} y2={H - M.bottom} stroke={plotColours.grid} />
          <text x={x(deg)} y={H - M.bottom + 16} textAnchor="middle" fontSize={12} fill={plotColours.text}>
            {formatAngle(deg, 0)}
          </text>
        </g>
      ))}
      {dbTicks.map((db) => (
        <g key={`y${db}`}>
          <line x1={M.left} x2={W - M.right} y1={y(db)} y2={y(db)} stroke={plotColours.grid} />
          <text x={M.left - 8} y={y(db) + 4} textAnchor="end" fontSize={12} fill={plotColours.text}>
            {signed(db, 0)}
          </text>
        </g>
      ))}
      <rect x={M.left} y={M.top} width={W - M.left - M.right} height={H - M.top - M.bottom} fill="none" stroke={plotColours.axis} />
      <text x={(M.left + W - M.right) / 2} y={H - 8} textAnchor="middle" fontSize={12} fill={plotColours.text}>
        Angle from broadside (°)
      </text>
      <text x={14} y={(M.top + H - M.bottom) / 2} textAnchor="middle" fontSize={12} fill={plotColours.text} transform={`rotate(-90 14 ${(M.top + H - M.bottom) / 2})`}>
        Response (dB)
      </text>
      {series.map((s) => (
        <path key={s.key} d={pathOf(s.points.map((p) => ({ px: x(p.angleDeg), py: y(p.db) })))} fill="none" stroke={s.colour} strokeWidth={2} strokeDasharray={s.dash || undefined} strokeLinejoin="round" />
      ))}
      {markers.map((m) => (
        <g key={`${m.kind}-${m.key}`} data-marker={m.kind} data-source={m.kind === 'source' ? m.key : undefined}>
          <line x1={x(m.angleDeg)} x2={x(m.angleDeg)} y1={M.top} y2={H - M.bottom} stroke={m.colour} strokeWidth={1.5} strokeDasharray="4 3" />
          <text x={x(m.angleDeg) + 4} y={M.top + 12 + 13 * m.row} fontSize={11} fontWeight={700} fill={m.colour}>
            {m.label}
          </text>
        </g>
      ))}
    </>
  );
}

function PolarPlot({ series, markers }: { series: Series[]; markers: Marker[] }) {
  const arc = (r: number) => `M${CX - r} ${CY} A${r} ${r} 0 0 1 ${CX + r} ${CY}`;
  return (
    <>
      {dbTicks.map((db) => (
        <g key={`r${db}`}>
          {db > PLOT_FLOOR_DB ? <path d={arc(radius(db))} fill="none" stroke={db === 0 ? plotColours.axis : plotColours.grid} /> : null}
          <text x={CX + radius(db) + 3} y={CY + 14} fontSize={11} fill={plotColours.text}>
            {signed(db, 0)}
          </text>
        </g>
      ))}
      {angleTicks.map((deg) => {
        const end = polar(deg, R);
        const label = polar(deg, R + 14);
        return (
          <g key={`a${deg}`}>
            <line x1={CX} y1={CY} x2={end.px} y2={end.py} stroke={plotColours.grid} />
            <text x={label.px} y={label.py + 4} textAnchor={deg === 0 ? 'middle' : deg > 0 ? 'start' : 'end'} fontSize={12} fill={plotColours.text}>
              {formatAngle(deg, 0)}
            </text>
          </g>
        );
      })}
      <text x={CX} y={H - 4} textAnchor="middle" fontSize={12} fill={plotColours.text}>
        Radius: response (dB), {PLOT_FLOOR_DB} dB at the centre
      </text>
      {series.map((s) => (
        <path key={s.key} d={pathOf(s.points.map((p) => polar(p.angleDeg, radius(p.db))))} fill="none" stroke={s.colour} strokeWidth={2} strokeDasharray={s.dash || undefined} strokeLinejoin="round" />
      ))}
      {markers.map((m) => {
        const end = polar(m.angleDeg, R);
        const label = polar(m.angleDeg, R - 18 - 16 * m.row);
        return (
          <g key={`${m.kind}-${m.key}`} data-marker={m.kind} data-source={m.kind === 'source' ? m.key : undefined}>
            <line x1={CX} y1={CY} x2={end.px} y2={end.py} stroke={m.colour} strokeWidth={1.5} strokeDasharray="4 3" />
            <text x={label.px + 4} y={label.py} fontSize={11} fontWeight={700} fill={m.colour}>
              {m.label}
            </text>
          </g>
        );
      })}
    </>
  );
}

/** Each source's pattern value nearest to `deg` (the pattern is sampled every whole degree). */
function valueAt(points: Series['points'], deg: number): number | null {
  let best: Series['points'][number] | null = null;
  for (const p of points) if (!best || Math.abs(p.angleDeg - deg) < Math.abs(best.angleDeg - deg)) best = p;
  return best?.db ?? null;
}

/** "Beam pattern: want 0 dB at 0°; jam −23.4 dB at −30°; null at −41.1°" (non-physical sources say so). */
export function beamPatternLabel(sources: AnalysisResult['sources'], nullAngleDeg?: number | null): string {
  const parts = sources.map((s) =>
    s.physical && s.angleDeg !== null ? `${s.key} ${signed(s.responseDb)} dB at ${formatAngle(s.angleDeg)}` : `${s.key} ${signed(s.responseDb)} dB (non-physical delays, no angle)`,
  );
  if (nullAngleDeg != null) parts.push(`null at ${formatAngle(nullAngleDeg)}`);
  return `Beam pattern: ${parts.join('; ')}`;
}

/**
 * The beam pattern of every source with the chip's delays, as a cartesian plot (angle against response) or a
 * polar half-plane; markers at each source's emulated angle and at the null. Pure SVG; a visually hidden table
 * gives the same key values to screen readers.
 */
export function BeamPattern({ pattern, sources, nullAngleDeg = null, initialView = 'cartesian' }: BeamPatternProps) {
  const [view, setView] = useState<View>(initialView);
  const plotted = sources.filter((s) => pattern.responseDb[s.key]);
  if (plotted.length === 0 || pattern.angleDeg.length === 0) return <EmptyState title="No beam pattern to show" />;

  const series: Series[] = plotted.map((s, i) => ({
    key: s.key,
    role: roleLabels[s.role],
    ...seriesStyle(i),
    points: pattern.angleDeg.map((angleDeg, k) => ({ angleDeg, db: pattern.responseDb[s.key]![k]! })),
    markerDeg: s.physical && s.angleDeg !== null && inView(s.angleDeg) ? s.angleDeg : null,
  }));
  const markers = withRows([
    ...series.flatMap((s) => (s.markerDeg === null ? [] : [{ kind: 'source' as const, key: s.key, angleDeg: s.markerDeg, colour: s.colour, label: s.key }])),
    ...(nullAngleDeg != null && inView(nullAngleDeg) ? [{ kind: 'null' as const, key: 'null', angleDeg: nullAngleDeg, colour: plotColours.null, label: 'null' }] : []),
  ]);

  const summary = beamPatternLabel(plotted, nullAngleDeg);
  const toggle = (v: View, label: string) => (
    <button
      type="button"
      aria-pressed={view === v}
      onClick={() => setView(v)}
      className={`px-3 py-1.5 text-caption font-semibold first:rounded-l-chip last:rounded-r-chip ${view === v ? 'bg-ink-800 text-white' : 'bg-white text-ink-700 hover:bg-ptfe-100'}`}
    >
      {label}
    </button>
  );

  return (
    <figure className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <figcaption className="text-caption font-semibold uppercase tracking-wide text-ink-500">Beam pattern with the chip’s delays</figcaption>
        <div role="group" aria-label="Plot type" className="inline-flex rounded-chip ring-1 ring-ink-200">
          {toggle('cartesian', 'Cartesian')}
          {toggle('polar', 'Polar')}
        </div>
      </div>
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={summary} className="h-auto w-full rounded-panel bg-white ring-1 ring-ink-100" data-view={view}>
        {view === 'cartesian' ? <CartesianPlot series={series} markers={markers} /> : <PolarPlot series={series} markers={markers} />}
      </svg>
      <ul className="flex flex-wrap gap-x-5 gap-y-1 text-caption text-ink-700" aria-label="Legend">
        {series.map((s) => (
          <li key={s.key} className="inline-flex items-center gap-2">
            <svg width={28} height={10} aria-hidden>
              <line x1={1} x2={27} y1={5} y2={5} stroke={s.colour} strokeWidth={2.5} strokeDasharray={s.dash || undefined} />
            </svg>
            <span>
              <span className="font-semibold">{s.key}</span> · {s.role}
            </span>
          </li>
        ))}
        {nullAngleDeg != null ? (
          <li className="inline-flex items-center gap-2">
            <svg width={28} height={10} aria-hidden>
              <line x1={1} x2={27} y1={5} y2={5} stroke={plotColours.null} strokeWidth={1.5} strokeDasharray="4 3" />
            </svg>
            <span>null at {formatAngle(nullAngleDeg)}</span>
          </li>
        ) : null}
      </ul>
      {/* A table ignores the 1 px width of sr-only and would widen the page: the wrapper carries it instead. */}
      <div className="sr-only">
        <table>
          <caption>Beam pattern key values (responses below {PLOT_FLOOR_DB} dB are drawn at {PLOT_FLOOR_DB} dB)</caption>
          <thead>
            <tr>
              <th scope="col">Source</th>
              <th scope="col">Role</th>
              <th scope="col">Emulated angle</th>
              <th scope="col">Response</th>
              <th scope="col">Peak of the pattern</th>
              {nullAngleDeg != null ? <th scope="col">Pattern at the null ({formatAngle(nullAngleDeg)})</th> : null}
            </tr>
          </thead>
          <tbody>
            {series.map((s, i) => {
              const peak = s.points.reduce((a, b) => (b.db > a.db ? b : a));
              const atNull = nullAngleDeg != null ? valueAt(s.points, nullAngleDeg) : null;
              return (
                <tr key={s.key}>
                  <th scope="row">{s.key}</th>
                  <td>{s.role}</td>
                  <td>{plotted[i]!.angleDeg === null ? 'non-physical' : formatAngle(plotted[i]!.angleDeg!)}</td>
                  <td>{signed(plotted[i]!.responseDb, 2)} dB</td>
                  <td>
                    {signed(peak.db, 2)} dB at {formatAngle(peak.angleDeg, 0)}
                  </td>
                  {nullAngleDeg != null ? <td>{atNull === null ? '—' : `${signed(atNull, 2)} dB`}</td> : null}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </figure>
  );
}
