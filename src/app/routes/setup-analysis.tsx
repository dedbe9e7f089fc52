import type { AnalysisResult } from '@shared/domain/analysis';
import { AnalysisSummary } from '@/features/analysis/components/analysis-summary';
import { BeamPattern } from '@/features/analysis/components/beam-pattern';

/** Where the chip's delays put the first interferer's deepest null: the lowest point of its pattern (1° steps). */
function interfererNullDeg(result: AnalysisResult): number | null {
  const interferer = result.sources.find((s) => s.role === 'interferer');
  const curve = interferer ? result.pattern.responseDb[interferer.key] : undefined;
  if (!curve?.length) return null;
  let lowest = 0;
  curve.forEach((db, i) => {
    if (db < curve[lowest]!) lowest = i;
  });
  return result.pattern.angleDeg[lowest] ?? null;
}

/** How the setup pages show an analysis, the live preview and a revision's stored result alike: the pattern, then the numbers. */
export function SetupAnalysis({ result }: { result: AnalysisResult }) {
  return (
    <div className="space-y-5">
      <BeamPattern pattern={result.pattern} sources={result.sources} nullAngleDeg={interfererNullDeg(result)} />
      <AnalysisSummary result={result} />
    </div>
  );
}
