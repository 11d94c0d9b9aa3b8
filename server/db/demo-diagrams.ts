/**
 * The three demo diagram documents. shared/diagram/templates.ts (the diagram document builders) did
 * not exist when this was written, so these are minimal, empty documents of format version 1; wire
 * them to the templates when those land.
 */
export interface DemoDiagram {
  name: string;
  description: string;
  content: Record<string, unknown>;
}

const empty = () => ({ formatVersion: 1, settings: {}, parts: [], cables: [], annotations: [] });

export function demoDiagramContents(): DemoDiagram[] {
  return [
    {
      name: 'Post-to-post bank, end take-off',
      description: 'Four 12 V batteries jumpered post to post, with both main cables taken off the end battery.',
      content: empty(),
    },
    {
      name: 'Busbar bank, unequal cables',
      description: 'Four 12 V batteries on positive and negative busbars, each on its own fused cable; cable lengths differ.',
      content: empty(),
    },
    {
      name: '48 V series-parallel 4S2P',
      description: 'Two strings of four 12 V batteries in series, paralleled on busbars for the 48 V plant.',
      content: empty(),
    },
  ];
}
