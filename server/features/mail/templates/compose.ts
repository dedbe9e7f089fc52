// Skewbench's own message layout: every notification is composed from the same parts, as an HTML part (inline
// styles, a single centred column that mail programs render alike) and a plain-text part with the same content.
import type { RenderedMail } from '../outbox.service.js';

export interface MailLab {
  name: string;
  /** Base of every link, from PUBLIC_URL, without a trailing slash. */
  publicUrl: string;
}

export interface MailContent {
  subject: string;
  /** Who it is for, e.g. "Ada Quill"; the greeting is built from it. */
  recipientName: string;
  /** The opening paragraph(s). */
  lead: string[];
  /** Label and value rows (instrument, time, project …). */
  facts?: [string, string][];
  /** Quoted blocks kept as written, e.g. a handover note: heading and text. */
  blocks?: { heading: string; text: string }[];
  /** Further pages, as a list of links ("/instruments/3"), after the blocks. */
  links?: { label: string; url: string }[];
  /** The main button, with an absolute or lab-relative URL ("/bookings/12"). */
  action?: { label: string; url: string };
  /** Further paragraphs after the button. */
  after?: string[];
  /** Small print: why this message came, where to change it. */
  footer: string[];
  attachments?: RenderedMail['attachments'];
}

export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** A lab-relative path made absolute with PUBLIC_URL; absolute URLs stay. */
export function absoluteUrl(lab: MailLab, url: string): string {
  return /^https?:\/\//.test(url) ? url : `${lab.publicUrl}${url.startsWith('/') ? '' : '/'}${url}`;
}

const colours = { ink: '#212a3a', muted: '#4f607a', rule: '#e2e7ee', paper: '#fdfcf9', accent: '#b8622c', link: '#21726b', quote: '#f8f6f0' };

export function composeMail(lab: MailLab, content: MailContent): RenderedMail {
  const greeting = `Hello ${content.recipientName},`;
  const actionUrl = content.action ? absoluteUrl(lab, content.action.url) : null;

  const text: string[] = [greeting, '', ...content.lead.flatMap((p) => [p, ''])];
  if (content.facts?.length) {
    const width = Math.max(...content.facts.map(([label]) => label.length));
    for (const [label, value] of content.facts) text.push(`  ${`${label}:`.padEnd(width + 1)} ${value}`);
    text.push('');
  }
  for (const block of content.blocks ?? []) {
    text.push(`${block.heading}:`, ...block.text.split('\n').map((line) => `  > ${line}`), '');
  }
  if (content.links?.length) text.push(...content.links.map((l) => `  ${l.label}: ${absoluteUrl(lab, l.url)}`), '');
  if (content.action && actionUrl) text.push(`${content.action.label}: ${actionUrl}`, '');
  for (const p of content.after ?? []) text.push(p, '');
  text.push('-- ', `Skewbench · ${lab.name}`, ...content.footer, `${lab.publicUrl}/`);

  const p = (value: string, style = '') => `<p style="margin:0 0 14px;${style}">${escapeHtml(value)}</p>`;
  const facts = content.facts?.length
    ? `<table role="presentation" cellpadding="0" cellspacing="0" style="border-collapse:collapse;margin:0 0 16px;width:100%">${content.facts
        .map(
          ([label, value]) =>
            `<tr><td style="padding:5px 12px 5px 0;color:${colours.muted};white-space:nowrap;vertical-align:top;border-top:1px solid ${colours.rule}">${escapeHtml(label)}</td><td style="padding:5px 0;border-top:1px solid ${colours.rule}">${escapeHtml(value)}</td></tr>`,
        )
        .join('')}</table>`
    : '';
  const blocks = (content.blocks ?? [])
    .map(
      (b) =>
        `<p style="margin:0 0 6px;font-weight:700">${escapeHtml(b.heading)}</p><div style="margin:0 0 16px;padding:10px 14px;background:${colours.quote};border-left:3px solid ${colours.accent};white-space:pre-wrap">${escapeHtml(b.text)}</div>`,
    )
    .join('');
  const links = content.links?.length
    ? `<ul style="margin:0 0 16px;padding-left:20px">${content.links
        .map((l) => `<li style="margin:0 0 4px"><a href="${escapeHtml(absoluteUrl(lab, l.url))}" style="color:${colours.link}">${escapeHtml(l.label)}</a></li>`)
        .join('')}</ul>`
    : '';
  const action =
    content.action && actionUrl
      ? `<p style="margin:4px 0 18px"><a href="${escapeHtml(actionUrl)}" style="display:inline-block;padding:9px 16px;background:${colours.accent};color:#ffffff;border-radius:5px;text-decoration:none;font-weight:700">${escapeHtml(content.action.label)}</a></p><p style="margin:0 0 14px;font-size:13px;color:${colours.muted}">Or open ${escapeHtml(actionUrl)}</p>`
      : '';
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(content.subject)}</title></head>
<body style="margin:0;padding:0;background:${colours.paper};color:${colours.ink};font-family:'Nunito Sans',Segoe UI,Helvetica,Arial,sans-serif;font-size:15px;line-height:1.5">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${colours.paper}"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:560px;background:#ffffff;border:1px solid ${colours.rule};border-radius:8px">
<tr><td style="padding:14px 22px;border-bottom:3px solid ${colours.accent};font-weight:800;letter-spacing:0.02em">Skewbench <span style="font-weight:400;color:${colours.muted}">· ${escapeHtml(lab.name)}</span></td></tr>
<tr><td style="padding:20px 22px">
${p(greeting)}${content.lead.map((x) => p(x)).join('')}${facts}${blocks}${links}${action}${(content.after ?? []).map((x) => p(x)).join('')}
</td></tr>
<tr><td style="padding:12px 22px;border-top:1px solid ${colours.rule};font-size:12px;color:${colours.muted}">${content.footer.map((x) => escapeHtml(x)).join('<br>')}<br><a href="${escapeHtml(lab.publicUrl)}/" style="color:${colours.link}">${escapeHtml(lab.publicUrl)}</a></td></tr>
</table></td></tr></table></body></html>`;
  return { subject: content.subject, text: text.join('\n'), html, attachments: content.attachments };
}
