/**
 * The solved case's figures: each battery's current and share (bar and number) against its ideal share,
 * each cable's current against its ampacity, each fuse's loading, voltage and drop at each load, losses,
 * and the bank's figures.
 */
import type { BankFigures, OperatingPoint } from '@shared/electrical';
import type { DiagramDocument } from '@shared/diagram';
import type { LabelOf } from './labels';
import { Bar, Figures, Loading, PartLink, fmtA, fmtAh, fmtPct, fmtPp, fmtV, fmtW, tableClass } from './ui';

const LOSS_KIND_NAMES: Record<string, string> = {
  battery: 'in batteries', cable: 'in cables', lug: 'at lugs', fuse: 'in fuses', busbar: 'in busbars', switch: 'in switches', shunt: 'in shunts', charger: 'in chargers', other: 'other',
};

export function BankTable({ bank, labelOf }: { bank: BankFigures; labelOf: LabelOf }) {
  const rows: [string, string][] = [
    ['Nominal voltage', fmtV(bank.nominal_V, 1)],
    ['Capacity', fmtAh(bank.capacity_Ah)],
    ['Energy', `${(bank.energy_Wh / 1000).toFixed(2)} kWh`],
    ['Units (batteries or strings)', String(bank.units)],
    ['C-rate (load case)', bank.cRate === null ? '—' : `${bank.cRate.toFixed(2)} C`],
  ];
  for (const [id, inv] of Object.entries(bank.inverters)) {
    rows.push([`${labelOf(id)} DC current`, `${fmtA(inv.dcCurrentAtNominal_A)} at ${fmtV(bank.nominal_V, 1)}`]);
    rows.push([`  at ${fmtV(bank.systemVoltage_V, 0)} system`, fmtA(inv.dcCurrentAtSystemVoltage_A)]);
  }
  return <Figures rows={rows} />;
}

export function BatteriesTable({ op, labelOf }: { op: OperatingPoint; labelOf: LabelOf }) {
  const entries = Object.entries(op.sources);
  if (!entries.length) return null;
  const scale = Math.max(1e-9, ...entries.map(([, s]) => Math.max(Math.abs(s.share_pct), s.idealShare_pct))) * 1.1;
  return (
    <table className={tableClass} aria-label="Batteries and strings">
      <colgroup>
        <col className="w-[24%]" />
        <col className="w-[16%]" />
        <col className="w-[29%]" />
        <col className="w-[14%]" />
        <col className="w-[17%]" />
      </colgroup>
      <thead>
        <tr>
          <th className="text-left">{entries.every(([, s]) => s.type === 'battery') ? 'Battery' : 'Unit'}</th>
          <th className="text-right">Current</th>
          <th className="text-left pl-1.5">Share</th>
          <th className="text-right">Ideal</th>
          <th className="text-right">Dev.</th>
        </tr>
      </thead>
      <tbody>
        {entries.map(([id, s]) => (
          <tr key={id} data-testid={`battery-row-${id}`}>
            <td className="truncate">
              <PartLink id={id}>{labelOf(id)}</PartLink>
            </td>
            <td className="text-right">{fmtA(s.current_A)}</td>
            <td className="pl-1.5">
              <span className="flex items-center gap-1">
                <span className="min-w-0 flex-1">
                  <Bar fraction={Math.abs(s.share_pct) / scale} marker={s.idealShare_pct / scale} />
                </span>
                <span className="w-10 shrink-0 text-right">{fmtPct(s.share_pct)}</span>
              </span>
            </td>
            <td className="text-right text-graphite-600">{fmtPct(s.idealShare_pct)}</td>
            <td className={`text-right ${Math.abs(s.deviation_pct) > 10 ? 'font-semibold text-caution-700' : ''}`}>{fmtPp(s.deviation_pp)}</td>
          </tr>
        ))}
      </tbody>
      <caption className="caption-bottom pt-1 text-left text-[11px] text-graphite-500">
        Bank imbalance {fmtPct(op.imbalance_pct)} (spread of share ÷ ideal share). Bar: share; tick: ideal share. Positive current is discharge.
      </caption>
    </table>
  );
}

