/**
 * The three demo diagram documents for the Gannet Island ranger station project, built with the
 * diagram templates (shared/diagram/templates.ts). They are starting points for the demo, not designs
 * approved to install.
 */
import { diagramSchema, type DiagramDocument } from '../../shared/electrical/document/schema';
import { busbarBankTemplate, postToPostTemplate, seriesParallelTemplate } from '../../shared/diagram/templates';
import { batteryDefaults } from '../../shared/electrical/parts/battery';

export interface DemoDiagram {
  name: string;
  description: string;
  content: DiagramDocument;
}

/** Battery-to-busbar run lengths, m: the batteries stand at different distances from the busbars. */
const UNEQUAL_RUNS_M = [0.8, 1.2, 1.7, 2.4];

function busbarBankWithUnequalCables(name: string): DiagramDocument {
  const doc = busbarBankTemplate({ count: 4, name });
  const cables = doc.cables.map((c) => {
    const m = /^c-(pos|neg)(\d+)$/.exec(c.id);
    if (!m) return c;
    return { ...c, props: { ...c.props, length_m: UNEQUAL_RUNS_M[Number(m[2]) - 1] } };
  });
  return diagramSchema.parse({ ...doc, cables });
}

export function demoDiagramContents(): DemoDiagram[] {
  return [
    {
      name: 'Post-to-post bank, end take-off',
      description: 'Four 12 V batteries jumpered post to post. r1 took both main cables off the end battery; r2 moved the negative to battery 4 (diagonal take-off); r3 shortens the jumpers.',
      content: postToPostTemplate({ count: 4, takeOff: 'same-end', name: 'Post-to-post bank, end take-off' }),
    },
    {
      name: 'Busbar bank, unequal cables',
      description: `Four 12 V batteries on positive and negative busbars, each fused; battery cables of ${UNEQUAL_RUNS_M.join(', ')} m.`,
      content: busbarBankWithUnequalCables('Busbar bank, unequal cables'),
    },
    {
      name: '48 V series-parallel 4S2P',
      description: 'Two strings of four 12 V batteries in series, paralleled on busbars with a fuse per string.',
      content: seriesParallelTemplate({ seriesCount: 4, parallelCount: 2, name: '48 V series-parallel 4S2P' }),
    },
  ];
}

/** The post-to-post bank's three revisions (seeded with a review history). */
export function demoRevisionContents(): { message: string; content: DiagramDocument }[] {
  const name = 'Post-to-post bank, end take-off';
  return [
    {
      message: 'First layout: four batteries post to post, both main cables off battery 1.',
      content: postToPostTemplate({ count: 4, takeOff: 'same-end', name }),
    },
    {
      message: 'Main negative moved to battery 4 (diagonal take-off) to even out the battery currents.',
      content: postToPostTemplate({ count: 4, takeOff: 'diagonal', name }),
    },
    {
      message: 'Jumpers cut to 0.5 m after measuring the battery box; main fuse unchanged.',
      content: postToPostTemplate({ count: 4, takeOff: 'diagonal', name, jumper: { length_m: 0.5 } }),
    },
  ];
}

/**
 * The survey launch's house bank as found on board: two 12 V AGM batteries jumpered post to post with
 * both main cables on battery 1 — the poor take-off the editor's take-off explorer is for. No revisions.
 */
export function demoHouseBankContent(): DemoDiagram {
  const name = 'House bank as found, both leads on battery 1';
  const doc = postToPostTemplate({ count: 2, takeOff: 'same-end', name });
  const agm = batteryDefaults('agm', 110);
  const parts = doc.parts.map((p) => (p.type === 'battery' ? { ...p, props: { ...agm } } : p));
  return {
    name,
    description: 'Two 110 Ah AGM batteries, both main cables on battery 1, feeding the DC panel and a 2 kW inverter.',
    content: diagramSchema.parse({ ...doc, parts }),
  };
}
