/**
 * Fault results: the prospective current at each fuse and cable — the largest over every fault case
 * (battery internally shorted, cable shorted at its load end) against the fuse's interrupting rating —
 * and, with one fault chosen, the currents in that case.
 */
import type { AnalysisOk, FaultCase } from '@shared/electrical';
import type { DiagramDocument } from '@shared/diagram';
import { CheckIcon, ErrorIcon } from '@/components/icons';
import type { LabelOf } from './labels';
import { Figures, PartLink, fmtKA, tableClass } from './ui';

export function faultCaseLabel(c: Pick<FaultCase, 'kind' | 'id'> | undefined, labelOf: LabelOf): string {
  // A cable no fault case drives current through has no worst case.
  if (!c) return '—';
  return c.kind === 'battery' ? `${labelOf(c.id)} internally shorted` : `${labelOf(c.id)} shorted at its load end`;
}

function Verdict({ current_A, interrupting_A }: { current_A: number; interrupting_A: number }) {
  return current_A > interrupting_A ? (
    <span className="inline-flex items-center gap-0.5 font-semibold text-fault-700">
      <ErrorIcon size={11} /> above
    </span>
  ) : (
    <span className="inline-flex items-center gap-0.5 text-ok-700">
      <CheckIcon size={11} /> within
    </span>
  );
}

export function FaultResults({ result, doc, labelOf }: { result: AnalysisOk; doc: DiagramDocument; labelOf: LabelOf }) {
  const sweep = result.faults;
  if (!sweep) return <p className="text-[12px] text-graphite-600">No fault study: the bank without its loads and chargers does not form one circuit.</p>;
  const fuses = doc.parts.filter((p) => p.type === 'fuse');
  const one = result.faultCase && result.operating ? { fc: result.faultCase, op: result.operating } : null;
  const cableRows = Object.entries(sweep.maxByCable).sort((a, b) => b[1].current_A - a[1].current_A);
  return (
    <div className="space-y-2">
      {one ? (
        <div className="rounded-md border border-fault-200 bg-fault-50 px-2.5 py-2 text-[12px]">
          <p className="font-semibold text-fault-700">{faultCaseLabel(one.fc, labelOf)}</p>
          <p>
            Current in the fault: <strong className="tabular-nums">{fmtKA(one.fc.faultCurrent_A)}</strong> (bolted, {(sweep.fault_ohm * 1000).toFixed(1)} mΩ)
          </p>
        </div>
      ) : (
        <Figures rows={[['Fault cases studied', String(sweep.cases.length)], ['Largest fault current', fmtKA(sweep.worstFault_A)], ['Bolted fault resistance', `${(sweep.fault_ohm * 1000).toFixed(1)} mΩ`]]} />
      )}
      {fuses.length ? (
        <table className={tableClass} aria-label="Prospective current at each fuse">
          <colgroup>
            <col className="w-[27%]" />
            {one ? <col className="w-[17%]" /> : null}
            <col className={one ? 'w-[17%]' : 'w-[22%]'} />
            <col className={one ? 'w-[19%]' : 'w-[25%]'} />
            <col className={one ? 'w-[20%]' : 'w-[26%]'} />
          </colgroup>
          <thead>
            <tr>
              <th className="text-left">Fuse</th>
              {one ? <th className="text-right">This fault</th> : null}
              <th className="text-right">Max</th>
              <th className="pl-1 text-right" title="Interrupting rating">Int. rating</th>
              <th className="text-right" title="Largest prospective current against the interrupting rating">Check</th>
            </tr>
          </thead>
          <tbody>
            {fuses.map((p) => {
              if (p.type !== 'fuse') return null;
              const max = sweep.maxByFuse[p.id];
              const here = one ? Math.abs(one.op.parts[p.id]?.current_A ?? 0) : 0;
              return (
                <tr key={p.id} title={max ? `Largest in: ${faultCaseLabel(sweep.cases[max.case], labelOf)}` : undefined}>
                  <td className="truncate">
                    <PartLink id={p.id}>{labelOf(p.id)}</PartLink>
                  </td>
                  {one ? <td className="text-right">{fmtKA(here)}</td> : null}
                  <td className="text-right">
                    {max ? fmtKA(max.current_A) : '—'}
                    {max ? <span className="sr-only">, largest when {faultCaseLabel(sweep.cases[max.case], labelOf)}</span> : null}
                  </td>
                  <td className="text-right text-graphite-600">{fmtKA(p.props.interrupting_A)}</td>
                  <td className="text-right">{max ? <Verdict current_A={max.current_A} interrupting_A={p.props.interrupting_A} /> : '—'}</td>
                </tr>
              );
            })}
          </tbody>
          <caption className="caption-bottom pt-1 text-left text-[11px] text-graphite-500">
            Max: the largest prospective current through the fuse over all {sweep.cases.length} fault cases (a row's tooltip names that case).
          </caption>
        </table>
      ) : (
        <p className="text-[12px] text-caution-700">There are no fuses in this diagram: nothing limits a fault current.</p>
      )}
      <table className={tableClass} aria-label="Prospective current in each cable">
        <colgroup>
          <col className="w-[34%]" />
          {one ? <col className="w-[20%]" /> : null}
          <col className="w-[20%]" />
          <col className={one ? 'w-[26%]' : 'w-[46%]'} />
        </colgroup>
        <thead>
          <tr>
            <th className="text-left">Cable</th>
            {one ? <th className="text-right">This fault</th> : null}
            <th className="text-right">Max</th>
            <th className="pl-2 text-left">Worst case</th>
          </tr>
        </thead>
        <tbody>
          {cableRows.map(([id, m]) => (
            <tr key={id}>
              <td className="truncate">
                <PartLink id={id}>{labelOf(id)}</PartLink>
              </td>
              {one ? <td className="text-right">{fmtKA(Math.abs(one.op.cables[id]?.current_A ?? 0))}</td> : null}
              <td className="text-right">{fmtKA(m.current_A)}</td>
              <td className="truncate pl-2 text-graphite-600" title={faultCaseLabel(sweep.cases[m.case], labelOf)}>
                {faultCaseLabel(sweep.cases[m.case], labelOf)}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
