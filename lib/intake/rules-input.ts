import { z } from 'zod';
import { schemeRulesSchema } from '@/lib/rules/schema';

/**
 * Plain words for the scheme rules' generic checks (a number out of range, an option not offered),
 * where the rules' own schema gives no message of its own. Its own messages always take precedence.
 */
export const rulesErrorMap: z.core.$ZodErrorMap = (issue) => {
  switch (issue.code) {
    case 'invalid_type':
      if (issue.expected === 'int') return 'Enter a whole number.';
      if (issue.expected === 'number') return 'Enter a number.';
      if (issue.expected === 'string') return 'Enter a value.';
      if (issue.expected === 'boolean') return 'Tick or clear the box.';
      return undefined;
    case 'too_small':
      if (issue.origin === 'number') return `Must be ${issue.inclusive ? 'at least' : 'more than'} ${issue.minimum}.`;
      if (issue.origin === 'string') return `Needs at least ${issue.minimum} characters.`;
      return undefined;
    case 'too_big':
      if (issue.origin === 'number') return `Must be ${issue.inclusive ? 'at most' : 'less than'} ${issue.maximum}.`;
      if (issue.origin === 'string') return `Is limited to ${issue.maximum} characters.`;
      return undefined;
    case 'invalid_value':
      return 'Choose one of the options offered.';
    default:
      return undefined;
  }
};

/** Publishing a version: the whole rules document, the moment it takes effect, and why it changed. */
export const publishRulesSchema = z.object({
  effectiveFrom: z.preprocess(
    (v) => (v === '' || v === null ? undefined : typeof v === 'string' ? new Date(v) : v),
    z
      .date({ error: 'Enter when the new version takes effect.' })
      .refine((d) => !Number.isNaN(d.getTime()), 'Enter when the new version takes effect.')
      // Results already made keep their version; a version cannot reach back under them.
      .refine((d) => d.getTime() >= Date.now() - 5 * 60_000, 'A new version takes effect now or later, never in the past.'),
  ),
  note: z.string({ error: 'Say what changes and why.' }).trim().min(5, 'Say what changes and why (at least 5 characters).').max(500, 'The note is limited to 500 characters.'),
  rules: schemeRulesSchema,
});

export type PublishRulesInput = z.output<typeof publishRulesSchema>;
