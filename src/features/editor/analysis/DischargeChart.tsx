/**
 * Discharge over time: each battery's (or string's) current and state of charge against time, as two
 * SVG line charts sharing the time axis, with a legend and axis labels with units. Series differ by
 * dash pattern as well as colour. A table of the samples is there for screen readers and exact values.
 */
import type { DischargeResult } from '@shared/electrical';
import type { LabelOf } from './labels';
import { Figures, fmtA, fmtAh, fmtPct, tableClass } from './ui';

const COLOURS = ['#9c552b', '#2a62a8', '#2f7a45', '#8f5b00', '#6b3fa0', '#b3261e', '#3e454f', '#0f7c80'];
const DASHES = ['', '5 3', '2 2', '8 3 2 3', '1 3', '10 4', '4 2 1 2 1 2', '12 2'];
export const seriesStyle = (i: number) => ({ stroke: COLOURS[i % COLOURS.length], dash: DASHES[i % DASHES.length] });

/** Round tick steps (1, 2, 2.5, 5 × 10^k) covering [lo, hi] with about `n` ticks. */
export function niceTicks(lo: number, hi: number, n = 4): number[] {
  if (!(hi > lo)) hi = lo + 1;
  const raw = (hi - lo) / n;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

const W = 300;
const H = 128;
const M = { l: 38, r: 8, t: 8, b: 26 };

interface PlotProps {
  title: string;
  yLabel: string;
  units: string[];
  t: number[];
  values: (id: string) => number[];
  yMin?: number;
  yMax?: number;
  fmtTick: (v: number) => string;
  labelOf: LabelOf;
  marks?: { x: number; text: string }[];
}

function Plot({ title, yLabel, units, t, values, yMin, yMax, fmtTick, labelOf, marks = [] }: PlotProps) {
  const all = units.flatMap((u) => values(u));
  // Without fixed limits, the data's own range with a margin, so that close series stay apart.
  const dMin = Math.min(...all);
  const dMax = Math.max(...all);
  const pad = Math.max((dMax - dMin) * 0.15, Math.abs(dMax) * 0.02, 1e-3);
  const lo0 = yMin ?? dMin - pad;
  const hi0 = yMax ?? dMax + pad;
  const yt = niceTicks(lo0, hi0);
  const lo = Math.min(lo0, yt[0]);
  const hi = Math.max(hi0, yt[yt.length - 1]);
  const tMax = Math.max(t[t.length - 1] ?? 1, 1e-6);
  const xt = niceTicks(0, tMax, 5).filter((v) => v <= tMax + 1e-9);
  const x = (v: number) => M.l + (v / tMax) * (W - M.l - M.r);
  const y = (v: number) => M.t + (1 - (v - lo) / (hi - lo || 1)) * (H - M.t - M.b);
  return (
    <svg viewBox={`0 0 ${W} ${H}`} className="block w-full" role="img" aria-label={title} data-testid={`chart-${yLabel.split(' ')[0].toLowerCase()}`}>
      <title>{title}</title>
      <g className="text-graphite-500" fontSize="9" fill="currentColor">
        {yt.map((v) => (
          <g key={`y${v}`}>
            <line x1={M.l} x2={W - M.r} y1={y(v)} y2={y(v)} stroke="var(--color-graphite-100)" />
            <text x={M.l - 3} y={y(v) + 3} textAnchor="end">
              {fmtTick(v)}
            </text>
          </g>
        ))}
        {xt.map((v) => (
          <g key={`x${v}`}>
            <line x1={x(v)} x2={x(v)} y1={H - M.b} y2={H - M.b + 3} stroke="var(--color-graphite-400)" />
            <text x={x(v)} y={H - M.b + 12} textAnchor="middle">
              {Number(v.toFixed(2))}
            </text>
          </g>
        ))}
        <line x1={M.l} x2={W - M.r} y1={H - M.b} y2={H - M.b} stroke="var(--color-graphite-400)" />
        <line x1={M.l} x2={M.l} y1={M.t} y2={H - M.b} stroke="var(--color-graphite-400)" />
        <text x={(M.l + W - M.r) / 2} y={H - 3} textAnchor="middle" fill="var(--color-graphite-600)">
          time (h)
        </text>
        <text transform={`translate(9 ${(M.t + H - M.b) / 2}) rotate(-90)`} textAnchor="middle" fill="var(--color-graphite-600)">
          {yLabel}
        </text>
      </g>
      {units.map((u, i) => {
        const v = values(u);
        const s = seriesStyle(i);
        const d = t.map((tt, k) => `${k ? 'L' : 'M'}${x(tt).toFixed(1)} ${y(v[k]).toFixed(1)}`).join(' ');
        return (
          <path key={u} d={d} fill="none" stroke={s.stroke} strokeWidth={1.6} strokeDasharray={s.dash || undefined} data-series={u}>
            <title>{labelOf(u)}</title>
          </path>
        );
      })}
      {marks.map((m) => (
        <g key={m.text} fontSize="9">
          <line x1={x(m.x)} x2={x(m.x)} y1={M.t} y2={H - M.b} stroke="var(--color-fault-600)" strokeDasharray="2 2" />
          <text x={x(m.x) - 3} y={M.t + 8} textAnchor="end" fill="var(--color-fault-700)">
            {m.text}
          </text>
        </g>
      ))}
    </svg>
  );
}

const STOPPED_BY: Record<DischargeResult['stoppedBy'], string> = {
  soc_floor: 'it reached its state-of-charge floor',
  voltage_cutoff: 'it reached its cut-off voltage',
  load_cutoff: "the load's low-voltage cut-off was reached",
  step_limit: 'the step limit was reached first',
  no_load: 'there is no load to discharge into',
  solve_failed: 'a step could not be solved',
};

export function DischargeChart({ discharge, labelOf }: { discharge: DischargeResult; labelOf: LabelOf }) {
  const { samples } = discharge;
  if (samples.length < 2) {
    return <p className="text-[12px] text-graphite-600">No discharge to show: {STOPPED_BY[discharge.stoppedBy]}.</p>;
  }
  const units = Object.keys(samples[0].currents_A);
  const t = samples.map((s) => s.t_h);
  const first = discharge.firstEmpty;
  const every = Math.max(1, Math.ceil(samples.length / 12));
  const tableRows = samples.filter((_, i) => i % every === 0 || i === samples.length - 1);
  return (
    <div className="space-y-2" data-testid="discharge">
      <p className="text-[12px] leading-[1.35]" data-testid="first-empty">
        {first ? (
          <>
            <strong>{labelOf(first)}</strong> empties first, after <strong>{discharge.duration_h.toFixed(2)} h</strong>: {STOPPED_BY[discharge.stoppedBy]}.
          </>
        ) : (
          <>Stopped after {discharge.duration_h.toFixed(2)} h: {STOPPED_BY[discharge.stoppedBy]}.</>
        )}
      </p>
      <Figures
        rows={[
          ['Usable', `${fmtAh(discharge.usable_Ah)} of ${fmtAh(discharge.nameplate_Ah)} nameplate`],
          ['Usable share', fmtPct(discharge.usable_pct)],
          ['Steps', String(discharge.steps)],
        ]}
      />
      <ul className="flex flex-wrap gap-x-3 gap-y-1 text-[11px]" aria-label="Legend">
        {units.map((u, i) => {
          const s = seriesStyle(i);
          return (
            <li key={u} className="flex items-center gap-1">
              <svg width="22" height="6" aria-hidden="true">
                <line x1="0" x2="22" y1="3" y2="3" stroke={s.stroke} strokeWidth="2" strokeDasharray={s.dash || undefined} />
              </svg>
              {labelOf(u)}
            </li>
          );
        })}
      </ul>
      <Plot
        title="Current of each battery over time, A"
        yLabel="current (A)"
        units={units}
        t={t}
        values={(u) => samples.map((s) => s.currents_A[u] ?? 0)}
        fmtTick={(v) => String(Number(v.toFixed(1)))}
        labelOf={labelOf}
      />
      <Plot
        title="State of charge of each battery over time, %"
        yLabel="SoC (%)"
        units={units}
        t={t}
        values={(u) => samples.map((s) => (s.soc[u] ?? 0) * 100)}
        yMin={0}
        yMax={100}
        fmtTick={(v) => String(Math.round(v))}
        labelOf={labelOf}
        marks={first ? [{ x: discharge.duration_h, text: `${labelOf(first)} empty` }] : []}
      />
      <details className="text-[11px]">
        <summary className="cursor-pointer text-graphite-600">Samples as a table</summary>
        <div className="mt-1 overflow-x-auto">
          <table className={`${tableClass} table-auto`}>
            <thead>
              <tr>
                <th className="text-left">t (h)</th>
                {units.map((u) => (
                  <th key={u} className="text-right">
                    {labelOf(u)} A / SoC
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {tableRows.map((s) => (
                <tr key={s.t_h}>
                  <td>{s.t_h.toFixed(2)}</td>
                  {units.map((u) => (
                    <td key={u} className="text-right whitespace-nowrap">
                      {fmtA(s.currents_A[u] ?? 0)} / {fmtPct((s.soc[u] ?? 0) * 100, 0)}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
    </div>
  );
}
