import { useEffect, useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import { can } from '@shared/roles';
import { NotFoundPage } from '@/app/NotFound';
import { Button } from '@/components/Button';
import { ConfirmDialog } from '@/components/ConfirmDialog';
import { ChevronRightIcon, DiagramIcon, PencilIcon, TrashIcon } from '@/components/icons';
import { PageHeader } from '@/components/PageHeader';
import { EmptyState, ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { isApiError } from '@/lib/api';
import { rememberTeam } from '@/lib/currentTeam';
import { formatDateTime, plural } from '@/lib/format';
import { useSignedInMe } from '../auth/hooks';
import { NewDiagramButton } from './NewDiagramButton';
import { DiagramMenu } from './DiagramMenu';
import { ActivityList } from '../activity/ActivityList';
import { UploadsSection } from '../uploads/UploadsSection';
import { RevisionStateBadge } from '../revisions/RevisionStateBadge';
import type { Project } from './api';
import { useDeleteProject, useDiagrams, useProject } from './hooks';
import { EditProjectDialog } from './ProjectFormDialog';

export function ProjectPage() {
  const { projectId = '' } = useParams();
  const project = useProject(projectId);
  const me = useSignedInMe();

  const teamId = project.data?.teamId;
  useEffect(() => {
    if (teamId) rememberTeam(teamId);
  }, [teamId]);

  if (project.isPending) {
    return (
      <LoadingRegion label="Loading project">
        <Skeleton className="mb-2 h-3 w-24" />
        <Skeleton className="mb-6 h-6 w-64" />
        <Skeleton className="h-40 w-full" />
      </LoadingRegion>
    );
  }
  if (project.isError) {
    if (isApiError(project.error) && project.error.status === 404) return <NotFoundPage what="project" />;
    return <ErrorState title="Could not load this project" error={project.error} onRetry={() => project.refetch()} retrying={project.isFetching} />;
  }
  const membership = me.teams.find((t) => t.id === project.data.teamId);
  return <ProjectView project={project.data} teamName={membership?.name ?? ''} mayEdit={can(membership?.role, 'project.edit')} mayImport={can(membership?.role, 'diagram.edit')} />;
}

function ProjectView({ project, teamName, mayEdit, mayImport }: { project: Project; teamName: string; mayEdit: boolean; mayImport: boolean }) {
  const diagrams = useDiagrams(project.id);
  const navigate = useNavigate();
  const [editing, setEditing] = useState(false);
  const [deleting, setDeleting] = useState(false);
  const remove = useDeleteProject(project);

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-1 text-xs text-graphite-500">
        <Link to={`/teams/${project.teamId}/projects`} className="hover:text-graphite-800 hover:underline">
          {teamName || 'Projects'}
        </Link>
        <span aria-hidden="true" className="mx-1.5">/</span>
        <span aria-current="page">{project.name}</span>
      </nav>
      <PageHeader
        title={project.name}
        description={
          <>
            {project.site ? <span className="font-medium text-graphite-700">{project.site}</span> : <span>No site given</span>}
            {project.description ? <p className="mt-1 max-w-3xl whitespace-pre-line">{project.description}</p> : null}
          </>
        }
        actions={
          mayEdit || mayImport ? (
            <>
              {mayImport ? <NewDiagramButton projectId={project.id} /> : null}
              {mayEdit ? <>
              <Button onClick={() => setEditing(true)}>
                <PencilIcon size={14} /> Edit
              </Button>
              <Button variant="danger-outline" onClick={() => setDeleting(true)}>
                <TrashIcon size={14} /> Delete
              </Button>
              </> : null}
            </>
          ) : null
        }
      />

      <section aria-labelledby="diagrams-heading">
        <h2 id="diagrams-heading" className="mb-2 text-[13px] font-semibold tracking-wide text-graphite-600 uppercase">
          Diagrams
        </h2>
        {diagrams.isPending ? (
          <LoadingRegion label="Loading diagrams">
            <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
              {[0, 1, 2].map((i) => (
                <div key={i} className="space-y-2 rounded-lg border border-graphite-200 bg-white p-4">
                  <Skeleton className="h-4 w-2/3" />
                  <Skeleton className="h-3 w-1/3" />
                </div>
              ))}
            </div>
          </LoadingRegion>
        ) : diagrams.isError ? (
          <ErrorState title="Could not load diagrams" error={diagrams.error} onRetry={() => diagrams.refetch()} retrying={diagrams.isFetching} />
        ) : diagrams.data.length === 0 ? (
          <EmptyState icon={<DiagramIcon size={32} />} title="No diagrams in this project">
            Diagrams of the bank — batteries, busbars, fuses and cable runs — will be listed here.
            {mayImport ? <> Start one with <strong className="font-semibold">New diagram…</strong>: blank, from a template, or from a file.</> : null}
          </EmptyState>
        ) : (
          <ul aria-label="Diagrams" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            {diagrams.data.map((d) => (
              <li key={d.id} className="group relative flex h-full flex-col rounded-lg border border-graphite-200 bg-white p-4 shadow-xs hover:border-copper-300 hover:shadow-sm">
                <span className="flex items-center gap-2">
                  <DiagramIcon size={16} className="text-copper-600" />
                  {/* The whole card opens the editor; the history link sits above that link. */}
                  <Link to={`/diagrams/${d.id}`} className="min-w-0 flex-1 truncate font-medium text-graphite-950 after:absolute after:inset-0 after:content-['']">
                    {d.name}
                  </Link>
                  <ChevronRightIcon size={16} className="text-graphite-400 group-hover:text-copper-600" />
                </span>
                {d.description ? <span className="mt-1 line-clamp-2 text-[13px] text-graphite-600">{d.description}</span> : null}
                <span className="relative z-10 mt-2 flex flex-wrap items-center gap-2 text-xs">
                  {d.latestRevision ? (
                    <RevisionStateBadge state={d.latestRevision.state} number={d.latestRevision.number} />
                  ) : (
                    <span className="text-graphite-500">No revision saved</span>
                  )}
                  <Link to={`/diagrams/${d.id}/history`} className="text-graphite-600 underline-offset-2 hover:text-graphite-900 hover:underline">
                    History
                  </Link>
                  {mayImport ? (
                    <DiagramMenu
                      diagram={{ id: d.id, name: d.name, projectId: project.id, teamId: project.teamId }}
                      withNew={false}
                      label={`Move or copy ${d.name}`}
                      button="Move or copy…"
                      buttonClassName="text-graphite-600 underline-offset-2 hover:text-graphite-900 hover:underline"
                    />
                  ) : null}
                </span>
                <span className="mt-auto flex justify-between gap-2 pt-3 text-xs text-graphite-500">
                  <span className="font-mono">{plural(d.partCount, 'part')}</span>
                  <span>Updated {formatDateTime(d.updatedAt)}</span>
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <UploadsSection projectId={project.id} teamId={project.teamId} />

      <section aria-labelledby="activity-heading" className="mt-8">
        <h2 id="activity-heading" className="mb-2 text-[13px] font-semibold tracking-wide text-graphite-600 uppercase">
          Activity
        </h2>
        <ActivityList projectId={project.id} />
      </section>

      {mayEdit ? (
        <>
          <EditProjectDialog key={project.updatedAt} project={project} open={editing} onClose={() => setEditing(false)} />
          <ConfirmDialog
            open={deleting}
            onClose={() => {
              remove.reset();
              setDeleting(false);
            }}
            onConfirm={() => remove.mutate(undefined, { onSuccess: () => navigate(`/teams/${project.teamId}/projects`, { replace: true }) })}
            title="Delete project?"
            confirmLabel="Delete project"
            pending={remove.isPending}
            error={remove.error}
          >
            <p>
              <strong className="font-semibold text-graphite-900">{project.name}</strong> and its{' '}
              {diagrams.data ? plural(diagrams.data.length, 'diagram') : 'diagrams'} will be deleted for everyone in the team. This
              cannot be undone.
            </p>
          </ConfirmDialog>
        </>
      ) : null}
    </>
  );
}
