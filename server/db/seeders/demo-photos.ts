import sharp from 'sharp';
import type { SessionUser } from '../../../shared/schemas/people.js';
import { createPhoto } from '../../features/photos/photos.service.js';
import type { ImageStore } from '../../lib/uploads.js';

/**
 * Bench pictures drawn at seed time (no photographs, no brands): a probe station seen from above,
 * a matched cable pair, and a splitter feeding two inputs. Shapes only, so no font is needed.
 */
const drawings: Record<'probeStation' | 'cablePair' | 'splitter', string> = {
  probeStation: `<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="800">
    <rect width="1200" height="800" fill="#e9e4d8"/>
    <rect x="240" y="140" width="720" height="520" rx="24" fill="#3c4b63"/>
    <circle cx="600" cy="400" r="190" fill="#9aa8bc"/><circle cx="600" cy="400" r="150" fill="#c5cedb"/>
    <rect x="560" y="360" width="80" height="80" fill="#2c8c84"/>
    <rect x="90" y="370" width="420" height="60" rx="12" fill="#151b26"/><rect x="690" y="370" width="420" height="60" rx="12" fill="#151b26"/>
    <path d="M510 400 L560 400" stroke="#cd7b43" stroke-width="10"/><path d="M640 400 L690 400" stroke="#cd7b43" stroke-width="10"/>
    <path d="M90 400 C40 400 40 700 200 760" fill="none" stroke="#b8622c" stroke-width="14"/>
    <path d="M1110 400 C1160 400 1160 700 1000 760" fill="none" stroke="#b8622c" stroke-width="14"/>
  </svg>`,
  cablePair: `<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="800">
    <rect width="1200" height="800" fill="#f8f6f0"/>
    <path d="M120 250 C400 120 800 380 1080 250" fill="none" stroke="#9a4e22" stroke-width="26"/>
    <path d="M120 520 C420 380 760 700 1080 520" fill="none" stroke="#21726b" stroke-width="26"/>
    <rect x="70" y="225" width="70" height="50" rx="8" fill="#c5cedb"/><rect x="1060" y="225" width="70" height="50" rx="8" fill="#c5cedb"/>
    <rect x="70" y="495" width="70" height="50" rx="8" fill="#c5cedb"/><rect x="1060" y="495" width="70" height="50" rx="8" fill="#c5cedb"/>
  </svg>`,
  splitter: `<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="800">
    <rect width="1200" height="800" fill="#efebe0"/>
    <rect x="420" y="300" width="360" height="200" rx="20" fill="#4f607a"/>
    <path d="M80 400 L420 400" stroke="#b8622c" stroke-width="22"/>
    <path d="M780 350 C900 350 900 200 1120 200" fill="none" stroke="#b8622c" stroke-width="22"/>
    <path d="M780 450 C900 450 900 600 1120 600" fill="none" stroke="#b8622c" stroke-width="22"/>
  </svg>`,
};

async function render(svg: string): Promise<Buffer> {
  return sharp(Buffer.from(svg)).jpeg({ quality: 82 }).toBuffer();
}

/** Add the drawn photos to the demo's PS-1, the matched pair C-003/C-004 and splitter SP-01. */
export async function seedDemoPhotos(store: ImageStore, manager: SessionUser, ids: { ps1: number; c003: number; c004: number; sp01: number }) {
  const add = async (subjectType: 'instrument' | 'part', subjectId: number, drawing: keyof typeof drawings, caption: string) =>
    createPhoto(store, manager, { subjectType, subjectId, caption }, await render(drawings[drawing]));
  await add('instrument', ids.ps1, 'probeStation', 'PS-1 from above: chuck, two RF arms, cables to the rack');
  await add('part', ids.c003, 'cablePair', 'Matched pair C-003 (top) and C-004 (+10 mm)');
  await add('part', ids.c004, 'cablePair', 'Matched pair C-003 (top) and C-004 (+10 mm)');
  await add('part', ids.sp01, 'splitter', 'SP-01 feeding both chip inputs from one generator');
}
