import { z } from 'zod';
import { preparations, readingFlags } from '@/lib/enums';
import { SODIUM_CHLORIDE_TABLE } from '@/lib/arbitration';

// Shared by the browser forms (react-hook-form's resolver) and the data layer: one set of rules and
// messages, so what the browser accepts is what the server accepts.

const MINUS = /[\u2212\u2013]/g;

/** A number as typed: the minus sign as shown on screen and a decimal comma are accepted; empty is missing. */
function typedNumber(value: unknown): unknown {
  if (typeof value !== 'string') return value;
  const cleaned = value.trim().replace(MINUS, '-').replace(',', '.');
  if (cleaned === '') return undefined;
  const n = Number(cleaned);
  return Number.isFinite(n) ? n : value;
}

function decimal(missing: string, options: { min: number; max: number; range: string; decimals: number }) {
  const factor = 10 ** options.decimals;
  return z.preprocess(
    typedNumber,
    z
      .number({ error: missing })
      .refine((v) => v >= options.min && v <= options.max, options.range)
      .refine((v) => Math.abs(v * factor - Math.round(v * factor)) < 1e-6, options.decimals === 0 ? 'Enter a whole number.' : `Use at most ${options.decimals} decimals.`),
  );
}

/** A freezing point read from the cryoscope, °C, at the 0.0001 °C resolution the product stores. */
export const freezingPointReading = decimal('Enter the reading in °C, such as −0.5120.', {
  min: -1,
  max: 0,
  range: 'A freezing point lies between −1.000 and 0.000 °C.',
  decimals: 4,
});

const warmest = SODIUM_CHLORIDE_TABLE[0].freezingPoint;
const coldest = SODIUM_CHLORIDE_TABLE[SODIUM_CHLORIDE_TABLE.length - 1].freezingPoint;

/** A sodium chloride standard must lie within ISO 5764 Table 1, where its salt content is known. */
export const standardNominal = decimal('Enter the standard’s freezing point in °C, such as −0.512.', {
  min: coldest,
  max: warmest,
  range: 'Use a standard between −0.600 and −0.400 °C (ISO 5764, Table 1).',
  decimals: 4,
});

const text = (min: number, max: number, what: string) =>
  z.string({ error: `Enter ${what}.` }).trim().min(min, min === 1 ? `Enter ${what}.` : `${what[0].toUpperCase()}${what.slice(1)} needs at least ${min} characters.`).max(max, `${what[0].toUpperCase()}${what.slice(1)} is limited to ${max} characters.`);

const checkbox = z.preprocess((v) => v === true || v === 'on' || v === 'true', z.boolean());

/** A moment typed into a form (the browser's local time) or sent as ISO text; never in the future. */
export const pastInstant = (what: string) =>
  z.preprocess(
    (v) => (v === '' || v === null ? undefined : typeof v === 'string' ? new Date(v) : v),
    z
      .date({ error: `Enter ${what}.` })
      .refine((d) => !Number.isNaN(d.getTime()), `Enter ${what}.`)
      .refine((d) => d.getTime() <= Date.now() + 5 * 60_000, 'This cannot be in the future.'),
  );

const code = (what: string) =>
  z
    .string({ error: `Enter ${what[0].toLowerCase()}${what.slice(1)}.` })
    .trim()
    .min(1, { error: `Enter ${what[0].toLowerCase()}${what.slice(1)}.`, abort: true })
    .min(3, { error: `${what} needs at least 3 characters.`, abort: true })
    .max(60, `${what} is limited to 60 characters.`)
    .regex(/^[A-Za-z0-9][A-Za-z0-9./_-]*$/, `${what} may hold letters, digits and . / _ - only.`);

const optionalCode = (what: string) => z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? undefined : v), code(what).optional());

export const readingInputSchema = z.object({ value: freezingPointReading, flag: z.enum(readingFlags).default('none') });

const readings = z.array(readingInputSchema).min(2, 'Enter at least two readings.').max(10, 'At most ten readings.');

const sampleTemperature = decimal('Enter the test portion’s temperature in °C.', { min: 0, max: 50, range: 'Enter a temperature between 0 and 50 °C.', decimals: 1 });

export const calibrationCheckInputSchema = z.object({
  instrumentId: z.uuid('Choose the instrument.'),
  analystName: text(2, 120, 'the analyst’s name'),
  checkedAt: pastInstant('when the check was run'),
  nominal: standardNominal,
  readings: z.array(freezingPointReading).min(1, 'Enter the readings on the standard.').max(20, 'At most 20 readings.'),
});
export type CalibrationCheckInput = z.output<typeof calibrationCheckInputSchema>;

export const addInstrumentSchema = z.object({
  organisationId: z.preprocess((v) => (v === '' ? undefined : v), z.uuid('Choose the organisation that owns it.').optional()),
  serialNumber: code('The serial number'),
  description: text(3, 160, 'a description, such as “Intake cryoscope, bay 3”'),
});
export type AddInstrumentInput = z.output<typeof addInstrumentSchema>;

export const intakeInputSchema = z
  .object({
    farmId: z.uuid('Choose the farm the load came from.'),
    reference: code('The delivery reference'),
    collectedAt: pastInstant('when the load was collected'),
    receivedAt: pastInstant('when the load was received'),
    volumeLitres: decimal('Enter the volume in litres.', { min: 1, max: 60_000, range: 'Enter a volume from 1 to 60 000 litres.', decimals: 0 }),
    tanker: text(1, 40, 'the tanker'),
    compartment: text(1, 20, 'the compartment'),
    receiptTemperature: decimal('Enter the temperature on receipt in °C.', { min: -2, max: 40, range: 'Enter a temperature between −2 and 40 °C.', decimals: 1 }),
    routineCode: optionalCode('The routine sample code'),
    retainedCode: optionalCode('The retained sample code'),
    sealNumber: code('The seal number'),
    retainedLocation: text(2, 200, 'where the retained sample is stored'),
    retainedTemperature: decimal('Enter the storage temperature in °C.', { min: -30, max: 50, range: 'Enter a temperature between −30 and 50 °C.', decimals: 1 }),
    instrumentId: z.uuid('Choose the instrument.'),
    analystName: text(2, 120, 'the analyst’s name'),
    testedAt: pastInstant('when the sample was tested'),
    sampleTemperature,
    preparation: z.enum(preparations, { error: 'Choose the preparation.' }),
    readings,
    acknowledgeUnfit: checkbox.default(false),
  })
  .superRefine((v, ctx) => {
    if (v.receivedAt.getTime() < v.collectedAt.getTime()) ctx.addIssue({ code: 'custom', path: ['receivedAt'], message: 'A load is received after it is collected.' });
    if (v.testedAt.getTime() < v.receivedAt.getTime()) ctx.addIssue({ code: 'custom', path: ['testedAt'], message: 'The sample is tested after the load is received.' });
    if (v.routineCode && v.retainedCode && v.routineCode === v.retainedCode) ctx.addIssue({ code: 'custom', path: ['retainedCode'], message: 'The retained sample needs a code of its own.' });
  });
export type IntakeInput = z.output<typeof intakeInputSchema>;

export const correctionInputSchema = z.object({
  intakeResultId: z.uuid('That result was not found.'),
  reason: text(10, 2000, 'the reason for the correction'),
  sampleTemperature,
  preparation: z.enum(preparations, { error: 'Choose the preparation.' }),
  readings,
});
export type CorrectionInput = z.output<typeof correctionInputSchema>;
