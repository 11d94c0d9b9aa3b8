/**
 * The annotation layer in the whole editor screen (jsdom): the panel adds a callout pinned to the
 * selected part, a numbered installation step, a free note and a highlight; the layer hides and shows
 * from the Annotations menu; annotation edits never change parts or cables; a trainer (read only
 * electrically) annotates through the annotations-only route; roles without diagram.annotate see no
 * edit controls.
 */
import '../editor/flow-mocks';
import { screen, waitFor, within } from '@testing-library/react';
import userEvent, { type UserEvent } from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { useAnnotationUi } from '@/features/annotations/state';
import { useEditorStore } from '@/features/editor/store';
import { meWith, mockApi, renderApp } from '../helpers';

const ID = 'd-ann';
const SLOW = { timeout: 30_000 };

// The layer's UI state lives in a module-level store: each test starts from a fresh screen.
beforeEach(() => {
  useAnnotationUi.setState({ visible: true, forceVisible: false, forceHidden: false, panelOpen: false, activeId: null });
});

function bank(annotations: DiagramDocument['annotations'] = []): DiagramDocument {
  return { ...postToPostTemplate({ count: 4, takeOff: 'diagonal', name: 'Pump house bank' }), annotations };
}

interface Put {
  url: string;
  body: Record<string, unknown>;
}

/** The editor for a role, on the API mock; PUTs (working copy, annotations) are recorded and accepted. */
async function openEditor(role: string, doc: DiagramDocument = bank()) {
  const puts: Put[] = [];
  let version = 7;
  const accept = ({ url, body }: { url: string; body: unknown }) => {
    puts.push({ url, body: body as Record<string, unknown> });
    version += 1;
    return { body: { workingCopyVersion: version, updatedAt: '2026-11-20T10:00:00Z' } };
  };
  mockApi({
    'GET /api/auth/me': { body: meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }]) },
    [`GET /api/diagrams/${ID}`]: {
      body: {
        role,
        diagram: {
          id: ID, projectId: 'p-cabin', teamId: 't-north', projectName: 'Lakeside cabin', name: 'Pump house bank', description: '',
          content: doc, workingCopyVersion: 7, updatedAt: '2026-11-20T09:00:00Z', updatedBy: null,
        },
      },
    },
    [`PUT /api/diagrams/${ID}/working-copy`]: accept,
    [`PUT /api/diagrams/${ID}/annotations`]: accept,
  });
  renderApp(`/diagrams/${ID}`);
  await screen.findByRole('heading', { name: 'Pump house bank' }, { timeout: 10_000 });
  await waitFor(() => expect(document.querySelectorAll('.react-flow__node')).toHaveLength(6));
  return { puts, user: userEvent.setup() };
}

const node = (id: string) => document.querySelector<HTMLElement>(`.react-flow__node[data-id="${id}"]`)!;

/** Select parts on the canvas with the keyboard: focus a part, Enter; Shift held adds to the selection. */
async function select(user: UserEvent, ...ids: string[]) {
  node(ids[0]).focus();
  await user.keyboard('{Enter}');
  for (const id of ids.slice(1)) {
    node(id).focus();
    await user.keyboard('{Shift>}{Enter}{/Shift}');
  }
  await waitFor(() => expect([...useEditorStore.getState().selection].sort()).toEqual([...ids].sort()));
}

async function openPanel(user: UserEvent, item: RegExp = /^Edit annotations…$/) {
  await user.click(screen.getByRole('button', { name: /^Annotations/ }));
  await user.click(screen.getByRole('menuitem', { name: item }));
  return screen.getByRole('region', { name: 'Annotations' });
}

const electrical = () => structuredClone({ parts: useEditorStore.getState().doc.parts, cables: useEditorStore.getState().doc.cables });
const layer = () => screen.queryByTestId('annotation-layer');

