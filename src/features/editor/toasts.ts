/** Short-lived editor messages (connection warnings, paste, arrange). UI state only, not the document. */
import { create } from 'zustand';
import type { Signal } from '@/components/Notice';

export interface Toast {
  id: number;
  signal: Signal;
  text: string;
}

interface ToastState {
  toasts: Toast[];
  push: (signal: Signal, text: string) => void;
  dismiss: (id: number) => void;
}

let next = 1;
const LIFETIME_MS = 7000;

export const useToasts = create<ToastState>()((set, get) => ({
  toasts: [],
  push: (signal, text) => {
    const id = next++;
    set({ toasts: [...get().toasts.slice(-3), { id, signal, text }] });
    setTimeout(() => get().dismiss(id), LIFETIME_MS);
  },
  dismiss: (id) => set({ toasts: get().toasts.filter((t) => t.id !== id) }),
}));

export const toast = (signal: Signal, text: string) => useToasts.getState().push(signal, text);
