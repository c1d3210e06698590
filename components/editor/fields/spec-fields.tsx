'use client';

import { getNumberAt, setAt, type FieldSpec } from '@/lib/editor/fields';
import { EngineeringInput } from './engineering-input';

/**
 * The numeric fields of one object (a capacitor spec, a diode spec, a source's data…) from
 * their {@link FieldSpec}s. Each committed value yields a copy of the object with that one value
 * changed; refused entries never leave their field.
 */
export function SpecFields<T extends object>({
  specs,
  value,
  onChange,
  readOnly,
  testIdPrefix,
  columns = 2,
}: {
  specs: readonly FieldSpec[];
  value: T;
  onChange: (next: T) => void;
  readOnly: boolean;
  testIdPrefix?: string;
  columns?: 1 | 2;
}) {
  return (
    <div className={`grid gap-x-3 gap-y-2 ${columns === 2 ? 'grid-cols-2' : 'grid-cols-1'}`}>
      {specs.map((spec) => {
        const key = spec.path.join('.');
        const current = getNumberAt(value, spec.path);
        const common = {
          label: spec.label,
          unit: spec.unit,
          rule: spec.rule,
          scale: spec.scale,
          hint: spec.hint,
          readOnly,
          testId: testIdPrefix ? `${testIdPrefix}-${key}` : undefined,
        };
        // A required value that is missing (a malformed document) shows empty and must be filled.
        return spec.optional ? (
          <EngineeringInput key={key} {...common} optional value={current} onCommit={(v) => onChange(setAt(value, spec.path, v))} />
        ) : (
          <EngineeringInput key={key} {...common} value={current ?? Number.NaN} onCommit={(v) => onChange(setAt(value, spec.path, v))} />
        );
      })}
    </div>
  );
}
