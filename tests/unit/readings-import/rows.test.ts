import { describe, expect, it } from 'vitest';
import { importText, problemsOn, retestTarget } from './fixtures';

// Invented readings; the range −1.000 to 0.000 °C and the 2 to 10 readings are the bounds of the
// product's own reading schemas, not values from a published source.

describe('per-row problems', () => {
  const file = [
    'replicate,freezing_point,unit',
    '1,-0.5124,°C', // line 2: fine
    '2,abc,°C', // line 3: not a number
    '3,,°C', // line 4: empty
    '4,-1.5124,°C', // line 5: out of range
    '2,-0.5130,°C', // line 6: duplicate replicate
    '6,-0.51245,°C', // line 7: five decimals
    '7,0.512,°C', // line 8: no minus sign
    '8,-0.5126,furlong', // line 9: unknown unit
  ].join('\n');
  const { result } = importText(file);

  it('name the line, the field and what is wrong', () => {
    expect(problemsOn(result, 2)).toEqual([]);
    expect(problemsOn(result, 3)).toEqual(['freezing_point: “abc” is not a number.']);
    expect(problemsOn(result, 4)).toEqual(['freezing_point: Empty: enter the reading.']);
    expect(problemsOn(result, 5)).toEqual(['freezing_point: -1.5124 °C is outside the range of a freezing point of milk (−1.000 to 0.000 °C).']);
    expect(problemsOn(result, 6)).toEqual(['replicate: Replicate 2 appears twice (also on line 3).']);
    expect(problemsOn(result, 7)).toEqual(['freezing_point: Use at most four decimals in °C.']);
    expect(problemsOn(result, 8)).toEqual(['freezing_point: 0.512 °C is outside the range of a freezing point of milk (−1.000 to 0.000 °C). A freezing point of milk is below 0: write it with its minus sign.']);
    expect(problemsOn(result, 9)).toEqual(['unit: “furlong” is not a unit this import reads: use m°C, °C or °H.']);
  });

  it('stand on the row itself too, for the preview', () => {
    expect(result.rows.find((r) => r.line === 3)?.errors).toHaveLength(1);
    expect(result.rows.find((r) => r.line === 2)?.errors).toEqual([]);
  });

  it('name a gap in the replicates for the whole set', () => {
    expect(problemsOn(result, null as unknown as number)).toEqual(['set: Sample replicate 5 is missing: number the readings 1 to 8 in the order taken, leaving none out.']);
  });

  it('keep the whole set out of the form', () => {
    expect(result.values).toBeNull();
  });

  it('hint at m°C when °C values look like m°C', () => {
    const { result: r } = importText('replicate,freezing_point\n1,-512.4\n2,-513.0');
    expect(problemsOn(r, 2)[0]).toContain('If the file is in m°C, choose m°C as the unit.');
  });

  it('refuse a decimal point in a file read with decimal commas', () => {
    const { result: r } = importText('replicate;freezing_point\n1;-0,5124\n2;-0.5130');
    expect(problemsOn(r, 3)).toEqual(['freezing_point: “-0.5130” uses a decimal point, but the file is read with a decimal comma. Change the decimal separator or correct the value.']);
  });

  it('refuse a replicate that is not a whole number and a time that is not ISO 8601 or lies ahead', () => {
    const { result: r } = importText('replicate,freezing_point,measured_at\n1.5,-0.5124,14/03/2026 07:42\n2,-0.5130,2026-03-15T08:00:00Z');
    expect(problemsOn(r, 2)).toEqual(['replicate: “1.5” is not a replicate number (1, 2, 3…).', 'measured_at: “14/03/2026 07:42” is not an ISO 8601 date and time, such as 2026-03-14T07:42:00+01:00.']);
    expect(problemsOn(r, 3)).toEqual(['measured_at: This lies in the future.']);
  });
});

describe('a file with only bad rows', () => {
  const { result } = importText('replicate,freezing_point\n1,n/a\n2,\n3,-7');

  it('says that no row can be used, and gives each row its problem', () => {
    expect(result.errors[0]).toEqual({ line: null, field: 'set', message: 'No row of this file can be used: every row has a problem, listed beside it.' });
    expect(result.rows.every((r) => r.errors.length === 1)).toBe(true);
    expect(result.values).toBeNull();
  });
});

describe('the set as a whole', () => {
  it('needs at least two readings of the sample', () => {
    const { result } = importText('replicate,freezing_point\n1,-0.5124');
    expect(result.errors).toEqual([{ line: null, field: 'set', message: 'The file has 1 reading of the sample; at least 2 are needed.' }]);
  });

  it('takes at most ten readings of the sample', () => {
    const rows = Array.from({ length: 11 }, (_, i) => `${i + 1},-0.51${String(20 + i).padStart(2, '0')}`);
    const { result } = importText(['replicate,freezing_point', ...rows].join('\n'));
    expect(result.errors).toEqual([{ line: null, field: 'set', message: 'The file has 11 readings of the sample; the form takes at most 10.' }]);
  });

  it('holds one sample: a second sample code is an error on its rows', () => {
    const { result } = importText('replicate,freezing_point,sample_code\n1,-0.5124,R-LW-104\n2,-0.5130,R-LW-105\n3,-0.5128,R-LW-104');
    expect(problemsOn(result, 3)).toEqual(['sample_code: Sample code “R-LW-105” differs from “R-LW-104” on line 2: one file holds one measurement set.']);
    expect(result.values).toBeNull();
  });

  it('belongs to the sample the form is for', () => {
    const { result } = importText('replicate,freezing_point,sample_code\n1,-0.5124,K-LW-104\n2,-0.5130,K-LW-104', { ...retestTarget, expectedSampleCode: 'K-LW-200' });
    expect(problemsOn(result, 2)).toEqual(['sample_code: This file is for sample “K-LW-104”; the sample here is “K-LW-200”.']);
  });

  it('refuses calibration rows where the form takes none (intake)', () => {
    const { result } = importText('kind,replicate,freezing_point\ncalibration,1,-0.5120\nsample,1,-0.5124\nsample,2,-0.5130');
    expect(problemsOn(result, 2)[0]).toMatch(/^kind: This form takes no calibration readings/);
  });

  it('takes exactly the scheme’s number of calibration readings on the retest', () => {
    const cal = (n: number) => Array.from({ length: n }, (_, i) => `calibration,${i + 1},-0.512${i}`);
    const ok = importText(['kind,replicate,freezing_point', ...cal(5), 'sample,1,-0.5124', 'sample,2,-0.5130'].join('\n'), retestTarget).result;
    expect(ok.errors).toEqual([]);
    expect(ok.values?.calibrationReadings).toEqual(['-0.5120', '-0.5121', '-0.5122', '-0.5123', '-0.5124']);
    const short = importText(['kind,replicate,freezing_point', ...cal(3), 'sample,1,-0.5124', 'sample,2,-0.5130'].join('\n'), retestTarget).result;
    expect(short.errors).toEqual([{ line: null, field: 'set', message: 'The scheme’s calibration check takes 5 readings on the standard; the file has 3.' }]);
  });

  it('carries the observation of each reading', () => {
    const { result } = importText('replicate,freezing_point,observation\n1,-0.5124,early crystallisation\n2,-0.5130,normal');
    expect(result.values?.readings).toEqual([
      { value: '-0.5124', flag: 'early_crystallisation' },
      { value: '-0.5130', flag: 'none' },
    ]);
  });
});
