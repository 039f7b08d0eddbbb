import type { Metadata } from 'next';
import Link from 'next/link';
import { headers } from 'next/headers';
import { letterCheckAllowed, tooManyLetterChecks } from '@/lib/throttle/letter-checks';
import { getDb } from '@/db/client';
import { publicVerification } from '@/lib/dal/decision-verify';
import { recordHashSchema } from '@/lib/decision/schemas';
import { Card } from '@/components/ui/card';
import { Button } from '@/components/ui/button';
import { Field, TextInput } from '@/components/ui/field';
import { RecordHashResult } from '@/components/decision/verification-result';
import { LetterCheckForm } from '@/components/decision/letter-check-form';

export const metadata: Metadata = { title: 'Verify a decision letter' };
export const dynamic = 'force-dynamic';

/**
 * Public: anyone holding a decision letter can check it here. The answer says whether the hash or
 * the file belongs to a sealed decision and whether its record still verifies — never the record.
 */
export default async function VerifyPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { hash } = await searchParams;
  const typed = typeof hash === 'string' && hash.trim() !== '' ? hash : null;
  const parsed = typed === null ? null : recordHashSchema.safeParse(typed);
  const throttled = parsed?.success ? !(await letterCheckAllowed(await headers())) : false;
  const result = parsed?.success && !throttled ? await publicVerification(getDb(), { recordSha256: parsed.data }) : null;

  return (
    <main id="main" className="mx-auto grid max-w-3xl gap-6 px-4 py-10">
      <header>
        <Link href="/" className="mb-4 flex items-center gap-2 text-xl font-bold text-ink hover:no-underline">
          <span aria-hidden="true" className="inline-block h-6 w-6 rounded-sm border-2 border-frost bg-frost-soft" />
          Countersample
        </Link>
        <h1 className="text-2xl font-bold">Verify a decision letter</h1>
        <p className="mt-1 text-ink-soft">
          A decision letter carries the SHA-256 of the sealed case record and the server’s signature of it. Enter the hash printed on the letter, or choose the letter’s file. The answer says whether it belongs to a sealed decision; the record itself is shown only to the parties of the case.
        </p>
      </header>

      <Card id="by-hash" title="By the record hash">
        <form method="get" action="/verify" className="grid gap-3">
          <Field id="hash" label="Record SHA-256" hint="64 hexadecimal digits, as printed under “Record SHA-256” on the letter." error={parsed && !parsed.success ? parsed.error.issues[0]?.message : throttled ? tooManyLetterChecks : undefined}>
            <TextInput id="hash" name="hash" defaultValue={typed ?? ''} spellCheck={false} autoComplete="off" className="font-mono text-sm" invalid={(!!parsed && !parsed.success) || throttled} />
          </Field>
          <div>
            <Button type="submit">Check the hash</Button>
          </div>
        </form>
        {result && parsed?.success ? (
          <div className="mt-4">
            <RecordHashResult hash={parsed.data} result={result} />
          </div>
        ) : null}
      </Card>

      <Card id="by-file" title="By the letter file">
        <LetterCheckForm />
        <p className="mt-3 text-xs text-brine">
          Only a file exactly as it was issued is recognised: a letter that was printed to PDF again, edited or signed by a viewer has other bytes. Such a copy is named as changed, with the record it claims.
        </p>
      </Card>

      <p className="text-xs text-brine">
        The signature can also be checked without this page, with the public key at <a href="/.well-known/countersample-signing-key">/.well-known/countersample-signing-key</a>. A decision supports no claim beyond what it says; local regulations and the supply contract prevail.
      </p>
    </main>
  );
}