describe('annotations panel (designer)', () => {
  it('adds a callout, a step, a note and a highlight without touching parts or cables', SLOW, async () => {
    const { user, puts } = await openEditor('designer');
    const before = electrical();

    // Callout on the selected part: the form takes battery 2 from the canvas selection.
    await select(user, 'bat2');
    const panel = await openPanel(user);
    await user.click(within(panel).getByRole('button', { name: '+ Callout' }));
    const callout = within(panel).getByRole('form', { name: 'New callout' });
    expect(within(callout).getByRole('combobox')).toHaveDisplayValue('Battery 2');
    await user.type(within(callout).getByRole('textbox'), 'Torque the posts to the data sheet');
    await user.click(within(callout).getByRole('button', { name: 'Add' }));
    expect(useEditorStore.getState().doc.annotations).toEqual([
      { id: 'callout1', kind: 'callout', partId: 'bat2', text: 'Torque the posts to the data sheet' },
    ]);
    expect(layer()!.querySelector('.bw-ann-callout')).toHaveTextContent('Torque the posts to the data sheet');

    // A numbered step on batteries 1 and 2: number 1 offered, a disc with "1" on each part.
    await select(user, 'bat1', 'bat2');
    await user.click(within(panel).getByRole('button', { name: '+ Step' }));
    const step = within(panel).getByRole('form', { name: 'New installation step' });
    expect(within(step).getByRole('spinbutton', { name: 'Step number' })).toHaveValue(1);
    expect(step).toHaveTextContent('Parts: Battery 1, Battery 2');
    await user.type(within(step).getByRole('textbox', { name: 'What to do' }), 'Fit the positive jumpers');
    await user.click(within(step).getByRole('button', { name: 'Add' }));
    const discs = [...layer()!.querySelectorAll('.bw-ann-step')];
    expect(discs.map((d) => d.textContent)).toEqual(['1', '1']);
    expect(discs[0]).toHaveAttribute('title', 'Step 1: Fit the positive jumpers');

    // The next step is offered number 2; a second step 1 is refused.
    await user.click(within(panel).getByRole('button', { name: '+ Step' }));
    const step2 = within(panel).getByRole('form', { name: 'New installation step' });
    const number = within(step2).getByRole('spinbutton', { name: 'Step number' });
    expect(number).toHaveValue(2);
    await user.clear(number);
    await user.type(number, '1');
    await user.type(within(step2).getByRole('textbox', { name: 'What to do' }), 'Again');
    await user.click(within(step2).getByRole('button', { name: 'Add' }));
    expect(within(step2).getByRole('alert')).toHaveTextContent('There is already a step 1.');
    await user.click(within(step2).getByRole('button', { name: 'Cancel' }));

    // A free note (no parts needed).
    await user.click(within(panel).getByRole('button', { name: '+ Note' }));
    const note = within(panel).getByRole('form', { name: 'New note' });
    await user.type(within(note).getByRole('textbox', { name: 'Text' }), 'Isolator stays open during the work');
    await user.click(within(note).getByRole('button', { name: 'Add' }));
    expect(layer()!.querySelector('.bw-ann-note')).toHaveTextContent('Isolator stays open during the work');

    // A highlight around batteries 3 and 4.
    await select(user, 'bat3', 'bat4');
    await user.click(within(panel).getByRole('button', { name: '+ Highlight' }));
    const hl = within(panel).getByRole('form', { name: 'New highlight' });
    expect(hl).toHaveTextContent('Parts: Battery 3, Battery 4');
    await user.type(within(hl).getByRole('textbox', { name: 'Label (optional)' }), 'Negative end');
    await user.click(within(hl).getByRole('button', { name: 'Add' }));
    expect(layer()!.querySelector('.bw-ann-highlight')).toHaveTextContent('Negative end');

    const annotations = useEditorStore.getState().doc.annotations;
    expect(annotations.map((a) => a.kind)).toEqual(['callout', 'step', 'note', 'highlight']);
    expect(annotations[1]).toEqual({ id: 'step1', kind: 'step', number: 1, text: 'Fit the positive jumpers', partIds: ['bat1', 'bat2'] });
    expect(annotations[3]).toEqual({ id: 'hl1', kind: 'highlight', partIds: ['bat3', 'bat4'], label: 'Negative end' });
    const list = within(panel).getByRole('list', { name: 'Annotation list' });
    expect(within(list).getAllByRole('listitem')).toHaveLength(4);
    expect(electrical()).toEqual(before);

    // A designer's annotation edits are saved with the working copy, parts and cables as they were.
    await waitFor(() => expect((puts.at(-1)?.body.content as DiagramDocument | undefined)?.annotations).toHaveLength(4), { timeout: 10_000 });
    const saved = puts.at(-1)!;
    expect(saved.url).toBe(`/api/diagrams/${ID}/working-copy`);
    expect({ parts: (saved.body.content as DiagramDocument).parts, cables: (saved.body.content as DiagramDocument).cables }).toEqual(before);
  });

  it('asks for a part before adding a callout or a highlight, and for text before a note', SLOW, async () => {
    const { user } = await openEditor('designer');
    const panel = await openPanel(user);
    await user.click(within(panel).getByRole('button', { name: '+ Callout' }));
    const callout = within(panel).getByRole('form', { name: 'New callout' });
    await user.type(within(callout).getByRole('textbox'), 'Where?');
    await user.click(within(callout).getByRole('button', { name: 'Add' }));
    expect(within(callout).getByRole('alert')).toHaveTextContent('Select the part(s) on the canvas first.');
    await user.click(within(callout).getByRole('button', { name: 'Cancel' }));
    await user.click(within(panel).getByRole('button', { name: '+ Note' }));
    const note = within(panel).getByRole('form', { name: 'New note' });
    await user.click(within(note).getByRole('button', { name: 'Add' }));
    expect(within(note).getByRole('alert')).toHaveTextContent('Write the text first.');
    expect(useEditorStore.getState().doc.annotations).toEqual([]);
  });

  it('hides and shows the layer from the Annotations menu; editing and deleting leave parts and cables alone', SLOW, async () => {
    const doc = bank([{ id: 'callout1', kind: 'callout', partId: 'bat1', text: 'Check the lug crimp' }]);
    const { user } = await openEditor('designer', doc);
    const before = electrical();
    expect(layer()).toHaveTextContent('Check the lug crimp');

    await user.click(screen.getByRole('button', { name: 'Annotations' }));
    const show = screen.getByRole('menuitemcheckbox', { name: /Show annotations/ });
    expect(show).toHaveAttribute('aria-checked', 'true');
    await user.click(show);
    expect(layer()).toBeNull();
    const menuButton = screen.getByRole('button', { name: 'Annotations' });
    expect(menuButton).toHaveTextContent('Annotations (hidden)');
    await user.click(menuButton);
    expect(screen.getByRole('menuitemcheckbox', { name: /Show annotations/ })).toHaveAttribute('aria-checked', 'false');
    await user.click(screen.getByRole('menuitemcheckbox', { name: /Show annotations/ }));
    expect(layer()).toHaveTextContent('Check the lug crimp');
    expect(menuButton).toHaveTextContent(/^Annotations$/);

    const panel = await openPanel(user);
    await user.click(within(panel).getByRole('button', { name: 'Edit callout callout1' }));
    const form = within(panel).getByRole('form', { name: 'Edit callout' });
    const text = within(form).getByRole('textbox');
    await user.clear(text);
    await user.type(text, 'Check the lug crimp and the boot');
    await user.click(within(form).getByRole('button', { name: 'Save' }));
    expect(layer()).toHaveTextContent('Check the lug crimp and the boot');
    await user.click(within(panel).getByRole('button', { name: 'Delete callout callout1' }));
    expect(useEditorStore.getState().doc.annotations).toEqual([]);
    expect(layer()).toBeNull();
    expect(electrical()).toEqual(before);
  });
});

