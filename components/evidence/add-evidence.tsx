'use client';

import dynamic from 'next/dynamic';
import { useState } from 'react';
import { Button } from '@/components/ui/button';

// The upload SDK is fetched only when someone means to add a file, never with the case page itself.
const EvidenceUploader = dynamic(() => import('./evidence-uploader').then((m) => m.EvidenceUploader), {
  ssr: false,
  loading: () => (
    <p role="status" className="text-sm text-brine" data-testid="evidence-uploader-loading">
      Opening the uploader…
    </p>
  ),
});

/** "Add evidence" first; the uploader opens in its place, with the focus on its first field. */
export function AddEvidence({ caseId }: { caseId: string }) {
  const [open, setOpen] = useState(false);
  if (open) return <EvidenceUploader caseId={caseId} autoFocus />;
  return (
    <div>
      <Button type="button" data-testid="add-evidence" onClick={() => setOpen(true)}>
        Add evidence
      </Button>
    </div>
  );
}
