import { useState, type FormEvent } from 'react';
import { createProjectSchema, updateProjectSchema } from '@shared/schemas/projects';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { TextAreaField, TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { parseForm, serverFormErrors } from '@/lib/forms';
import type { Project } from './api';
import { useCreateProject, useUpdateProject } from './hooks';

interface Values {
  name: string;
  site: string;
  description: string;
}

function ProjectFields({ values, setValues, fieldErrors }: { values: Values; setValues: (fn: (v: Values) => Values) => void; fieldErrors: FieldErrors }) {
  return (
    <>
      <TextField
        label="Project name"
        name="name"
        placeholder="e.g. Pump house 48 V bank"
        value={values.name}
        onChange={(e) => setValues((v) => ({ ...v, name: e.target.value }))}
        errors={fieldErrors.name}
        data-autofocus
      />
      <TextField
        label="Site"
        name="site"
        placeholder="Address, vessel or shelter"
        value={values.site}
        onChange={(e) => setValues((v) => ({ ...v, site: e.target.value }))}
        errors={fieldErrors.site}
      />
      <TextAreaField
        label="Description"
        name="description"
        rows={3}
        value={values.description}
        onChange={(e) => setValues((v) => ({ ...v, description: e.target.value }))}
        errors={fieldErrors.description}
      />
    </>
  );
}

export function CreateProjectDialog({ teamId, open, onClose, onCreated }: { teamId: string; open: boolean; onClose: () => void; onCreated: (p: Project) => void }) {
  const create = useCreateProject();
  const [values, setValues] = useState<Values>({ name: '', site: '', description: '' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const server = serverFormErrors(create.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };

  function close() {
    setValues({ name: '', site: '', description: '' });
    setClientErrors({});
    create.reset();
    onClose();
  }

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(createProjectSchema, { teamId, ...values });
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    create.mutate(parsed.data, {
      onSuccess: (project) => {
        close();
        onCreated(project);
      },
    });
  }

  return (
    <Dialog open={open} onClose={close} title="New project" description="A project groups the diagrams for one site or installation.">
      <form noValidate onSubmit={onSubmit} className="space-y-4" aria-label="New project">
        <div aria-live="assertive">{server.formError ? <Notice signal="error">{server.formError}</Notice> : null}</div>
        <ProjectFields values={values} setValues={setValues} fieldErrors={fieldErrors} />
        <DialogActions>
          <Button onClick={close} disabled={create.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={create.isPending}>
            Create project
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}

export function EditProjectDialog({ project, open, onClose }: { project: Project; open: boolean; onClose: () => void }) {
  const update = useUpdateProject(project.id);
  const initial = { name: project.name, site: project.site, description: project.description };
  const [values, setValues] = useState<Values>(initial);
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const server = serverFormErrors(update.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };

  function close() {
    setValues(initial);
    setClientErrors({});
    update.reset();
    onClose();
  }

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const changed = Object.fromEntries(Object.entries(values).filter(([k, v]) => v !== initial[k as keyof Values]));
    if (Object.keys(changed).length === 0) return close();
    const parsed = parseForm(updateProjectSchema, changed);
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    update.mutate(parsed.data, { onSuccess: () => onClose() });
  }

  return (
    <Dialog open={open} onClose={close} title="Edit project">
      <form noValidate onSubmit={onSubmit} className="space-y-4" aria-label="Edit project">
        <div aria-live="assertive">{server.formError ? <Notice signal="error">{server.formError}</Notice> : null}</div>
        <ProjectFields values={values} setValues={setValues} fieldErrors={fieldErrors} />
        <DialogActions>
          <Button onClick={close} disabled={update.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={update.isPending}>
            Save changes
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
