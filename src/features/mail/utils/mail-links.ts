/**
 * The links of a captured message, for the list under the preview: the preview frame is sandboxed, so its links
 * cannot be followed there. Pure string work (no DOM), so it runs anywhere and in unit tests.
 */

export interface MailLink {
  /** Absolute http(s) URL, normalised by the URL parser. */
  url: string;
  /** The anchor's text in the HTML part, when it says more than the URL itself. */
  label?: string;
}

const entities: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'", nbsp: ' ' };

/** Undo HTML character references (`&amp;`, `&#39;`, `&#x2F;`); unknown names stay as written. */
export function decodeEntities(value: string): string {
  return value.replace(/&(#x[0-9a-f]+|#\d+|[a-z]+);/gi, (whole, ref: string) => {
    if (ref[0] === '#') {
      const code = ref[1] === 'x' || ref[1] === 'X' ? parseInt(ref.slice(2), 16) : parseInt(ref.slice(1), 10);
      return Number.isFinite(code) && code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : whole;
    }
    return entities[ref.toLowerCase()] ?? whole;
  });
}

/** `value` as an absolute http(s) URL, or null (mailto:, javascript:, relative or broken URLs). */
function webUrl(value: string): string | null {
  try {
    const url = new URL(value.trim());
    return url.protocol === 'http:' || url.protocol === 'https:' ? url.href : null;
  } catch {
    return null;
  }
}

const anchorPattern = /<a\b[^>]*?\shref\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'>]+))[^>]*>([\s\S]*?)<\/a\s*>/gi;
const textUrlPattern = /\bhttps?:\/\/[^\s<>"]+/gi;

/** A URL found in running text, without the sentence's punctuation after it ("…/bookings/12." → "…/bookings/12"). */
function trimTextUrl(raw: string): string {
  let url = raw.replace(/[.,;:!?'*]+$/, '');
  // A closing bracket belongs to the URL only when the URL opened it: "(see https://x/a)" vs "https://x/wiki/A_(b)".
  while (/[)\]}]$/.test(url)) {
    const close = url.at(-1)!;
    const open = close === ')' ? '(' : close === ']' ? '[' : '{';
    if (url.split(open).length >= url.split(close).length) break;
    url = url.slice(0, -1).replace(/[.,;:!?'*]+$/, '');
  }
  return url;
}

/**
 * Every distinct web link of a message: the HTML part's anchors first (with their text as label), then URLs in
 * the plain text that the HTML did not have. Duplicates are dropped, keeping the first label found.
 */
export function extractLinks(html: string | null | undefined, text: string | null | undefined): MailLink[] {
  const found = new Map<string, MailLink>();
  const add = (rawUrl: string, rawLabel?: string) => {
    const url = webUrl(rawUrl);
    if (!url) return;
    const label = rawLabel?.trim();
    const known = found.get(url);
    const useful = label && webUrl(label) !== url ? label : undefined;
    if (!known) found.set(url, useful ? { url, label: useful } : { url });
    else if (!known.label && useful) known.label = useful;
  };
  for (const match of (html ?? '').matchAll(anchorPattern)) {
    const href = decodeEntities(match[1] ?? match[2] ?? match[3] ?? '');
    const label = decodeEntities((match[4] ?? '').replace(/<[^>]*>/g, ' ')).replace(/\s+/g, ' ');
    add(href, label);
  }
  for (const match of (text ?? '').matchAll(textUrlPattern)) add(trimTextUrl(match[0]));
  return [...found.values()];
}
