/**
 * Results of A and B side by side (load case): each battery's current and share of the bank current and
 * the difference, imbalance, load voltage and drop, wiring losses, findings added and resolved, and the
 * bill-of-materials lines that change. Design-check figures, not approval to install.
 */
import { useMemo } from 'react';
import { diffResultsSummaries, type ResultsSummary } from '@shared/diagram/diff';
import { BOM_CATEGORIES } from '@shared/diagram/bom';
import { localizeUnitsInText } from '@shared/units';
import { ErrorIcon, NoteIcon, WarningIcon } from '@/components/icons';
import { useEditorStore } from '@/features/editor/store';
import type { BomChange } from './bomDiff';

const amps = (x: number | undefined) => (x === undefined ? '—' : `${x.toFixed(Math.abs(x) >= 100 ? 0 : 1)} A`);
const pct = (x: number | undefined, d = 1) => (x === undefined ? '—' : `${x.toFixed(d)} %`);
const share = (x: number | undefined) => (x === undefined ? '—' : `${(x * 100).toFixed(1)} %`);
const volts = (x: number | undefined) => (x === undefined ? '—' : `${x.toFixed(2)} V`);
const watts = (x: number | undefined) => (x === undefined ? '—' : `${x.toFixed(Math.abs(x) >= 100 ? 0 : 1)} W`);

/** A signed difference with its unit; "±0" shows unchanged figures plainly. */
function signed(x: number | undefined, unit: string, digits = 1) {
  if (x === undefined) return '—';
  const r = Number(x.toFixed(digits));
  if (r === 0) return `±0 ${unit}`;
  return `${r > 0 ? '+' : '−'}${Math.abs(r).toFixed(digits)} ${unit}`;
}

const CATEGORY_LABEL: Record<(typeof BOM_CATEGORIES)[number], string> = {
  batteries: 'Batteries', cables: 'Cable', lugs: 'Lugs', fuses: 'Fuses', fuse_holders: 'Fuse holders', busbars: 'Busbars',
  switches: 'Switches', shunts: 'Shunts', chargers: 'Chargers', inverters: 'Inverters',
};

function SeverityWord({ severity }: { severity: string }) {
  const Icon = severity === 'error' ? ErrorIcon : severity === 'warning' ? WarningIcon : NoteIcon;
  const word = severity === 'error' ? 'Error' : severity === 'warning' ? 'Warning' : 'Note';
  const tone = severity === 'error' ? 'text-fault-700' : severity === 'warning' ? 'text-caution-700' : 'text-note-700';
  return (
    <span className={`inline-flex items-center gap-1 font-semibold ${tone}`}>
      <Icon size={12} /> {word}
    </span>
  );
}

export interface ResultsTableProps {
  a: ResultsSummary;
  b: ResultsSummary;
  labelA: string;
  labelB: string;
  /** Where the figures come from, for the caption. */
  source: string;
  bom: BomChange[];
  /** "solved" or why not, per side. */
  statusA?: string;
  statusB?: string;
}

