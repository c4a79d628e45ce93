// Builds the production app once and serves it with `vite preview` on 127.0.0.1 for every e2e file.
import { spawn, execFileSync, type ChildProcess } from 'node:child_process';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string;
  }
}

const PORT = Number(process.env.E2E_PORT ?? 4319);
// Each port gets its own build folder so parallel runs (e.g. two developers' checks) do not collide.
const OUT_DIR = `test-output/dist-${PORT}`;

async function waitForServer(url: string, timeoutMs: number): Promise<void> {
  const start = Date.now();
  for (;;) {
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      /* not up yet */
    }
    if (Date.now() - start > timeoutMs) throw new Error(`e2e: preview server did not answer at ${url}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

let server: ChildProcess | undefined;

export default async function setup(project: TestProject) {
  if (!process.env.E2E_SKIP_BUILD) {
    // Vitest sets NODE_ENV=test, which would make Vite build React's development bundle; the
    // end-to-end tests drive what a user gets, the production build.
    execFileSync('npx', ['vite', 'build', '--logLevel', 'warn', '--outDir', OUT_DIR, '--emptyOutDir'], {
      stdio: 'inherit',
      env: { ...process.env, NODE_ENV: 'production' },
    });
  }
  server = spawn('npx', ['vite', 'preview', '--host', '127.0.0.1', '--port', String(PORT), '--strictPort', '--outDir', OUT_DIR], {
    detached: true,
    stdio: 'ignore',
  });
  const baseURL = `http://127.0.0.1:${PORT}/`;
  await waitForServer(baseURL, 30_000);
  project.provide('baseURL', baseURL);
  return () => {
    if (server?.pid) {
      try {
        process.kill(-server.pid, 'SIGTERM');
      } catch {
        /* already gone */
      }
    }
  };
}
