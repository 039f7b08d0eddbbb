import { assess, assessmentInputSchema } from '@/lib/arbitration';
import { can } from '@/lib/auth/permissions';
import { AppError } from '@/lib/errors';
import { parseJsonBody, withActor } from '@/lib/http/api';

export const dynamic = 'force-dynamic';

/** The proposed outcome for a disputed result, computed from the body alone; nothing is stored. */
export const POST = withActor(async ({ request, actor }) => {
  // Refuse before reading the body, so a role without the permission learns nothing about its input.
  if (!can(actor.role, 'assessment', 'run')) throw new AppError('forbidden', 'Your role does not allow running assessments.');
  const input = await parseJsonBody(request, assessmentInputSchema);
  try {
    return assess(input);
  } catch (error) {
    // The module throws a RangeError for a value it cannot work with. The schema should have caught
    // every such value, so reaching this means the two disagree: still the caller's input, not our fault.
    if (error instanceof RangeError) {
      throw new AppError('invalid', `The body passed the schema but cannot be assessed: ${error.message}`);
    }
    throw error;
  }
});
