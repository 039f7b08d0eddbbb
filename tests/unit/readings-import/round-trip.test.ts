import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { submitRetestSchema } from '@/lib/cases/schemas';
import { correctionInputSchema, intakeInputSchema } from '@/lib/intake/schemas';
import { importText, intakeTarget, retestTarget } from './fixtures';

// The import's output must be what a laboratory could have typed: the server parses it with the
// very schemas the forms submit through.
const FILE = [
  'kind;replicate;freezing_point;unit;observation',
  'calibration;1;-512,1;m°C;',
  'calibration;2;-511,8;m°C;',
  'calibration;3;-512,3;m°C;',
  'calibration;4;-512,0;m°C;',
  'calibration;5;-511,9;m°C;',
  'sample;2;-0,5300;°C;normal',
  'sample;1;-0,5250;°C;early_crystallisation',
  'sample;3;-0,5270;°C;',
  'sample;4;-0,5280;°C;',
].join('\n');

describe('round trip into the server’s schemas', () => {
  it('the retest’s readings and calibration check pass submitRetestSchema', () => {
    const { result } = importText(FILE, retestTarget);
    expect(result.errors).toEqual([]);
    const parsed = submitRetestSchema.pick({ readings: true, calibrationReadings: true }).parse(result.values);
    expect(parsed.readings).toEqual([
      { value: -0.525, flag: 'early_crystallisation' },
      { value: -0.53, flag: 'none' },
      { value: -0.527, flag: 'none' },
      { value: -0.528, flag: 'none' },
    ]);
    expect(parsed.calibrationReadings).toEqual([-0.5121, -0.5118, -0.5123, -0.512, -0.5119]);
  });

  it('the intake’s readings pass the intake and correction schemas', () => {
    const samplesOnly = FILE.split('\n').filter((l) => !l.startsWith('calibration')).join('\n');
    const { result } = importText(samplesOnly, intakeTarget);
    expect(result.errors).toEqual([]);
    const readings = z.object({ readings: intakeInputSchema.shape.readings }).parse({ readings: result.values?.readings });
    expect(readings.readings.map((r) => r.value)).toEqual([-0.525, -0.53, -0.527, -0.528]);
    expect(correctionInputSchema.shape.readings.safeParse(result.values?.readings).success).toBe(true);
  });
});
