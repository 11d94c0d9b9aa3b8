/**
 * The editor's "?" help: a short, illustrated how-to for the three main jobs — trying take-off points,
 * comparing and signing off a revision, briefing a crew — and the keyboard shortcuts. The pictures are
 * small inline drawings in the product's own symbols (batteries, leads, sheets), not screenshots.
 */
import { useId, useRef, useState, type KeyboardEvent, type ReactNode } from 'react';
import { Dialog } from '@/components/Dialog';

export type HelpTopic = 'takeoff' | 'signoff' | 'briefing' | 'keys';

interface Step {
  title: string;
  text: ReactNode;
  /** A small drawing; its aria-label says what it shows. */
  picture: ReactNode;
}

// Drawing helpers: one 120 × 64 viewBox per picture, strokes in currentColor, copper for what matters.
const COPPER = 'var(--color-copper-600, #b45f2a)';
const OK = 'var(--color-ok-700, #2f7a3a)';
const MUTED = 'var(--color-graphite-400, #9aa1a9)';

function Picture({ alt, children }: { alt: string; children: ReactNode }) {
  return (
    <svg viewBox="0 0 120 64" width={120} height={64} role="img" aria-label={alt} className="shrink-0 rounded border border-graphite-200 bg-white text-graphite-700" focusable="false">
      {children}
    </svg>
  );
}

/** A battery as the canvas draws it: a box with + and − posts. */
function Battery({ x, y, w = 20, h = 14 }: { x: number; y: number; w?: number; h?: number }) {
  return (
    <g>
      <rect x={x} y={y} width={w} height={h} rx={2} fill="white" stroke="currentColor" strokeWidth={1.4} />
      <circle cx={x + 5} cy={y} r={1.8} fill="currentColor" />
      <circle cx={x + w - 5} cy={y} r={1.8} fill="currentColor" />
      <text x={x + 3} y={y - 3} fontSize={6} fill="currentColor">+</text>
      <text x={x + w - 7} y={y - 3} fontSize={6} fill="currentColor">−</text>
    </g>
  );
}

function Bank({ y = 34 }: { y?: number }) {
  return (
    <>
      {[8, 36, 64, 92].map((x) => (
        <Battery key={x} x={x} y={y} />
      ))}
      {/* Jumpers, post to post */}
      <path d={`M13 ${y} q14 -6 28 0 M41 ${y} q14 -6 28 0 M69 ${y} q14 -6 28 0`} fill="none" stroke={MUTED} strokeWidth={1.2} />
    </>
  );
}

function Sheet({ x, y, label, mark }: { x: number; y: number; label: string; mark?: boolean }) {
  return (
    <g>
      <rect x={x} y={y} width={30} height={38} rx={1.5} fill="white" stroke="currentColor" strokeWidth={1.3} />
      <path d={`M${x + 4} ${y + 8}h22M${x + 4} ${y + 14}h16M${x + 4} ${y + 20}h19`} stroke={MUTED} strokeWidth={1.2} />
      {mark ? <rect x={x + 14} y={y + 24} width={10} height={8} rx={1} fill="none" stroke={COPPER} strokeWidth={1.6} /> : null}
      <text x={x + 3} y={y + 35} fontSize={6} fill="currentColor">{label}</text>
    </g>
  );
}

