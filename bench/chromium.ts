// Shared by the app benches: the production build served by `vite preview` on 127.0.0.1 (a free
// port) and a headless Chromium, started before and stopped after the bench's own measurement.
import { spawn } from 'node:child_process';
import { createServer } from 'node:net';
import { chromium, type Browser, type BrowserContext } from 'playwright-core';
import { buildAppOnce } from './app-build';

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

async function waitForServer(bench: string, url: string, timeoutMs: number): Promise<void> {
  const start = Date.now();
  for (;;) {
    try {
      if ((await fetch(url)).ok) return;
    } catch {
      /* not up yet */
    }
    if (Date.now() - start > timeoutMs) throw new Error(`${bench} bench: preview server did not answer at ${url}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

const isLocal = (u: string) => /^(data:|blob:|about:)/.test(u) || new URL(u).hostname === '127.0.0.1';

export interface ServedApp {
  /** The app's root, `http://127.0.0.1:<port>/`. */
  url: string;
  browser: Browser;
  /** A fresh context (empty cache and storage), 1400 × 900, every request off 127.0.0.1 aborted. */
  newContext(): Promise<BrowserContext>;
}

/**
 * Build the app (once per run), serve it, launch headless Chromium and run `measure`; the browser
 * and the server are stopped afterwards, whatever happens. `bench` names the bench in errors.
 */
export async function withServedApp<T>(bench: string, measure: (app: ServedApp) => Promise<T>): Promise<T> {
  const dir = buildAppOnce();
  const port = await freePort();
  const server = spawn('npx', ['vite', 'preview', '--host', '127.0.0.1', '--port', String(port), '--strictPort', '--outDir', dir], {
    detached: true,
    stdio: 'ignore',
  });
  let browser: Browser | undefined;
  try {
    const url = `http://127.0.0.1:${port}/`;
    await waitForServer(bench, url, 30_000);
    const b = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
        '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    browser = b;
    const newContext = async (): Promise<BrowserContext> => {
      const context = await b.newContext({ viewport: { width: 1400, height: 900 } });
      await context.route((u) => !isLocal(u.toString()), (r) => r.abort());
      return context;
    };
    return await measure({ url, browser: b, newContext });
  } finally {
    await browser?.close();
    if (server.pid) {
      try {
        process.kill(-server.pid, 'SIGTERM');
      } catch {
        /* already gone */
      }
    }
  }
}
