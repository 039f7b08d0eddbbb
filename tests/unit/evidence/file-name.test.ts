import { describe, expect, it } from 'vitest';
import { cleanFileName } from '@/lib/evidence/file-name';

describe('file names of evidence', () => {
  it('keeps an ordinary name as it is, accents included', () => {
    expect(cleanFileName('Relevé cryoscope 2026-06-03.pdf')).toEqual({ ok: true, name: 'Relevé cryoscope 2026-06-03.pdf' });
  });

  it('refuses folder paths, whichever separator, and bare dot names', () => {
    for (const name of ['../secret.pdf', '..\\..\\boot.ini', 'reports/sheet.pdf', '/etc/passwd', '..', '.']) {
      const result = cleanFileName(name);
      expect(result.ok, name).toBe(false);
    }
  });

  it('refuses a name that reverses its own direction to hide the real extension', () => {
    const result = cleanFileName('sheet\u202Efdp.exe');
    expect(result).toEqual({ ok: false, reason: expect.stringMatching(/reverse the text direction/) });
  });

  it('drops control and zero-width characters and replaces reserved ones', () => {
    expect(cleanFileName('lab\u0000 sheet\u0007\u200B.pdf')).toEqual({ ok: true, name: 'lab sheet.pdf' });
    expect(cleanFileName('a<b>:"c"|?*.csv')).toEqual({ ok: true, name: 'a_b___c____.csv' });
    expect(cleanFileName('line\r\nbreak.txt')).toEqual({ ok: true, name: 'line break.txt' });
  });

  it('drops leading dots, so no hidden file, and refuses a name that is empty once cleaned', () => {
    expect(cleanFileName('...profile.pdf')).toEqual({ ok: true, name: 'profile.pdf' });
    expect(cleanFileName('\u0000\u0001').ok).toBe(false);
    expect(cleanFileName('').ok).toBe(false);
  });

  it('shortens a very long name to 120 characters and keeps its extension', () => {
    const result = cleanFileName(`${'x'.repeat(300)}.pdf`);
    expect(result.ok).toBe(true);
    if (result.ok) {
      expect(result.name).toHaveLength(120);
      expect(result.name.endsWith('.pdf')).toBe(true);
    }
  });
});
