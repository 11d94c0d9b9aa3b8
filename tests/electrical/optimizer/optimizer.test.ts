import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate } from '../../../shared/diagram';
import { analyzeDiagram } from '../../../shared/electrical/analysis';
import { applyTakeoff, optimizeTakeoff } from '../../../shared/electrical/optimizer';

describe('take-off optimizer', () => {
  it('two equal batteries with both leads on battery 1: the best pair is the diagonal, which shares equally', () => {
    const doc = postToPostTemplate({ count: 2, takeOff: 'same-end' });
    const r = optimizeTakeoff(doc);
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.layout).toBe('post_to_post');
    expect(r.options).toHaveLength(4);
    const b = r.best.choice;
    expect(b.kind).toBe('post_to_post');
    if (b.kind !== 'post_to_post') return;
    expect(b.pos.battery).not.toBe(b.neg.battery); // first principles: opposite ends share equally
    expect(r.best.imbalance_pct).toBeLessThan(0.01);
    expect(r.explanation).toMatch(/imbalance from \d+\.\d % to 0\.0 %/);
    // The returned document, analysed afresh, agrees.
    const after = analyzeDiagram(r.document);
    if (!after.ok) throw new Error('analysis failed');
    expect(after.operating!.imbalance_pct).toBeCloseTo(r.best.imbalance_pct, 6);
    expect(after.findings.map((f) => f.id)).not.toContain('both-leads-one-battery');
  });

  it('evaluates every pair on a chain of 4 and ranks by imbalance, then losses', () => {
    const r = optimizeTakeoff(postToPostTemplate({ count: 4, takeOff: 'same-end' }));
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.options).toHaveLength(16);
    for (let i = 1; i < r.options.length; i++) {
      const a = Math.round(r.options[i - 1].imbalance_pct * 10);
      const b = Math.round(r.options[i].imbalance_pct * 10);
      expect(a <= b).toBe(true);
      if (a === b) expect(r.options[i - 1].losses_W).toBeLessThanOrEqual(r.options[i].losses_W);
    }
    // The options' figures match a fresh analysis of the same layout (candidate leads are truly open).
    const opt = r.options[5];
    const again = analyzeDiagram(applyTakeoff(postToPostTemplate({ count: 4, takeOff: 'same-end' }), opt.choice));
    if (!again.ok) throw new Error('analysis failed');
    expect(again.operating!.imbalance_pct).toBeCloseTo(opt.imbalance_pct, 5);
  });

  it('busbar bank with one long run: equalising the runs to the longest balances it', () => {
    const doc = busbarBankTemplate({ count: 4 });
    doc.cables.find((c) => c.id === 'c-neg2')!.props.length_m = 2;
    const r = optimizeTakeoff(doc);
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.layout).toBe('busbar');
    const now = r.options.find((o) => o.current)!;
    expect(r.best.current).toBe(false);
    expect(r.best.imbalance_pct).toBeLessThan(now.imbalance_pct / 4);
    const c = r.best.choice;
    if (c.kind !== 'cable_lengths') throw new Error('expected lengths');
    expect(Object.keys(c.lengths_m).sort()).toEqual(['c-neg1', 'c-neg3', 'c-neg4']);
    expect(c.lengths_m['c-neg1']).toBeCloseTo(2, 9);
    expect(r.document.cables.find((x) => x.id === 'c-neg3')!.props.length_m).toBeCloseTo(2, 9);
  });
});
