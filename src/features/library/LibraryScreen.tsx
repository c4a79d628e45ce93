import { Fragment, Suspense, lazy, useCallback, useEffect, useMemo, useState, type FocusEvent } from 'react';
import './library.css';
import type { Component, ComponentCategory } from '../../core/formulation/model';
import { CATEGORY_LABEL } from '../../core/formulation/model';
import { ActionNotice, DemoTag } from '../../components/notices';
import { downloadText } from '../../components/download';
import { DETAILS_OF_ATTR, isOpeningDraw, useRowWindow } from '../../components/row-window';
import { useFormat } from '../../components/format';
import { isDemoComponent, libraryRoomProblem, useLibrary, useLibraryHistory, useRecipes, useSettings } from '../../state';
import { checkComponent } from '../../state/checks';
import { ComponentRow, CATEGORY_OPTIONS } from './ComponentRow';
import { ComponentDetails } from './ComponentDetails';
import { ImpactConfirm, type PendingStockChange, type StockUpdateOutcome } from './ImpactConfirm';
import { predictionImpact } from '../../core/recipes/impact';
import { normaliseCurrency } from '../../core/currency/exchange-rates';


/** Stock fields whose change moves the viscosity and density predictions of recipes. */
const PREDICTION_INPUTS = ['viscosityPoints', 'density15', 'calibration'] as const;
const PREDICTION_INPUT_LABEL: Record<(typeof PREDICTION_INPUTS)[number], string> = {
  viscosityPoints: 'viscosities',
  density15: 'density',
  calibration: 'calibration',
};

// Import and export (zod, CSV parsing) load on first use, not with the opening screen.
const ImportPanel = lazy(() => import('./ImportPanel').then((m) => ({ default: m.ImportPanel })));
const libraryIo = () => import('../../state/library-io');

