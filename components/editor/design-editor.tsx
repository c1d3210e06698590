'use client';
/**
 * The design editor: tray, toolbar, canvas, engine status, diagnostics, hover card, inspector
 * and results panel over one editor store. In `working` mode it autosaves the working copy to
 * localStorage, saves revisions through the API (a stale base answers 409: reload or compare), and
 * edits unless the design is read-only for this user. In `revision` mode it shows an older
 * revision, read-only.
 */
import { memo, useCallback, useEffect, useRef, useState } from 'react';
import { ReactFlowProvider, useReactFlow } from '@xyflow/react';
import { useQueryClient } from '@tanstack/react-query';
import type { DesignBlock, DesignDocument } from '@/lib/circuit/document/schema';
import { blockSize } from '@/lib/circuit/document/geometry';
import { createBlock, type TrayItemKey } from '@/lib/circuit/document/tray';
import { ApiError, api as callApi, formError } from '@/lib/client/api';
import { formatDateTime } from '@/lib/client/format';
import { keys, useSaveRevision } from '@/lib/client/hooks';
import { clearWorkingCopy, readWorkingCopy, saveFailureText, writeWorkingCopy, type WorkingCopy } from '@/lib/editor/autosave';
import { compareDocuments, sameValue, type DocumentComparison } from '@/lib/editor/compare';
import { useEngine } from '@/lib/editor/engine/use-engine';
import { downloadText, exportDesignJson, exportNetlistText, importDesignFile } from '@/lib/editor/io';
import { EditorPartsProvider, useTeamDeratedSnapshot } from '@/components/parts/editor-parts-context';
import { BlockInspector, SettingsInspector } from './inspector';
import { ResultsPanel } from './panel';
import { BlockTray } from './block-tray';
import { downloadDataUrl, drawingDataUrl } from './drawing-export';
import { EditorCanvas } from './editor-canvas';
import { EditorToolbar, type ToolbarActions } from './editor-toolbar';
import { DiagnosticsList, EngineStatusPill, TopologyBadge } from './engine-strip';
import { HoverLayer } from './hover-layer';
import { HoverContext, createHoverStore } from './hover-store';
import { HelpSheet, useShortcuts } from './shortcuts';
import { EditorStoreProvider, useEditor, useEditorApi } from './store-context';

// The panel and the list change only when the engine posts a result: a drag (a new document on
// every pointer move) must not redraw their tables and plots.
const ResultsPanelMemo = memo(ResultsPanel);
const DiagnosticsListMemo = memo(DiagnosticsList);
// Neither depends on the engine snapshot: an engine result must not redraw the tray or the forms.
const BlockTrayMemo = memo(BlockTray);
const HelpSheetMemo = memo(HelpSheet);

/** Autosave waits this long after the last edit before writing (ms). */
const AUTOSAVE_DELAY_MS = 800;

export interface DesignEditorProps {
  designId: string;
  title: string;
  /** Revision the shown document is (working mode: the base of the edits). */
  revisionNumber: number;
  document: DesignDocument;
  mode: 'working' | 'revision';
  /** Whether the user may edit this design (server-decided permission, and not archived). */
  canEdit: boolean;
  /** Why editing is off when `canEdit` is false. */
  /** Why a working copy is read-only: the role, an archived design, or a colleague's design opened to view (`viewing`). */
  readOnlyReason?: 'role' | 'archived' | 'viewing';
  /** Whether the user may fork (the read-only banner then points to it). */
  canFork?: boolean;
  /** Whether this editor takes the keyboard shortcuts (one editor on the page at a time). */
  active?: boolean;
}

/** The whole editor for one design revision. */
export function DesignEditor(props: DesignEditorProps) {
  const readOnly = props.mode === 'revision' || !props.canEdit;
  const [hover] = useState(createHoverStore);
  return (
    <EditorStoreProvider document={props.document} readOnly={readOnly}>
      <ReactFlowProvider>
        <HoverContext.Provider value={hover}>
          {/* The team's parts library (binding in the inspector) and its derating policy (stress). */}
          <EditorPartsProvider designId={props.designId}>
            <EditorBody {...props} />
          </EditorPartsProvider>
        </HoverContext.Provider>
      </ReactFlowProvider>
    </EditorStoreProvider>
  );
}

function slug(title: string): string {
  return title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'design';
}

type Notice = { tone: 'info' | 'error'; text: string } | null;

