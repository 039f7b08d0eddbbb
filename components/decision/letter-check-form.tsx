'use client';

import { useState, type FormEvent } from 'react';
import { checkLetter, type LetterCheckState } from '@/app/verify/actions';
import { Button } from '@/components/ui/button';
import { Field, FormMessage } from '@/components/ui/field';
import { embeddedRecordHash, MAX_LETTER_BYTES } from '@/lib/decision/letter/marker';
import { LetterFileResult } from './verification-result';

function hex(buffer: ArrayBuffer): string {
  return [...new Uint8Array(buffer)].map((b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * Checks a letter file. Where the browser can hash (Web Crypto, on HTTPS or this machine), only the
 * hashes are sent; the letter itself stays with its reader.
 */
export function LetterCheckForm() {
  const [state, setState] = useState<LetterCheckState>(null);
  const [busy, setBusy] = useState(false);
  const [fileError, setFileError] = useState<string | null>(null);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setState(null);
    const input = event.currentTarget.elements.namedItem('file') as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return setFileError('Choose the letter’s PDF file.');
    if (file.size > MAX_LETTER_BYTES) return setFileError('That file is larger than any decision letter (10 MB at most).');
    setFileError(null);
    setBusy(true);
    try {
      const data = new FormData();
      if (globalThis.crypto?.subtle) {
        const bytes = await file.arrayBuffer();
        data.set('fileSha256', hex(await crypto.subtle.digest('SHA-256', bytes)));
        data.set('embeddedRecordSha256', embeddedRecordHash(new Uint8Array(bytes)) ?? '');
      } else {
        data.set('file', file);
      }
      setState(await checkLetter(data));
    } catch {
      setState({ ok: false, message: 'The file could not be read or checked; try again.' });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-3" data-testid="letter-check-form">
      <Field id="letter-file" label="The letter (PDF)" hint="Where your browser can, it computes the file’s fingerprint itself and sends only that." error={fileError ?? undefined}>
        <input id="letter-file" name="file" type="file" accept="application/pdf,.pdf" className="text-sm" aria-invalid={!!fileError || undefined} />
      </Field>
      <div>
        <Button type="submit" disabled={busy}>
          {busy ? 'Checking…' : 'Check the letter'}
        </Button>
      </div>
      {state && !state.ok ? <FormMessage tone="error">{state.message}</FormMessage> : null}
      {state && state.ok ? <LetterFileResult check={state.check} /> : null}
    </form>
  );
}