export function ResultsTable({ a, b, labelA, labelB, source, bom, statusA, statusB }: ResultsTableProps) {
  const diff = useMemo(() => diffResultsSummaries(a, b), [a, b]);
  // Set by useViewOnlyEditorStore from the user's effective unit system.
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const notSolved = [statusA && statusA !== 'solved' ? `${labelA}: could not be solved` : null, statusB && statusB !== 'solved' ? `${labelB}: could not be solved` : null].filter(Boolean);
  return (
    <div className="space-y-4">
      {notSolved.length ? <p className="text-[12px] text-caution-700">{notSolved.join('; ')} — its figures are empty; see its findings.</p> : null}
      <table className="bw-table" aria-label="Battery currents and shares">
        <caption className="mb-1 text-left text-[12px] text-graphite-500">Load case. {source}</caption>
        <thead>
          <tr>
            <th scope="col">Battery</th>
            <th scope="col" className="num">{labelA} current</th>
            <th scope="col" className="num">{labelA} share</th>
            <th scope="col" className="num">{labelB} current</th>
            <th scope="col" className="num">{labelB} share</th>
            <th scope="col" className="num">Δ current</th>
            <th scope="col" className="num">Δ share</th>
          </tr>
        </thead>
        <tbody>
          {diff.batteries.length === 0 ? (
            <tr><td colSpan={7} className="text-graphite-500">No battery figures.</td></tr>
          ) : null}
          {diff.batteries.map((row) => (
            <tr key={row.id} data-testid={`share-row-${row.id}`}>
              <th scope="row" className="!text-[13px] !font-medium !normal-case !tracking-normal text-graphite-900">
                {row.label}
                {!row.a ? <span className="ml-1 text-[11px] text-ok-700">(only in {labelB})</span> : null}
                {!row.b ? <span className="ml-1 text-[11px] text-fault-700">(only in {labelA})</span> : null}
              </th>
              <td className="num">{amps(row.a?.current_A)}</td>
              <td className="num">{share(row.a?.share)}</td>
              <td className="num">{amps(row.b?.current_A)}</td>
              <td className="num">{share(row.b?.share)}</td>
              <td className="num">{signed(row.delta_current_A, 'A')}</td>
              <td className="num" data-testid={`share-delta-${row.id}`}>{row.delta_share === undefined ? '—' : signed(row.delta_share * 100, 'pts')}</td>
            </tr>
          ))}
        </tbody>
      </table>

      <table className="bw-table" aria-label="Bank figures">
        <thead>
          <tr>
            <th scope="col">Figure</th>
            <th scope="col" className="num">{labelA}</th>
            <th scope="col" className="num">{labelB}</th>
            <th scope="col" className="num">Δ</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row" className="!text-[13px] !font-normal !normal-case !tracking-normal">Imbalance (spread of battery currents)</th>
            <td className="num">{pct(diff.imbalance_pct.a)}</td>
            <td className="num">{pct(diff.imbalance_pct.b)}</td>
            <td className="num">{signed(diff.imbalance_pct.delta, 'pts')}</td>
          </tr>
          <tr>
            <th scope="row" className="!text-[13px] !font-normal !normal-case !tracking-normal">Voltage at the worst-placed load</th>
            <td className="num">{volts(diff.loadVoltage_V.a)}</td>
            <td className="num">{volts(diff.loadVoltage_V.b)}</td>
            <td className="num">{signed(diff.loadVoltage_V.delta, 'V', 2)}</td>
          </tr>
          <tr>
            <th scope="row" className="!text-[13px] !font-normal !normal-case !tracking-normal">Voltage drop, bank to load</th>
            <td className="num">{pct(diff.drop_pct.a, 2)}</td>
            <td className="num">{pct(diff.drop_pct.b, 2)}</td>
            <td className="num">{signed(diff.drop_pct.delta, 'pts', 2)}</td>
          </tr>
          <tr>
            <th scope="row" className="!text-[13px] !font-normal !normal-case !tracking-normal">Wiring losses</th>
            <td className="num">{watts(diff.losses_W.a)}</td>
            <td className="num">{watts(diff.losses_W.b)}</td>
            <td className="num">{signed(diff.losses_W.delta, 'W')}</td>
          </tr>
        </tbody>
      </table>

      <div className="grid gap-3 sm:grid-cols-2">
        <section aria-labelledby="findings-added">
          <h4 id="findings-added" className="mb-1 text-[12px] font-semibold text-graphite-700">
            Findings added in {labelB} <span className="font-mono">({diff.findingsAdded.length})</span>
          </h4>
          {diff.findingsAdded.length === 0 ? <p className="text-[12px] text-graphite-500">None.</p> : null}
          <ul className="space-y-1 text-[12px]">
            {diff.findingsAdded.map((f) => (
              <li key={f.id}><SeverityWord severity={f.severity} /> {localizeUnitsInText(f.message, unitSystem)}</li>
            ))}
          </ul>
        </section>
        <section aria-labelledby="findings-resolved">
          <h4 id="findings-resolved" className="mb-1 text-[12px] font-semibold text-graphite-700">
            Findings resolved <span className="font-mono">({diff.findingsResolved.length})</span>
          </h4>
          {diff.findingsResolved.length === 0 ? <p className="text-[12px] text-graphite-500">None.</p> : null}
          <ul className="space-y-1 text-[12px]">
            {diff.findingsResolved.map((f) => (
              <li key={f.id}><span className="font-semibold text-ok-700">✓ Resolved</span> <span className="line-through decoration-graphite-400">{localizeUnitsInText(f.message, unitSystem)}</span></li>
            ))}
          </ul>
        </section>
      </div>

      <section aria-labelledby="bom-changes">
        <h4 id="bom-changes" className="mb-1 text-[12px] font-semibold text-graphite-700">
          Bill of materials changes <span className="font-mono">({bom.length})</span>
        </h4>
        {bom.length === 0 ? (
          <p className="text-[12px] text-graphite-500">The same parts and cable to order.</p>
        ) : (
          <table className="bw-table" aria-label="Bill of materials changes">
            <thead>
              <tr>
                <th scope="col">Line</th>
                <th scope="col" className="num">{labelA}</th>
                <th scope="col" className="num">{labelB}</th>
              </tr>
            </thead>
            <tbody>
              {bom.map((l) => (
                <tr key={`${l.category}:${l.description}`}>
                  <td>
                    <span className="text-[11px] text-graphite-500">{CATEGORY_LABEL[l.category]} · </span>
                    {l.description}
                    <span className={`ml-1 text-[11px] font-semibold ${l.status === 'added' ? 'text-ok-700' : l.status === 'removed' ? 'text-fault-700' : 'text-caution-700'}`}>
                      {l.status === 'added' ? '+ new line' : l.status === 'removed' ? '− line dropped' : 'Δ quantity'}
                    </span>
                  </td>
                  <td className="num">{l.a} {l.unit}</td>
                  <td className="num">{l.b} {l.unit}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}
