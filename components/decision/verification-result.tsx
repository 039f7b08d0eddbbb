import type { PublicVerification } from '@/lib/dal/decision-verify';
import { formatDateTime } from '@/lib/format/dates';
import { FormMessage } from '@/components/ui/field';

export type LetterCheck = {
  /** The file's own SHA-256, computed in the browser or on the server. */
  fileSha256: string;
  byFile: PublicVerification;
  /** The record hash the file says it carries, and what that hash matches, when the file itself is unknown. */
  embeddedRecordSha256: string | null;
  byEmbeddedHash: PublicVerification | null;
};

function SealState({ match }: { match: Extract<PublicVerification, { found: true }> }) {
  const sound = match.intact && match.signatureValid;
  return (
    <ul className="mt-2 grid gap-1 text-sm">
      <li>
        Case <strong>{match.caseNumber}</strong>, decision signed {formatDateTime(match.signedAt)}.
      </li>
      <li>{match.intact ? '✓ The record in the database still has this hash: nothing was changed after sealing.' : '✕ The record in the database no longer has this hash: it was changed after sealing. Tell the board.'}</li>
      <li>{match.signatureValid ? '✓ The signature is valid for the server’s published key.' : '✕ The signature does not verify with the server’s published key.'}</li>
      {match.superseded ? <li>▲ This decision was corrected by a later decision of {formatDateTime(match.superseded.signedAt)}; ask a party for the current letter.</li> : <li>✓ It is the current decision of the case.</li>}
      {!sound ? <li>This record cannot be relied on as sealed.</li> : null}
    </ul>
  );
}

/** The answer for a typed record hash. */
export function RecordHashResult({ hash, result }: { hash: string; result: PublicVerification }) {
  if (!result.found) {
    return <FormMessage tone="error">No sealed decision has the record hash {hash}. Check that it was copied in full, as printed on the letter.</FormMessage>;
  }
  const sound = result.intact && result.signatureValid;
  return (
    <div role="status" className={`rounded-control border px-4 py-3 ${sound ? 'border-clover bg-clover-soft' : 'border-rust bg-rust-soft'}`} data-testid="verification-result">
      <p className="font-bold">{sound ? '✓ This hash belongs to a sealed decision.' : '✕ This hash belongs to a sealed decision whose record no longer verifies.'}</p>
      <SealState match={result} />
    </div>
  );
}

/** The answer for an uploaded letter. */
export function LetterFileResult({ check }: { check: LetterCheck }) {
  if (check.byFile.found) {
    const sound = check.byFile.intact && check.byFile.signatureValid;
    return (
      <div role="status" className={`rounded-control border px-4 py-3 ${sound ? 'border-clover bg-clover-soft' : 'border-rust bg-rust-soft'}`} data-testid="verification-result">
        <p className="font-bold">{sound ? '✓ This file is a decision letter exactly as it was issued.' : '✕ This file is a letter as issued, but its record no longer verifies.'}</p>
        <p className="mt-1 break-all text-xs">File SHA-256 {check.fileSha256}</p>
        <SealState match={check.byFile} />
      </div>
    );
  }
  if (check.byEmbeddedHash?.found) {
    return (
      <div role="status" className="rounded-control border border-amber bg-amber-soft px-4 py-3" data-testid="verification-result">
        <p className="font-bold">▲ This file is not a letter as it was issued: it was changed or saved again since.</p>
        <p className="mt-1 text-sm">
          It names the record {check.embeddedRecordSha256}, which is sealed. Do not rely on this copy: compare its text with a letter downloaded from the case, or check the record hash printed on a letter you trust.
        </p>
        <SealState match={check.byEmbeddedHash} />
      </div>
    );
  }
  return (
    <FormMessage tone="error">
      This file matches no letter issued here{check.embeddedRecordSha256 ? ', and the record it names is not sealed here' : ''}. (File SHA-256 {check.fileSha256}.)
    </FormMessage>
  );
}