const TAKEOFF: Step[] = [
  {
    title: 'Open the take-off explorer',
    text: (
      <>
        Draw the bank (or start from a template), then open <strong>Analysis</strong> in the side panel. The explorer lists every pair of
        batteries the main leads could land on, and each run length, with the imbalance each one gives.
      </>
    ),
    picture: (
      <Picture alt="Four batteries jumpered post to post; the positive main lead on the first battery, the negative on the last.">
        <Bank />
        <path d="M13 34V10h30" fill="none" stroke={COPPER} strokeWidth={2} />
        <path d="M107 34V10H77" fill="none" stroke="currentColor" strokeWidth={2} />
        <text x={48} y={13} fontSize={7} fill="currentColor">load</text>
      </Picture>
    ),
  },
  {
    title: 'Preview a layout',
    text: (
      <>
        Choose a line, or <strong>Suggest</strong> for the best one. The canvas shows where each lead would move as a dashed ghost; the
        drawing itself does not change yet.
      </>
    ),
    picture: (
      <Picture alt="The same bank with the positive lead shown dashed, moved to the second battery.">
        <Bank />
        <path d="M13 34V10h30" fill="none" stroke={MUTED} strokeWidth={1.5} />
        <path d="M41 34V16h14" fill="none" stroke={COPPER} strokeWidth={2} strokeDasharray="4 3" />
        <path d="M107 34V10H77" fill="none" stroke="currentColor" strokeWidth={2} />
      </Picture>
    ),
  },
  {
    title: 'Read the shares before → after',
    text: (
      <>
        The preview lists each battery's share of the current, the loading of every changed cable and fuse, and the findings that appear or
        clear. The battery on the shortest path works hardest; aim for even shares.
      </>
    ),
    picture: (
      <Picture alt="Bar chart: four uneven battery shares before, four nearly even shares after.">
        {[34, 24, 18, 14].map((h, i) => (
          <rect key={`a${i}`} x={8 + i * 10} y={54 - h} width={7} height={h} fill={MUTED} />
        ))}
        <path d="M52 34h12m-4 -4 4 4-4 4" fill="none" stroke="currentColor" strokeWidth={1.4} />
        {[22, 23, 22, 21].map((h, i) => (
          <rect key={`b${i}`} x={72 + i * 10} y={54 - h} width={7} height={h} fill={COPPER} />
        ))}
        <path d="M6 55h108" stroke="currentColor" strokeWidth={1} />
      </Picture>
    ),
  },
  {
    title: 'Apply it, or keep what you have',
    text: (
      <>
        <strong>Apply this layout</strong> is offered only when the layout adds no error and overloads nothing. It is one step:{' '}
        <kbd>Ctrl+Z</kbd> puts the leads back.
      </>
    ),
    picture: (
      <Picture alt="A tick beside the bank: the checked layout applied.">
        <Bank y={40} />
        <path d="M41 40V22" fill="none" stroke={COPPER} strokeWidth={2} />
        <path d="M80 12l6 6 12-12" fill="none" stroke={OK} strokeWidth={3} strokeLinecap="round" />
      </Picture>
    ),
  },
];

const SIGNOFF: Step[] = [
  {
    title: 'Save a revision',
    text: (
      <>
        <strong>Save revision…</strong> with a line on what changed. A revision never changes afterwards: its content, results and hash are
        kept as saved.
      </>
    ),
    picture: (
      <Picture alt="A stack of numbered drawing sheets, r1 to r3.">
        <Sheet x={20} y={18} label="r1" />
        <Sheet x={34} y={12} label="r2" />
        <Sheet x={48} y={6} label="r3" />
      </Picture>
    ),
  },
  {
    title: 'Compare two revisions',
    text: (
      <>
        In <strong>History</strong>, tick two revisions and <strong>Compare selected</strong> (or compare the latest with the working copy).
        Changed parts are marked on both drawings, with a results table and the bill-of-materials changes.
      </>
    ),
    picture: (
      <Picture alt="Two sheets side by side, the same part marked in copper on both.">
        <Sheet x={18} y={12} label="r2" mark />
        <path d="M54 31h10m-4 -4 4 4-4 4" fill="none" stroke="currentColor" strokeWidth={1.4} />
        <Sheet x={70} y={12} label="r3" mark />
      </Picture>
    ),
  },
  {
    title: 'Ask for a review',
    text: (
      <>
        <strong>Request review…</strong> names the reviewers; each is told (in the app, and by e-mail when mail is set up). The revision
        shows <em>In review</em>.
      </>
    ),
    picture: (
      <Picture alt="A sheet passed to a reviewer.">
        <Sheet x={14} y={12} label="r3" />
        <path d="M50 31h18m-4 -4 4 4-4 4" fill="none" stroke={COPPER} strokeWidth={1.6} />
        <circle cx={90} cy={22} r={7} fill="none" stroke="currentColor" strokeWidth={1.5} />
        <path d="M77 48c2-10 24-10 26 0" fill="none" stroke="currentColor" strokeWidth={1.5} />
      </Picture>
    ),
  },
  {
    title: 'Comment, then approve or request changes',
    text: (
      <>
        The reviewer pins comments to parts, then <strong>Approve</strong> or <strong>Request changes</strong> with a note. An approved revision
        is locked; a change means a new revision and a new review. Approval is a review of the design, not approval to install.
      </>
    ),
    picture: (
      <Picture alt="A sheet with a comment pin, a tick and a padlock.">
        <Sheet x={14} y={12} label="r3" />
        <path d="M36 20h14v9h-8l-4 4v-4h-2z" fill="white" stroke={COPPER} strokeWidth={1.3} />
        <path d="M62 32l6 6 12-12" fill="none" stroke={OK} strokeWidth={3} strokeLinecap="round" />
        <rect x={90} y={30} width={16} height={12} rx={2} fill="none" stroke="currentColor" strokeWidth={1.5} />
        <path d="M93 30v-4a5 5 0 0 1 10 0v4" fill="none" stroke="currentColor" strokeWidth={1.5} />
      </Picture>
    ),
  },
];

