/**
 * What React Flow needs from the browser that jsdom lacks: ResizeObserver (firing asynchronously),
 * DOMMatrixReadOnly, element sizes and SVG bounding boxes. Import this first in editor tests.
 */
import { emptyDiagram, type DiagramDocument } from '@shared/diagram';
import { useEditorStore } from '@/features/editor/store';

class ResizeObserverMock {
  private cb: ResizeObserverCallback;
  constructor(cb: ResizeObserverCallback) {
    this.cb = cb;
  }
  observe(target: Element) {
    setTimeout(() => this.cb([{ target, contentRect: target.getBoundingClientRect() } as unknown as ResizeObserverEntry], this as unknown as ResizeObserver), 0);
  }
  unobserve() {}
  disconnect() {}
}

class DOMMatrixReadOnlyMock {
  m22: number;
  constructor(transform?: string) {
    const scale = transform?.match(/scale\(([1-9.])\)/)?.[1];
    this.m22 = scale !== undefined ? Number(scale) : 1;
  }
}

export function installFlowMocks() {
  globalThis.ResizeObserver = ResizeObserverMock as unknown as typeof ResizeObserver;
  (globalThis as unknown as { DOMMatrixReadOnly: unknown }).DOMMatrixReadOnly = DOMMatrixReadOnlyMock;
  Object.defineProperties(HTMLElement.prototype, {
    offsetHeight: { configurable: true, get() { return Number.parseFloat((this as HTMLElement).style.height) || 1; } },
    offsetWidth: { configurable: true, get() { return Number.parseFloat((this as HTMLElement).style.width) || 1; } },
  });
  (SVGElement.prototype as unknown as { getBBox: () => DOMRect }).getBBox = () => ({ x: 0, y: 0, width: 0, height: 0 }) as DOMRect;
}

installFlowMocks();

/** Reset the editor store to a document, editable, in a unit system. */
export function resetEditor(doc: DiagramDocument = emptyDiagram(), opts: { readOnly?: boolean; unitSystem?: 'metric' | 'us' } = {}) {
  useEditorStore.getState().load(doc, { diagramId: 'd-test', readOnly: opts.readOnly ?? false, unitSystem: opts.unitSystem ?? 'metric' });
  useEditorStore.setState({ clipboard: null, pasteCount: 0 });
}

export const editor = () => useEditorStore.getState();
