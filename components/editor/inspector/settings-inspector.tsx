'use client';

import type { DesignSettings } from '@/lib/circuit';
import { SpecFields } from '@/components/editor/fields/spec-fields';
import { SETTINGS_FIELDS } from '@/lib/editor/fields';

const [stray, bleeder, derating, ...requirement] = SETTINGS_FIELDS;

/**
 * The design-wide settings: stray capacitance, the output bleeder, the derating the stress table
 * checks against, and what the design must meet. `onChange` receives the whole new settings.
 */
export function SettingsInspector({ settings, readOnly, onChange }: { settings: DesignSettings; readOnly: boolean; onChange: (next: DesignSettings) => void }) {
  return (
    <section className="space-y-3 text-ink-100" data-testid="settings-inspector" aria-label="Design settings">
      <h3 className="text-sm font-semibold text-copper-100">Design settings</h3>
      {readOnly ? <p className="text-[11px] text-ink-400">Read-only: values are shown, not editable.</p> : null}
      <SpecFields specs={[stray, bleeder, derating]} value={settings} onChange={onChange} readOnly={readOnly} testIdPrefix="setting" />
      <div>
        <h4 className="mb-1 text-xs font-semibold uppercase tracking-wide text-ink-400">Requirement</h4>
        <SpecFields specs={requirement} value={settings} onChange={onChange} readOnly={readOnly} testIdPrefix="setting" />
      </div>
    </section>
  );
}
