import type { Preparation, ReadingFlag } from '@/lib/enums';

/**
 * The test portion is brought to 20 ± 2 °C before it goes into the cryoscope (common practice, no
 * published source). Outside that range the result is still recorded, but flagged for whoever weighs it.
 */
export const SAMPLE_TEMPERATURE = { targetCelsius: 20, toleranceCelsius: 2 } as const;

export type SampleTemperatureCheck = { ok: boolean; message: string };

export function sampleTemperatureCheck(celsius: number): SampleTemperatureCheck {
  const { targetCelsius, toleranceCelsius } = SAMPLE_TEMPERATURE;
  // Compared in tenths of a degree, the resolution it is typed at, so 22.0 °C is inside and 22.1 °C is not.
  const offTenths = Math.abs(Math.round(celsius * 10) - targetCelsius * 10);
  if (offTenths <= toleranceCelsius * 10) {
    return { ok: true, message: `Within ${targetCelsius} ± ${toleranceCelsius} °C.` };
  }
  return {
    ok: false,
    message: `Outside ${targetCelsius} ± ${toleranceCelsius} °C, the temperature a test portion is usually brought to; the result is recorded with this flag.`,
  };
}

/** What the analyst should do when the plateau does not come as expected (common practice, no published source). */
export const flagGuidance: Record<Exclude<ReadingFlag, 'none'>, string> = {
  early_crystallisation:
    'Early crystallisation is usually crystallised fat: warm the sample to about 45 °C for 5 minutes, cool it to 20 °C and test at once (record the preparation as pre-warmed).',
  no_crystallisation: 'No crystallisation at all often points to added salts: note it, repeat the reading, and keep the retained sample sealed.',
};

export const flagLabels: Record<ReadingFlag, string> = {
  none: 'Normal plateau',
  early_crystallisation: 'Early crystallisation',
  no_crystallisation: 'No crystallisation',
};

export const preparationLabels: Record<Preparation, string> = {
  none: 'None',
  prewarmed: 'Pre-warmed to melt crystallised fat',
};

export const resultBasisLabels = { mean_of_2: 'mean of 2 readings', mean_of_4: 'mean of 4 readings', median_of_4: 'median of 4 readings' } as const;

export const decisionRuleLabels = {
  simple: 'simple acceptance',
  guarded_rejection: 'guarded rejection',
  guarded_acceptance: 'guarded acceptance',
} as const;
