/** API bodies for reviews: review requests, comments, decisions. */
import { z } from 'zod';

export const reviewRequestSchema = z.object({
  reviewerIds: z
    .array(z.string().min(1, 'Reviewer id is required'))
    .min(1, 'Choose at least one reviewer')
    .max(20, 'At most 20 reviewers')
    .refine((ids) => new Set(ids).size === ids.length, { message: 'A reviewer is listed twice' }),
});
export type ReviewRequestInput = z.input<typeof reviewRequestSchema>;

export const commentSchema = z.object({
  body: z.string().trim().min(1, 'Write a comment').max(4000, 'Comment is too long'),
  /** Pin the comment to a part (or cable) of the revision by its diagram id. */
  partId: z.string().min(1).max(64).optional(),
  /** Reply to this comment (replies join the thread of its first comment). */
  parentId: z.string().min(1).optional(),
});
export type CommentInput = z.input<typeof commentSchema>;

export const resolveCommentSchema = z.object({ resolved: z.boolean({ error: 'resolved must be true or false' }) });
export type ResolveCommentInput = z.input<typeof resolveCommentSchema>;

export const REVIEW_DECISIONS = ['approve', 'request_changes'] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];

export const decisionSchema = z.object({
  decision: z.enum(REVIEW_DECISIONS, { error: 'Choose approve or request changes' }),
  note: z.string().trim().max(2000, 'Note is too long').default(''),
});
export type DecisionInput = z.input<typeof decisionSchema>;
