import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate } from '../../../shared/diagram';
import { compileDiagram, connectedRemainder } from '../../../shared/electrical/compile';
import { fuseDefaults } from '../../../shared/electrical/parts';

const without = <T extends { cables: { id: string }[] }>(d: T, ...ids: string[]): T => ({ ...d, cables: d.cables.filter((c) => !ids.includes(c.id)) });

describe('the connected remainder', () => {
  it('a fully wired diagram is its own remainder', () => {
    const d = busbarBankTemplate({ count: 2 });
    const r = connectedRemainder(d);
    expect(r.notConnected).toEqual([]);
    expect(r.doc.parts).toHaveLength(d.parts.length);
    expect(r.doc.cables).toHaveLength(d.cables.length);
  });

  it('a battery with an open negative is left out; the cables that meet on its positive post still join there', () => {
    // Post to post, take-off diagonal: battery 1's positive carries the jumper to battery 2 and the lead to the main fuse.
    const d = without(postToPostTemplate({ count: 4, takeOff: 'diagonal' }), 'j-neg-1');
    const r = connectedRemainder(d);
    expect(r.loose).toEqual(['bat1']);
    expect(r.openTerminals).toEqual({ bat1: ['neg'] });
    expect(r.notConnected).toEqual(['bat1']);
    expect(r.doc.cables.map((c) => c.id)).toEqual(expect.arrayContaining(['j-pos-1', 'c-main-fuse']));
    // The remainder compiles: the post is a joint of two cables.
    const c = compileDiagram(r.doc);
    expect(c.ok).toBe(true);
    if (c.ok) expect(c.map.cables['j-pos-1'].from_node).toBe(c.map.cables['c-main-fuse'].from_node);
  });

  it('a battery with an open negative takes its fuse and the fuse’s runs with it; the busbar stays', () => {
    const d = without(busbarBankTemplate({ count: 3, batteryFuse: fuseDefaults('class_t', 100) }), 'c-neg2');
    const r = connectedRemainder(d);
    expect(r.loose).toEqual(['bat2']);
    expect(new Set(r.notConnected)).toEqual(new Set(['bat2', 'fuse2', 'c-fuse2', 'c-pos2']));
    expect(new Set(r.deadEnds)).toEqual(new Set(['fuse2', 'c-fuse2', 'c-pos2']));
    expect(r.doc.parts.map((p) => p.id)).toContain('bus-pos');
    expect(compileDiagram(r.doc).ok).toBe(true);
  });

  it('a load with an open negative draws nothing: it and its positive lead are left out', () => {
    const d = without(busbarBankTemplate({ count: 2 }), 'c-main-neg');
    const r = connectedRemainder(d);
    expect(r.loose).toEqual(['inverter']);
    expect(new Set(r.notConnected)).toEqual(new Set(['inverter', 'main-fuse', 'c-main-fuse', 'c-main-pos']));
  });

  it('a floating part is left out; notes stay', () => {
    const d = busbarBankTemplate({ count: 2 });
    d.parts.push({ ...d.parts.find((p) => p.id === 'bat1')!, id: 'spare', label: 'Spare' });
    d.parts.push({ id: 'memo', type: 'note', label: '', rotation: 0, position: { x: 0, y: 0 }, props: { text: 'Torque to spec' } });
    const r = connectedRemainder(d);
    expect(r.notConnected).toEqual(['spare']);
    expect(r.openTerminals).toEqual({ spare: ['pos', 'neg'] });
    expect(r.doc.parts.map((p) => p.id)).toContain('memo');
  });

  it('a busbar with spare studs is not loose', () => {
    const d = busbarBankTemplate({ count: 2 });
    const bus = d.parts.find((p) => p.id === 'bus-pos');
    if (bus?.type === 'busbar') bus.props = { ...bus.props, tapCount: bus.props.tapCount + 2 };
    expect(connectedRemainder(d).notConnected).toEqual([]);
  });
});
