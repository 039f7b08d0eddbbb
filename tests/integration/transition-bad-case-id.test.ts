import { beforeAll, describe, expect, it } from 'vitest';
import { getDb } from '@/db/client';
import { runTransition } from '@/lib/dal/case-transition';
import { AppError } from '@/lib/errors';
import type { Actor } from '@/lib/auth/actor';
import { actorOf, demoUser, seedDemoForTests, signIn } from './helpers';

let plant: Actor;

beforeAll(async () => {
  await seedDemoForTests();
  plant = await actorOf(await signIn(demoUser('plant').email));
});

describe('a transition on something that is not a case id', () => {
  // The case form's action hands its caseId straight through; the database would refuse to compare
  // " " with a uuid column and the form would show "something went wrong" instead of a 404.
  for (const caseId of [' ', 'not-a-uuid', '', '00000000-0000-0000-0000-00000000000g']) {
    it(`answers 404 for ${JSON.stringify(caseId)}`, async () => {
      const error = await runTransition(getDb(), plant, caseId, 'dispatch', {}).then(
        () => null,
        (e: unknown) => e,
      );
      expect(error).toBeInstanceOf(AppError);
      expect((error as AppError).code).toBe('not_found');
    });
  }
});
