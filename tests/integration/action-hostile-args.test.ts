import { beforeAll, describe, expect, it, vi } from 'vitest';

const request = vi.hoisted(() => ({ headers: new Headers() }));
vi.mock('next/headers', () => ({ headers: async () => request.headers, cookies: async () => ({ get: () => undefined, getAll: () => [] }) }));
vi.mock('next/cache', () => ({ revalidatePath: vi.fn() }));

const { seedDemoForTests, signIn, demoUser } = await import('./helpers');
const { postNoteAction, replyToNoteAction, editNoteAction } = await import('@/app/(app)/cases/[caseId]/notes-actions');
const { transitionCase } = await import('@/app/(app)/cases/[caseId]/actions');
const { endSessionAction } = await import('@/app/(app)/account/actions');

const GENERIC = /went wrong on our side/;
// Sent by a client as a server action argument, this object cannot even be turned into a string.
const hostile = { toString: 0 } as unknown as string;

beforeAll(async () => {
  await seedDemoForTests();
  request.headers = new Headers({ cookie: await signIn(demoUser('supplier').email) });
});

describe('server actions given arguments that are not what their form sends', () => {
  it('note actions answer "not found" for a case id that is not a string', async () => {
    for (const state of [await postNoteAction(hostile, {}), await replyToNoteAction(hostile, hostile, {}), await editNoteAction(hostile, hostile, {})]) {
      expect(state).toMatchObject({ ok: false, message: 'That case was not found.' });
    }
  });

  it('the case form answers "not found" for a transition name that is not a string', async () => {
    const state = await transitionCase(crypto.randomUUID(), hostile as never, null);
    expect(state).toMatchObject({ ok: false, message: 'That case was not found.' });
  });

  it('ending a session refuses an id holding a NUL character as a field error', async () => {
    const data = new FormData();
    data.set('sessionId', 'abc\u0000');
    const state = await endSessionAction(null, data);
    expect(state?.ok).toBe(false);
    expect(state?.message).not.toMatch(GENERIC);
    expect(state?.fieldErrors?.sessionId).toEqual(['That session was not found.']);
  });
});
