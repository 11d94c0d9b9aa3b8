import { Router } from 'express';
import { checkOptionsSchema, copyDiagramSchema, duplicateDiagramSchema, moveDiagramSchema, restoreRevisionSchema, saveRevisionSchema, updateDiagramSchema, workingCopySchema } from '../../shared/schemas/diagrams';
import { requireAuth, type AppDeps } from '../http/context';
import { ApiError, fieldErrors, notFound } from '../http/errors';
import { parse } from '../http/validate';
import type { Permission } from '../../shared/roles';
import type { Db } from '../db/client';
import { commentSchema, decisionSchema, resolveCommentSchema, reviewRequestSchema } from '../../shared/schemas/reviews';
import { addComment, decide, listComments, requestReview, setCommentResolved } from '../services/reviews';
import { requireDiagramRole, requireProjectRole } from '../services/access';
import { copyDiagram, deleteDiagram, moveDiagram, saveAnnotations, saveWorkingCopy, updateDiagram, workingCopyContent } from '../services/diagrams';
import { annotationsBodySchema } from '../../shared/diagram/annotations';
import { checkDiagram } from '../services/checks';
import { duplicateDiagram, findRevision, getDiagramWithLatest, getRevision, listRevisions, restoreRevision, savedRevisionJson, saveRevision } from '../services/revisions';
import { prepareRevision, revisionContentErrors } from '../services/summaries';
import type { FieldErrors } from '../../shared/schemas/errors';

/** The save body without its document: the document is validated in the analysis worker pool. */
const saveRevisionEnvelopeSchema = saveRevisionSchema.omit({ content: true });

const fieldsNeedAttention = (fields: FieldErrors) => new ApiError(400, 'validation_failed', 'Some fields need attention.', { fields });

/** A revision number from the URL: 1, 2, … (anything else names no revision). */
export function revisionNumber(raw: string): number {
  if (!/^[1-9][0-9]{0,8}$/.test(raw)) throw notFound('No such revision.');
  return Number(raw);
}

/** The caller's access to a diagram (404 / 403) and the revision named in the URL (404). */
async function revisionAccess(db: Db, userId: string, diagramId: string, n: string, permission: Permission) {
  const access = await requireDiagramRole(db, userId, diagramId, permission);
  const revision = await findRevision(db, diagramId, revisionNumber(n));
  return { ...access, revision };
}

