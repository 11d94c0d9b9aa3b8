/** `npm run dev`: the same server with Vite in middleware mode (hot reload) instead of dist/client. */
import path from 'node:path';
import type { ViteDevServer } from 'vite';

process.env.NODE_ENV ??= 'development';

const { ROOT_DIR, runServer } = await import('./index');

let vite: ViteDevServer | undefined;

await runServer({
  async client() {
    const { createServer } = await import('vite');
    vite = await createServer({
      root: ROOT_DIR,
      configFile: path.join(ROOT_DIR, 'vite.config.ts'),
      server: { middlewareMode: true },
      appType: 'custom',
    });
    return {
      mode: 'vite',
      middlewares: vite.middlewares as never,
      transformIndexHtml: (url, html) => vite!.transformIndexHtml(url, html),
      indexHtmlPath: path.join(ROOT_DIR, 'index.html'),
    };
  },
  async onShutdown() {
    await vite?.close();
  },
});