function useAutosave(enabled: boolean, designId: string, baseRevision: number, initial: DesignDocument) {
  const editor = useEditorApi();
  const [offer, setOffer] = useState<WorkingCopy | null>(() => {
    if (!enabled || typeof window === 'undefined') return null;
    const copy = readWorkingCopy(window.localStorage, designId);
    return copy && !sameValue(copy.document, initial) ? copy : null;
  });
  const pending = useRef(offer !== null);
  const base = useRef(baseRevision);
  useEffect(() => {
    base.current = baseRevision;
  }, [baseRevision]);
  useEffect(() => {
    if (!enabled) return;
    let timer: ReturnType<typeof setTimeout> | null = null;
    const unsub = editor.subscribe((s, prev) => {
      if (s.document === prev.document && s.dirty === prev.dirty) return;
      // While a stored copy waits for restore/discard, it must not be overwritten.
      if (pending.current) return;
      if (timer) clearTimeout(timer);
      timer = setTimeout(() => {
        const now = editor.getState();
        if (now.dirty) writeWorkingCopy(window.localStorage, designId, { baseRevision: base.current, savedAt: new Date().toISOString(), document: now.document });
        else clearWorkingCopy(window.localStorage, designId);
      }, AUTOSAVE_DELAY_MS);
    });
    return () => {
      unsub();
      if (timer) clearTimeout(timer);
      // Leaving the editor (another revision picked, page left) must not lose the last edits.
      const now = editor.getState();
      if (!pending.current && now.dirty) writeWorkingCopy(window.localStorage, designId, { baseRevision: base.current, savedAt: new Date().toISOString(), document: now.document });
    };
  }, [enabled, designId, editor]);
  const restore = useCallback(() => {
    if (!offer) return;
    pending.current = false;
    editor.getState().replaceDocument(offer.document);
    setOffer(null);
  }, [offer, editor]);
  const discard = useCallback(() => {
    pending.current = false;
    clearWorkingCopy(window.localStorage, designId);
    setOffer(null);
  }, [designId]);
  return { offer, restore, discard };
}

function ConflictBanner({
  latest,
  comparison,
  busy,
  onReload,
  onCompare,
}: {
  latest: number | null;
  comparison: DocumentComparison | null;
  busy: boolean;
  onReload: () => void;
  onCompare: () => void;
}) {
  const word: Record<string, string> = { 'only-mine': 'only in your copy', 'only-theirs': 'only in theirs', values: 'values differ', moved: 'moved' };
  return (
    <div role="alert" data-testid="conflict-banner" data-latest-revision={latest ?? ''} className="rounded-md border border-hazard-700 bg-hazard-700/20 px-3 py-2 text-sm text-hazard-100">
      <div className="flex flex-wrap items-center gap-2">
        <p className="mr-auto">
          <strong>A colleague saved r{latest ?? '?'} first.</strong> Your changes are still here, not saved. Reload to drop them and take r{latest ?? '?'}, or compare to see what differs.
        </p>
        <button type="button" onClick={onCompare} disabled={busy} data-testid="conflict-compare" className="rounded-md border border-hazard-500 px-2.5 py-1 text-xs hover:bg-hazard-700/40">
          Compare
        </button>
        <button type="button" onClick={onReload} disabled={busy} data-testid="conflict-reload" className="rounded-md bg-hazard-700 px-2.5 py-1 text-xs text-hazard-100 hover:bg-hazard-500">
          Reload r{latest ?? '?'}
        </button>
      </div>
      {comparison ? (
        <div className="mt-2 text-xs text-ink-100" data-testid="conflict-diff">
          {comparison.blocks.length === 0 && comparison.wiresOnlyMine === 0 && comparison.wiresOnlyTheirs === 0 && !comparison.settingsDiffer ? (
            <p>Your copy and r{latest} draw the same circuit.</p>
          ) : (
            <ul className="list-disc space-y-0.5 pl-5">
              {comparison.blocks.map((b) => (
                <li key={`${b.id}-${b.change}`} data-testid="conflict-diff-block" data-block={b.id} data-change={b.change}>
                  {b.label} <span className="text-ink-400">({b.id})</span>: {word[b.change]}
                </li>
              ))}
              {comparison.wiresOnlyMine > 0 ? <li>{comparison.wiresOnlyMine} wire(s) only in your copy</li> : null}
              {comparison.wiresOnlyTheirs > 0 ? <li>{comparison.wiresOnlyTheirs} wire(s) only in r{latest}</li> : null}
              {comparison.settingsDiffer ? <li>Design settings differ</li> : null}
            </ul>
          )}
        </div>
      ) : null}
    </div>
  );
}

