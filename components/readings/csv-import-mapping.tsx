'use client';

import { useId } from 'react';
import { decimalSeparators, delimiters, fieldLabels, importFields, importUnits, mappingSchema, unitLabels, type ImportField, type Mapping } from '@/lib/readings-import';
import { Field, Select } from '@/components/ui/field';

const NONE = '';

/** Which column feeds which field, and how the numbers are written; the preview follows each change. */
export function CsvImportMapping({ header, mapping, onChange, allowHortvet, unitOnly = false }: { header: string[]; mapping: Mapping; onChange: (m: Mapping) => void; allowHortvet: boolean; unitOnly?: boolean }) {
  const id = useId();
  const check = mappingSchema.safeParse(mapping);
  const errorOf = (field: ImportField) => (check.success ? undefined : check.error.issues.find((i) => i.path[1] === field)?.message);
  const setColumn = (field: ImportField, value: string) => onChange({ ...mapping, columns: { ...mapping.columns, [field]: value === NONE ? null : Number(value) } });
  const units = importUnits.filter((u) => u !== 'H' || allowHortvet);

  const unit = (
    <Field id={`${id}-unit`} label={mapping.columns.unit === null ? 'Unit of the freezing points' : 'Unit where a row names none'}>
      <Select id={`${id}-unit`} value={mapping.unit} onChange={(e) => onChange({ ...mapping, unit: e.target.value as Mapping['unit'] })}>
        {units.map((u) => (
          <option key={u} value={u}>
            {unitLabels[u]}
          </option>
        ))}
      </Select>
    </Field>
  );
  if (unitOnly) return <div className="max-w-xs">{unit}</div>;

  return (
    <fieldset className="rounded-control border border-line bg-white p-3" aria-describedby={`${id}-intro`}>
      <legend className="px-1 font-bold">Column mapping</legend>
      <p id={`${id}-intro`} className="mb-3 text-brine">
        The file’s header is not our layout. Say which column holds what; columns left unmapped are ignored.
      </p>
      <div className="grid gap-3 md:grid-cols-3">
        {importFields.map((field) => (
          <Field key={field} id={`${id}-${field}`} label={fieldLabels[field]} error={errorOf(field)}>
            <Select id={`${id}-${field}`} data-field={field} value={mapping.columns[field] === null ? NONE : String(mapping.columns[field])} invalid={!!errorOf(field)} onChange={(e) => setColumn(field, e.target.value)}>
              <option value={NONE}>{field === 'freezing_point' ? 'Choose…' : '— not in the file —'}</option>
              {header.map((name, i) => (
                <option key={i} value={String(i)}>
                  {name === '' ? `Column ${i + 1}` : name}
                </option>
              ))}
            </Select>
          </Field>
        ))}
        {unit}
        <Field id={`${id}-decimal`} label="Decimal separator">
          <Select id={`${id}-decimal`} value={mapping.decimal} onChange={(e) => onChange({ ...mapping, decimal: e.target.value as Mapping['decimal'] })}>
            {decimalSeparators.map((d) => (
              <option key={d} value={d}>
                {d === '.' ? 'Point (−0.512)' : 'Comma (−0,512)'}
              </option>
            ))}
          </Select>
        </Field>
        <Field id={`${id}-delimiter`} label="Column separator">
          <Select id={`${id}-delimiter`} value={mapping.delimiter} onChange={(e) => onChange({ ...mapping, delimiter: e.target.value as Mapping['delimiter'] })}>
            {delimiters.map((d) => (
              <option key={d} value={d}>
                {d === ',' ? 'Comma' : 'Semicolon'}
              </option>
            ))}
          </Select>
        </Field>
      </div>
    </fieldset>
  );
}
