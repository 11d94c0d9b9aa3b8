/**
 * Move a diagram to another project of its team (it keeps its revisions and history), or copy its
 * working copy into one (a new diagram named "… (copy)"). POST /api/diagrams/:id/move and /copy.
 */
import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { copyName } from '@shared/schemas/diagrams';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { SelectField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { serverFormErrors } from '@/lib/forms';
import { copyDiagram, moveDiagram } from './api';
import { projectKeys, useProjects } from './hooks';

export interface MovableDiagram {
  id: string;
  name: string;
  projectId: string;
  teamId: string;
}

export function MoveCopyDialog({ diagram, mode, open, onClose }: { diagram: MovableDiagram; mode: 'move' | 'copy'; open: boolean; onClose: () => void }) {
  const projects = useProjects(diagram.teamId);
  const choices = (projects.data ?? []).filter((p) => mode === 'copy' || p.id !== diagram.projectId);
  const [picked, setPicked] = useState('');
  const target = picked || (mode === 'copy' ? diagram.projectId : (choices[0]?.id ?? ''));
  const qc = useQueryClient();
  const navigate = useNavigate();
  const run = useMutation({
    mutationFn: () => (mode === 'move' ? moveDiagram(diagram.id, target) : copyDiagram(diagram.id, target)),
    onSuccess: async (result) => {
      await Promise.all([
        qc.invalidateQueries({ queryKey: projectKeys.diagrams(diagram.projectId) }),
        qc.invalidateQueries({ queryKey: projectKeys.diagrams(target) }),
        qc.invalidateQueries({ queryKey: ['diagrams', 'detail', diagram.id] }),
      ]);
      close();
      if (mode === 'copy') navigate(`/diagrams/${result.id}`);
    },
  });
  const errors = serverFormErrors(run.error);

  function close() {
    setPicked('');
    run.reset();
    onClose();
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    if (target) run.mutate();
  }

  const title = mode === 'move' ? 'Move to another project' : 'Copy to a project';
  return (
    <Dialog
      open={open}
      onClose={close}
      title={title}
      description={
        mode === 'move'
          ? `${diagram.name} moves with its revisions, reviews and comments. Links to it keep working.`
          : `A new diagram, “${copyName(diagram.name)}”, from the current working copy. Revisions and reviews stay with the original.`
      }
    >
      <form onSubmit={submit} className="space-y-4">
        {projects.isPending ? <p className="text-[13px] text-graphite-600">Loading the team's projects…</p> : null}
        {projects.isError ? <Notice signal="error">The projects could not be loaded.</Notice> : null}
        {projects.data && choices.length === 0 ? (
          <Notice signal="note">There is no other project in this team. Create one on the Projects page first.</Notice>
        ) : null}
        {choices.length ? (
          <SelectField label="Project" value={target} onChange={(e) => setPicked(e.target.value)} errors={errors.fieldErrors.projectId} data-autofocus>
            {choices.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
                {p.id === diagram.projectId ? ' (this project)' : ''}
              </option>
            ))}
          </SelectField>
        ) : null}
        {errors.formError ? <Notice signal="error">{errors.formError}</Notice> : null}
        <DialogActions>
          <Button variant="ghost" onClick={close}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={run.isPending} disabled={!target}>
            {mode === 'move' ? 'Move' : 'Copy and open'}
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
