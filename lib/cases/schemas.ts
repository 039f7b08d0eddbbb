import { z } from 'zod';
import { disputeGrounds, readingFlags, preparations } from '@/lib/enums';

// Shared by the forms in the browser and the server actions and routes: one set of rules and messages.

const text = (min: number, max: number, what: string) =>
  z.string().trim().min(min, `${what} needs at least ${min} characters.`).max(max, `${what} is limited to ${max} characters.`);

/** A freezing point in °C as typed, with at most four decimals, between −1.000 and 0.000 °C. */
export const freezingPointInput = z.coerce
  .number({ error: 'Enter a temperature in °C, such as −0.512.' })
  .refine(Number.isFinite, 'Enter a temperature in °C, such as −0.512.')
  .refine((v) => v >= -1 && v <= 0, 'A freezing point of milk lies between −1.000 and 0.000 °C.')
  .refine((v) => Math.abs(v * 10_000 - Math.round(v * 10_000)) < 1e-6, 'Use at most four decimals.');

const storageTemperature = z.coerce
  .number({ error: 'Enter the temperature in °C.' })
  .refine(Number.isFinite, 'Enter the temperature in °C.')
  .refine((v) => v >= -30 && v <= 50, 'Enter a temperature between −30 and 50 °C.');

const checkbox = z.preprocess((v) => v === true || v === 'on' || v === 'true', z.boolean());
const pastInstant = z.coerce
  .date({ error: 'Enter a date and time.' })
  .refine((d) => d.getTime() <= Date.now() + 5 * 60_000, 'This cannot be in the future.');

export const openDisputeSchema = z.object({
  intakeResultId: z.uuid('Choose the delivery you contest.'),
  grounds: z.preprocess((v) => (typeof v === 'string' ? [v] : v), z.array(z.enum(disputeGrounds)).min(1, 'Choose at least one ground.')),
  explanation: text(20, 4000, 'The explanation'),
  remedy: text(3, 1000, 'The remedy'),
});

export const dispatchSchema = z.object({
  labOrganisationId: z.uuid('Choose the referee laboratory.'),
  sealNumber: text(3, 60, 'The seal number'),
  courier: text(3, 200, 'The courier and container'),
  temperature: storageTemperature,
  sealIntact: checkbox.refine((v) => v, 'Dispatch only a sample whose seal is intact; otherwise tell the board in a note.'),
  answer: z.string().trim().max(4000, 'The answer is limited to 4000 characters.').optional().default(''),
});

export const receiveSchema = z.object({
  sealNumber: text(3, 60, 'The seal number as read'),
  sealIntact: checkbox,
  frozen: checkbox,
  temperature: storageTemperature,
  condition: z.string().trim().max(2000, 'The condition is limited to 2000 characters.').optional().default(''),
});

export const retestReadingSchema = z.object({ value: freezingPointInput, flag: z.enum(readingFlags).default('none') });

export const submitRetestSchema = z.object({
  instrumentId: z.uuid('Choose the instrument.'),
  analystName: text(2, 120, 'The analyst’s name'),
  testedAt: pastInstant,
  sampleTemperature: storageTemperature,
  preparation: z.enum(preparations),
  calibrationReadings: z.array(freezingPointInput).min(1, 'Enter the readings of the calibration check.').max(20),
  readings: z.array(retestReadingSchema).min(2, 'Enter at least two readings.').max(10, 'At most ten readings.'),
});

export const orderFurtherTestSchema = z.object({
  kind: z.enum(['third_laboratory', 'authentic'], { error: 'Choose the kind of further test.' }),
  labOrganisationId: z.uuid('Choose the laboratory that will test.'),
  sampleCode: text(3, 60, 'The sample code'),
  sealNumber: text(3, 60, 'The seal number'),
  sampledAt: pastInstant,
  reasons: text(10, 4000, 'The reasons'),
});

export const withdrawSchema = z.object({ reason: text(5, 2000, 'The reason') });

export const transitionSchemas = {
  dispatch: dispatchSchema,
  receive: receiveSchema,
  submit_retest: submitRetestSchema,
  order_further_test: orderFurtherTestSchema,
  withdraw: withdrawSchema,
} as const;

export type TransitionInputs = { [K in keyof typeof transitionSchemas]: z.infer<(typeof transitionSchemas)[K]> };