export function diagramRoutes(deps: AppDeps): Router {
  const { db, mailer, config, analysis } = deps;
  const r = Router();

  r.get('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    const { role } = await requireDiagramRole(db, user.id, req.params.id, 'project.read');
    res.json({ diagram: await getDiagramWithLatest(db, req.params.id), role });
  });

  r.put('/:id/working-copy', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(workingCopySchema, req.body);
    res.json(await saveWorkingCopy(db, user.id, req.params.id, input.content, input.baseVersion));
  });

  r.put('/:id/annotations', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.annotate');
    // Strict: a body carrying parts, cables or settings is refused, not silently ignored.
    const input = parse(annotationsBodySchema.strict(), req.body);
    res.json(await saveAnnotations(db, user.id, req.params.id, input.annotations, input.baseVersion));
  });

  r.patch('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(updateDiagramSchema, req.body);
    res.json({ diagram: await updateDiagram(db, user.id, req.params.id, input) });
  });

  r.delete('/:id', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    await deleteDiagram(db, user.id, req.params.id);
    res.status(204).end();
  });

  r.post('/:id/duplicate', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(duplicateDiagramSchema, req.body);
    res.status(201).json({ diagram: await duplicateDiagram(db, user.id, req.params.id, input) });
  });

  // Move or copy to another project of the same team: `diagram.edit` on the diagram's project and on
  // the target (a target in a team the caller is not in answers 404, like any other resource there).
  r.post('/:id/move', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(moveDiagramSchema, req.body);
    const target = await requireProjectRole(db, user.id, input.projectId, 'diagram.edit');
    res.json({ diagram: await moveDiagram(db, user.id, req.params.id, target.project) });
  });

  r.post('/:id/copy', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const input = parse(copyDiagramSchema, req.body);
    const target = await requireProjectRole(db, user.id, input.projectId, 'diagram.edit');
    res.status(201).json({ diagram: await copyDiagram(db, user.id, req.params.id, target.project, input.name) });
  });

  // The analysis of sent content (unsaved edits) or of the working copy, in a worker thread; nothing is stored.
  r.post('/:id/check', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'project.read');
    const input = parse(checkOptionsSchema, req.body);
    const fromRequest = input.content !== undefined;
    const checked = await checkDiagram(analysis, {
      content: fromRequest ? input.content : await workingCopyContent(db, req.params.id),
      source: fromRequest ? 'request' : 'working_copy',
      mode: input.mode,
      fault: input.fault,
    });
    // The result is already JSON (serialised in the worker): sent as is, not parsed and re-serialised here.
    res
      .type('json')
      .send(`{"analysis":${checked.analysisJson},"source":"${fromRequest ? 'request' : 'working_copy'}","elements":${checked.elements}}`);
  });

  r.get('/:id/revisions', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'project.read');
    res.json({ revisions: await listRevisions(db, req.params.id) });
  });

  // saveRevisionSchema, checked in two places: the message and base here, the document (zod on a
  // 2,000-part document costs tens of milliseconds) in a worker along with its analysis, hash and JSON.
  r.post('/:id/revisions', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const body: unknown = req.body ?? {};
    if (typeof body !== 'object' || body === null || Array.isArray(body)) parse(saveRevisionSchema, body); // throws: not an object
    const content = (body as { content?: unknown }).content;
    const envelope = saveRevisionEnvelopeSchema.safeParse(body);
    if (!envelope.success) throw fieldsNeedAttention({ ...fieldErrors(envelope.error), ...(await revisionContentErrors(content, analysis)) });
    const prepared = await prepareRevision(content, { validate: true }, analysis);
    if (!prepared.ok) throw fieldsNeedAttention(prepared.fields);
    const saved = await saveRevision(db, user.id, req.params.id, { ...envelope.data, prepared: prepared.revision });
    res.status(201).type('json').send(savedRevisionJson(saved));
  });

  r.get('/:id/revisions/:n', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'project.read');
    res.json({ revision: await getRevision(db, req.params.id, revisionNumber(req.params.n)) });
  });

  r.post('/:id/revisions/:n/restore', async (req, res) => {
    const { user } = requireAuth(res);
    await requireDiagramRole(db, user.id, req.params.id, 'diagram.edit');
    const n = revisionNumber(req.params.n);
    const input = parse(restoreRevisionSchema, req.body);
    res.status(201).type('json').send(savedRevisionJson(await restoreRevision(db, user.id, req.params.id, n, input.message, analysis)));
  });

  r.post('/:id/revisions/:n/review-requests', async (req, res) => {
    const { user } = requireAuth(res);
    const ctx = await revisionAccess(db, user.id, req.params.id, req.params.n, 'diagram.edit');
    const input = parse(reviewRequestSchema, req.body);
    res.json({ review: await requestReview(db, mailer, config.appOrigin, user, ctx, input.reviewerIds) });
  });

  r.get('/:id/revisions/:n/comments', async (req, res) => {
    const { user } = requireAuth(res);
    const ctx = await revisionAccess(db, user.id, req.params.id, req.params.n, 'project.read');
    res.json({ comments: await listComments(db, ctx.revision.id) });
  });

  r.post('/:id/revisions/:n/comments', async (req, res) => {
    const { user } = requireAuth(res);
    const ctx = await revisionAccess(db, user.id, req.params.id, req.params.n, 'review.comment');
    const input = parse(commentSchema, req.body);
    res.status(201).json({ comment: await addComment(db, mailer, config.appOrigin, user, ctx, input) });
  });

  r.patch('/:id/revisions/:n/comments/:commentId', async (req, res) => {
    const { user } = requireAuth(res);
    const ctx = await revisionAccess(db, user.id, req.params.id, req.params.n, 'review.comment');
    const input = parse(resolveCommentSchema, req.body);
    res.json({ comment: await setCommentResolved(db, user, ctx.role, ctx, req.params.commentId, input.resolved) });
  });

  r.post('/:id/revisions/:n/decision', async (req, res) => {
    const { user } = requireAuth(res);
    const ctx = await revisionAccess(db, user.id, req.params.id, req.params.n, 'review.decide');
    const input = parse(decisionSchema, req.body);
    res.json({ review: await decide(db, mailer, config.appOrigin, user, ctx, input) });
  });

  return r;
}
