'use client';
/**
 * Keyboard shortcuts of the editor, one table for both the key handler and the help sheet (so
 * the sheet can never list a key that does nothing, or miss one that does something).
 */
import { useEffect, useRef } from 'react';
import { chordMatches } from './canvas-model';

export type ShortcutAction =
  | 'undo'
  | 'redo'
  | 'delete'
  | 'copy'
  | 'paste'
  | 'selectAll'
  | 'clearSelection'
  | 'fitView'
  | 'zoomIn'
  | 'zoomOut'
  | 'toggleDcLabels'
  | 'save'
  | 'help';

export interface Shortcut {
  action: ShortcutAction;
  keys: string[];
  what: string;
  /** Whether the key changes the document (ignored in read-only mode). */
  edits: boolean;
}

/** Every shortcut, in help-sheet order. `Ctrl` means Ctrl, or ⌘ on a Mac. */
export const SHORTCUTS: Shortcut[] = [
  { action: 'undo', keys: ['Ctrl+Z'], what: 'Undo the last change', edits: true },
  { action: 'redo', keys: ['Ctrl+Shift+Z', 'Ctrl+Y'], what: 'Redo', edits: true },
  { action: 'delete', keys: ['Delete', 'Backspace'], what: 'Delete the selected blocks and wires (wires on deleted blocks go too)', edits: true },
  { action: 'copy', keys: ['Ctrl+C'], what: 'Copy the selected blocks and the wires between them', edits: false },
  { action: 'paste', keys: ['Ctrl+V'], what: 'Paste the copied blocks with fresh names', edits: true },
  { action: 'selectAll', keys: ['Ctrl+A'], what: 'Select every block and wire', edits: false },
  { action: 'clearSelection', keys: ['Escape'], what: 'Clear the selection', edits: false },
  { action: 'fitView', keys: ['F'], what: 'Fit the whole drawing in view', edits: false },
  { action: 'zoomIn', keys: ['+'], what: 'Zoom in', edits: false },
  { action: 'zoomOut', keys: ['-'], what: 'Zoom out', edits: false },
  { action: 'toggleDcLabels', keys: ['L'], what: 'Show or hide the DC level on every node', edits: false },
  { action: 'save', keys: ['Ctrl+S'], what: 'Save a revision (asks for a message)', edits: true },
  { action: 'help', keys: ['?'], what: 'Open this list', edits: false },
];

/** Keys handled by the canvas itself (listed in the help sheet, not by the handler). */
export const CANVAS_KEYS: { keys: string[]; what: string }[] = [
  { keys: ['Tab', 'Shift+Tab'], what: 'Move the focus between blocks and wires on the canvas' },
  { keys: ['Enter', 'Space'], what: 'Select the focused block or wire; on a tray item, place it in the middle of the view' },
  { keys: ['Arrow keys'], what: 'Move the selected blocks (hold Shift for larger steps)' },
  { keys: ['Enter on a port', 'Enter on a second port'], what: 'Draw a wire between two focused ports without the mouse' },
  { keys: ['Shift+drag'], what: 'Select the blocks inside a box' },
  { keys: ['Ctrl+click'], what: 'Add a block or wire to the selection' },
  { keys: ['Mouse wheel', 'drag the ground'], what: 'Zoom and pan' },
];

function typingInto(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  const tag = target.tagName;
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag === 'INPUT') {
    const type = (target as HTMLInputElement).type;
    return !['button', 'checkbox', 'radio', 'submit', 'reset', 'file'].includes(type);
  }
  return false;
}

/**
 * Listens on the window while mounted and `enabled`; keys typed into a field, and Ctrl+C while
 * the user has text selected on the page, are left to the browser.
 */
export function useShortcuts(enabled: boolean, handlers: Partial<Record<ShortcutAction, () => void>>): void {
  const ref = useRef(handlers);
  useEffect(() => {
    ref.current = handlers;
  });
  useEffect(() => {
    if (!enabled) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.defaultPrevented || typingInto(e.target)) return;
      if (e.target instanceof HTMLElement && e.target.closest('dialog[open]')) return;
      for (const s of SHORTCUTS) {
        if (!s.keys.some((k) => chordMatches(e, k))) continue;
        if (s.action === 'copy' && (window.getSelection()?.toString() ?? '') !== '') return;
        const h = ref.current[s.action];
        if (!h) return;
        e.preventDefault();
        h();
        return;
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [enabled]);
}

/** The help sheet: a modal dialog listing every shortcut. */
export function HelpSheet({ open, onClose }: { open: boolean; onClose: () => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      onClose={onClose}
      data-testid="help-sheet"
      aria-labelledby="help-sheet-title"
      className="m-auto w-[36rem] max-w-[95vw] rounded-lg border border-ink-600 bg-ink-900 p-5 text-ink-100"
    >
      <div className="mb-3 flex items-center justify-between">
        <h2 id="help-sheet-title" className="text-lg font-semibold text-ink-50">
          Keyboard shortcuts
        </h2>
        <button type="button" onClick={onClose} className="rounded px-2 py-1 text-sm text-ink-200 hover:bg-ink-800" autoFocus>
          Close
        </button>
      </div>
      <table className="w-full text-sm">
        <tbody>
          {[...SHORTCUTS.map((s) => ({ keys: s.keys, what: s.what })), ...CANVAS_KEYS].map((s) => (
            <tr key={s.what} className="border-t border-ink-800">
              <td className="py-1.5 pr-4 align-top whitespace-nowrap">
                {s.keys.map((k, i) => (
                  <span key={k}>
                    {i > 0 ? <span className="px-1 text-ink-400">or</span> : null}
                    <kbd className="rounded border border-ink-600 bg-ink-800 px-1.5 py-0.5 font-mono text-xs">{k}</kbd>
                  </span>
                ))}
              </td>
              <td className="py-1.5 text-ink-200">{s.what}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </dialog>
  );
}
