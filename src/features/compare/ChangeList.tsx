/** The legend of diff marks and the list of changes; clicking a change frames it in both canvases. */
import { STATUS_TEXT, statusCounts, type ChangeItem, type DiffStatus } from './marks';

const ORDER: DiffStatus[] = ['added', 'removed', 'moved', 'changed'];

const OUTLINE: Record<DiffStatus, string> = {
  added: 'solid outline',
  removed: 'dashed outline',
  moved: 'dotted outline',
  changed: 'double outline',
};

export function Legend({ items }: { items: ChangeItem[] }) {
  const counts = statusCounts(items);
  return (
    <ul aria-label="Legend" className="flex flex-wrap items-center gap-x-4 gap-y-1 text-[12px] text-graphite-700">
      {ORDER.map((s) => (
        <li key={s} className="flex items-center gap-1.5" data-testid={`legend-${s}`}>
          <span className={`bw-swatch bw-swatch-${s}`} aria-hidden="true" />
          <span className={`bw-diff-tag bw-diff-tag-${s}`}>
            <span aria-hidden="true" className="bw-diff-glyph">{STATUS_TEXT[s].glyph}</span>
            {STATUS_TEXT[s].word}
          </span>
          <span className="text-graphite-500">
            {OUTLINE[s]} · <span className="font-mono">{counts[s]}</span>
          </span>
        </li>
      ))}
    </ul>
  );
}

export function ChangeList({ items, activeKey, onSelect }: { items: ChangeItem[]; activeKey: string | null; onSelect: (item: ChangeItem) => void }) {
  if (items.length === 0) {
    return <p className="rounded-md border border-dashed border-graphite-300 px-3 py-4 text-center text-[13px] text-graphite-600">The two versions are the same.</p>;
  }
  return (
    <ol aria-label="Changes" className="divide-y divide-graphite-100 rounded-md border border-graphite-200 bg-white">
      {items.map((item) => {
        const t = STATUS_TEXT[item.status];
        const active = item.key === activeKey;
        return (
          <li key={item.key}>
            <button
              type="button"
              onClick={() => onSelect(item)}
              aria-current={active || undefined}
              disabled={item.frame.length === 0 && item.kind !== 'part' && item.kind !== 'cable'}
              className={`flex w-full items-start gap-2 px-3 py-2 text-left hover:bg-graphite-50 disabled:cursor-default disabled:hover:bg-transparent ${active ? 'bg-copper-50' : ''}`}
            >
              <span className={`bw-diff-tag bw-diff-tag-${item.status} mt-px`}>
                <span aria-hidden="true" className="bw-diff-glyph">{t.glyph}</span>
                {t.word}
              </span>
              <span className="min-w-0 flex-1">
                <span className="block text-[13px] font-medium text-graphite-900">{item.title}</span>
                {item.details.length ? (
                  <ul className="mt-0.5 space-y-0.5 text-[12px] text-graphite-600">
                    {item.details.map((d) => (
                      <li key={d}>{d}</li>
                    ))}
                  </ul>
                ) : null}
              </span>
            </button>
          </li>
        );
      })}
    </ol>
  );
}
