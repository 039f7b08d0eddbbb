import { describe, expect, it } from 'vitest';
import { mappingSchema, matchInstrument, type Mapping } from '@/lib/readings-import';
import { importText } from './fixtures';

// An invented foreign export: its own column names, m°C, semicolons and decimal commas.
const FOREIGN = ['Run No;Sample ID;FP [mC];Operator;Date', '1;K-LW-104;-512,4;B. Hollis;2026-03-14 07:42', '2;K-LW-104;-513,0;B. Hollis;2026-03-14 07:45'].join('\n');

describe('mapping a foreign layout', () => {
  it('is proposed from the header, for the user to confirm', () => {
    const { opened, mapping } = importText(FOREIGN);
    expect(opened.ourLayout).toBe(false);
    expect(mapping.columns).toMatchObject({ replicate: 0, sample_code: 1, freezing_point: 2, analyst: 3, measured_at: 4, unit: null, instrument: null });
    expect(mapping.decimal).toBe(',');
    // The unit in the header's brackets is proposed for rows that name none.
    expect(mapping.unit).toBe('mC');
  });

  it('gives the readings once the unit is chosen', () => {
    const { result } = importText(FOREIGN, undefined, (m) => ({ ...m, unit: 'mC' }));
    expect(result.errors).toEqual([]);
    expect(result.values?.readings.map((r) => r.value)).toEqual(['-0.5124', '-0.5130']);
    expect(result.meta.analyst).toBe('B. Hollis');
  });

  it('can be changed by hand: another column as the freezing point', () => {
    const { result } = importText('a,b,c\nx,-0.5124,-0.6000\ny,-0.5130,-0.6010', undefined, (m) => ({ ...m, columns: { ...m.columns, freezing_point: 2 } }));
    expect(result.values?.readings.map((r) => r.value)).toEqual(['-0.6000', '-0.6010']);
  });

  it('is refused without a freezing-point column or with one column feeding two fields', () => {
    const base = importText(FOREIGN).mapping;
    const none = mappingSchema.safeParse({ ...base, columns: { ...base.columns, freezing_point: null } } satisfies Mapping);
    expect(none.success).toBe(false);
    expect(none.error?.issues.map((i) => i.message)).toEqual(['Choose the column that holds the freezing points.']);
    const twice = mappingSchema.safeParse({ ...base, columns: { ...base.columns, note: 2 } });
    expect(twice.error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`)).toEqual(['columns.note: This column already feeds “freezing point”.']);
    expect(mappingSchema.safeParse(base).success).toBe(true);
  });
});

describe('the instrument a file names', () => {
  const options = [
    { id: 'a', label: 'CRY-0417 · Referee bench cryoscope' },
    { id: 'b', label: 'CRY-0522 · Spare cryoscope' },
  ];
  it('is found by serial number or whole label, ignoring case', () => {
    expect(matchInstrument('cry-0417', options)).toBe('a');
    expect(matchInstrument('CRY-0522 · Spare cryoscope', options)).toBe('b');
  });
  it('is left to the user when it fits none', () => {
    expect(matchInstrument('CRY-9999', options)).toBeNull();
    expect(matchInstrument('', options)).toBeNull();
  });
});
