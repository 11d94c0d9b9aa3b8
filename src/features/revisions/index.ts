/** What other features (the editor) mount from revisions. */
export { SaveRevisionButton, type SaveRevisionButtonProps } from './SaveRevisionButton';
export { ConflictDialog, type ConflictDialogProps } from './ConflictDialog';
export { RevisionStateBadge } from './RevisionStateBadge';
export { readUnsaved, clearUnsaved, stashUnsaved, type UnsavedRevision } from './stash';
export type { Revision, RevisionMeta, RevisionConflict } from './api';