export function CablesTable({ op, labelOf }: { op: OperatingPoint; labelOf: LabelOf }) {
  const entries = Object.entries(op.cables).filter(([, c]) => c.r_ohm > 0 || Math.abs(c.current_A) > 0);
  if (!entries.length) return null;
  return (
    <table className={tableClass} aria-label="Cables">
      <colgroup>
        <col className="w-[36%]" />
        <col className="w-[18%]" />
        <col className="w-[20%]" />
        <col className="w-[26%]" />
      </colgroup>
      <thead>
        <tr>
          <th className="text-left">Cable</th>
          <th className="text-right">Current</th>
          <th className="text-right">Ampacity</th>
          <th className="text-right">Loading</th>
        </tr>
      </thead>
      <tbody>
        {entries.map(([id, c]) => (
          <tr key={id}>
            <td className="truncate">
              <PartLink id={id}>{labelOf(id)}</PartLink>
            </td>
            <td className="text-right">{fmtA(Math.abs(c.current_A))}</td>
            <td className="text-right text-graphite-600">{c.ampacity_A === null ? '—' : fmtA(c.ampacity_A)}</td>
            <td className="text-right">
              <Loading pct={c.utilisation_pct} />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function FusesTable({ op, doc, labelOf }: { op: OperatingPoint; doc: DiagramDocument; labelOf: LabelOf }) {
  const fuses = doc.parts.filter((p) => p.type === 'fuse' && op.parts[p.id]);
  if (!fuses.length) return null;
  return (
    <table className={tableClass} aria-label="Fuses">
      <colgroup>
        <col className="w-[36%]" />
        <col className="w-[18%]" />
        <col className="w-[20%]" />
        <col className="w-[26%]" />
      </colgroup>
      <thead>
        <tr>
          <th className="text-left">Fuse</th>
          <th className="text-right">Current</th>
          <th className="text-right">Rating</th>
          <th className="text-right">Loading</th>
        </tr>
      </thead>
      <tbody>
        {fuses.map((p) => {
          const f = op.parts[p.id];
          return (
            <tr key={p.id}>
              <td className="truncate">
                <PartLink id={p.id}>{labelOf(p.id)}</PartLink>
              </td>
              <td className="text-right">{fmtA(Math.abs(f.current_A ?? 0))}</td>
              <td className="text-right text-graphite-600">{f.rating_A === undefined ? '—' : fmtA(f.rating_A)}</td>
              <td className="text-right">
                <Loading pct={f.utilisation_pct} />
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

export function LoadsAndLosses({ op, doc, labelOf, dropLimit_pct }: { op: OperatingPoint; doc: DiagramDocument; labelOf: LabelOf; dropLimit_pct: number }) {
  const loads = doc.parts.filter((p) => (p.type === 'inverter' || p.type === 'dc_load') && op.parts[p.id]);
  const rows: [string, React.ReactNode][] = [];
  for (const p of loads) {
    const f = op.parts[p.id];
    const over = (f.drop_pct ?? 0) > dropLimit_pct;
    rows.push([`${labelOf(p.id)} voltage`, fmtV(f.voltage_V ?? 0)]);
    rows.push([
      `${labelOf(p.id)} drop`,
      <span key="d" className={over ? 'font-semibold text-caution-700' : ''}>
        {fmtV(f.drop_V ?? 0, 3)} · {fmtPct(f.drop_pct ?? 0, 2)}
        {over ? ` (over ${dropLimit_pct} %)` : ''}
      </span>,
    ]);
  }
  rows.push(['Total loss', fmtW(op.losses.total_W)]);
  const kinds = Object.entries(op.losses.byKind).filter(([, w]) => w > 0.05).sort((a, b) => b[1] - a[1]);
  for (const [k, w] of kinds) rows.push([`  ${LOSS_KIND_NAMES[k] ?? k}`, fmtW(w)]);
  return <Figures rows={rows} />;
}
