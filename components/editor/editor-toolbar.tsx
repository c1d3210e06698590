'use client';
/**
 * The editor's toolbar: history, view, ladder actions (n more stages; start from a starter),
 * files (import; export netlist, design JSON, PNG, SVG) and saving. Edit controls are left out in
 * read-only mode; viewing and exporting stay.
 */
import { useId, useState } from 'react';
import type { StarterKind } from '@/lib/editor/store';
import { useEditor } from './store-context';

const btn =
  'inline-flex items-center gap-1 rounded-md border border-ink-600 bg-ink-800 px-2.5 py-1 text-xs font-medium text-ink-100 hover:border-ink-400 disabled:cursor-not-allowed disabled:opacity-40';
const btnOn = 'border-lagoon-400 bg-lagoon-800/50 text-lagoon-100';
const group = 'flex flex-wrap items-center gap-1.5 rounded-lg border border-ink-800 bg-ink-900/50 px-2 py-1';
const num = 'w-14 rounded-md border border-ink-600 bg-ink-900 px-1.5 py-1 text-xs text-ink-50 tabular-nums';

export interface ToolbarActions {
  undo(): void;
  redo(): void;
  deleteSelection(): void;
  copy(): void;
  paste(): void;
  fitView(): void;
  toggleDcLabels(): void;
  openHelp(): void;
  appendStages(n: number): void;
  loadStarter(kind: StarterKind, n: number): void;
  importFile(file: File): void;
  exportNetlist(): void;
  exportJson(): void;
  exportImage(format: 'png' | 'svg'): void;
  openSave(): void;
}

function clampStages(v: string): number {
  const n = Math.round(Number(v));
  return Number.isFinite(n) ? Math.min(Math.max(n, 1), 100) : 1;
}

