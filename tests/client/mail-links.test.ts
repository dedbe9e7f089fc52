import { describe, expect, it } from 'vitest';
import { decodeEntities, extractLinks } from '../../src/features/mail/utils/mail-links.js';
import { formatBytes, kindLabel, matchesRecipient, recipientsOf, serverRecipient } from '../../src/features/mail/utils/mail-format.js';

describe('extractLinks (the links listed under the sandboxed preview)', () => {
  it('takes the HTML anchors with their text, decoding entities in the href', () => {
    const html = `<p>Hello</p><a href="https://lab.test/invite?token=ab&amp;next=%2F" style="x">Set your <b>password</b></a>
      <a href='http://lab.test/bookings/12'>Booking 12</a>`;
    expect(extractLinks(html, null)).toEqual([
      { url: 'https://lab.test/invite?token=ab&next=%2F', label: 'Set your password' },
      { url: 'http://lab.test/bookings/12', label: 'Booking 12' },
    ]);
  });

  it('adds URLs of the plain text that the HTML lacks, without the punctuation after them', () => {
    const text = 'Open https://lab.test/bookings/12. Or see (https://lab.test/setups/3), and https://lab.test/wiki/A_(b)!';
    expect(extractLinks('<a href="https://lab.test/bookings/12">Open the booking</a>', text)).toEqual([
      { url: 'https://lab.test/bookings/12', label: 'Open the booking' },
      { url: 'https://lab.test/setups/3' },
      { url: 'https://lab.test/wiki/A_(b)' },
    ]);
  });

  it('drops duplicates, labels that only repeat the URL, and anything but http(s)', () => {
    const html = `<a href="https://lab.test/">https://lab.test/</a><a href="mailto:ada@lab.test">Ada</a><a href="javascript:alert(1)">x</a><a href="/relative">r</a>`;
    expect(extractLinks(html, 'https://lab.test/ and again https://lab.test/')).toEqual([{ url: 'https://lab.test/' }]);
  });

  it('finds nothing in a message without links', () => {
    expect(extractLinks(null, 'No links here.')).toEqual([]);
    expect(extractLinks('<p>none</p>', null)).toEqual([]);
  });

  it('decodes named and numeric character references and leaves unknown ones', () => {
    expect(decodeEntities('a&amp;b &#39;c&#x27; &lt;d&gt; &bogus;')).toBe("a&b 'c' <d> &bogus;");
  });
});

describe('recipient filter', () => {
  const message = { toAddresses: ['ada.quill@lab.test'], toHeader: 'Ada Quill <ada.quill@lab.test>' };

  it('asks the server only for a complete address, lower-cased', () => {
    expect(serverRecipient('Ada.Quill@Lab.Test ')).toBe('ada.quill@lab.test');
    expect(serverRecipient('ada')).toBeUndefined();
    expect(serverRecipient('ada@lab')).toBeUndefined();
    expect(serverRecipient('')).toBeUndefined();
  });

  it('matches any part of an address or the To header, ignoring case', () => {
    expect(matchesRecipient(message, 'QUILL')).toBe(true);
    expect(matchesRecipient(message, 'Ada Quill')).toBe(true);
    expect(matchesRecipient(message, '  ')).toBe(true);
    expect(matchesRecipient(message, 'bob')).toBe(false);
  });

  it('suggests each recipient once, sorted', () => {
    expect(recipientsOf([{ toAddresses: ['b@lab.test', 'a@lab.test'] }, { toAddresses: ['a@lab.test'] }])).toEqual(['a@lab.test', 'b@lab.test']);
  });
});

describe('mail display helpers', () => {
  it.each([
    [0, '0 B'],
    [999, '999 B'],
    [1000, '1 kB'],
    [3456, '3.5 kB'],
    [1_250_000, '1.3 MB'],
  ])('formatBytes(%i) = %s', (bytes, text) => {
    expect(formatBytes(bytes)).toBe(text);
  });

  it('names an outbox kind in words', () => {
    expect(kindLabel('booking-confirmed')).toBe('Booking confirmed');
    expect(kindLabel('handover')).toBe('Handover');
  });
});
