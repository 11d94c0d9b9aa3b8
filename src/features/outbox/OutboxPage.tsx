import { useState } from 'react';
import { can } from '@shared/roles';
import { NotFoundPage } from '@/app/NotFound';
import { Button } from '@/components/Button';
import { InboxIcon, MailIcon, RefreshIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { EmptyState, ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { formatDateTime } from '@/lib/format';
import { useSignedInMe } from '../auth/hooks';
import { useCurrentTeam } from '../teams/hooks';
import type { OutboxMessage } from './api';
import { useOutbox } from './hooks';
import { useOwnOutbox } from '../home/hooks';

/** Mail this server would have sent, captured locally because no SMTP server is configured. */
export function OutboxPage() {
  const me = useSignedInMe();
  const { team } = useCurrentTeam();
  const current = team!;
  const allowed = me.mailMode === 'outbox';
  // Every user reads the mail captured for them; owners may also read the team's whole outbox.
  const teamScope = allowed && can(current.role, 'outbox.read');
  const [view, setView] = useState<'mine' | 'team'>(teamScope ? 'team' : 'mine');
  const teamOutbox = useOutbox(current.id, teamScope && view === 'team');
  const ownOutbox = useOwnOutbox(allowed && view === 'mine');
  const outbox = view === 'team' ? teamOutbox : ownOutbox;
  const [openId, setOpenId] = useState<string | null>(null);

  if (!allowed) return <NotFoundPage />;

  const messages = outbox.data ?? [];
  const open = messages.find((m) => m.id === openId) ?? null;

  return (
    <>
      <PageHeader
        eyebrow={current.name}
        title={teamScope ? 'Outbox' : 'Your mail'}
        actions={
          <>
            {teamScope ? (
              <div role="group" aria-label="Whose mail" className="inline-flex overflow-hidden rounded-md border border-graphite-300">
                {(['mine', 'team'] as const).map((v) => (
                  <button
                    key={v}
                    type="button"
                    aria-pressed={view === v}
                    onClick={() => {
                      setView(v);
                      setOpenId(null);
                    }}
                    className={`h-9 px-3 text-sm font-medium ${view === v ? 'bg-graphite-900 text-white' : 'bg-white text-graphite-800 hover:bg-graphite-50'}`}
                  >
                    {v === 'mine' ? 'Your mail' : 'All team mail'}
                  </button>
                ))}
              </div>
            ) : null}
          <Button onClick={() => outbox.refetch()} pending={outbox.isFetching && !outbox.isPending}>
            {outbox.isFetching && !outbox.isPending ? null : <RefreshIcon size={14} />} Refresh
          </Button>
          </>
        }
      />
      <Notice signal="note" className="mb-4">
        This server has no mail server configured, so e-mails (invites and review notices) are kept here instead of being sent.
        {view === 'mine' ? ' These are the messages addressed to you.' : ' Copy an invite link from a message to hand it over.'}
      </Notice>
      {outbox.isPending ? (
        <LoadingRegion label="Loading messages">
          <div className="space-y-2">
            {[0, 1, 2].map((i) => (
              <Skeleton key={i} className="h-12 w-full" />
            ))}
          </div>
        </LoadingRegion>
      ) : outbox.isError ? (
        <ErrorState title="Could not load the outbox" error={outbox.error} onRetry={() => outbox.refetch()} retrying={outbox.isFetching} />
      ) : messages.length === 0 ? (
        <EmptyState icon={<InboxIcon size={32} />} title="No messages">
          {view === 'mine' ? 'Review requests, comments and decisions addressed to you appear here.' : 'Invites and review notices about this team appear here.'}
        </EmptyState>
      ) : (
        <div className="grid items-start gap-4 lg:grid-cols-[22rem_1fr]">
          <ul aria-label="Messages" className="divide-y divide-graphite-100 overflow-hidden rounded-lg border border-graphite-200 bg-white shadow-xs">
            {messages.map((m) => {
              const selected = m.id === open?.id;
              return (
                <li key={m.id}>
                  <button
                    type="button"
                    aria-pressed={selected}
                    onClick={() => setOpenId(m.id)}
                    className={`block w-full px-4 py-2.5 text-left focus-visible:outline-offset-[-2px] ${
                      selected ? 'bg-copper-50 shadow-[inset_3px_0_0_var(--color-copper-500)]' : 'hover:bg-graphite-50'
                    }`}
                  >
                    <span className="block truncate text-[13px] font-medium text-graphite-950">{m.subject}</span>
                    <span className="flex justify-between gap-2 text-xs text-graphite-500">
                      <span className="truncate font-mono">{m.to}</span>
                      <span className="shrink-0">{formatDateTime(m.createdAt)}</span>
                    </span>
                  </button>
                </li>
              );
            })}
          </ul>
          {open ? (
            <MessageView message={open} />
          ) : (
            <div className="hidden rounded-lg border border-dashed border-graphite-300 p-10 text-center text-sm text-graphite-500 lg:block">
              <MailIcon size={24} className="mx-auto mb-2 text-graphite-400" />
              Choose a message to read it.
            </div>
          )}
        </div>
      )}
    </>
  );
}

const URL_RE = /(https?:\/\/[^\s<>"]+)/g;

/** The plain-text body with its links made clickable; the HTML body is never injected. */
function MessageView({ message }: { message: OutboxMessage }) {
  const parts = message.text.split(URL_RE);
  return (
    <article aria-label={message.subject} className="rounded-lg border border-graphite-200 bg-white shadow-xs">
      <header className="border-b border-graphite-100 px-5 py-3">
        <h2 className="text-[15px] font-semibold">{message.subject}</h2>
        <dl className="mt-1 grid grid-cols-[4rem_1fr] gap-y-0.5 text-xs text-graphite-600">
          <dt>To</dt>
          <dd className="font-mono">{message.to}</dd>
          <dt>Captured</dt>
          <dd>{formatDateTime(message.createdAt)}</dd>
        </dl>
      </header>
      <div className="px-5 py-4 font-mono text-[13px] leading-5 whitespace-pre-wrap text-graphite-800">
        {parts.map((part, i) =>
          i % 2 === 1 ? (
            <a key={i} href={part} className="break-all text-copper-700 underline underline-offset-2">
              {part}
            </a>
          ) : (
            <span key={i}>{part}</span>
          ),
        )}
      </div>
    </article>
  );
}
