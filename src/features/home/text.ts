import type { AppNotification } from './api';

/** One line for a notice, in plain words. */
export function noticeText(n: AppNotification): string {
  const who = n.actor?.name ?? 'Someone';
  const what = `${n.diagram.name} revision ${n.revision}`;
  switch (n.kind) {
    case 'review_requested':
      return `${who} asked you to review ${what}`;
    case 'changes_requested':
      return `${who} requested changes to ${what}`;
    case 'approved':
      return `${who} approved ${what}`;
    case 'comment':
      return `${who} commented on ${what}`;
    case 'reply':
      return `${who} replied on ${what}`;
  }
}
