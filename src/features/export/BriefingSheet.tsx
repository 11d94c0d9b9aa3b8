/**
 * The crew-briefing sheet: the whole drawing on the left; on the right the title block (project,
 * diagram, revision, review state and approver, date, author), the legend of symbols, the installation
 * steps and the safety caution. An unapproved revision or a working copy carries a "NOT REVIEWED"
 * stamp and watermark. The same component is rendered off screen for image export and on the print view.
 */
import './sheet.css';
import { forwardRef } from 'react';
import type { AnnotationKind, Step } from '@shared/diagram/annotations';
import { PART_TYPES, type PartType } from '@shared/electrical/parts';
import { formatDateTime } from '@/lib/format';
import { PaletteGlyph } from '@/features/editor/canvas/symbols';
import { BRIEFING_CAUTION, BRIEFING_CAUTION_TITLE } from './caution';
import { SHEET_MARGIN, sheetSize } from './layout';
import { reviewStateText, revisionText, type SheetMeta } from './meta';

export interface SheetImage {
  src: string;
  /** CSS pixels (the image may hold more device pixels). */
  width: number;
  height: number;
}

export interface BriefingSheetProps {
  meta: SheetMeta;
  image: SheetImage;
  partTypes: PartType[];
  /** Installation steps to list (empty when annotations are left out). */
  steps: Step[];
  /** Annotation kinds drawn on the sheet (their legend entries). */
  annotationKinds: AnnotationKind[];
  analysisLabel: string;
  unitLabel: string;
}

function Line({ kind }: { kind: 'cable' | 'jumper' | 'over' }) {
  const stroke = kind === 'over' ? '#b3261e' : kind === 'jumper' ? '#67707d' : '#3e454f';
  return (
    <svg width="30" height="10" aria-hidden="true">
      <line x1="1" y1="5" x2="29" y2="5" stroke={stroke} strokeWidth={kind === 'over' ? 3 : 2} strokeDasharray={kind === 'over' ? '8 3' : undefined} />
    </svg>
  );
}

function Terminal({ kind }: { kind: 'pos' | 'neg' }) {
  return (
    <svg width="16" height="16" viewBox="0 0 16 16" aria-hidden="true">
      {kind === 'pos' ? <rect x="1" y="1" width="14" height="14" rx="2" fill="#fff" stroke="#2a3038" strokeWidth="1.5" /> : <circle cx="8" cy="8" r="7" fill="#fff" stroke="#2a3038" strokeWidth="1.5" />}
      <path d={kind === 'pos' ? 'M4.5 8h7M8 4.5v7' : 'M4.5 8h7'} stroke="#1c2127" strokeWidth="1.6" />
    </svg>
  );
}

function Legend({ partTypes, kinds }: { partTypes: PartType[]; kinds: AnnotationKind[] }) {
  return (
    <ul className="bw-sheet-legend">
      {partTypes.map((t) => (
        <li key={t}>
          <span className="bw-legend-mark"><PaletteGlyph type={t} /></span>
          {PART_TYPES[t].name}
        </li>
      ))}
      <li><span className="bw-legend-mark"><Terminal kind="pos" /></span>Positive terminal</li>
      <li><span className="bw-legend-mark"><Terminal kind="neg" /></span>Negative terminal</li>
      <li><span className="bw-legend-mark"><Line kind="cable" /></span>Cable run (width grows with loading)</li>
      <li><span className="bw-legend-mark"><Line kind="jumper" /></span>Battery jumper</li>
      <li><span className="bw-legend-mark"><Line kind="over" /></span>Over ampacity</li>
      <li>
        <span className="bw-legend-mark">
          <svg width="28" height="8" aria-hidden="true"><rect x="0.5" y="0.5" width="27" height="7" fill="#fff" stroke="#b1b8c2" /><rect x="1" y="1" width="15" height="6" fill="#b96a3a" /></svg>
        </span>
        Battery share of bank current
      </li>
      <li style={{ gridColumn: '1 / -1' }}>
        <span className="bw-legend-mark" style={{ fontSize: 9, fontWeight: 600 }}>2/0</span>
        Cable label: size · length; current · % of ampacity
      </li>
      {kinds.includes('step') ? (
        <li>
            <span className="bw-legend-mark">
              <svg width="18" height="18" aria-hidden="true"><circle cx="9" cy="9" r="8" fill="#1f4b82" /><text x="9" y="12.5" textAnchor="middle" fontSize="10" fontWeight="700" fill="#fff">1</text></svg>
            </span>
            Installation step
          </li>
      ) : null}
      {kinds.includes('highlight') ? (
        <li>
            <span className="bw-legend-mark">
              <svg width="28" height="14" aria-hidden="true"><rect x="1" y="1" width="26" height="12" rx="3" fill="rgb(42 98 168 / 0.05)" stroke="#2a62a8" strokeWidth="1.5" strokeDasharray="4 2" /></svg>
            </span>
            Highlighted group
          </li>
      ) : null}
      {kinds.includes('callout') ? (
        <li>
            <span className="bw-legend-mark">
              <svg width="28" height="14" aria-hidden="true"><rect x="8" y="1" width="19" height="10" rx="2" fill="#fff" stroke="#2a62a8" strokeWidth="1.2" /><line x1="1" y1="13" x2="9" y2="8" stroke="#2a62a8" strokeWidth="1.2" /></svg>
            </span>
            Callout on a part
          </li>
      ) : null}
      {kinds.includes('note') ? (
        <li>
            <span className="bw-legend-mark">
              <svg width="28" height="14" aria-hidden="true"><rect x="1" y="1" width="26" height="12" rx="2" fill="#eef4fb" stroke="#bcd4ef" /><rect x="1" y="1" width="3" height="12" fill="#2a62a8" /></svg>
            </span>
            Note
          </li>
      ) : null}
    </ul>
  );
}

