/**
 * Analysis and rule-check benchmarks (picked up by bench/index.ts through the registry):
 * "solve + all checks" on 40-battery banks — one compile, the load case (constant-power inverter,
 * Newton), a fault on every battery and at the load end of every cable (rank-one updates of one
 * factorization), bank figures and every rule — plus the pieces on their own, the take-off optimizer
 * and a discharge run.
 */
import { busbarBankTemplate, postToPostTemplate } from '../shared/diagram/templates';
import { analyzeDiagram } from '../shared/electrical/study/analyze';
import { buildContext, type AnalysisContext } from '../shared/electrical/analysis/context';
import { faultSweep, prepareFaults } from '../shared/electrical/analysis/faults';
import { optimizeTakeoff } from '../shared/electrical/optimizer';
import type { BenchCase } from './registry';

const busbar40 = () => busbarBankTemplate({ count: 40 });
const chain40 = () => postToPostTemplate({ count: 40, takeOff: 'diagonal' });

const mustCompile = (doc: ReturnType<typeof busbar40>): AnalysisContext => {
  const b = buildContext(doc);
  if (!b.ok) throw new Error('bench diagram does not compile');
  return b.ctx;
};

function checked(doc: ReturnType<typeof busbar40>) {
  const r = analyzeDiagram(doc);
  if (!r.ok || !r.faults || r.faults.cases.filter((c) => c.kind === 'battery').length !== 40) throw new Error('bench diagram does not analyse');
  return doc;
}

export const cases: BenchCase[] = [
  {
    name: 'checks: solve + all checks, 40-battery busbar bank, fault on every battery and cable',
    setup: () => checked(busbar40()),
    run: (doc) => analyzeDiagram(doc as ReturnType<typeof busbar40>),
    samples: 101,
    targetMs: 5,
    note: 'analyzeDiagram(load): compile, load case, 163 fault cases, every rule',
  },
  {
    name: 'checks: solve + all checks, 40 batteries post to post (diagonal)',
    setup: () => checked(chain40()),
    run: (doc) => analyzeDiagram(doc as ReturnType<typeof busbar40>),
    samples: 101,
    targetMs: 5,
  },
  {
    name: 'checks: compile only (40-battery busbar bank)',
    setup: busbar40,
    run: (doc) => buildContext(doc as ReturnType<typeof busbar40>),
    samples: 101,
  },
  {
    name: 'checks: fault sweep only (40-battery busbar bank, 163 cases)',
    setup: () => mustCompile(busbar40()),
    run: (ctx) => faultSweep(ctx as AnalysisContext, prepareFaults(ctx as AnalysisContext)),
    samples: 101,
  },
  {
    name: 'checks: take-off optimizer, 4 batteries post to post (16 pairs)',
    setup: () => postToPostTemplate({ count: 4, takeOff: 'same-end' }),
    run: (doc) => optimizeTakeoff(doc as ReturnType<typeof busbar40>),
    samples: 51,
  },
  {
    name: 'checks: discharge, 40-battery busbar bank',
    setup: () => {
      const doc = busbarBankTemplate({ count: 40 });
      const r = analyzeDiagram(doc, { mode: 'discharge', rules: false });
      if (!r.ok || !r.discharge || r.discharge.steps < 10) throw new Error('bench discharge did not run');
      return doc;
    },
    run: (doc) => analyzeDiagram(doc as ReturnType<typeof busbar40>, { mode: 'discharge', rules: false }),
    samples: 21,
    note: 'analyzeDiagram(discharge, no rules): compile, one factorization, then per step one right-hand side solve and a warm-started Newton',
  },
  {
    name: 'checks: discharge, 4-battery busbar bank',
    setup: () => busbarBankTemplate({ count: 4 }),
    run: (doc) => analyzeDiagram(doc as ReturnType<typeof busbar40>, { mode: 'discharge', rules: false }),
    samples: 11,
  },
];
