/** The editor's "?" help: the three jobs step by step with their drawings, and the keyboard shortcuts. */
import { describe, expect, it } from 'vitest';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { HowToDialog } from '@/features/help/HowToDialog';
import { SHORTCUTS } from '@/features/editor/shortcuts';

function steps() {
  const panel = screen.getByRole('tabpanel');
  return within(panel).getAllByRole('listitem');
}

describe('HowToDialog', () => {
  it('walks through trying take-off points, each step with its own drawing', () => {
    render(<HowToDialog open onClose={() => {}} shortcuts={SHORTCUTS} />);
    const dialog = screen.getByRole('dialog', { name: 'How to' });
    expect(within(dialog).getByRole('tab', { name: 'Try take-off points' })).toHaveAttribute('aria-selected', 'true');
    const items = steps();
    expect(items.length).toBeGreaterThanOrEqual(3);
    for (const li of items) {
      const picture = within(li).getByRole('img');
      expect(picture.tagName.toLowerCase()).toBe('svg');
      expect(picture.getAttribute('aria-label')?.length).toBeGreaterThan(10);
    }
    expect(within(dialog).getByRole('tabpanel')).toHaveTextContent(/main leads/);
    expect(within(dialog).getByRole('tabpanel')).toHaveTextContent(/Apply this layout/);
    // The caution stays with the help.
    expect(dialog).toHaveTextContent(/not approval to install/);
  });

  it('switches jobs with the arrow keys: compare and sign off, brief a crew, shortcuts', async () => {
    const user = userEvent.setup();
    render(<HowToDialog open onClose={() => {}} shortcuts={SHORTCUTS} />);
    screen.getByRole('tab', { name: 'Try take-off points' }).focus();
    await user.keyboard('{ArrowRight}');
    expect(screen.getByRole('tab', { name: 'Compare and sign off' })).toHaveFocus();
    expect(screen.getByRole('tabpanel')).toHaveTextContent(/Save revision…/);
    expect(screen.getByRole('tabpanel')).toHaveTextContent(/Approve/);
    expect(steps().every((li) => within(li).queryByRole('img'))).toBe(true);
    await user.keyboard('{ArrowRight}');
    expect(screen.getByRole('tabpanel')).toHaveTextContent(/numbered steps/);
    expect(screen.getByRole('tabpanel')).toHaveTextContent(/Cut list CSV/);
    await user.keyboard('{End}');
    expect(screen.getByRole('tab', { name: 'Keyboard shortcuts' })).toHaveAttribute('aria-selected', 'true');
    expect(within(screen.getByRole('tabpanel')).getAllByRole('term')).toHaveLength(SHORTCUTS.length);
    await user.keyboard('{ArrowRight}');
    expect(screen.getByRole('tab', { name: 'Try take-off points' })).toHaveAttribute('aria-selected', 'true');
  });

  it('opens on a chosen topic and closes with Escape', async () => {
    const user = userEvent.setup();
    let closed = false;
    render(<HowToDialog open onClose={() => { closed = true; }} shortcuts={SHORTCUTS} initialTopic="briefing" />);
    expect(screen.getByRole('tab', { name: 'Brief a crew' })).toHaveAttribute('aria-selected', 'true');
    await user.keyboard('{Escape}');
    expect(closed).toBe(true);
  });
});