function localIsoDate(d: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

type Flash = { tone: 'info' | 'success' | 'warning' | 'error'; text: string; undo?: boolean } | null;

export default function LibraryScreen() {
  const components = useLibrary((s) => s.components);
  const recipes = useRecipes((s) => s.recipes);
  const history = useLibraryHistory();
  const fmt = useFormat();
  const { blendMethod, baseCurrency } = useSettings();
  const [query, setQuery] = useState('');
  const [category, setCategory] = useState<ComponentCategory | 'all'>('all');
  const [expanded, setExpanded] = useState<string | null>(null);
  const [importing, setImporting] = useState(false);
  const [flash, setFlash] = useState<Flash>(null);

  const usedIn = useMemo(() => {
    const m = new Map<string, string[]>();
    for (const r of recipes) for (const l of r.lines) m.set(l.componentId, [...(m.get(l.componentId) ?? []), r.name]);
    return m;
  }, [recipes]);
  // Saved work other than recipes that names a stock: the whole-line plan and the QC loop's entries.
  // Deleting the stock would drop these silently (a plan without its kept stock, a correction without
  // a stock on hand), so it is refused like a stock in a recipe.
  const linePlan = useRecipes((s) => s.linePlan);
  const qcEntries = useRecipes((s) => s.qc);
  const namedIn = useCallback(
    (id: string): string[] => {
      const out: string[] = [];
      if (id in linePlan.supplies) out.push('the whole-line plan (limited, with its supply)');
      if (id in linePlan.keep) out.push('the whole-line plan (kept in use)');
      for (const r of recipes) {
        const q = qcEntries[r.id];
        if (!q) continue;
        const lot = q.lots[id];
        if (lot && (lot.kv40 !== null || lot.kv100 !== null || lot.density15 !== null)) out.push(`the QC loop of “${r.name}” (lot values)`);
        if (q.correction.stockIds.includes(id) || (q.correction.onHandKg[id] ?? null) !== null) {
          out.push(`the QC loop of “${r.name}” (stocks on hand for a correction)`);
        }
      }
      return out;
    },
    [linePlan, qcEntries, recipes],
  );

  const shown = useMemo(() => {
    const q = query.trim().toLowerCase();
    return components.filter(
      (c) => (category === 'all' || c.category === category) && (!q || c.code.toLowerCase().includes(q) || c.name.toLowerCase().includes(q)),
    );
  }, [components, query, category]);

  const issues = useMemo(() => {
    let errors = 0;
    let warnings = 0;
    // Codes counted once (a clash check per stock against the whole library is quadratic: minutes at 20,000).
    const codes = new Map<string, number>();
    for (const c of components) {
      const k = c.code.trim().toLowerCase();
      codes.set(k, (codes.get(k) ?? 0) + 1);
    }
    let pending = 0;
    for (const c of components) {
      if (c.notEntered?.length) pending++;
      const r = checkComponent(c);
      if (r.errors.length || (codes.get(c.code.trim().toLowerCase()) ?? 0) > 1) errors++;
      else if (r.warnings.length) warnings++;
    }
    return { errors, warnings, pending };
  }, [components]);

  const codeError = useCallback(
    (code: string, id: string) => {
      const k = code.trim().toLowerCase();
      const other = useLibrary.getState().components.find((c) => c.id !== id && c.code.trim().toLowerCase() === k);
      return other ? `${code.trim()} is already used by “${other.name || other.code}”` : undefined;
    },
    [],
  );
  // A change that moves saved recipes' predictions waits for the user's confirmation (issue 10, item 14).
  const [pending, setPending] = useState<PendingStockChange | null>(null);
  const onUpdate = useCallback(
    (id: string, patch: Partial<Omit<Component, 'id'>>): StockUpdateOutcome => {
      const store = useLibrary.getState();
      const apply = () => store.updateComponent(id, patch);
      const what = PREDICTION_INPUTS.filter((k) => k in patch);
      if (what.length === 0) {
        const was = store.components.find((x) => x.id === id);
        const refused = apply();
        if (refused) return { kind: 'refused', message: refused };
        // A stock withdrawn while saved recipes charge it: said here, where it is done (the recipes' blend
        // sheets print on hold from now on; core/release/release-hold.ts).
        if (was && patch.availability === 'withdrawn' && was.availability !== 'withdrawn') {
          const users = useRecipes.getState().recipes.filter((r) => r.lines.some((l) => l.componentId === id && l.massFraction > 0));
          if (users.length > 0) {
            const n = users.length;
            setFlash({
              tone: 'warning',
              text: `${was.code} is withdrawn. It is used in ${n === 1 ? '1 saved recipe' : `${n} saved recipes`} (${users.map((r) => r.name).join('; ')}): ${n === 1 ? 'its blend sheet prints' : 'their blend sheets print'} on hold (not for release) until ${n === 1 ? 'it is' : 'they are'} revised without it.`,
              undo: true,
            });
          }
        }
        return { kind: 'stored' };
      }
      const before = store.components;
      const c = before.find((x) => x.id === id);
      if (!c) return { kind: 'stored' };
      // Entering a value not yet entered moves no saved prediction: recipes using the stock had none
      // (never predicted from its placeholders), so there is nothing to confirm.
      if ('notEntered' in patch && c.notEntered?.length) {
        const refused = apply();
        return refused ? { kind: 'refused', message: refused } : { kind: 'stored' };
      }
      const after = before.map((x) => (x.id === id ? { ...x, ...patch } : x));
      const impact = predictionImpact(useRecipes.getState().recipes, before, after, [id], blendMethod);
      if (impact.length === 0) {
        const refused = apply();
        return refused ? { kind: 'refused', message: refused } : { kind: 'stored' };
      }
      let settle: (applied: boolean) => void = () => undefined;
      const settled = new Promise<boolean>((resolve) => {
        settle = resolve;
      });
      setPending({
        settle: (applied) => settle(applied),
        code: c.code,
        what: what.map((k) => PREDICTION_INPUT_LABEL[k]).join(' and '),
        impact,
        apply: () => {
          const refused = apply();
          setFlash(
            refused
              ? { tone: 'warning', text: refused }
              : { tone: 'success', text: `Stored the ${what.map((k) => PREDICTION_INPUT_LABEL[k]).join(' and ')} of ${c.code}; ${impact.length} saved ${impact.length === 1 ? 'recipe is' : 'recipes are'} flagged as changed since saved.`, undo: true },
          );
        },
      });
      return { kind: 'confirm', settled };
    },
    [blendMethod],
  );
  const onToggleDetails = useCallback((id: string) => setExpanded((e) => (e === id ? null : id)), []);
  /** A stock just added or cloned: its row is brought into view and its code field focused, ready to type. */
  const [arrived, setArrived] = useState<string | null>(null);
  useEffect(() => {
    if (!arrived) return;
    const row = [...document.querySelectorAll<HTMLElement>('.library-screen tr[data-row-key]')].find((tr) => tr.getAttribute('data-row-key') === arrived);
    const field = row?.querySelector<HTMLElement>('input, select, [role="textbox"]');
    if (!field) return; // drawn in a later render: this effect runs again with the rows
    setArrived(null);
    field.scrollIntoView?.({ block: 'center' });
    field.focus();
  });
  /** True (and said) when the library is at its one stock limit: Add and Clone then add nothing. */
  const full = useCallback(() => {
    const problem = libraryRoomProblem(useLibrary.getState().components.length, 1, 'entry', (n) => fmt.num(n, 0));
    if (problem) setFlash({ tone: 'error', text: problem });
    return problem !== null;
  }, [fmt]);
  const onClone = useCallback((id: string) => {
    if (full()) return;
    const newId = useLibrary.getState().cloneComponent(id);
    setArrived(newId);
    const copy = useLibrary.getState().components.find((c) => c.id === newId);
    if (copy) setFlash({ tone: 'success', text: `Cloned as ${copy.code}.`, undo: true });
  }, [full]);
  const onDelete = useCallback(
    (id: string) => {
      const c = useLibrary.getState().components.find((x) => x.id === id);
      if (!c) return;
      const uses = usedIn.get(id);
      if (uses?.length) {
        setFlash({
          tone: 'warning',
          text: `${c.code} is used in ${uses.length} recipe${uses.length > 1 ? 's' : ''} (${uses.join('; ')}), so it was not deleted. Mark it withdrawn instead, or remove it from those recipes first.`,
        });
        return;
      }
      const named = namedIn(id);
      if (named.length) {
        setFlash({
          tone: 'warning',
          text: `${c.code} is named in ${named.join('; ')}, so it was not deleted. Mark it withdrawn instead, or remove it there first.`,
        });
        return;
      }
      useLibrary.getState().removeComponent(id);
      setFlash({ tone: 'info', text: `Deleted ${c.code}${c.name ? ` (${c.name})` : ''}.`, undo: true });
    },
    [usedIn, namedIn],
  );

  // A long library draws only the rows near the viewport (plus the focused row and open details);
  // as the page's opening screen, the rows below the window follow right after the first paint.
  const keys = useMemo(() => shown.map((c) => c.id), [shown]);
  const [focusedKey, setFocusedKey] = useState<string | null>(null);
  const rows = useRowWindow(keys, [focusedKey, expanded, arrived], { inViewFirst: isOpeningDraw() });
  const onBodyFocus = useCallback((e: FocusEvent<HTMLTableSectionElement>) => {
    const tr = (e.target as Element).closest?.('tr[data-row-key]');
    setFocusedKey(tr ? tr.getAttribute('data-row-key') : null);
  }, []);

  const hasDemo = components.some(isDemoComponent);
  const stamp = new Date().toISOString().slice(0, 10);
  const today = localIsoDate(new Date());

  return (
    <section className="library-screen" aria-labelledby="library-h">
      <div className="screen-head">
        <h2 id="library-h">Stocks</h2>
        {hasDemo ? <DemoTag>Invented demo library — not real products</DemoTag> : null}
      </div>
      <p className="lead small">
        {components.length} stocks. Type in a cell and press Enter (or leave it) to save; Escape puts back the saved value. VI (ASTM D2270)
        and grade (ISO 3448) are computed from ν40 and ν100.
        {issues.errors || issues.warnings ? (
          <strong className={issues.errors ? 'text-error' : 'text-warning'}>
            {' '}
            {issues.errors ? `${issues.errors} stock${issues.errors > 1 ? 's' : ''} with errors. ` : ''}
            {issues.warnings ? `${issues.warnings} with values flagged for checking.` : ''}
          </strong>
        ) : null}
        {issues.pending ? (
          <strong className="text-warning" data-testid="pending-count">
            {' '}
            {issues.pending === 1 ? '1 stock has' : `${fmt.num(issues.pending, 0)} stocks have`} measured values not yet entered and {issues.pending === 1 ? 'is' : 'are'} not in use.
          </strong>
        ) : null}
      </p>

      <div className="toolbar" role="toolbar" aria-label="Library actions">
        <button
          type="button"
          className="primary"
          onClick={() => {
            if (full()) return;
            // Priced in the base currency: a price typed for it is never restated at another currency's rate unseen.
            const id = useLibrary.getState().addComponent({ price: { amount: 0, basis: 'per-kg', currency: normaliseCurrency(baseCurrency) || 'EUR' } });
            setQuery('');
            setCategory('all');
            setExpanded(id);
            setArrived(id);
            setFlash({ tone: 'success', text: 'Added a new stock at the end of the table; fill in its code, ν40, ν100, density and price. Until its ν40, ν100 and density are entered it is left out of solving, the explorer, the line plan and release.', undo: true });
          }}
        >
          Add stock
        </button>
        <button type="button" disabled={!history.canUndo} onClick={history.undo}>
          Undo
        </button>
        <button type="button" disabled={!history.canRedo} onClick={history.redo}>
          Redo
        </button>
        <span className="toolbar-gap" />
        <button type="button" aria-expanded={importing} onClick={() => setImporting((v) => !v)}>
          Import CSV / JSON…
        </button>
        <button type="button" onClick={() => void libraryIo().then((io) => downloadText(`blendbench-stocks-${stamp}.csv`, io.libraryToCsv(components), 'text/csv'))}>
          Export CSV
        </button>
        <button type="button" onClick={() => void libraryIo().then((io) => downloadText(`blendbench-stocks-${stamp}.json`, io.libraryToJson(components), 'application/json'))}>
          Export JSON
        </button>
        <span className="toolbar-gap" />
        <label className="inline-field">
          <span>Find</span>
          <input type="search" value={query} onChange={(e) => setQuery(e.target.value)} placeholder="code or name" size={14} />
        </label>
        <label className="inline-field">
          <span>Category</span>
          <select value={category} onChange={(e) => setCategory(e.target.value as ComponentCategory | 'all')}>
            <option value="all">All</option>
            {CATEGORY_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </label>
      </div>

      {flash ? (
        <ActionNotice
          tone={flash.tone}
          text={flash.text}
          canUndo={Boolean(flash.undo && history.canUndo)}
          onUndo={history.undo}
          onDismiss={() => setFlash(null)}
        />
      ) : null}

      {pending ? (
        <ImpactConfirm
          pending={pending}
          onDone={(applied) => {
            setPending(null);
            pending.settle(applied);
            if (!applied) setFlash({ tone: 'info', text: `Nothing changed: ${pending.code} keeps its stored ${pending.what}.` });
          }}
        />
      ) : null}

      {importing ? (
        <Suspense fallback={<p className="muted">Opening the import…</p>}>
          <ImportPanel
            onClose={() => setImporting(false)}
            onImported={(text) => {
              setImporting(false);
              setFlash({ tone: 'success', text, undo: true });
            }}
          />
        </Suspense>
      ) : null}

      <div className="table-scroll">
        <table className="data library-table" aria-label="Component library" aria-rowcount={rows.windowed ? shown.length + 1 : undefined}>
          {/* Set column widths (table-layout: fixed, library.css): the browser sizes the columns without measuring every cell first. */}
          <colgroup>
            <col className="col-code" />
            <col className="col-name" />
            <col className="col-category" />
            <col className="col-kv40" />
            <col className="col-kv100" />
            <col className="col-vi" />
            <col className="col-grade" />
            <col className="col-density" />
            <col className="col-aniline" />
            <col className="col-price" />
            <col className="col-avail" />
            <col className="col-actions" />
          </colgroup>
          <thead>
            <tr>
              <th scope="col">Code</th>
              <th scope="col">Name</th>
              <th scope="col">Category</th>
              <th scope="col" className="num">
                ν40 <span className="unit">mm²/s</span>
              </th>
              <th scope="col" className="num">
                ν100 <span className="unit">mm²/s</span>
              </th>
              <th scope="col" className="num computed-head">
                VI <span className="unit">computed</span>
              </th>
              <th scope="col" className="num computed-head">
                ISO VG <span className="unit">computed</span>
              </th>
              <th scope="col" className="num">
                ρ15 <span className="unit">kg/L</span>
              </th>
              <th scope="col" className="num">
                Aniline pt <span className="unit">{fmt.tempUnit}</span>
              </th>
              {/* The basis is in each cell (a litre price names its 15 °C there); a price in another currency names it too. */}
              <th scope="col" className="num" title="Price on the basis shown in each cell; a litre price is for litres at 15 °C">
                Price <span className="unit">{normaliseCurrency(baseCurrency) || 'base currency'}</span>
              </th>
              <th scope="col">Availability</th>
              <th scope="col">
                <span className="visually-hidden">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody ref={rows.bodyRef} onFocus={onBodyFocus}>
            {/* One flat list keyed by stock, so that a row keeps its state (focus, typed value) as the window moves. */}
            {rows.segments.flatMap((seg) =>
              seg.kind === 'gap' ? (
                <tr key={`gap-${seg.start}`} className="row-gap" aria-hidden="true" data-testid="row-gap" style={{ height: `${seg.height}px` }}>
                  <td colSpan={12} />
                </tr>
              ) : (
                shown.slice(seg.start, seg.end).map((c, k) => (
                  <Fragment key={c.id}>
                    <ComponentRow
                      c={c}
                      codeError={codeError}
                      expanded={expanded === c.id}
                      detailsId={`details-${c.id}`}
                      rowIndex={rows.windowed ? seg.start + k + 2 : undefined}
                      onUpdate={onUpdate}
                      onToggleDetails={onToggleDetails}
                      onClone={onClone}
                      onDelete={onDelete}
                    />
                    {expanded === c.id ? (
                      <tr className="details-row" id={`details-${c.id}`} {...{ [DETAILS_OF_ATTR]: c.id }}>
                        <td colSpan={12}>
                          <ComponentDetails
                            c={c}
                            usedIn={usedIn.get(c.id) ?? []}
                            components={components}
                            recipes={recipes}
                            defaultMethod={blendMethod}
                            today={today}
                            onUpdate={onUpdate}
                          />
                        </td>
                      </tr>
                    ) : null}
                  </Fragment>
                ))
              ),
            )}
          </tbody>
        </table>
        {shown.length === 0 ? <p className="muted">No stock matches {query ? `“${query}”` : 'this filter'}.</p> : null}
      </div>
      <p className="small muted">
        Categories: {Object.values(CATEGORY_LABEL).join(', ')} (API 1509 Appendix E groups). Withdrawn stocks stay in the library for
        reference and comparison but are excluded from every solve.
      </p>
    </section>
  );
}
