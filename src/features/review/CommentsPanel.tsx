/**
 * Review comments on a revision: threads (a first comment and its replies), on the diagram or pinned to
 * a part or cable (picked on the canvas or from the list), resolvable by their author or a designer.
 */
import { useMemo, useState } from 'react';
import type { DiagramDocument } from '@shared/diagram';
import { PART_TYPES } from '@shared/electrical/parts';
import { can, type Role } from '@shared/roles';
import { Button } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { Skeleton } from '@/components/States';
import { errorMessage } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import type { ReviewComment } from '@/features/revisions/api';
import { useAddComment, useComments, useResolveComment } from '@/features/revisions/hooks';

export interface Thread {
  root: ReviewComment;
  replies: ReviewComment[];
}

/** Threads in order of their first comment; replies oldest first. */
export function threadsOf(comments: ReviewComment[]): Thread[] {
  const roots = comments.filter((c) => !c.parentId);
  const byRoot = new Map(roots.map((r) => [r.id, [] as ReviewComment[]]));
  for (const c of comments) if (c.parentId) byRoot.get(c.parentId)?.push(c);
  return roots.map((root) => ({ root, replies: byRoot.get(root.id) ?? [] }));
}

/** Open (unresolved) threads per pinned part or cable id, for the canvas markers. */
export function openPins(comments: ReviewComment[] | undefined): Map<string, number> {
  const out = new Map<string, number>();
  for (const t of threadsOf(comments ?? [])) {
    if (t.root.partId && !t.root.resolved) out.set(t.root.partId, (out.get(t.root.partId) ?? 0) + 1);
  }
  return out;
}

export function targetsOf(doc: DiagramDocument) {
  return [
    ...doc.parts.map((p) => ({ id: p.id, label: `${p.label || p.id} (${PART_TYPES[p.type].name.toLowerCase()})` })),
    ...doc.cables.map((c) => ({ id: c.id, label: `${c.label || c.id} (cable ${c.from.part}.${c.from.terminal} – ${c.to.part}.${c.to.terminal})` })),
  ];
}

export interface CommentsPanelProps {
  diagramId: string;
  projectId: string;
  revision: number;
  doc: DiagramDocument;
  role: Role;
  meId: string;
  /** The part or cable picked on the canvas (pins a new comment there). */
  picked: string | null;
  onPick: (id: string | null) => void;
  /** Frame a pinned part on the canvas. */
  onShow?: (id: string) => void;
}

export function CommentsPanel({ diagramId, projectId, revision, doc, role, meId, picked, onPick, onShow }: CommentsPanelProps) {
  const comments = useComments(diagramId, revision);
  const add = useAddComment(diagramId, revision, projectId);
  const [body, setBody] = useState('');
  const [showResolved, setShowResolved] = useState(false);
  const targets = useMemo(() => targetsOf(doc), [doc]);
  const labelOf = useMemo(() => new Map(targets.map((t) => [t.id, t.label])), [targets]);
  const mayComment = can(role, 'review.comment');
  const threads = threadsOf(comments.data ?? []);
  const shown = showResolved ? threads : threads.filter((t) => !t.root.resolved);
  const resolvedCount = threads.length - threads.filter((t) => !t.root.resolved).length;

  return (
    <section aria-labelledby="comments-heading" className="space-y-3">
      <div className="flex items-center justify-between gap-2">
        <h3 id="comments-heading" className="text-[13px] font-semibold text-graphite-800">
          Comments <span className="font-mono text-graphite-500">({threads.length - resolvedCount} open)</span>
        </h3>
        {resolvedCount ? (
          <label className="flex items-center gap-1 text-[12px] text-graphite-600">
            <input type="checkbox" checked={showResolved} onChange={(e) => setShowResolved(e.target.checked)} className="accent-copper-600" />
            Show resolved ({resolvedCount})
          </label>
        ) : null}
      </div>

      {mayComment ? (
        <form
          aria-label="New comment"
          className="space-y-2 rounded-md border border-graphite-200 bg-white p-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (!body.trim()) return;
            add.mutate({ body: body.trim(), ...(picked ? { partId: picked } : {}) }, { onSuccess: () => { setBody(''); onPick(null); } });
          }}
        >
          <label className="block text-[12px] font-medium text-graphite-700" htmlFor="comment-pin">
            Pin to (or click a part on the canvas)
          </label>
          <select
            id="comment-pin"
            value={picked ?? ''}
            onChange={(e) => onPick(e.target.value || null)}
            className="h-8 w-full rounded-md border border-graphite-300 bg-white px-2 text-[13px]"
          >
            <option value="">The whole diagram</option>
            {targets.map((t) => (
              <option key={t.id} value={t.id}>{t.label}</option>
            ))}
          </select>
          <label className="sr-only" htmlFor="comment-body">Comment</label>
          <textarea
            id="comment-body"
            value={body}
            onChange={(e) => setBody(e.target.value)}
            maxLength={4000}
            rows={2}
            placeholder={picked ? `Comment on ${labelOf.get(picked) ?? picked}` : 'Comment on the diagram'}
            className="w-full rounded-md border border-graphite-300 px-2 py-1.5 text-[13px]"
          />
          {add.error ? <Notice signal="error">{errorMessage(add.error)}</Notice> : null}
          <Button type="submit" size="sm" variant="primary" disabled={!body.trim()} pending={add.isPending}>
            Add comment
          </Button>
        </form>
      ) : null}

      {comments.isPending ? <Skeleton className="h-16 w-full" /> : null}
      {comments.isError ? <Notice signal="error">{errorMessage(comments.error)}</Notice> : null}
      {comments.data && shown.length === 0 ? <p className="text-[12px] text-graphite-500">No open comments.</p> : null}
      <ul aria-label="Comment threads" className="space-y-2">
        {shown.map((t) => (
          <ThreadView
            key={t.root.id}
            thread={t}
            diagramId={diagramId}
            projectId={projectId}
            revision={revision}
            pinLabel={t.root.partId ? labelOf.get(t.root.partId) ?? t.root.partId : null}
            mayComment={mayComment}
            mayResolve={t.root.author?.id === meId || can(role, 'diagram.edit')}
            onShow={onShow}
          />
        ))}
      </ul>
    </section>
  );
}

