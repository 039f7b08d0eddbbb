import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { detectDelimiter, MAX_DATA_ROWS, MAX_FILE_BYTES, openReadingsFile, validateImport } from '@/lib/readings-import';
import { bytes, importText, retestTarget } from './fixtures';

// Readings below are invented examples of the shape laboratories export, not measured values.

describe('our layout', () => {
  it('is recognised and read in replicate order', () => {
    const { opened, result } = importText(
      ['replicate,freezing_point,unit,measured_at,sample_code,instrument,analyst,note', '2,-0.5131,°C,2026-03-14T07:44:00Z,R-LW-104,CRY-0417,Ada Fenwick,', '1,-0.5124,°C,2026-03-14T07:42:00Z,R-LW-104,CRY-0417,Ada Fenwick,first portion'].join('\n'),
    );
    expect(opened.ourLayout).toBe(true);
    expect(opened.table.delimiter).toBe(',');
    expect(result.errors).toEqual([]);
    expect(result.values?.readings).toEqual([
      { value: '-0.5124', flag: 'none' },
      { value: '-0.5131', flag: 'none' },
    ]);
    expect(result.meta).toMatchObject({ sampleCode: 'R-LW-104', instrument: 'CRY-0417', analyst: 'Ada Fenwick', notes: 1 });
    expect(result.meta.firstMeasuredAt?.toISOString()).toBe('2026-03-14T07:42:00.000Z');
  });

  it('takes header names in any case and order, with the unit from the chosen unit when there is no unit column', () => {
    const { opened, result } = importText('Freezing Point,Replicate\n-512.4,1\n-513.0,2', undefined, (m) => ({ ...m, unit: 'mC' }));
    expect(opened.ourLayout).toBe(true);
    expect(result.values?.readings.map((r) => r.value)).toEqual(['-0.5124', '-0.5130']);
  });

  it('reads the downloadable template without a problem, calibration rows included', () => {
    const template = fs.readFileSync(path.join(process.cwd(), 'public/templates/readings-template.csv'));
    const opened = openReadingsFile(new Uint8Array(template));
    expect(opened.ok).toBe(true);
    if (!opened.ok) return;
    expect(opened.ourLayout).toBe(true);
    const result = validateImport(opened.table, opened.mapping, { ...retestTarget, now: new Date('2030-01-01T00:00:00Z') });
    expect(result.errors).toEqual([]);
    expect(result.values?.readings.length).toBeGreaterThanOrEqual(2);
    expect(result.values?.calibrationReadings).toHaveLength(5);
  });
});

describe('separators and encodings', () => {
  it('reads a semicolon-separated file with decimal commas', () => {
    const { opened, mapping, result } = importText('replicate;freezing_point;unit\n1;-0,5124;°C\n2;-0,5131;°C\n');
    expect(opened.table.delimiter).toBe(';');
    expect(mapping.decimal).toBe(',');
    expect(result.errors).toEqual([]);
    expect(result.values?.readings.map((r) => r.value)).toEqual(['-0.5124', '-0.5131']);
  });

  it('judges the delimiter on the header, not on decimal commas in the numbers', () => {
    expect(detectDelimiter('replicate;freezing_point\n1;-0,512\n')).toBe(';');
    expect(detectDelimiter('replicate,freezing_point\n1,"-0,512"\n')).toBe(',');
  });

  it('reads quoted decimal commas in a comma-separated file', () => {
    const { mapping, result } = importText('replicate,freezing_point\n1,"-0,5124"\n2,"-0,5130"');
    expect(mapping.decimal).toBe(',');
    expect(result.values?.readings.map((r) => r.value)).toEqual(['-0.5124', '-0.5130']);
  });

  it('drops a UTF-8 byte-order mark, so the first column is still recognised', () => {
    const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...bytes('replicate,freezing_point\n1,-0.5124\n2,-0.5130')]);
    const opened = openReadingsFile(withBom);
    expect(opened.ok && opened.hadBom).toBe(true);
    expect(opened.ok && opened.ourLayout).toBe(true);
    expect(opened.ok && opened.mapping.columns.replicate).toBe(0);
  });

  it('ignores blank lines and keeps the file’s line numbers', () => {
    const { result } = importText('replicate,freezing_point\r\n\r\n1,-0.5124\r\n  \r\n2,abc\r\n');
    expect(result.rows.map((r) => r.line)).toEqual([3, 5]);
    expect(result.errors).toEqual([{ line: 5, field: 'freezing_point', message: '“abc” is not a number.' }]);
  });

  it('accepts the typographic minus sign', () => {
    expect(importText('replicate,freezing_point\n1,\u22120.5124\n2,\u22120.5130').result.values?.readings[0].value).toBe('-0.5124');
  });
});

describe('files that cannot be read', () => {
  const refused = (data: Uint8Array) => {
    const opened = openReadingsFile(data);
    return opened.ok ? 'accepted' : opened.message;
  };

  it('says so for an empty or blank file', () => {
    expect(refused(new Uint8Array())).toBe('The file is empty.');
    expect(refused(bytes('\n \n\r\n'))).toBe('The file holds no readings: it is blank.');
  });

  it('refuses a binary file', () => {
    const spreadsheet = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00, 0x08, 0x00]);
    expect(refused(spreadsheet)).toMatch(/^This is not a text file/);
  });

  it('refuses text that is not UTF-8', () => {
    // "Höhe" in Latin-1: 0xF6 alone is not UTF-8.
    expect(refused(new Uint8Array([0x72, 0x65, 0x70, 0x3b, 0x48, 0xf6, 0x68, 0x65, 0x0a]))).toMatch(/not UTF-8/);
  });

  it('refuses a file without a header row', () => {
    expect(refused(bytes('1,-0.5124,mC\n2,-0.5130,mC'))).toMatch(/^Line 1 holds numbers, not column names/);
  });

  it('refuses a header with nothing below it', () => {
    expect(refused(bytes('replicate,freezing_point\n'))).toBe('The file has column names but no readings below them.');
  });

  it('refuses a file with nothing that could be a freezing point', () => {
    expect(refused(bytes('name,comment\nAda,fine\nBen,also fine'))).toBe('Nothing in this file can be imported: no column holds numbers that could be freezing points.');
  });

  it('refuses a file beyond the size and row limits', () => {
    expect(refused(new Uint8Array(MAX_FILE_BYTES + 1).fill(0x41))).toMatch(/^The file is 257 kB; a readings file is at most 256 kB/);
    const many = ['replicate,freezing_point', ...Array.from({ length: MAX_DATA_ROWS + 1 }, (_, i) => `${i + 1},-0.5120`)].join('\n');
    expect(refused(bytes(many))).toBe(`The file has ${MAX_DATA_ROWS + 1} rows; an import takes at most ${MAX_DATA_ROWS}. Export only the readings of this one sample.`);
  });
});