describe('annotations panel (trainer: read only electrically)', () => {
  it('has no palette, adds a callout and saves only the annotations through their own route', SLOW, async () => {
    const { user, puts } = await openEditor('trainer');
    expect(screen.queryByRole('navigation', { name: 'Parts palette' })).toBeNull();
    expect(screen.getByText(/Read only \(Trainer\)/)).toBeInTheDocument();
    const before = electrical();

    await select(user, 'bat3');
    const panel = await openPanel(user);
    expect(within(panel).getByRole('button', { name: 'Undo' })).toBeDisabled();
    await user.click(within(panel).getByRole('button', { name: '+ Callout' }));
    const callout = within(panel).getByRole('form', { name: 'New callout' });
    expect(within(callout).getByRole('combobox')).toHaveDisplayValue('Battery 3');
    await user.type(within(callout).getByRole('textbox'), 'Crew: isolate here first');
    await user.click(within(callout).getByRole('button', { name: 'Add' }));
    expect(layer()).toHaveTextContent('Crew: isolate here first');
    expect(within(panel).getByRole('status')).toHaveTextContent('Unsaved annotation changes');

    await waitFor(() => expect(within(panel).getByRole('status')).toHaveTextContent('Annotations saved'), { timeout: 5_000 });
    expect(puts).toHaveLength(1);
    expect(puts[0].url).toBe(`/api/diagrams/${ID}/annotations`);
    expect(Object.keys(puts[0].body).sort()).toEqual(['annotations', 'baseVersion']);
    expect(puts[0].body).toEqual({ baseVersion: 7, annotations: [{ id: 'callout1', kind: 'callout', partId: 'bat3', text: 'Crew: isolate here first' }] });
    expect(electrical()).toEqual(before);

    // Undo is the trainer's own, and its save goes the same way, from the version the server answered.
    await user.click(within(panel).getByRole('button', { name: 'Undo' }));
    expect(useEditorStore.getState().doc.annotations).toEqual([]);
    await waitFor(() => expect(puts).toHaveLength(2), { timeout: 5_000 });
    expect(puts[1]).toEqual({ url: `/api/diagrams/${ID}/annotations`, body: { baseVersion: 8, annotations: [] } });
    expect(puts.some((p) => p.url.endsWith('/working-copy'))).toBe(false);
    expect(electrical()).toEqual(before);
  });
});

describe('annotations panel: roles that may not annotate', () => {
  for (const role of ['viewer', 'reviewer']) {
    it(`shows a ${role} the list with no edit controls`, SLOW, async () => {
      const doc = bank([{ id: 'step1', kind: 'step', number: 1, text: 'Fit the fuse last', partIds: ['bat1'] }]);
      const { user } = await openEditor(role, doc);
      const panel = await openPanel(user, /^List annotations…$/);
      expect(within(panel).getByRole('list', { name: 'Annotation list' })).toHaveTextContent('1. Fit the fuse last');
      expect(within(panel).queryByRole('group', { name: 'Add an annotation' })).toBeNull();
      expect(within(panel).queryByRole('button', { name: /^\+ / })).toBeNull();
      expect(within(panel).queryByRole('button', { name: /^(Edit|Delete) / })).toBeNull();
      expect(within(panel).queryByRole('button', { name: /^(Undo|Redo)$/ })).toBeNull();
      expect(screen.queryByRole('menuitem', { name: /Edit annotations/ })).toBeNull();
    });
  }
});