function SaveForm({ onSave, onCancel, pending }: { onSave: (message: string) => void; onCancel: () => void; pending: boolean }) {
  const [message, setMessage] = useState('');
  return (
    <form
      className="flex flex-wrap items-center gap-2 rounded-md border border-lagoon-600 bg-ink-900 px-3 py-2"
      data-testid="save-revision-form"
      onSubmit={(e) => {
        e.preventDefault();
        onSave(message.trim());
      }}
    >
      <label htmlFor="revision-message" className="text-sm text-ink-200">
        What changed?
      </label>
      <input
        id="revision-message"
        autoFocus
        value={message}
        maxLength={500}
        onChange={(e) => setMessage(e.target.value)}
        onKeyDown={(e) => e.key === 'Escape' && onCancel()}
        placeholder="e.g. 4 stages, 22 nF pumping capacitors"
        className="min-w-64 flex-1 rounded-md border border-ink-600 bg-ink-800 px-2 py-1 text-sm text-ink-50"
        data-testid="revision-message"
      />
      <button type="submit" disabled={pending} data-testid="save-revision-confirm" className="rounded-md bg-lagoon-600 px-3 py-1 text-sm text-ink-50 hover:bg-lagoon-400 hover:text-ink-900 disabled:opacity-50">
        {pending ? 'Saving…' : 'Save'}
      </button>
      <button type="button" onClick={onCancel} className="rounded-md px-2 py-1 text-sm text-ink-200 hover:bg-ink-800">
        Cancel
      </button>
    </form>
  );
}

const SelectionInspector = memo(function SelectionInspector() {
  const editor = useEditorApi();
  const document = useEditor((s) => s.document);
  const selection = useEditor((s) => s.selection);
  const readOnly = useEditor((s) => s.readOnly);
  const onBlock = useCallback((next: DesignBlock) => editor.getState().updateBlock(next), [editor]);
  if (selection.blocks.length === 1) {
    const block = document.blocks.find((b) => b.id === selection.blocks[0]);
    if (block) return <BlockInspector key={block.id} block={block} readOnly={readOnly} onChange={onBlock} />;
  }
  if (selection.blocks.length + selection.wires.length > 1) {
    return (
      <p className="text-sm text-ink-200" data-testid="multi-selection">
        {selection.blocks.length} block(s) and {selection.wires.length} wire(s) selected. Drag one to move them together; Delete removes them.
      </p>
    );
  }
  if (selection.wires.length === 1) {
    const w = document.wires.find((x) => x.id === selection.wires[0]);
    return w ? (
      <p className="text-sm text-ink-200" data-testid="wire-selection">
        Wire {w.id}: {w.source} {w.sourcePort} ↔ {w.target} {w.targetPort}. Delete removes it.
      </p>
    ) : null;
  }
  return <SettingsInspector settings={document.settings} readOnly={readOnly} onChange={(s) => editor.getState().updateSettings(s)} />;
});

