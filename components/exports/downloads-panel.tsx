'use client';
/**
 * Downloads of the shown revision: BOM (CSV), netlist (SPICE subset), design JSON and the design
 * report (PDF, drawn on the server). Plain links to GET …/revisions/:n/export?format=…, answered
 * as attachments, so the browser saves the file and nothing runs in the page.
 */
import { Panel } from '@/components/ui/notice';

const ITEMS = [
  { format: 'bom', label: 'Bill of materials', hint: 'CSV · designators, quantities, ratings, worst stress, cost' },
  { format: 'netlist', label: 'Netlist', hint: 'SPICE subset (.cir) · reads back into npm run solve' },
  { format: 'json', label: 'Design JSON', hint: 'The stored document of this revision' },
  { format: 'pdf', label: 'Design report', hint: 'PDF · drawing, results, part stress, plots, safety, approvals' },
] as const;

export function DownloadsPanel({ designId, revision }: { designId: string; revision: number }) {
  return (
    <Panel title={<span>Downloads · r{revision}</span>} testId="downloads-panel">
      <ul className="space-y-2">
        {ITEMS.map((item) => (
          <li key={item.format}>
            <a
              href={`/api/designs/${designId}/revisions/${revision}/export?format=${item.format}`}
              download
              data-testid={`download-${item.format}`}
              className="block rounded-md border border-ink-600 px-3 py-2 text-sm text-copper-100 hover:border-copper-400 hover:text-ink-50 focus:outline-none focus-visible:ring-2 focus-visible:ring-lagoon-400"
            >
              <span className="font-medium">{item.label}</span>
              <span className="block text-xs text-ink-400">{item.hint}</span>
            </a>
          </li>
        ))}
      </ul>
      <p className="mt-3 text-xs text-hazard-100" data-testid="downloads-caution">
        The report carries the high-voltage cautions: the ladder stores a lethal charge; fit bleeders, discharge and ground every node
        before touching, and build to local codes with licensed practice. An approval is not a safety certificate.
      </p>
    </Panel>
  );
}
