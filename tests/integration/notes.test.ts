import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ActorKey, World } from './support/lifecycle';

// env() reads SMTP_URL once: the catcher must listen and the variables be set before the app is loaded.
const { startMailCatcher } = await import('@/lib/mail/catcher');
const catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
process.env.SMTP_URL = `smtp://127.0.0.1:${catcher.smtpPort}`;
process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${catcher.httpPort}`;

const { and, count, eq } = await import('drizzle-orm');
const { getDb } = await import('@/db/client');
const { auditEvent, disputeCase, note, noteRevision, outgoingMail } = await import('@/db/schema');
const { createNote, editNote, listVisibleNotes, replyToNote } = await import('@/lib/dal/notes');
const { getCaseFile } = await import('@/lib/dal/case-file');
const { runTransition } = await import('@/lib/dal/case-transition');
const { verifyAuditChain } = await import('@/lib/audit/verify');
const { resetMailTransport } = await import('@/lib/mail/transport');
const { GET: caseRoute } = await import('@/app/api/v1/cases/[caseId]/route');
const { callRoute, demoUser } = await import('./helpers');
const L = await import('./support/lifecycle');
const { MINUTE } = L;

let world: World;

const text = (value: string, marks?: unknown[]) => ({ type: 'text', text: value, ...(marks ? { marks } : {}) });
const doc = (...paragraphs: unknown[][]) => ({ type: 'doc', content: paragraphs.map((content) => ({ type: 'paragraph', content })) });
const say = (words: string) => doc([text(words)]);

async function noteIdsVia(key: ActorKey, caseId: string) {
  const db = getDb();
  const file = await getCaseFile(db, world.actors[key], caseId);
  const listed = await listVisibleNotes(db, world.actors[key], caseId);
  const response = await callRoute(caseRoute, `/api/v1/cases/${caseId}`, { cookie: world.cookies[key], params: { caseId } });
  expect(response.status).toBe(200);
  const api = (await response.json()) as { notes: { id: string; body: unknown; text: string }[]; ledger: { action: string; change: unknown }[] };
  const ids = file.notes.map((n) => n.id).sort();
  // Every read path must agree: the page's data, the data layer's list and the API.
  expect(listed.map((n) => n.id).sort()).toEqual(ids);
  expect(api.notes.map((n) => n.id).sort()).toEqual(ids);
  return { ids, file, api };
}

async function counts() {
  const db = getDb();
  const [[notes], [revisions], [audit], [mail]] = await Promise.all([
    db.select({ n: count() }).from(note),
    db.select({ n: count() }).from(noteRevision),
    db.select({ n: count() }).from(auditEvent),
    db.select({ n: count() }).from(outgoingMail),
  ]);
  return { notes: notes.n, revisions: revisions.n, audit: audit.n, mail: mail.n };
}

function noteMailTo(number: string): string[] {
  return catcher.messages.filter((m) => m.subject.startsWith(`${number}:`) && m.template === 'note-posted').flatMap((m) => m.to).sort();
}

async function mailSettled() {
  // sendMail awaits the SMTP hand-over, so after the call returns the catcher has it or it failed.
  const db = getDb();
  const failed = await db.select({ n: count() }).from(outgoingMail).where(eq(outgoingMail.status, 'failed'));
  expect(failed[0].n).toBe(0);
}

beforeAll(async () => {
  world = await L.setUpWorld();
});

afterAll(async () => {
  resetMailTransport();
  await catcher.close();
});

describe('visibility', () => {
  it('an internal note is read by its own organisation only, through every read path, and its trace is left out of the others’ ledger', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const internal = await createNote(db, world.actors.plant, c.id, { body: say('Internal: was compartment 2 rinsed?'), visibility: 'internal' });
    const shared = await createNote(db, world.actors.plant, c.id, { body: say('The morning check passed.'), visibility: 'parties' });

    const plant = await noteIdsVia('plant', c.id);
    expect(plant.ids).toEqual([internal.id, shared.id].sort());
    expect(plant.file.ledger.filter((e) => e.action === 'note.created')).toHaveLength(2);

    for (const key of ['supplier', 'lab', 'arbiter', 'arbiter2'] as const) {
      const seen = await noteIdsVia(key, c.id);
      expect(seen.ids).toEqual([shared.id]);
      expect(JSON.stringify(seen.api)).not.toContain('compartment 2');
      expect(seen.file.ledger.filter((e) => e.action === 'note.created').map((e) => (e.change as { visibility: string }).visibility)).toEqual(['parties']);
    }
  });

  it('outsiders and the administrator get 404 from every path, reading or writing', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const shared = await createNote(db, world.actors.supplier, c.id, { body: say('Shared with the parties.'), visibility: 'parties' });
    const before = await counts();
    for (const key of ['otherLab', 'otherArbiter', 'admin', 'supplier2'] as const) {
      const actor = world.actors[key];
      await L.expectAppError(listVisibleNotes(db, actor, c.id), 'not_found');
      await L.expectAppError(getCaseFile(db, actor, c.id), 'not_found');
      await L.expectAppError(createNote(db, actor, c.id, { body: say('Hello'), visibility: 'parties' }), 'not_found');
      await L.expectAppError(replyToNote(db, actor, c.id, shared.id, { body: say('Hello') }), 'not_found');
      await L.expectAppError(editNote(db, actor, c.id, shared.id, { body: say('Hello') }), 'not_found');
      const response = await callRoute(caseRoute, `/api/v1/cases/${c.id}`, { cookie: world.cookies[key], params: { caseId: c.id } });
      await L.expectProblem(response, 404);
    }
    expect(await counts()).toEqual(before);
  });

  it('a party cannot reach another organisation’s internal note by its id: replying or editing answers 404', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const internal = await createNote(db, world.actors.arbiter, c.id, { body: say('Board only.'), visibility: 'internal' });
    await L.expectAppError(replyToNote(db, world.actors.supplier, c.id, internal.id, { body: say('Let me in') }), 'not_found');
    await L.expectAppError(editNote(db, world.actors.plant, c.id, internal.id, { body: say('Changed') }), 'not_found');
    // Another board member reads and answers it: internal means the organisation, not the author.
    const reply = await replyToNote(db, world.actors.arbiter2, c.id, internal.id, { body: say('Agreed.') });
    expect(reply.visibility).toBe('internal');
  });

  it('the blind laboratory reads only its own organisation’s notes until it submits its retest', async () => {
    const c = await L.freshCaseIn(world, 'retest');
    const db = getDb();
    const supplierNote = await createNote(db, world.actors.supplier, c.id, { body: say('Our bulk-tank check read −0.521 °C.'), visibility: 'parties' });
    const labNote = await createNote(db, world.actors.lab, c.id, { body: say('Sample received cold and sealed.'), visibility: 'parties' });
    expect((await noteIdsVia('lab', c.id)).ids).toEqual([labNote.id]);
    await L.expectAppError(replyToNote(db, world.actors.lab, c.id, supplierNote.id, { body: say('Noted') }), 'not_found');

    await runTransition(db, world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world));
    expect((await noteIdsVia('lab', c.id)).ids).toEqual([supplierNote.id, labNote.id].sort());
  });
});

describe('threads', () => {
  it('a reply inherits the thread’s visibility, refuses another, and a reply to a reply joins the thread', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const root = await createNote(db, world.actors.plant, c.id, { body: say('Internal thread.'), visibility: 'internal' });
    const before = await counts();
    const refused = await L.expectAppError(replyToNote(db, world.actors.plant, c.id, root.id, { body: say('Now for everyone'), visibility: 'parties' }), 'invalid');
    expect(refused.fieldErrors?.visibility?.[0]).toMatch(/internal to your organisation, so its replies are too/);
    expect(await counts()).toEqual(before);

    const reply = await replyToNote(db, world.actors.plant, c.id, root.id, { body: say('First reply.') });
    expect(reply).toMatchObject({ parentId: root.id, visibility: 'internal' });
    const nested = await replyToNote(db, world.actors.plant, c.id, reply.id, { body: say('Reply to the reply.') });
    expect(nested).toMatchObject({ parentId: root.id, visibility: 'internal' });
    expect((await noteIdsVia('supplier', c.id)).ids).toEqual([]);

    const shared = await createNote(db, world.actors.supplier, c.id, { body: say('Shared thread.'), visibility: 'parties' });
    const answer = await replyToNote(db, world.actors.plant, c.id, shared.id, { body: say('Shared answer.') });
    expect(answer.visibility).toBe('parties');
    expect((await noteIdsVia('arbiter', c.id)).ids).toEqual([shared.id, answer.id].sort());
  });
});

describe('editing', () => {
  it('keeps the earlier body as a revision that every reader of the note sees, with one audit event per write', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const seq = await L.lastAuditSeq();
    const posted = await createNote(db, world.actors.supplier, c.id, { body: say('Frist version.'), visibility: 'parties' });
    const edited = await editNote(db, world.actors.supplier, c.id, posted.id, { body: doc([text('First', [{ type: 'bold' }]), text(' version, corrected.')]) });
    expect(edited).toEqual({ id: posted.id, changed: true });

    const audit = await L.auditSince(seq);
    expect(audit.map((e) => [e.action, e.objectId])).toEqual([
      ['note.created', posted.id],
      ['note.edited', posted.id],
    ]);
    expect(JSON.stringify(audit.map((e) => e.change))).not.toContain('version');

    for (const key of ['supplier', 'plant', 'arbiter'] as const) {
      const { file, api } = await noteIdsVia(key, c.id);
      const seen = file.notes.find((n) => n.id === posted.id)!;
      expect(seen.editedAt).not.toBeNull();
      expect(seen.text).toBe('First version, corrected.');
      expect(seen.revisions).toHaveLength(1);
      expect(seen.revisions[0].body).toEqual(say('Frist version.'));
      expect(seen.mine).toBe(key === 'supplier');
      expect(api.notes.find((n) => n.id === posted.id)!.text).toBe('First version, corrected.');
    }
    expect(await verifyAuditChain(db)).toMatchObject({ ok: true });
  });

  it('is for the author alone, and only within 15 minutes of posting', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const postedAt = new Date(Date.now() - 20 * MINUTE);
    const posted = await createNote(db, world.actors.plant, c.id, { body: say('Posted a while ago.'), visibility: 'parties' }, { now: postedAt });
    const before = await counts();

    const other = await L.expectAppError(editNote(db, world.actors.supplier, c.id, posted.id, { body: say('Not mine') }), 'forbidden');
    expect(other.message).toMatch(/Only the author/);
    // The same board organisation is still not the author.
    await L.expectAppError(editNote(db, world.actors.arbiter, c.id, posted.id, { body: say('Not mine either') }), 'forbidden');

    await editNote(db, world.actors.plant, c.id, posted.id, { body: say('Within the window.') }, { now: new Date(postedAt.getTime() + 14 * MINUTE) });
    const late = await L.expectAppError(editNote(db, world.actors.plant, c.id, posted.id, { body: say('Too late.') }, { now: new Date(postedAt.getTime() + 15 * MINUTE + 1000) }), 'conflict');
    expect(late.message).toMatch(/15 minutes/);
    await L.expectAppError(editNote(db, world.actors.plant, c.id, posted.id, { body: say('Too late, by the real clock.') }), 'conflict');

    const after = await counts();
    expect(after).toEqual({ ...before, revisions: before.revisions + 1, audit: before.audit + 1 });
    const [row] = await db.select().from(note).where(eq(note.id, posted.id));
    expect(row.body).toEqual(say('Within the window.'));
    const { file } = await noteIdsVia('plant', c.id);
    expect(file.notes.find((n) => n.id === posted.id)!.editableUntil).toBeNull();
  });

  it('an unchanged body writes nothing', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const posted = await createNote(db, world.actors.plant, c.id, { body: say('Same.'), visibility: 'parties' });
    const before = await counts();
    expect(await editNote(db, world.actors.plant, c.id, posted.id, { body: say('Same.') })).toEqual({ id: posted.id, changed: false });
    expect(await counts()).toEqual(before);
  });
});

describe('mail', () => {
  it('a shared note mails the other parties, not the author’s organisation and not the laboratory while it tests blind; an internal note mails nobody', async () => {
    const c = await L.freshCaseIn(world, 'retest');
    const db = getDb();
    await createNote(db, world.actors.supplier, c.id, { body: doc([text('See '), text('the logger file', [{ type: 'link', attrs: { href: 'https://example.org/logger' } }]), text(' <b>please</b>.')]), visibility: 'parties' });
    await mailSettled();
    expect(noteMailTo(c.number)).toEqual([demoUser('arbiter').email, demoUser('arbiter2').email, demoUser('plant').email].sort());
    const message = catcher.messages.find((m) => m.subject.startsWith(`${c.number}:`) && m.template === 'note-posted')!;
    expect(message.subject).toContain('a new note from');
    // The note's words arrive as text: markup typed into it is escaped, the link is written out.
    expect(message.html).toContain('&lt;b&gt;please&lt;/b&gt;');
    expect(message.html).not.toContain('<b>please</b>');
    expect(message.text).toContain('the logger file (https://example.org/logger)');

    const mailBefore = (await counts()).mail;
    await createNote(db, world.actors.plant, c.id, { body: say('Internal only.'), visibility: 'internal' });
    expect((await counts()).mail).toBe(mailBefore);

    await runTransition(db, world.actors.lab, c.id, 'submit_retest', L.inputs.submit_retest(world));
    const lengthBefore = noteMailTo(c.number).length;
    await createNote(db, world.actors.plant, c.id, { body: say('Now the laboratory reads shared notes too.'), visibility: 'parties' });
    await mailSettled();
    const latest = noteMailTo(c.number).slice();
    expect(latest.length - lengthBefore).toBe(4);
    // The author's plant is not told; the laboratory, having submitted, now is.
    expect(latest.filter((to) => to === demoUser('lab').email)).toHaveLength(1);
    expect(latest.filter((to) => to === demoUser('plant').email)).toHaveLength(1);
    expect(latest.filter((to) => to === demoUser('supplier').email)).toHaveLength(1);
  });
});

describe('closed cases', () => {
  it('a decided or withdrawn case takes no note, reply or edit, and nothing is written', async () => {
    const db = getDb();
    const demo = await db.select().from(disputeCase).where(eq(disputeCase.supplierOrganisationId, world.org.supplier));
    const decided = demo.find((c) => c.status === 'decided')!;
    const withdrawn = await L.freshCaseIn(world, 'open');
    const early = await createNote(db, world.actors.supplier, withdrawn.id, { body: say('Before withdrawing.'), visibility: 'parties' });
    await runTransition(db, world.actors.supplier, withdrawn.id, 'withdraw', L.inputs.withdraw(world));

    const before = await counts();
    const sealed = await L.expectAppError(createNote(db, world.actors.arbiter, decided.id, { body: say('After the decision'), visibility: 'parties' }), 'conflict');
    expect(sealed.message).toMatch(/decided/);
    const [decidedNote] = await db.select({ id: note.id }).from(note).where(eq(note.caseId, decided.id)).limit(1);
    if (decidedNote) await L.expectAppError(replyToNote(db, world.actors.plant, decided.id, decidedNote.id, { body: say('Late reply') }), 'conflict');
    const gone = await L.expectAppError(createNote(db, world.actors.plant, withdrawn.id, { body: say('After withdrawal'), visibility: 'parties' }), 'conflict');
    expect(gone.message).toMatch(/withdrawn/);
    await L.expectAppError(replyToNote(db, world.actors.plant, withdrawn.id, early.id, { body: say('Late reply') }), 'conflict');
    await L.expectAppError(editNote(db, world.actors.supplier, withdrawn.id, early.id, { body: say('Changed after withdrawal') }), 'conflict');
    expect(await counts()).toEqual(before);
    const { file } = await noteIdsVia('supplier', withdrawn.id);
    expect(file.notes[0].editableUntil).toBeNull();
  });
});

describe('bad input', () => {
  it.each([
    ['a javascript: link', { body: doc([text('x', [{ type: 'link', attrs: { href: 'javascript:alert(1)' } }])]), visibility: 'parties' }, 'body', /A link may point only to/],
    ['a spaced, mixed-case javascript: link', { body: doc([text('x', [{ type: 'link', attrs: { href: ' JaVaScRiPt:alert(1)' } }])]), visibility: 'parties' }, 'body', /A link may point only to/],
    ['an unknown node', { body: { type: 'doc', content: [{ type: 'image', attrs: { src: 'x' } }] }, visibility: 'parties' }, 'body', /does not offer/],
    ['no document', { body: 'not json', visibility: 'parties' }, 'body', /could not be read/],
    ['empty text', { body: doc([]), visibility: 'parties' }, 'body', /Write something/],
    ['too long', { body: say('x'.repeat(10_001)), visibility: 'parties' }, 'body', /too long/],
    ['no visibility', { body: say('Fine words') }, 'visibility', /Choose who may read/],
  ])('%s: a field error, nothing written', async (_name, input, field, message) => {
    const c = await L.freshCaseIn(world, 'open');
    const before = await counts();
    const error = await L.expectAppError(createNote(getDb(), world.actors.supplier, c.id, input), 'invalid');
    expect(error.fieldErrors?.[field]?.[0]).toMatch(message);
    expect(await counts()).toEqual(before);
  });

  it('mentions: only people who may read the note, labelled with their own name', async () => {
    const c = await L.freshCaseIn(world, 'review');
    const db = getDb();
    const mention = (id: string, label: string) => ({ type: 'mention', attrs: { id, label } });
    const refused = await L.expectAppError(createNote(db, world.actors.plant, c.id, { body: doc([mention(world.actors.supplier.userId, 'Gareth'), text(' see this')]), visibility: 'internal' }), 'invalid');
    expect(refused.fieldErrors?.body?.[0]).toMatch(/only people of your own organisation/);
    await L.expectAppError(createNote(db, world.actors.plant, c.id, { body: doc([mention(world.actors.otherLab.userId, 'Petra'), text(' see this')]), visibility: 'parties' }), 'invalid');

    const written = await createNote(db, world.actors.plant, c.id, { body: doc([mention(world.actors.supplier.userId, 'The Boss'), text(' please look')]), visibility: 'parties' });
    const [row] = await db.select().from(note).where(and(eq(note.id, written.id)));
    expect(JSON.stringify(row.body)).toContain(world.actors.supplier.name);
    expect(JSON.stringify(row.body)).not.toContain('The Boss');
  });
});
