// The Stocks screen's chunks are preloaded only when the page opens on the Stocks screen (issue 9 §3,
// s23): a small script of the page (scripts/compile-hints.ts) links them as modulepreload for the bare
// page and #/library; a page opened on another screen requests none of them until Stocks is opened.
import { afterEach, describe, expect, inject, it } from 'vitest';
import { launch, type Session } from './support';

const STOCKS_CHUNK = /\/assets\/LibraryScreen-[^/]+\.js$/;

describe('opening preloads', () => {
  let s: Session | undefined;
  afterEach(async () => {
    await s?.close();
    s = undefined;
  });

  async function open(hash: string): Promise<{ session: Session; requested: string[] }> {
    const session = await launch();
    s = session;
    const requested: string[] = [];
    session.page.on('request', (r) => requested.push(r.url()));
    await session.page.goto(`${inject('baseURL')}${hash}`);
    return { session, requested };
  }

  it('the bare page links and fetches the Stocks screen\'s chunks as it opens', async () => {
    const { session, requested } = await open('');
    await session.page.getByRole('heading', { level: 2, name: 'Stocks' }).waitFor();
    expect(requested.some((u) => STOCKS_CHUNK.test(u))).toBe(true);
    const linked = await session.page.evaluate(() => [...document.querySelectorAll<HTMLLinkElement>('link[rel="modulepreload"]')].map((l) => l.href));
    expect(linked.some((u) => STOCKS_CHUNK.test(u))).toBe(true);
    expect(session.errors).toEqual([]);
  });

  it('a page opened on the designer requests no Stocks chunk until Stocks is opened', async () => {
    const { session, requested } = await open('#/designer');
    await session.page.getByRole('heading', { level: 2, name: 'Recipe designer' }).waitFor();
    expect(requested.filter((u) => STOCKS_CHUNK.test(u))).toEqual([]);
    const linked = await session.page.evaluate(() => [...document.querySelectorAll<HTMLLinkElement>('link[rel="modulepreload"]')].map((l) => l.href));
    expect(linked.filter((u) => STOCKS_CHUNK.test(u))).toEqual([]);
    await session.page.getByRole('link', { name: /^Stocks/ }).click();
    await session.page.getByRole('heading', { level: 2, name: 'Stocks' }).waitFor();
    expect(requested.filter((u) => STOCKS_CHUNK.test(u))).toHaveLength(1);
    expect(session.errors).toEqual([]);
  });
});
