'use client';

import { useId, useState } from 'react';
import { useRouter } from 'next/navigation';
import { Field, FormMessage, Select, TextInput, describedBy } from '@/components/ui/field';
import { attachmentKinds, formatBytes, kindRules, maxBytesOf, typeList, type AttachmentKind } from '@/lib/evidence/kinds';
import { CAPTION_MAX_CHARS, uploadInputSchema, type UploadOutcome } from '@/lib/evidence/schemas';
import { uploadErrorMessage } from '@/lib/evidence/upload-errors';
import { EvidenceUploadButton } from './uploadthing';

type Phase = { step: 'idle' } | { step: 'sending'; percent: number } | { step: 'checking' };
type Report = { added: string[]; refused: { fileName: string; reason: string }[]; error: string | null };

// The SDK's default classes are Tailwind classes our build does not generate; ours replace them.
const ownClassesOnly = (...classes: (string | undefined | null | false)[]): string => classes.filter((c): c is string => typeof c === 'string' && c !== '').at(-1) ?? '';

/** Kind, caption, then the files: each file is checked by the server before it joins the case. */
export function EvidenceUploader({ caseId, autoFocus = false }: { caseId: string; autoFocus?: boolean }) {
  const router = useRouter();
  const id = useId();
  const [kind, setKind] = useState<AttachmentKind>('lab_sheet');
  const [caption, setCaption] = useState('');
  const [phase, setPhase] = useState<Phase>({ step: 'idle' });
  const [report, setReport] = useState<Report | null>(null);
  const rule = kindRules[kind];
  const input = uploadInputSchema.safeParse({ caseId, kind, caption });
  const captionError = input.success ? undefined : input.error.issues.find((issue) => issue.path[0] === 'caption')?.message;
  const busy = phase.step !== 'idle';

  function finish(files: { name: string; serverData: UploadOutcome | null }[]) {
    const added: string[] = [];
    const refused: Report['refused'] = [];
    for (const file of files) {
      const outcome = file.serverData;
      if (outcome?.ok) added.push(outcome.fileName);
      // No server data means the app never answered the store: nothing was recorded.
      else refused.push({ fileName: outcome?.fileName ?? file.name, reason: outcome?.reason ?? 'The server did not confirm the file, so it was not added. Try again.' });
    }
    setPhase({ step: 'idle' });
    setReport({ added, refused, error: null });
    if (added.length) {
      setCaption('');
      router.refresh();
    }
  }

  return (
    <section aria-labelledby={`${id}-title`} className="grid gap-3 rounded-card border border-line bg-paper-deep/40 p-4" data-testid="evidence-uploader">
      <h3 id={`${id}-title`} className="font-bold">
        Add evidence
      </h3>
      <div className="grid gap-3 sm:grid-cols-[minmax(12rem,1fr)_2fr]">
        <Field id={`${id}-kind`} label="Kind of evidence" hint={rule.hint}>
          <Select id={`${id}-kind`} value={kind} disabled={busy} autoFocus={autoFocus} aria-describedby={describedBy(`${id}-kind`, false, true)} onChange={(e) => setKind(e.target.value as AttachmentKind)}>
            {attachmentKinds.map((k) => (
              <option key={k} value={k}>
                {kindRules[k].label}
              </option>
            ))}
          </Select>
        </Field>
        <Field id={`${id}-caption`} label="Caption (optional)" hint="What the file shows, in a line: the board reads it beside the file." error={captionError}>
          <TextInput
            id={`${id}-caption`}
            value={caption}
            maxLength={CAPTION_MAX_CHARS}
            disabled={busy}
            invalid={!!captionError}
            aria-describedby={describedBy(`${id}-caption`, !!captionError, true)}
            onChange={(e) => setCaption(e.target.value)}
          />
        </Field>
      </div>
      <div className="flex flex-wrap items-center gap-4">
        <EvidenceUploadButton
          key={kind}
          endpoint={kind}
          input={{ caseId, kind, caption: caption.trim() || undefined }}
          disabled={!input.success}
          config={{ cn: ownClassesOnly }}
          uploadProgressGranularity="fine"
          onUploadBegin={() => {
            setReport(null);
            setPhase({ step: 'sending', percent: 0 });
          }}
          onUploadProgress={(percent) => setPhase(percent >= 100 ? { step: 'checking' } : { step: 'sending', percent })}
          onClientUploadComplete={(files) => finish(files)}
          onUploadError={(error) => {
            setPhase({ step: 'idle' });
            setReport({ added: [], refused: [], error: uploadErrorMessage(error) });
          }}
          appearance={{
            container: 'flex flex-col items-start gap-1',
            button: ({ isUploading, ready }) =>
              `relative inline-flex cursor-pointer items-center justify-center gap-2 overflow-hidden rounded-control border px-4 py-2 text-sm font-bold focus-within:outline focus-within:outline-3 focus-within:outline-offset-2 focus-within:outline-frost ${
                !ready || isUploading ? 'cursor-progress border-line bg-paper-deep text-ink-soft' : 'border-frost-dark bg-frost text-white hover:bg-frost-dark'
              } data-[state=disabled]:cursor-not-allowed data-[state=disabled]:opacity-60`,
            allowedContent: 'text-xs text-brine',
          }}
          content={{
            button: ({ ready, isUploading }) => (isUploading ? 'Uploading…' : ready ? `Choose ${rule.maxCount > 1 ? 'files' : 'a file'} and upload` : 'Preparing…'),
            allowedContent: `${typeList(kind)} · up to ${formatBytes(maxBytesOf(kind))} each · ${rule.maxCount} at a time`,
          }}
        />
        {phase.step === 'sending' ? (
          <div className="grid min-w-48 gap-1" aria-live="polite">
            <progress className="h-2 w-48 accent-frost" max={100} value={phase.percent} aria-label="Upload progress" />
            <span className="text-xs text-brine">Sending… {Math.round(phase.percent)} %</span>
          </div>
        ) : null}
        {phase.step === 'checking' ? (
          <p className="text-sm text-brine" aria-live="polite">
            Sent. Checking the content and computing its SHA-256…
          </p>
        ) : null}
      </div>
      {report?.error ? <FormMessage tone="error">{report.error}</FormMessage> : null}
      {report?.added.length ? <FormMessage tone="success">{`Added to the case: ${report.added.join(', ')}.`}</FormMessage> : null}
      {report?.refused.map((r) => (
        <FormMessage key={r.fileName} tone="error">
          {`${r.fileName} was not added. ${r.reason}`}
        </FormMessage>
      ))}
    </section>
  );
}
