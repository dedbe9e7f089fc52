import QRCode from 'qrcode';
import { useEffect, useState } from 'react';

export interface LabelItem {
  key: string;
  tag: string;
  description: string;
  url: string;
}

export type PaperSize = 'a4' | 'letter';

/**
 * Label geometry per paper size: A4 as 3 × 8 labels of 70 × 37 mm, Letter as 3 × 10 labels of
 * 2.625 × 1 in, the two common sheet layouts [common practice]. Margins centre the grid on the page.
 */
export const paper: Record<PaperSize, { page: string; columns: number; rows: number; width: string; height: string; margin: string; label: string }> = {
  a4: { page: 'A4', columns: 3, rows: 8, width: '70mm', height: '37mm', margin: '0.5mm 0 0 0', label: 'A4 (3 × 8, 70 × 37 mm)' },
  letter: { page: 'letter', columns: 3, rows: 10, width: '2.625in', height: '1in', margin: '0.5in 0.1875in', label: 'Letter (3 × 10, 2⅝ × 1 in)' },
};

function QrImage({ url, alt }: { url: string; alt: string }) {
  const [src, setSrc] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    QRCode.toDataURL(url, { errorCorrectionLevel: 'M', margin: 1, width: 240 }).then((data) => live && setSrc(data));
    return () => {
      live = false;
    };
  }, [url]);
  return src ? <img src={src} alt={alt} className="aspect-square h-full" /> : <div className="aspect-square h-full bg-ptfe-200" aria-hidden />;
}

/** A printable sheet of QR labels; each code opens the item's page in Skewbench. */
export function LabelSheet({ items, size }: { items: LabelItem[]; size: PaperSize }) {
  const p = paper[size];
  return (
    <>
      {/* The page box of the chosen paper; only affects printing. */}
      <style>{`@page { size: ${p.page}; margin: ${p.margin}; }`}</style>
      <div
        data-testid="label-sheet"
        className="mx-auto grid bg-white shadow-panel print:shadow-none"
        style={{ gridTemplateColumns: `repeat(${p.columns}, ${p.width})`, gridAutoRows: p.height, width: `calc(${p.columns} * ${p.width})` }}
      >
        {items.map((item) => (
          <div key={item.key} className="flex items-center gap-2 overflow-hidden border border-dashed border-ink-100 p-1.5 print:border-transparent" style={{ breakInside: 'avoid' }}>
            <QrImage url={item.url} alt={`QR code for ${item.tag}`} />
            <div className="min-w-0">
              <div className="font-mono text-lead font-extrabold leading-tight text-ink-900">{item.tag}</div>
              <div className="line-clamp-2 text-[8pt] leading-tight text-ink-600">{item.description}</div>
              <div className="mt-0.5 text-[6pt] uppercase tracking-widest text-ink-400">skewbench</div>
            </div>
          </div>
        ))}
      </div>
    </>
  );
}
