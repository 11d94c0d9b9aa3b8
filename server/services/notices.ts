/**
 * E-mail notices of the review flow. Each links to the compare view of the revision against the one
 * before it (APP_ORIGIN/diagrams/:id/compare?a=N-1&b=N), or to the revision itself for a first revision.
 */
import type { ReviewDecision } from '../../shared/schemas/reviews';
import { escapeHtml, type OutgoingMail } from '../mail/mailer';

export function revisionLink(appOrigin: string, diagramId: string, revision: number): string {
  const id = encodeURIComponent(diagramId);
  return revision > 1 ? `${appOrigin}/diagrams/${id}/compare?a=${revision - 1}&b=${revision}` : `${appOrigin}/diagrams/${id}/revisions/${revision}`;
}

export type ReviewNotice = {
  to: { id?: string; email: string; name: string };
  actor: { name: string };
  diagram: { id: string; name: string };
  projectName: string;
  revision: number;
  teamId: string;
} & (
  | { kind: 'review_requested' }
  | { kind: 'comment'; body: string; partId: string | null }
  | { kind: 'decision'; decision: ReviewDecision; body: string }
);

const SAFETY = 'Review in Bankwright checks a design against its rules; it is not an approval to install. Follow local codes and licensed practice.';

export function reviewNotice(appOrigin: string, n: ReviewNotice): OutgoingMail {
  const link = revisionLink(appOrigin, n.diagram.id, n.revision);
  const what = `${n.diagram.name}, revision ${n.revision} (${n.projectName})`;
  let subject: string;
  let lead: string;
  let quote = '';
  switch (n.kind) {
    case 'review_requested':
      subject = `Review requested: ${n.diagram.name} revision ${n.revision}`;
      lead = `${n.actor.name} asked you to review ${what}.`;
      break;
    case 'comment':
      subject = `New comment on ${n.diagram.name} revision ${n.revision}`;
      lead = `${n.actor.name} commented on ${what}${n.partId ? ` at ${n.partId}` : ''}:`;
      quote = n.body;
      break;
    case 'decision':
      subject = `${n.decision === 'approve' ? 'Approved' : 'Changes requested'}: ${n.diagram.name} revision ${n.revision}`;
      lead = n.decision === 'approve' ? `${n.actor.name} approved ${what}.` : `${n.actor.name} requested changes to ${what}.`;
      quote = n.body;
      break;
  }
  const text = `${lead}\n\n${quote ? `${quote}\n\n` : ''}Open it: ${link}\n\n${SAFETY}\n`;
  const html =
    `<p>${escapeHtml(lead)}</p>` +
    (quote ? `<blockquote>${escapeHtml(quote).replace(/\n/g, '<br>')}</blockquote>` : '') +
    `<p><a href="${escapeHtml(link)}">Open it in Bankwright</a></p><p><small>${escapeHtml(SAFETY)}</small></p>`;
  return { to: n.to.email, subject, text, html, teamId: n.teamId, ...(n.to.id ? { recipientId: n.to.id } : {}) };
}