export function EditorToolbar({ actions, dcLabels, canSave, saving }: { actions: ToolbarActions; dcLabels: boolean; canSave: boolean; saving: boolean }) {
  const readOnly = useEditor((s) => s.readOnly);
  const canUndo = useEditor((s) => s.past.length > 0);
  const canRedo = useEditor((s) => s.future.length > 0);
  const hasSelection = useEditor((s) => s.selection.blocks.length + s.selection.wires.length > 0);
  const hasClipboard = useEditor((s) => (s.clipboard?.blocks.length ?? 0) > 0);
  const [more, setMore] = useState('1');
  const [starterKind, setStarterKind] = useState<StarterKind>('half-wave');
  const [starterN, setStarterN] = useState('3');
  const fileId = useId();

  return (
    <div role="toolbar" aria-label="Editor tools" className="flex flex-wrap items-center gap-2" data-testid="editor-toolbar">
      {!readOnly ? (
        <div className={group} aria-label="History and selection">
          <button type="button" className={btn} onClick={actions.undo} disabled={!canUndo} data-testid="undo" title="Undo (Ctrl+Z)">
            Undo
          </button>
          <button type="button" className={btn} onClick={actions.redo} disabled={!canRedo} data-testid="redo" title="Redo (Ctrl+Shift+Z or Ctrl+Y)">
            Redo
          </button>
          <button type="button" className={btn} onClick={actions.deleteSelection} disabled={!hasSelection} data-testid="delete-selection" title="Delete the selection (Delete)">
            Delete
          </button>
          <button type="button" className={btn} onClick={actions.copy} disabled={!hasSelection} data-testid="copy" title="Copy (Ctrl+C)">
            Copy
          </button>
          <button type="button" className={btn} onClick={actions.paste} disabled={!hasClipboard} data-testid="paste" title="Paste (Ctrl+V)">
            Paste
          </button>
        </div>
      ) : null}

      <div className={group} aria-label="View">
        <button type="button" className={btn} onClick={actions.fitView} data-testid="fit-view" title="Fit the drawing (F)">
          Fit
        </button>
        <button
          type="button"
          className={`${btn} ${dcLabels ? btnOn : ''}`}
          onClick={actions.toggleDcLabels}
          aria-pressed={dcLabels}
          data-testid="toggle-dc-labels"
          title="Write the DC level on every node (L)"
        >
          DC levels
        </button>
        <button type="button" className={btn} onClick={actions.openHelp} data-testid="open-help" title="Keyboard shortcuts (?)">
          Keys ?
        </button>
      </div>

      {!readOnly ? (
        <div className={group} aria-label="Ladder">
          <form
            className="flex items-center gap-1"
            onSubmit={(e) => {
              e.preventDefault();
              actions.appendStages(clampStages(more));
            }}
          >
            <label className="sr-only" htmlFor={`${fileId}-more`}>
              Stages to add
            </label>
            <input id={`${fileId}-more`} type="number" min={1} max={100} value={more} onChange={(e) => setMore(e.target.value)} className={num} data-testid="append-count" />
            <button type="submit" className={btn} data-testid="append-stages" title="Add stages on top of the selected ladder (or the only one)">
              more stages
            </button>
          </form>
          <form
            className="flex items-center gap-1"
            onSubmit={(e) => {
              e.preventDefault();
              actions.loadStarter(starterKind, clampStages(starterN));
            }}
          >
            <label className="sr-only" htmlFor={`${fileId}-kind`}>
              Starter ladder
            </label>
            <select
              id={`${fileId}-kind`}
              value={starterKind}
              onChange={(e) => setStarterKind(e.target.value as StarterKind)}
              className="rounded-md border border-ink-600 bg-ink-900 px-1.5 py-1 text-xs text-ink-50"
              data-testid="starter-kind"
            >
              <option value="half-wave">Half-wave</option>
              <option value="full-wave">Full-wave</option>
              <option value="symmetric">Symmetric pair</option>
            </select>
            <label className="sr-only" htmlFor={`${fileId}-n`}>
              Stages in the starter
            </label>
            <input id={`${fileId}-n`} type="number" min={1} max={100} value={starterN} onChange={(e) => setStarterN(e.target.value)} className={num} data-testid="starter-stages" />
            <button type="submit" className={btn} data-testid="load-starter" title="Replace the drawing with a starter ladder (undo brings yours back)">
              Start from
            </button>
          </form>
        </div>
      ) : null}

      <div className={group} aria-label="Files">
        {!readOnly ? (
          <>
            <input
              id={`${fileId}-file`}
              type="file"
              accept=".cir,.net,.sp,.txt,.json,text/plain,application/json"
              className="sr-only"
              tabIndex={-1}
              data-testid="import-file-input"
              onChange={(e) => {
                const f = e.target.files?.[0];
                if (f) actions.importFile(f);
                e.target.value = '';
              }}
            />
            <button
              type="button"
              className={btn}
              data-testid="import-file"
              title="Import a netlist (.cir, .net, .sp) or a design JSON"
              onClick={() => document.getElementById(`${fileId}-file`)?.click()}
            >
              Import…
            </button>
          </>
        ) : null}
        <button type="button" className={btn} onClick={actions.exportNetlist} data-testid="export-netlist" title="Download the SPICE-subset netlist">
          Netlist
        </button>
        <button type="button" className={btn} onClick={actions.exportJson} data-testid="export-json" title="Download the design as JSON">
          JSON
        </button>
        <button type="button" className={btn} onClick={() => actions.exportImage('png')} data-testid="export-png" title="Download a PNG of the drawing">
          PNG
        </button>
        <button type="button" className={btn} onClick={() => actions.exportImage('svg')} data-testid="export-svg" title="Download an SVG of the drawing">
          SVG
        </button>
      </div>

      {!readOnly ? (
        <button
          type="button"
          onClick={actions.openSave}
          disabled={!canSave || saving}
          data-testid="save-revision"
          title="Save a revision with a message (Ctrl+S)"
          className="ml-auto inline-flex items-center rounded-md bg-lagoon-600 px-3 py-1.5 text-sm font-medium text-ink-50 hover:bg-lagoon-400 hover:text-ink-900 disabled:cursor-not-allowed disabled:opacity-50"
        >
          {saving ? 'Saving…' : 'Save revision'}
        </button>
      ) : null}
    </div>
  );
}