const BRIEFING: Step[] = [
  {
    title: 'Mark up the drawing',
    text: (
      <>
        <strong>Annotations → Edit annotations…</strong>: callouts on parts, numbered steps in the order of the job, notes and highlights. They
        sit on their own layer; the electrical model is untouched.
      </>
    ),
    picture: (
      <Picture alt="A battery with numbered steps 1 and 2 and a callout.">
        <Battery x={40} y={30} w={34} h={20} />
        {[
          [30, 20, '1'],
          [86, 20, '2'],
        ].map(([cx, cy, n]) => (
          <g key={String(n)}>
            <circle cx={Number(cx)} cy={Number(cy)} r={6} fill={COPPER} />
            <text x={Number(cx) - 2} y={Number(cy) + 2.5} fontSize={7} fill="white">{n}</text>
          </g>
        ))}
        <path d="M96 40h16v10H96z" fill="white" stroke="currentColor" strokeWidth={1.2} />
        <path d="M96 45l-20 0" stroke="currentColor" strokeWidth={1} />
      </Picture>
    ),
  },
  {
    title: 'Export the sheet',
    text: (
      <>
        <strong>Export…</strong>: the whole drawing as PNG or SVG on a sheet with title block, legend, the safety caution and a “not reviewed”
        mark until the revision is approved.
      </>
    ),
    picture: (
      <Picture alt="A landscape sheet with a drawing area and a title block in the corner.">
        <rect x={12} y={8} width={96} height={48} rx={1.5} fill="white" stroke="currentColor" strokeWidth={1.4} />
        <Battery x={22} y={24} w={14} h={10} />
        <Battery x={42} y={24} w={14} h={10} />
        <rect x={78} y={40} width={28} height={14} fill="none" stroke={COPPER} strokeWidth={1.4} />
        <path d="M80 45h20M80 50h14" stroke={MUTED} strokeWidth={1} />
      </Picture>
    ),
  },
  {
    title: 'Print the briefing pack',
    text: (
      <>
        <strong>Export… → Print view…</strong> puts the drawing, the bill of materials and the findings on landscape pages; print, or save as
        PDF.
      </>
    ),
    picture: (
      <Picture alt="Three pages: drawing, bill of materials, findings.">
        <Sheet x={10} y={14} label="" />
        <Sheet x={45} y={14} label="" />
        <Sheet x={80} y={14} label="" />
      </Picture>
    ),
  },
  {
    title: 'Hand over the lists',
    text: (
      <>
        <strong>BOM → Download CSV</strong> for the stores (each part by its label on the drawing) and <strong>Cut list CSV</strong> for the
        cutting bench: every cable's length to cut, with lugs counted two per cable.
      </>
    ),
    picture: (
      <Picture alt="A table of parts and a cable with a lug at each end.">
        <rect x={8} y={10} width={52} height={44} fill="white" stroke="currentColor" strokeWidth={1.3} />
        <path d="M8 21h52M8 32h52M8 43h52M30 10v44" stroke={MUTED} strokeWidth={1} />
        <path d="M72 32h34" stroke={COPPER} strokeWidth={4} strokeLinecap="round" />
        <circle cx={70} cy={32} r={3.5} fill="white" stroke="currentColor" strokeWidth={1.4} />
        <circle cx={108} cy={32} r={3.5} fill="white" stroke="currentColor" strokeWidth={1.4} />
      </Picture>
    ),
  },
];

