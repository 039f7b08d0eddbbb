'use client';

import { useState } from 'react';
import { Check, Copy } from 'lucide-react';

/** The full SHA-256, selectable, with a button that copies it: parties compare it with their own file's. */
export function CopyHash({ sha256, fileName }: { sha256: string; fileName: string }) {
  const [copied, setCopied] = useState<'yes' | 'failed' | null>(null);
  return (
    <span className="flex flex-wrap items-center gap-2">
      <code className="break-all font-mono text-2xs text-ink" data-testid="evidence-sha256">
        {sha256}
      </code>
      <button
        type="button"
        className="inline-flex items-center gap-1 rounded-control border border-line bg-white px-2 py-0.5 text-xs font-bold text-frost-dark hover:border-brine"
        aria-label={`Copy the SHA-256 of ${fileName}`}
        onClick={async () => {
          try {
            await navigator.clipboard.writeText(sha256);
            setCopied('yes');
          } catch {
            setCopied('failed');
          }
        }}
      >
        {copied === 'yes' ? <Check aria-hidden="true" size={14} /> : <Copy aria-hidden="true" size={14} />}
        {copied === 'yes' ? 'Copied' : copied === 'failed' ? 'Select and copy it by hand' : 'Copy'}
      </button>
    </span>
  );
}
