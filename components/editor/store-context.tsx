'use client';
/**
 * One editor store per mounted editor, handed down by context (never module-global), and the
 * selector hooks the canvas parts read it with.
 */
import { createContext, useContext, useState, type ReactNode } from 'react';
import { useStore } from 'zustand';
import { createEditorStore, type EditorState, type EditorStore } from '@/lib/editor/store';
import type { DesignDocument } from '@/lib/circuit/document/schema';

const EditorStoreContext = createContext<EditorStore | null>(null);

/** Creates the store once for this mount from the first `document`/`readOnly` it is given. */
export function EditorStoreProvider({ document, readOnly, children }: { document: DesignDocument; readOnly: boolean; children: ReactNode }) {
  const [store] = useState(() => createEditorStore({ document, readOnly }));
  return <EditorStoreContext.Provider value={store}>{children}</EditorStoreContext.Provider>;
}

/** The store itself, for actions and `getState()` in event handlers. */
export function useEditorApi(): EditorStore {
  const store = useContext(EditorStoreContext);
  if (!store) throw new Error('useEditorApi must be used inside <EditorStoreProvider>');
  return store;
}

/** A narrow, re-rendering read of the store; keep selectors returning stable values. */
export function useEditor<T>(selector: (s: EditorState) => T): T {
  return useStore(useEditorApi(), selector);
}
