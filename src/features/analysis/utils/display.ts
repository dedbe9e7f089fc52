import type { SourceRole } from '@shared/domain/analysis';
import theme from '../../../../tailwind.config';

const { colors } = theme.theme.extend;

export const roleLabels: Record<SourceRole, string> = { desired: 'desired', interferer: 'interferer', other: 'other' };

/**
 * One colour and dash per source, by its place in the document (at most 8 sources), from Skewbench's palette
 * (tailwind.config.ts). Neighbours differ in hue and in dash, so curves stay apart without colour vision too.
 */
const seriesColours = [colors.copper[600], colors.phase[600], colors.fault[500], colors.caution[700], colors.ink[500], colors.pass[700], colors.phase[800], colors.copper[800]] as const;
const seriesDashes = ['', '7 4', '2 3', '9 3 2 3'] as const;

export function seriesStyle(index: number): { colour: string; dash: string } {
  return { colour: seriesColours[index % seriesColours.length]!, dash: seriesDashes[index % seriesDashes.length]! };
}

/** The colour of markers that belong to no source (the null), and of the grid and axes. */
export const plotColours = { null: colors.ink[800], grid: colors.ink[100], axis: colors.ink[300], text: colors.ink[500] } as const;

/** A signed number with a true minus sign and at most `digits` decimals: −23.4, 0, 12. */
export function signed(value: number, digits = 1): string {
  const rounded = Number(value.toFixed(digits));
  return rounded < 0 ? `−${Math.abs(rounded)}` : String(Math.abs(rounded));
}

export const formatAngle = (deg: number, digits = 1) => `${signed(deg, digits)}°`;