export const BriefingSheet = forwardRef<HTMLDivElement, BriefingSheetProps>(function BriefingSheet(
  { meta, image, partTypes, steps, annotationKinds, analysisLabel, unitLabel },
  ref,
) {
  const size = sheetSize(image);
  const approved = meta.revision?.state === 'approved';
  return (
    <div
      ref={ref}
      className="bw-sheet"
      data-testid="briefing-sheet"
      style={{ width: size.width, minHeight: size.height, padding: SHEET_MARGIN }}
      role="document"
      aria-label={`Crew briefing sheet: ${meta.diagramName}`}
    >
      <div className="bw-sheet-diagram" style={{ width: image.width, height: image.height }}>
        <img src={image.src} width={image.width} height={image.height} alt={`Diagram of ${meta.diagramName}`} />
        {meta.notReviewed ? <div className="bw-sheet-watermark" aria-hidden="true"><span>NOT REVIEWED</span></div> : null}
      </div>
      <div className="bw-sheet-side">
        {meta.notReviewed ? (
          <div className="bw-sheet-stamp" data-testid="not-reviewed">
            NOT REVIEWED
            <small>{meta.revision ? `r${meta.revision.number}: ${reviewStateText(meta)}` : 'Working copy, not a reviewed revision'}</small>
          </div>
        ) : null}
        <section className="bw-sheet-box" aria-label="Title block">
          <h3>Crew briefing</h3>
          <div className="bw-sheet-title">
            <div className="bw-sheet-project">{meta.projectName}</div>
            <div className="bw-sheet-name">{meta.diagramName}</div>
          </div>
          <dl className="bw-sheet-fields">
            <dt>Revision</dt>
            <dd>{revisionText(meta)}</dd>
            <dt>Review state</dt>
            <dd className={approved ? undefined : 'bw-sheet-bad'}>
              {reviewStateText(meta)}
              {approved && meta.revision?.approvedAt ? `, ${formatDateTime(meta.revision.approvedAt)}` : ''}
            </dd>
            <dt>Date</dt>
            <dd>{formatDateTime(meta.date)}</dd>
            <dt>Author</dt>
            <dd>{meta.author}</dd>
            <dt>Labels show</dt>
            <dd>{analysisLabel}</dd>
            <dt>Units</dt>
            <dd>{unitLabel}</dd>
          </dl>
        </section>
        <section className="bw-sheet-box" aria-label="Legend">
          <h3>Legend</h3>
          <Legend partTypes={partTypes} kinds={annotationKinds} />
        </section>
        {steps.length ? (
          <section className="bw-sheet-box" aria-label="Installation steps">
            <h3>Installation steps</h3>
            <ol className="bw-sheet-list">
              {steps.map((s) => (
                <li key={s.id} value={s.number}>{s.text}</li>
              ))}
            </ol>
          </section>
        ) : null}
        <section className="bw-sheet-box bw-sheet-caution" aria-label={BRIEFING_CAUTION_TITLE}>
          <h3>{BRIEFING_CAUTION_TITLE}</h3>
          <ul className="bw-sheet-list">
            {BRIEFING_CAUTION.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </section>
        <p className="bw-sheet-foot">
          Drawn with Bankwright. Figures are computed from the diagram as drawn; check them against the installed parts. A reviewed
          revision is a design review, not an approval to install.
        </p>
      </div>
    </div>
  );
});