export const HOW_TO: { id: Exclude<HelpTopic, 'keys'>; label: string; intro: string; steps: Step[] }[] = [
  { id: 'takeoff', label: 'Try take-off points', intro: 'Where the main leads land decides how evenly the batteries share the load.', steps: TAKEOFF },
  { id: 'signoff', label: 'Compare and sign off', intro: 'A design goes to the crew once a reviewer has approved a saved revision.', steps: SIGNOFF },
  { id: 'briefing', label: 'Brief a crew', intro: 'Give the installers a marked-up drawing, the materials and the cut list.', steps: BRIEFING },
];

function Steps({ steps }: { steps: Step[] }) {
  return (
    <ol className="space-y-3">
      {steps.map((s, i) => (
        <li key={s.title} className="flex gap-3">
          {s.picture}
          <div className="min-w-0 text-[13px]">
            <p className="font-semibold text-graphite-900">
              {i + 1}. {s.title}
            </p>
            <p className="mt-0.5 text-graphite-700">{s.text}</p>
          </div>
        </li>
      ))}
    </ol>
  );
}

export function HowToDialog({
  open,
  onClose,
  shortcuts,
  initialTopic = 'takeoff',
}: {
  open: boolean;
  onClose: () => void;
  shortcuts: { keys: string; what: string }[];
  initialTopic?: HelpTopic;
}) {
  const [topic, setTopic] = useState<HelpTopic>(initialTopic);
  const base = useId();
  const refs = useRef<Record<string, HTMLButtonElement | null>>({});
  const tabs: { id: HelpTopic; label: string }[] = [...HOW_TO.map((h) => ({ id: h.id, label: h.label })), { id: 'keys', label: 'Keyboard shortcuts' }];
  const onKeyDown = (e: KeyboardEvent) => {
    const i = tabs.findIndex((t) => t.id === topic);
    const next = e.key === 'ArrowRight' ? (i + 1) % tabs.length : e.key === 'ArrowLeft' ? (i + tabs.length - 1) % tabs.length : e.key === 'Home' ? 0 : e.key === 'End' ? tabs.length - 1 : -1;
    if (next < 0) return;
    e.preventDefault();
    setTopic(tabs[next].id);
    refs.current[tabs[next].id]?.focus();
  };
  const job = HOW_TO.find((h) => h.id === topic);
  return (
    <Dialog open={open} onClose={onClose} title="How to" description="The three main jobs, step by step, and the keyboard shortcuts." width="max-w-2xl">
      <div role="tablist" aria-label="Help topics" className="mb-3 flex flex-wrap gap-1 border-b border-graphite-200" onKeyDown={onKeyDown}>
        {tabs.map((t) => (
          <button
            key={t.id}
            ref={(el) => {
              refs.current[t.id] = el;
            }}
            type="button"
            role="tab"
            id={`${base}-${t.id}`}
            aria-selected={topic === t.id}
            aria-controls={`${base}-panel`}
            tabIndex={topic === t.id ? 0 : -1}
            onClick={() => setTopic(t.id)}
            className={`-mb-px border-b-2 px-2.5 py-1.5 text-[13px] font-medium ${topic === t.id ? 'border-copper-600 text-graphite-950' : 'border-transparent text-graphite-600 hover:text-graphite-900'}`}
          >
            {t.label}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`${base}-panel`} aria-labelledby={`${base}-${topic}`} className="max-h-[60vh] overflow-y-auto pr-1" tabIndex={0}>
        {job ? (
          <>
            <p className="mb-3 text-[13px] text-graphite-600">{job.intro}</p>
            <Steps steps={job.steps} />
          </>
        ) : (
          <>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1.5 text-[13px]">
              {shortcuts.map((s) => (
                <div key={s.keys} className="contents">
                  <dt>
                    <kbd className="rounded border border-graphite-300 bg-graphite-50 px-1.5 py-0.5 font-mono text-xs">{s.keys}</kbd>
                  </dt>
                  <dd className="text-graphite-700">{s.what}</dd>
                </div>
              ))}
            </dl>
            <p className="mt-4 text-xs text-graphite-500">
              Connect a cable by dragging from one terminal (+, − or a tap) to another; allowed terminals light up, and a + joined straight to a
              − is marked with a caution outline.
            </p>
          </>
        )}
      </div>
      <p className="mt-3 border-t border-graphite-200 pt-2 text-xs text-graphite-600">
        Figures here inform a design; they are not approval to install. Fuse each battery close to its post, de-energize before work, and
        follow local codes and licensed practice.
      </p>
    </Dialog>
  );
}