function EditorBody({ designId, title, revisionNumber, document: initialDocument, mode, canEdit, readOnlyReason = 'role', canFork = false, active = true }: DesignEditorProps) {
  const editor = useEditorApi();
  const qc = useQueryClient();
  const flow = useReactFlow();
  const document = useEditor((s) => s.document);
  const version = useEditor((s) => s.version);
  const readOnly = useEditor((s) => s.readOnly);
  const dirty = useEditor((s) => s.dirty);
  const lastRefusal = useEditor((s) => s.lastRefusal);
  const snapshot = useTeamDeratedSnapshot(useEngine(document, version, editor), document.settings.deratingFraction);
  const canvasBox = useRef<HTMLDivElement>(null);
  const [dcLabels, setDcLabels] = useState(false);
  const [help, setHelp] = useState(false);
  const [saving, setSaving] = useState(false);
  const [notice, setNotice] = useState<Notice>(null);
  const [selectedNodes, setSelectedNodes] = useState<string[]>([]);
  const [baseRevision, setBaseRevision] = useState(revisionNumber);
  const [conflict, setConflict] = useState<{ latest: number | null; comparison: DocumentComparison | null } | null>(null);
  const [conflictBusy, setConflictBusy] = useState(false);
  const save = useSaveRevision(designId);
  const working = mode === 'working';
  const autosave = useAutosave(working && canEdit, designId, baseRevision, initialDocument);

  const focusBlock = useCallback(
    (blockId: string) => {
      const block = editor.getState().document.blocks.find((b) => b.id === blockId);
      if (!block) return;
      editor.getState().select({ blocks: [blockId], wires: [] });
      const size = blockSize(block);
      void flow.setCenter(block.position.x + size.width / 2, block.position.y + size.height / 2, { zoom: Math.max(flow.getZoom(), 0.9), duration: 250 });
    },
    [editor, flow],
  );

  const addAtCentre = useCallback(
    (item: TrayItemKey) => {
      const box = canvasBox.current?.getBoundingClientRect();
      if (!box) return;
      const c = flow.screenToFlowPosition({ x: box.left + box.width / 2, y: box.top + box.height / 2 });
      // Step aside from a block already centred here, so repeated presses do not stack.
      const taken = (p: { x: number; y: number }) =>
        editor.getState().document.blocks.some((b) => {
          const size = blockSize(b);
          return Math.abs(b.position.x + size.width / 2 - p.x) < 12 && Math.abs(b.position.y + size.height / 2 - p.y) < 12;
        });
      // A stage steps exactly one stage width, so its inputs land on the previous stage's outputs
      // and snap: pressing a stage item n times builds a chained ladder of n stages.
      const size = blockSize(createBlock(item, 'probe', { x: 0, y: 0 }));
      const step = item.startsWith('stage-') ? size.width : size.width + 24;
      let at = c;
      for (let i = 0; i < 40 && taken(at); i++) at = { x: at.x + step, y: at.y };
      const res = editor.getState().addBlock(item, at, 'center');
      if (res.ok) setNotice({ tone: 'info', text: `Placed ${res.id} in the middle of the view.` });
    },
    [editor, flow],
  );

  const exportImage = useCallback(
    async (format: 'png' | 'svg') => {
      const box = canvasBox.current;
      if (!box) return;
      const nodes = flow.getNodes();
      const res = await drawingDataUrl(box, nodes.length ? flow.getNodesBounds(nodes) : null, format);
      if (res.ok) downloadDataUrl(`${slug(title)}.${format}`, res.url);
      else setNotice({ tone: 'error', text: res.reason });
    },
    [flow, title],
  );

  const doSave = useCallback(
    (message: string) => {
      const doc = editor.getState().document;
      save.mutate(
        { baseRevision, document: doc, ...(message ? { message } : {}) },
        {
          onSuccess: (res) => {
            editor.getState().markSaved(doc);
            setBaseRevision(res.revision.number);
            clearWorkingCopy(window.localStorage, designId);
            setConflict(null);
            setSaving(false);
            setNotice({ tone: 'info', text: `Saved as r${res.revision.number}.` });
          },
          onError: (e) => {
            if (e instanceof ApiError && e.status === 409 && e.latestRevision !== undefined) {
              setSaving(false);
              setConflict({ latest: e.latestRevision, comparison: null });
            } else setNotice({ tone: 'error', text: saveFailureText(e instanceof ApiError ? e.status : 0, formError(e)) });
          },
        },
      );
    },
    [editor, save, baseRevision, designId],
  );

  const reloadLatest = useCallback(async () => {
    setConflictBusy(true);
    try {
      const res = await qc.fetchQuery({ queryKey: keys.design(designId), queryFn: ({ signal }) => callApi('GET /api/designs/:designId', { params: { designId }, signal }), staleTime: 0 });
      editor.getState().resetDocument(res.revision.document);
      setBaseRevision(res.revision.number);
      clearWorkingCopy(window.localStorage, designId);
      setConflict(null);
      setNotice({ tone: 'info', text: `Loaded r${res.revision.number}; your unsaved changes were dropped.` });
    } catch (e) {
      setNotice({ tone: 'error', text: formError(e) ?? 'The latest revision could not be loaded.' });
    } finally {
      setConflictBusy(false);
    }
  }, [qc, designId, editor]);

  const compareLatest = useCallback(async () => {
    if (!conflict) return;
    setConflictBusy(true);
    try {
      const latest = conflict.latest;
      const res =
        latest !== null
          ? (await qc.fetchQuery({ queryKey: keys.revision(designId, latest), queryFn: ({ signal }) => callApi('GET /api/designs/:designId/revisions/:number', { params: { designId, number: String(latest) }, signal }) })).revision
          : (await qc.fetchQuery({ queryKey: keys.design(designId), queryFn: ({ signal }) => callApi('GET /api/designs/:designId', { params: { designId }, signal }), staleTime: 0 })).revision;
      setConflict({ latest: res.number, comparison: compareDocuments(editor.getState().document, res.document) });
    } catch (e) {
      setNotice({ tone: 'error', text: formError(e) ?? 'The latest revision could not be loaded.' });
    } finally {
      setConflictBusy(false);
    }
  }, [conflict, qc, designId, editor]);

  const importFile = useCallback(
    async (file: File) => {
      const text = await file.text();
      const res = importDesignFile(file.name, text);
      if (!res.ok) return setNotice({ tone: 'error', text: `Could not import ${file.name}: ${res.reason}` });
      editor.getState().replaceDocument(res.document);
      setNotice({ tone: 'info', text: `Imported ${file.name}${res.warnings.length ? ` — ${res.warnings.join(' ')}` : ''}. Undo brings the previous drawing back.` });
      window.requestAnimationFrame(() => void flow.fitView({ padding: 0.15 }));
    },
    [editor, flow],
  );

  const closeHelp = useCallback(() => setHelp(false), []);

  const actions: ToolbarActions = {
    undo: () => editor.getState().undo(),
    redo: () => editor.getState().redo(),
    deleteSelection: () => editor.getState().deleteSelection(),
    copy: () => {
      const r = editor.getState().copy();
      if (r.ok) setNotice({ tone: 'info', text: `Copied ${editor.getState().clipboard?.blocks.length ?? 0} block(s).` });
    },
    paste: () => editor.getState().paste(),
    fitView: () => void flow.fitView({ padding: 0.15, duration: 200 }),
    toggleDcLabels: () => setDcLabels((v) => !v),
    openHelp: () => setHelp(true),
    appendStages: (n) => {
      const r = editor.getState().appendStages(n);
      if (!r.ok) return;
      setNotice({ tone: 'info', text: `Added ${n} stage(s).` });
      window.requestAnimationFrame(() => void flow.fitView({ padding: 0.15, duration: 200 }));
    },
    loadStarter: (kind, n) => {
      const r = editor.getState().loadStarter(kind, n);
      if (r.ok) window.requestAnimationFrame(() => void flow.fitView({ padding: 0.15 }));
    },
    importFile: (f) => void importFile(f),
    exportNetlist: () => {
      const r = exportNetlistText(editor.getState().document, { title });
      if (r.ok) downloadText(`${slug(title)}.cir`, r.text, 'text/plain');
      else setNotice({ tone: 'error', text: `No netlist: ${r.reason}` });
    },
    exportJson: () => downloadText(`${slug(title)}.json`, exportDesignJson(editor.getState().document, { title }), 'application/json'),
    exportImage: (f) => void exportImage(f),
    openSave: () => setSaving(true),
  };

  useShortcuts(active && !help, {
    undo: actions.undo,
    redo: actions.redo,
    delete: actions.deleteSelection,
    copy: actions.copy,
    paste: actions.paste,
    selectAll: () => editor.getState().selectAll(),
    clearSelection: () => editor.getState().clearSelection(),
    fitView: actions.fitView,
    zoomIn: () => void flow.zoomIn({ duration: 150 }),
    zoomOut: () => void flow.zoomOut({ duration: 150 }),
    toggleDcLabels: actions.toggleDcLabels,
    save: () => !readOnly && dirty && setSaving(true),
    help: () => setHelp(true),
  });

  return (
    <div className="space-y-2" data-testid="design-editor" data-mode={mode} data-version={version} data-dirty={dirty ? 'true' : 'false'}>
      {readOnly ? (
        <div role="status" data-testid="read-only-banner" className="rounded-md border border-copper-600 bg-copper-800/30 px-3 py-2 text-sm text-copper-100">
          {mode === 'revision'
            ? `You are looking at r${revisionNumber}, an older revision: it opens read-only. Pick the latest revision to get back to the working copy${canFork ? ', or fork from here' : ''}.`
            : readOnlyReason === 'archived'
              ? `Read-only: this design is archived. Unarchive it to edit${canFork ? ', or fork it' : ''}.`
              : readOnlyReason === 'viewing'
                ? `Viewing a colleague's design, read-only.${canFork ? ' Fork it to try a variant of your own, or choose “Edit here” to change it for everyone.' : ''}`
              : `Read-only: your role on this team lets you view, hover and export this design, not change it.${canFork ? ' Fork it to make your own editable copy.' : ''}`}
        </div>
      ) : null}
      {autosave.offer ? (
        <div role="status" data-testid="autosave-offer" className="flex flex-wrap items-center gap-2 rounded-md border border-lagoon-600 bg-lagoon-800/30 px-3 py-2 text-sm text-lagoon-100">
          <span className="mr-auto">
            Unsaved work from {formatDateTime(autosave.offer.savedAt)} was kept in this browser (started from r{autosave.offer.baseRevision}
            {autosave.offer.baseRevision !== revisionNumber ? `; the latest is r${revisionNumber}` : ''}).
          </span>
          <button type="button" onClick={autosave.restore} data-testid="autosave-restore" className="rounded-md bg-lagoon-600 px-2.5 py-1 text-xs text-ink-50 hover:bg-lagoon-400 hover:text-ink-900">
            Restore it
          </button>
          <button type="button" onClick={autosave.discard} data-testid="autosave-discard" className="rounded-md border border-ink-600 px-2.5 py-1 text-xs text-ink-100 hover:border-ink-400">
            Discard
          </button>
        </div>
      ) : null}
      {conflict ? <ConflictBanner latest={conflict.latest} comparison={conflict.comparison} busy={conflictBusy} onReload={() => void reloadLatest()} onCompare={() => void compareLatest()} /> : null}

      <EditorToolbar actions={actions} dcLabels={dcLabels} canSave={working && dirty} saving={save.isPending} />
      {saving && !readOnly ? <SaveForm onSave={doSave} onCancel={() => setSaving(false)} pending={save.isPending} /> : null}

      <div className="flex flex-wrap items-center gap-2">
        <TopologyBadge snapshot={snapshot} empty={document.blocks.length === 0} />
        <EngineStatusPill snapshot={snapshot} empty={document.blocks.length === 0} />
        {working && !readOnly ? (
          <span className="text-xs text-ink-400" data-testid="save-state">
            {dirty ? `Unsaved changes on r${baseRevision} (kept in this browser)` : `Saved as r${baseRevision}`}
          </span>
        ) : null}
        {notice ? (
          <span role={notice.tone === 'error' ? 'alert' : 'status'} data-testid="editor-notice" className={`text-xs ${notice.tone === 'error' ? 'text-hazard-100' : 'text-ink-200'}`}>
            {notice.text}
            <button type="button" onClick={() => setNotice(null)} className="ml-1 rounded px-1 text-ink-400 hover:text-ink-100" aria-label="Dismiss message">
              ×
            </button>
          </span>
        ) : null}
      </div>

      <div className={`grid gap-3 ${readOnly ? 'lg:grid-cols-[1fr_26rem]' : 'lg:grid-cols-[11rem_1fr_26rem]'}`}>
        {!readOnly ? (
          <aside className="max-h-[78vh] overflow-y-auto rounded-lg border border-ink-800 bg-ink-800/40 p-2">
            <BlockTrayMemo onAdd={addAtCentre} />
          </aside>
        ) : null}
        <div className="min-w-0 space-y-2">
          <div className="relative h-[66vh] min-h-[28rem] overflow-hidden rounded-lg border border-ink-800" ref={canvasBox}>
            <EditorCanvas snapshot={snapshot} showDcLabels={dcLabels} designId={designId} />
            {lastRefusal ? (
              <div role="alert" data-testid="refusal-message" className="absolute left-1/2 top-3 z-10 flex max-w-[90%] -translate-x-1/2 items-start gap-2 rounded-md border border-hazard-700 bg-ink-900/95 px-3 py-2 text-sm text-hazard-100 shadow-lg">
                <span>{lastRefusal}</span>
                <button type="button" onClick={() => editor.getState().clearRefusal()} className="rounded px-1 text-ink-400 hover:text-ink-100" aria-label="Dismiss">
                  ×
                </button>
              </div>
            ) : null}
          </div>
          <section aria-label="Diagnostics" className="max-h-40 overflow-y-auto rounded-lg border border-ink-800 bg-ink-800/40 px-3 py-2">
            <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-ink-400">Diagnostics</h3>
            <DiagnosticsListMemo snapshot={snapshot} onFocusBlock={focusBlock} />
          </section>
        </div>
        <aside className="max-h-[78vh] space-y-3 overflow-y-auto rounded-lg border border-ink-800 bg-ink-800/40 p-3" aria-label="Inspector and results">
          <section aria-label="Inspector">
            <SelectionInspector />
          </section>
          <ResultsPanelMemo snapshot={snapshot} selectedNodes={selectedNodes} onSelectNodes={setSelectedNodes} onFocusBlock={focusBlock} />
        </aside>
      </div>
      <HoverLayer snapshot={snapshot} document={document} />
      <HelpSheetMemo open={help} onClose={closeHelp} />
    </div>
  );
}
