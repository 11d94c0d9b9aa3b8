/** Small pieces the analysis panels share: collapsible sections, part links, figures, bars. */
import { useId, useState, type ReactNode } from 'react';
import { ChevronDownIcon, ChevronRightIcon, ErrorIcon, WarningIcon } from '@/components/icons';
import { useEditorStore } from '../store';

export const fmtA = (a: number) => `${Math.abs(a) >= 1000 ? a.toFixed(0) : Math.abs(a) >= 100 ? a.toFixed(0) : a.toFixed(1)} A`;
export const fmtV = (v: number, digits = 2) => `${v.toFixed(digits)} V`;
export const fmtW = (w: number) => `${Math.abs(w) >= 100 ? w.toFixed(0) : w.toFixed(1)} W`;
export const fmtPct = (p: number, digits = 1) => `${p.toFixed(digits)} %`;
export const fmtPp = (p: number) => (Math.abs(p) < 0.05 ? '0.0 pp' : `${p > 0 ? '+' : '−'}${Math.abs(p).toFixed(1)} pp`);
export const fmtAh = (ah: number) => `${ah >= 100 ? ah.toFixed(0) : ah.toFixed(1)} Ah`;
export const fmtKA = (a: number) => (Math.abs(a) >= 10_000 ? `${(a / 1000).toFixed(1)} kA` : Math.abs(a) >= 1000 ? `${(a / 1000).toFixed(2)} kA` : fmtA(a));

export function Section({ title, defaultOpen = true, children, aside }: { title: string; defaultOpen?: boolean; children: ReactNode; aside?: ReactNode }) {
  const [open, setOpen] = useState(defaultOpen);
  const id = useId();
  const Chevron = open ? ChevronDownIcon : ChevronRightIcon;
  return (
    <section className="border-t border-graphite-200 pt-2" aria-labelledby={`${id}-h`}>
      <h3 id={`${id}-h`} className="flex items-center gap-1">
        <button
          type="button"
          aria-expanded={open}
          aria-controls={`${id}-body`}
          onClick={() => setOpen((o) => !o)}
          className="-ml-1 flex flex-1 items-center gap-1 rounded px-1 py-0.5 text-left text-[13px] font-semibold text-graphite-900 hover:bg-graphite-50"
        >
          <Chevron size={14} className="shrink-0 text-graphite-500" />
          {title}
        </button>
        {aside}
      </h3>
      {open ? (
        <div id={`${id}-body`} className="mt-1.5 space-y-2">
          {children}
        </div>
      ) : null}
    </section>
  );
}

/** A part or cable name that selects and frames it on the canvas. */
export function PartLink({ id, children }: { id: string; children: ReactNode }) {
  const focusParts = useEditorStore((s) => s.focusParts);
  return (
    <button type="button" className="max-w-full truncate text-left text-graphite-900 underline decoration-graphite-300 underline-offset-2 hover:decoration-copper-500" onClick={() => focusParts([id])}>
      {children}
    </button>
  );
}

/** A horizontal bar for a share or loading; `marker` draws a tick (e.g. the ideal share). Decorative: the number beside it carries the value. */
export function Bar({ fraction, marker, over = false }: { fraction: number; marker?: number; over?: boolean }) {
  const w = Math.max(0, Math.min(1, fraction)) * 100;
  return (
    <span aria-hidden="true" className="relative inline-block h-2 w-full min-w-6 overflow-hidden rounded-sm bg-graphite-100 align-middle">
      <span className={`absolute inset-y-0 left-0 ${over ? 'bg-fault-600' : 'bg-copper-400'}`} style={{ width: `${w}%` }} />
      {marker !== undefined ? <span className="absolute inset-y-[-1px] w-px bg-graphite-800" style={{ left: `${Math.max(0, Math.min(1, marker)) * 100}%` }} /> : null}
    </span>
  );
}

/** Loading against a limit: the number, and above 100 % an icon and the word "over" (not colour alone). */
export function Loading({ pct, warnAt = 80 }: { pct: number | null | undefined; warnAt?: number }) {
  if (pct === null || pct === undefined) return <span className="text-graphite-400">—</span>;
  if (pct > 100)
    return (
      <span className="inline-flex items-center gap-0.5 font-semibold text-fault-700">
        <ErrorIcon size={11} />
        {pct.toFixed(0)} % (over)
      </span>
    );
  if (pct >= warnAt)
    return (
      <span className="inline-flex items-center gap-0.5 text-caution-700">
        <WarningIcon size={11} />
        {pct.toFixed(0)} %
      </span>
    );
  return <span>{pct.toFixed(0)} %</span>;
}

export const tableClass = 'w-full table-fixed border-collapse text-[11px] tabular-nums [&_td]:py-0.5 [&_th]:py-0.5 [&_th]:font-medium [&_th]:text-graphite-500 [&_thead_tr]:border-b [&_thead_tr]:border-graphite-200 [&_tbody_tr]:border-b [&_tbody_tr]:border-graphite-100';

export function Figures({ rows }: { rows: [string, ReactNode][] }) {
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-[12px]">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          {/* A key starting with spaces is a sub-item of the row above. */}
          <dt className={k.startsWith(' ') ? 'pl-3 text-graphite-500' : 'text-graphite-600'}>{k.trim()}</dt>
          <dd className="text-right font-medium tabular-nums text-graphite-900">{v}</dd>
        </div>
      ))}
    </dl>
  );
}
