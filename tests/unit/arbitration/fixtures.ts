import type { AssessmentInput } from '@/lib/arbitration';

// Invented deliveries and readings; plausible for raw bovine milk tested by thermistor cryoscope.

/** A clean calibration check on a −0.512 °C standard: all five readings within ±0.004 °C. */
export const goodCalibration = () => ({ nominal: -0.512, readings: [-0.5121, -0.5117, -0.5124, -0.5119, -0.5126] });

/** Only 2 of 5 within ±0.004 °C of the −0.512 °C standard. */
export const failedCalibration = () => ({ nominal: -0.512, readings: [-0.5165, -0.5071, -0.5118, -0.5163, -0.5124] });

/**
 * The intake laboratory found −0.5131 °C, above the −0.515 °C limit; the referee laboratory's
 * retest of the retained sample finds −0.5143 °C. They agree (1.2 m°C apart), the accepted value
 * is −0.5137 °C, and under guarded rejection that is within the limit.
 */
export function disputedDelivery(): AssessmentInput {
  return {
    rules: {
      precision: { r: 0.004, R: 0.006 },
      limits: { upper: -0.515, lower: -0.56 },
      decisionRule: 'guarded_rejection',
      onDisagreement: 'third_laboratory',
      referenceFreezingPoint: -0.52,
      adjustThresholdPercent: 1,
      calibration: { tolerance: 0.004, required: 3 },
      sampleValidHours: 48,
      storageRange: { min: 0, max: 6 },
    },
    original: {
      readings: [-0.5128, -0.5134],
      testedAt: '2025-03-14T07:05:00+01:00',
      calibration: goodCalibration(),
    },
    retest: {
      readings: [-0.514, -0.5146],
      testedAt: '2025-03-15T10:20:00+01:00',
      calibration: { nominal: -0.512, readings: [-0.5118, -0.5123, -0.512, -0.5125, -0.5116] },
      sample: {
        sampledAt: '2025-03-14T06:40:00+01:00',
        sealIntact: true,
        frozen: false,
        custodyComplete: true,
        storageTemperatures: [3.8, 4.2, 4.0, 3.6, 4.4],
      },
    },
  };
}

/** The disputed delivery with its retest present, for editing in place. */
export function withRetest(
  edit: (input: AssessmentInput & { retest: NonNullable<AssessmentInput['retest']> }) => void,
): AssessmentInput {
  const input = disputedDelivery();
  if (input.retest === undefined) throw new Error('fixture has no retest');
  edit(input as AssessmentInput & { retest: NonNullable<AssessmentInput['retest']> });
  return input;
}

export function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object') {
    for (const key of Object.keys(value)) deepFreeze((value as Record<string, unknown>)[key]);
    Object.freeze(value);
  }
  return value;
}
