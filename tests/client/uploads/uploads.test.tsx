import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { meWith, mockApi, renderApp } from '../helpers';

const project = { id: 'p-1', teamId: 't-north', name: 'Harbour pump house', site: 'Pier 3', description: '', createdAt: '2025-03-01T10:00:00Z', updatedAt: '2025-03-01T10:00:00Z' };
const photo = {
  id: 'up-1', projectId: 'p-1', fileName: 'battery-box.jpg', contentType: 'image/jpeg', size: 345_000, width: 1600, height: 1200,
  uploadedBy: { id: 'u-sam', name: 'Sam Oduya' }, createdAt: '2025-04-02T09:30:00Z', contentUrl: '/api/uploads/up-1/content',
};
const sheet = {
  id: 'up-2', projectId: 'p-1', fileName: 'fuse holder.pdf', contentType: 'application/pdf', size: 2_400_000, width: null, height: null,
  uploadedBy: { id: 'u-dana', name: 'Dana Whitlock' }, createdAt: '2025-04-01T09:30:00Z', contentUrl: '/api/uploads/up-2/content',
};

function setup(role: string, userId: string, extra: Parameters<typeof mockApi>[0] = {}) {
  return mockApi({
    'GET /api/auth/me': { body: { ...meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }]), user: { id: userId, email: 'x@fieldcrew.test', name: 'X', createdAt: '2025-01-01T00:00:00Z' } } },
    'GET /api/projects/p-1': { body: { project } },
    'GET /api/projects/p-1/diagrams': { body: { diagrams: [] } },
    'GET /api/projects/p-1/activity': { body: { activity: [] } },
    'GET /api/projects/p-1/uploads': { body: { uploads: [photo, sheet], maxBytes: 20 * 1024 * 1024 } },
    ...extra,
  });
}

describe('project uploads', () => {
  it('lists photos as lazy thumbnails and data sheets as downloads, with who and when', async () => {
    setup('viewer', 'u-view');
    renderApp('/projects/p-1');
    const list = await screen.findByRole('list', { name: 'Data sheets and photos' });
    const thumb = within(list).getByRole('img', { name: 'battery-box.jpg' });
    expect(thumb).toHaveAttribute('src', '/api/uploads/up-1/content');
    expect(thumb).toHaveAttribute('loading', 'lazy');
    expect(within(list).getByRole('link', { name: 'Download data sheet fuse holder.pdf' })).toHaveAttribute('download', 'fuse holder.pdf');
    expect(within(list).getByText('1600 × 1200 · 337 KB')).toBeInTheDocument();
    expect(within(list).getByText('PDF · 2.3 MB')).toBeInTheDocument();
    expect(within(list).getByText('Sam Oduya')).toBeInTheDocument();
    // A viewer neither attaches nor deletes.
    expect(screen.queryByRole('button', { name: /Attach files/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /^Delete / })).not.toBeInTheDocument();
  });

  it('a trainer may delete their own photo but not the designer’s data sheet', async () => {
    setup('trainer', 'u-sam');
    renderApp('/projects/p-1');
    await screen.findByRole('list', { name: 'Data sheets and photos' });
    expect(screen.getByRole('button', { name: 'Delete battery-box.jpg' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Delete fuse holder.pdf' })).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: /Attach files/ })).toBeInTheDocument();
  });

  it('sends each picked file as multipart and shows the server’s refusal by file name', async () => {
    const fetchMock = setup('designer', 'u-dana', {
      'POST /api/projects/p-1/uploads': async () => ({
        status: 415,
        body: { error: { code: 'unsupported_type', message: "This file's content is application/x-elf (.elf), whatever its name says.", details: { detected: 'application/x-elf (.elf)' } } },
      }),
    });
    renderApp('/projects/p-1');
    const user = userEvent.setup();
    await screen.findByRole('list', { name: 'Data sheets and photos' });
    await user.upload(screen.getByLabelText('Attach data sheets or photos'), new File([new Uint8Array([0x7f, 0x45, 0x4c, 0x46])], 'photo.jpg', { type: 'image/jpeg' }));
    const notice = await screen.findByText(/Not attached/);
    expect(notice.closest('[role="alert"]')).toHaveTextContent('photo.jpg — This file\'s content is application/x-elf (.elf)');
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === 'POST')!;
    expect(post[0]).toBe('/api/projects/p-1/uploads');
    const body = post[1]!.body as FormData;
    expect(body).toBeInstanceOf(FormData);
    expect((body.get('file') as File).name).toBe('photo.jpg');
  });

  it('deletes after confirming', async () => {
    const del = vi.fn(() => ({ status: 204 }));
    setup('owner', 'u-owner', { 'DELETE /api/uploads/up-2': del });
    renderApp('/projects/p-1');
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Delete fuse holder.pdf' }));
    const dialog = await screen.findByRole('dialog', { name: 'Delete attachment?' });
    await user.click(within(dialog).getByRole('button', { name: 'Delete' }));
    await waitFor(() => expect(del).toHaveBeenCalledTimes(1));
  });
});
