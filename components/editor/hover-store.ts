'use client';
/**
 * What the pointer is over on the canvas, kept in its own small store so pointer moves re-render
 * only the hover card, never the canvas. A port or a wire names a net (node reading); a block
 * body names a part (stress card). Coordinates are the pointer's, in viewport px. The port
 * armed with Enter (keyboard wiring) lives here too: it is canvas interaction, not document.
 */
import { createContext, useContext } from 'react';
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { PortKey } from '@/lib/editor/types';

export interface HoverState {
  /** Port under the pointer (a handle, or a wire's first end). */
  port: PortKey | null;
  /** Block whose body is under the pointer. */
  block: string | null;
  x: number;
  y: number;
  /** Port picked with Enter as the first end of a keyboard-drawn wire. */
  armed: PortKey | null;
  arm(port: PortKey | null): void;
  setPort(port: PortKey | null, at?: { x: number; y: number }): void;
  setBlock(block: string | null, at?: { x: number; y: number }): void;
  move(x: number, y: number): void;
}

export type HoverStore = StoreApi<HoverState>;

export function createHoverStore(): HoverStore {
  return createStore<HoverState>()((set, get) => ({
    port: null,
    block: null,
    x: 0,
    y: 0,
    armed: null,
    arm(port) {
      if (port !== get().armed) set({ armed: port });
    },
    setPort(port, at) {
      if (port === get().port && !at) return;
      set({ port, ...(at ?? {}) });
    },
    setBlock(block, at) {
      if (block === get().block && !at) return;
      set({ block, ...(at ?? {}) });
    },
    move(x, y) {
      const s = get();
      if (s.port === null && s.block === null) return;
      if (s.x !== x || s.y !== y) set({ x, y });
    },
  }));
}

export const HoverContext = createContext<HoverStore | null>(null);

export function useHoverApi(): HoverStore {
  const h = useContext(HoverContext);
  if (!h) throw new Error('useHoverApi must be used inside the canvas');
  return h;
}