function ThreadView({ thread, diagramId, projectId, revision, pinLabel, mayComment, mayResolve, onShow }: {
  thread: Thread; diagramId: string; projectId: string; revision: number; pinLabel: string | null; mayComment: boolean; mayResolve: boolean; onShow?: (id: string) => void;
}) {
  const [reply, setReply] = useState('');
  const [replying, setReplying] = useState(false);
  const add = useAddComment(diagramId, revision, projectId);
  const resolve = useResolveComment(diagramId, revision);
  const { root, replies } = thread;
  return (
    <li className={`rounded-md border px-3 py-2 text-[13px] ${root.resolved ? 'border-graphite-200 bg-graphite-50 text-graphite-600' : 'border-graphite-200 bg-white'}`}>
      <div className="flex flex-wrap items-center gap-x-2 gap-y-1 text-[12px] text-graphite-500">
        {pinLabel ? (
          <button type="button" className="inline-flex items-center gap-1 rounded border border-copper-300 bg-copper-50 px-1 font-medium text-copper-800 hover:bg-copper-100" onClick={() => root.partId && onShow?.(root.partId)}>
            ▸ {pinLabel}
          </button>
        ) : (
          <span className="rounded border border-graphite-200 px-1">Diagram</span>
        )}
        {root.resolved ? <span className="font-semibold text-ok-700">✓ Resolved{root.resolvedBy ? ` by ${root.resolvedBy.name}` : ''}</span> : null}
      </div>
      <CommentBody c={root} />
      {replies.length ? (
        <ul className="mt-1 space-y-1 border-l-2 border-graphite-200 pl-3">
          {replies.map((r) => (
            <li key={r.id}><CommentBody c={r} /></li>
          ))}
        </ul>
      ) : null}
      <div className="mt-1.5 flex flex-wrap gap-1.5">
        {mayComment && !root.resolved ? (
          <Button size="sm" variant="ghost" onClick={() => setReplying((v) => !v)}>Reply</Button>
        ) : null}
        {mayResolve ? (
          <Button size="sm" variant="ghost" pending={resolve.isPending} onClick={() => resolve.mutate({ commentId: root.id, resolved: !root.resolved })}>
            {root.resolved ? 'Reopen' : 'Resolve'}
          </Button>
        ) : null}
      </div>
      {replying ? (
        <form
          className="mt-1.5 space-y-1.5"
          onSubmit={(e) => {
            e.preventDefault();
            if (!reply.trim()) return;
            add.mutate({ body: reply.trim(), parentId: root.id }, { onSuccess: () => { setReply(''); setReplying(false); } });
          }}
        >
          <label className="sr-only" htmlFor={`reply-${root.id}`}>Reply</label>
          <textarea id={`reply-${root.id}`} value={reply} onChange={(e) => setReply(e.target.value)} rows={2} maxLength={4000} className="w-full rounded-md border border-graphite-300 px-2 py-1.5 text-[13px]" />
          {add.error ? <Notice signal="error">{errorMessage(add.error)}</Notice> : null}
          <Button type="submit" size="sm" disabled={!reply.trim()} pending={add.isPending}>Send reply</Button>
        </form>
      ) : null}
      {resolve.error ? <Notice signal="error" className="mt-1">{errorMessage(resolve.error)}</Notice> : null}
    </li>
  );
}

function CommentBody({ c }: { c: ReviewComment }) {
  return (
    <div className="mt-1">
      <div className="text-[12px]">
        <span className="font-semibold text-graphite-800">{c.author?.name ?? 'A former member'}</span>{' '}
        <span className="text-graphite-500">{formatDateTime(c.createdAt)}</span>
      </div>
      <p className="whitespace-pre-line">{c.body}</p>
    </div>
  );
}
