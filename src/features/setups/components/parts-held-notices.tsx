import { Link } from 'react-router-dom';
import type { Setup } from '@shared/schemas/setups';
import { Notice } from '@/components/ui/feedback';

/** Parts of this setup that another setup also wires, in a booking at an overlapping time: both cannot have them. */
export function PartsHeldNotices({ partsHeld }: { partsHeld: Setup['partsHeld'] }) {
  if (partsHeld.length === 0) return null;
  return (
    <ul className="space-y-2" aria-label="Parts held elsewhere">
      {partsHeld.map((p) => (
        <li key={`${p.partId}-${p.setupId}`}>
          <Notice tone="caution">
            <span className="font-mono font-semibold">{p.tag}</span> is also wired in{' '}
            <Link to={`/setups/${p.setupId}`} className="font-semibold underline underline-offset-4">
              {p.setupTitle}
            </Link>
            {p.owner ? ` (${p.owner})` : ''}, for a booking at an overlapping time. Agree who has it, or swap it for another part.
          </Notice>
        </li>
      ))}
    </ul>
  );
}
