import { useState } from 'react';
import { Link, useNavigate } from 'react-router';
import { can } from '@shared/roles';
import { Button } from '@/components/Button';
import { ChevronRightIcon, DiagramIcon, FolderIcon, PlusIcon } from '@/components/icons';
import { PageHeader } from '@/components/PageHeader';
import { WorkPanel } from '@/features/home/WorkPanel';
import { EmptyState, ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { formatDate, plural } from '@/lib/format';
import { useCurrentTeam } from '../teams/hooks';
import { useProjects } from './hooks';
import { CreateProjectDialog } from './ProjectFormDialog';

export function ProjectListPage() {
  const { team } = useCurrentTeam();
  // TeamScope guarantees a known team here.
  const current = team!;
  const projects = useProjects(current.id);
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);
  const mayCreate = can(current.role, 'project.create');

  const newButton = mayCreate ? (
    <Button variant="primary" onClick={() => setCreating(true)}>
      <PlusIcon size={14} /> New project
    </Button>
  ) : null;

  return (
    <>
      <PageHeader eyebrow={current.name} title="Projects" actions={newButton} />
      <WorkPanel />
      {projects.isPending ? (
        <LoadingRegion label="Loading projects">
          <ul className="divide-y divide-graphite-100 overflow-hidden rounded-lg border border-graphite-200 bg-white">
            {[0, 1, 2, 3].map((i) => (
              <li key={i} className="flex items-center gap-4 px-4 py-3.5">
                <Skeleton className="size-8" />
                <div className="flex-1 space-y-2">
                  <Skeleton className="h-3.5 w-1/3" />
                  <Skeleton className="h-3 w-1/5" />
                </div>
                <Skeleton className="h-3 w-20" />
              </li>
            ))}
          </ul>
        </LoadingRegion>
      ) : projects.isError ? (
        <ErrorState title="Could not load projects" error={projects.error} onRetry={() => projects.refetch()} retrying={projects.isFetching} />
      ) : projects.data.length === 0 ? (
        <EmptyState
          icon={<FolderIcon size={32} />}
          title="No projects yet"
          action={newButton}
        >
          {mayCreate
            ? 'A project holds the diagrams for one site: a cabin bank, a vessel, a telecom shelter.'
            : 'Projects appear here once a designer or owner of this team creates one.'}
        </EmptyState>
      ) : (
        <ul aria-label="Projects" className="divide-y divide-graphite-100 overflow-hidden rounded-lg border border-graphite-200 bg-white shadow-xs">
          {projects.data.map((project) => (
            <li key={project.id}>
              <Link
                to={`/projects/${project.id}`}
                className="group flex items-center gap-4 px-4 py-3 hover:bg-graphite-50 focus-visible:bg-copper-50 focus-visible:outline-offset-[-2px]"
              >
                <span className="flex size-8 shrink-0 items-center justify-center rounded-md bg-graphite-100 text-graphite-600 group-hover:bg-copper-100 group-hover:text-copper-700">
                  <FolderIcon size={16} />
                </span>
                <span className="min-w-0 flex-1">
                  <span className="block truncate font-medium text-graphite-950">{project.name}</span>
                  <span className="block truncate text-[13px] text-graphite-500">{project.site || 'No site given'}</span>
                </span>
                {project.diagramCount !== undefined ? (
                  <span className="hidden items-center gap-1 text-[13px] text-graphite-600 sm:flex">
                    <DiagramIcon size={14} className="text-graphite-400" />
                    {plural(project.diagramCount, 'diagram')}
                  </span>
                ) : null}
                <span className="hidden w-32 text-right text-xs text-graphite-500 md:block">Updated {formatDate(project.updatedAt)}</span>
                <ChevronRightIcon size={16} className="text-graphite-400" />
              </Link>
            </li>
          ))}
        </ul>
      )}
      {mayCreate ? (
        <CreateProjectDialog
          teamId={current.id}
          open={creating}
          onClose={() => setCreating(false)}
          onCreated={(project) => navigate(`/projects/${project.id}`)}
        />
      ) : null}
    </>
  );
}
