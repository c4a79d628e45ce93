/**
 * Profile (not a bench line): what the explorer's JS heap grows by over repeated searches.
 *
 * Same set-up as bench/explorer-search.bench.ts (demo, BW-190 withdrawn, up to 5 stocks); after a
 * warm-up it takes a heap snapshot, runs N more searches, takes another, and prints the object kinds
 * (snapshot node type + name) whose count or self size grew most, so a leak shows by name.
 *
 *   npx tsx bench/profile/explorer-heap-diff.ts [warm-up searches=20] [searches=30]
 */
import { withServedApp } from '../chromium';
import { openExplorerScenario } from '../explorer-search.bench';

interface Snap {
  snapshot: { meta: { node_fields: string[]; node_types: [string[]] } };
  nodes: number[];
  strings: string[];
}

async function snapshot(cdp: import('playwright-core').CDPSession): Promise<Map<string, { n: number; size: number }>> {
  await cdp.send('HeapProfiler.collectGarbage');
  await cdp.send('HeapProfiler.collectGarbage');
  const chunks: string[] = [];
  const onChunk = (e: { chunk: string }) => chunks.push(e.chunk);
  cdp.on('HeapProfiler.addHeapSnapshotChunk', onChunk);
  await cdp.send('HeapProfiler.takeHeapSnapshot', { reportProgress: false });
  cdp.off('HeapProfiler.addHeapSnapshotChunk', onChunk);
  const snap = JSON.parse(chunks.join('')) as Snap;
  const fields = snap.snapshot.meta.node_fields;
  const nf = fields.length;
  const iType = fields.indexOf('type');
  const iName = fields.indexOf('name');
  const iSize = fields.indexOf('self_size');
  const types = snap.snapshot.meta.node_types[0];
  const out = new Map<string, { n: number; size: number }>();
  for (let i = 0; i < snap.nodes.length; i += nf) {
    const type = types[snap.nodes[i + iType]!]!;
    let name = snap.strings[snap.nodes[i + iName]!]!;
    if (type === 'string' || type === 'concatenated string' || type === 'sliced string') name = '';
    if (name.length > 60) name = name.slice(0, 60) + '…';
    const key = `${type} ${name}`;
    const e = out.get(key) ?? { n: 0, size: 0 };
    e.n++;
    e.size += snap.nodes[i + iSize]!;
    out.set(key, e);
  }
  return out;
}

const SEARCH = `async () => {
  const button = [...document.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Run search');
  button.click();
  await new Promise((resolve) => {
    const check = () => {
      const status = document.querySelector('.run-status')?.getAttribute('data-status');
      if (status === 'done') { obs.disconnect(); resolve(); }
    };
    const obs = new MutationObserver(check);
    obs.observe(document.querySelector('main') ?? document.body, { subtree: true, childList: true, attributes: true, characterData: true });
  });
  await new Promise((r) => requestAnimationFrame(r));
}`;

const warm = Number(process.argv[2] ?? 20);
const count = Number(process.argv[3] ?? 30);

await withServedApp('explorer-heap-diff', async (app) => {
  const { context, page, cdp } = await openExplorerScenario(app);
  await cdp.send('HeapProfiler.enable');
  for (let i = 0; i < warm; i++) await page.evaluate(`(${SEARCH})()`);
  const a = await snapshot(cdp);
  const heapA = ((await cdp.send('Runtime.getHeapUsage')) as { usedSize: number }).usedSize;
  for (let i = 0; i < count; i++) await page.evaluate(`(${SEARCH})()`);
  const b = await snapshot(cdp);
  const heapB = ((await cdp.send('Runtime.getHeapUsage')) as { usedSize: number }).usedSize;
  const rows = [...new Set([...a.keys(), ...b.keys()])].map((k) => {
    const x = a.get(k) ?? { n: 0, size: 0 };
    const y = b.get(k) ?? { n: 0, size: 0 };
    return { k, dn: y.n - x.n, ds: y.size - x.size };
  });
  rows.sort((p, q) => q.ds - p.ds);
  const sum = (m: Map<string, { n: number; size: number }>, code: boolean) =>
    [...m].reduce((t, [k, v]) => (k.startsWith('code ') === code ? t + v.size : t), 0);
  console.log(`used heap ${(heapA / 1e6).toFixed(3)} → ${(heapB / 1e6).toFixed(3)} MB over ${count} searches (after ${warm} warm-up)`);
  console.log(`  compiled code and its metadata (snapshot type "code"): ${((sum(b, true) - sum(a, true)) / 1e6).toFixed(3)} MB; everything else: ${((sum(b, false) - sum(a, false)) / 1e6).toFixed(3)} MB`);
  console.log('grew most (self size, count):');
  for (const r of rows.slice(0, 30)) console.log(`  ${(r.ds / 1024).toFixed(1).padStart(8)} kB  ${String(r.dn).padStart(6)}  ${r.k}`);
  console.log('shrank most:');
  for (const r of rows.slice(-8)) console.log(`  ${(r.ds / 1024).toFixed(1).padStart(8)} kB  ${String(r.dn).padStart(6)}  ${r.k}`);
  await context.close();
});
