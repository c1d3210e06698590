'use client';

import { useState } from 'react';
import { formatReading } from '@/lib/editor/format';
import { nextSort, sortNodeRows, toggleNodeSelection, type NodeRow, type NodeSortKey, type SortDirection } from './panel-model';

const COLUMNS: Array<{ key: NodeSortKey; label: string; numeric: boolean }> = [
  { key: 'label', label: 'Node', numeric: false },
  { key: 'meanV', label: 'DC mean', numeric: true },
  { key: 'rippleV', label: 'Ripple p-p', numeric: true },
  { key: 'minV', label: 'Min', numeric: true },
  { key: 'maxV', label: 'Max', numeric: true },
];

/**
 * Every node's voltages to ground, sortable by any column (click or Enter on the header).
 * Clicking a node plots it alone; the check box (or Ctrl/⌘/Shift-click) adds it to the plot.
 */
export function NodeTable({ rows, selected, onSelect, stale }: { rows: NodeRow[]; selected: string[]; onSelect: (nodes: string[]) => void; stale: boolean }) {
  const [sort, setSort] = useState<{ key: NodeSortKey; dir: SortDirection }>({ key: 'label', dir: 'asc' });
  const sorted = sortNodeRows(rows, sort.key, sort.dir);
  return (
    <div className="max-h-64 overflow-auto rounded border border-ink-800">
      <table data-testid="node-table" data-stale={stale ? 'true' : 'false'} className={`w-full border-collapse text-xs ${stale ? 'opacity-70' : ''}`}>
        <caption className="sr-only">Node voltages to ground; sort by a column header, select nodes to plot</caption>
        <thead className="sticky top-0 bg-ink-800 text-ink-200">
          <tr>
            <th scope="col" className="w-5 px-0.5 py-1">
              <span className="sr-only">Plot</span>
            </th>
            {COLUMNS.map((c) => (
              <th
                key={c.key}
                scope="col"
                aria-sort={sort.key === c.key ? (sort.dir === 'asc' ? 'ascending' : 'descending') : 'none'}
                className={`whitespace-nowrap px-1 py-1 font-medium ${c.numeric ? 'text-right' : 'text-left'}`}
              >
                <button
                  type="button"
                  onClick={() => setSort(nextSort(sort, c.key))}
                  className="inline-flex items-center gap-0.5 rounded px-0.5 hover:text-ink-50"
                  data-testid={`node-sort-${c.key}`}
                >
                  {c.label}
                  <span aria-hidden="true" className="text-[9px] text-ink-400">
                    {sort.key === c.key ? (sort.dir === 'asc' ? '▲' : '▼') : '↕'}
                  </span>
                </button>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {sorted.length === 0 ? (
            <tr>
              <td colSpan={6} className="px-2 py-2 text-ink-400">
                No nodes yet.
              </td>
            </tr>
          ) : null}
          {sorted.map((r) => {
            const on = selected.includes(r.node);
            return (
              <tr
                key={r.node}
                data-node={r.node}
                aria-selected={on}
                className={`border-t border-ink-800 ${on ? 'bg-lagoon-800/40' : 'hover:bg-ink-800/60'}`}
              >
                <td className="px-0.5 text-center">
                  <input
                    type="checkbox"
                    checked={on}
                    onChange={() => onSelect(toggleNodeSelection(selected, r.node, true))}
                    aria-label={`Plot ${r.label}`}
                    className="accent-lagoon-400"
                  />
                </td>
                <td className="min-w-[6rem] px-1 py-0.5 text-[11px]">
                  <button
                    type="button"
                    onClick={(e) => onSelect(toggleNodeSelection(selected, r.node, e.ctrlKey || e.metaKey || e.shiftKey))}
                    className="block w-full rounded text-left leading-tight text-ink-100 hover:text-lagoon-100"
                    title={`${r.label} (${r.node})`}
                  >
                    {r.label}
                  </button>
                </td>
                {(['meanV', 'rippleV', 'minV', 'maxV'] as const).map((k) => (
                  <td key={k} className={`whitespace-nowrap py-0.5 pl-1 pr-1 text-right font-mono text-[11px] tracking-tight ${k === 'meanV' ? 'text-lagoon-100' : 'text-ink-100'}`}>
                    {formatReading(r[k], 'V')}
                  </td>
                ))}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
