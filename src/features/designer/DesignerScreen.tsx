import { Suspense, lazy, memo, useCallback, useEffect, useId, useMemo, useRef, useState } from 'react';
import type { BlendTargets, Component, Recipe } from '../../core/formulation/model';
import { RECIPE_STATUS_LABEL } from '../../core/formulation/model';
import { recordStockBasis, stockBasisChanges } from '../../core/recipes/stock-basis';
import { notEnteredFields } from '../../core/formulation/entered-values';
import { isBlankSpecification, specificationGradeIssue, specificationGradeMessage } from '../../core/recipes/specification-grade';
import { StatusBadge, StockChangeList } from '../../components/recipe-status';
import { Notice } from '../../components/notices';
import { useFormat } from '../../components/format';
import {
  componentsById,
  defaultTargets,
  nextRevisionNumber,
  pricedLibrary,
  recipeActions,
  useLibrary,
  usePricedLibrary,
  useRecipes,
  useSettings,
  settingsActions,
  sayRefusal,
  UNKNOWN_VERSION,
} from '../../state';
import { BLEND_METHODS, BLEND_METHOD_LABEL, type BlendMethod } from '../../core/blending/blend-viscosity';
import { solvableLibrary, unpricedMessage, unpricedTitle } from '../../core/currency/exchange-rates';
import { TEXT_RULES, checkText, firstProblem, recipeProblems, recipeWho, targetsProblems } from '../../state/field-rules';
import { TargetsForm } from './TargetsForm';
import { RecipeTable } from './RecipeTable';
import { densityLookup, draftKeepable, useDesignerStore } from './store';
import { runSolve } from './solve';
import { PropertiesView, solveBand } from './PropertiesPanel';
import { useDraftRelays, type DraftInputs } from './draft-relays';
import { KeptDrafts } from './KeptDrafts';
import './designer.css';

const DesignerCharts = lazy(() => import('./DesignerCharts'));

/** Targets for a recipe: the stored ones, else defaults for its grade with the library's additive. */
function targetsFor(recipe: Recipe, stored: BlendTargets | undefined, additiveId: string | null): BlendTargets {
  return stored ?? defaultTargets(recipe.grade, additiveId, recipe.isReference ? recipe.id : null);
}

export default function DesignerScreen() {
  // Prices restated in the base currency at the boundary (Settings → exchange rates); stocks whose
  // currency has no rate keep their own price and are left out of costing and solving.
  const priced = usePricedLibrary();
  const components = priced.components;
  const byId = componentsById(components);
  const recipes = useRecipes((s) => s.recipes);
  const storedTargets = useRecipes((s) => s.targets);
  const activeRecipeId = useRecipes((s) => s.activeRecipeId);
  const settings = useSettings();
  const fmt = useFormat();

  const targets = useDesignerStore((s) => s.targets);
  // Not the lines themselves: an edit of a share changes neither the set of stocks nor whether the
  // recipe adds up, so it does not render the screen again (its numbers follow the relays below).
  const lineKey = useDesignerStore((s) => s.lines.map((l) => l.componentId).join('|'));
  const complete = useDesignerStore((s) => s.lines.length > 0 && Math.abs(s.lines.reduce((t, l) => t + l.massFraction, 0) - 1) < 1e-6);
  const basis = useDesignerStore((s) => s.basis);
  const rebalanceMode = useDesignerStore((s) => s.rebalanceMode);
  const balanceId = useDesignerStore((s) => s.balanceId);
  const editNote = useDesignerStore((s) => s.editNote);
  const notice = useDesignerStore((s) => s.notice);
  const name = useDesignerStore((s) => s.name);
  const sourceRecipeId = useDesignerStore((s) => s.sourceRecipeId);
  const dirty = useDesignerStore((s) => s.dirty);
  const initialised = useDesignerStore((s) => s.initialised);
  // The store's actions (the same functions in every state; the state read here is not used).
  const actions = useMemo(() => useDesignerStore.getState(), []);

  const additiveId = useMemo(
    () => components.find((c) => c.category === 'additive-package' && c.availability !== 'withdrawn')?.id ?? null,
    [components],
  );

  // First visit: open the active recipe (or the first reference recipe), else a blank VG 320 draft.
  // Later, a recipe made active elsewhere (e.g. adopted in the explorer) opens unless the draft has unsaved edits.
  const seenActiveId = useDesignerStore((s) => s.seenActiveId);
  useEffect(() => {
    // The store as it is now, not as rendered: an effect run twice (React's strict mode) must not
    // open the active recipe over a draft the first run restored.
    const now = useDesignerStore.getState();
    // After a reload: the draft kept from the last session (targets, limits, objective, lines) comes back.
    if (!now.initialised && actions.restoreDraft()) return;
    if (now.initialised && activeRecipeId === now.seenActiveId) return;
    actions.setSeenActiveId(activeRecipeId);
    if (now.initialised && now.dirty) return;
    const start = recipes.find((r) => r.id === activeRecipeId) ?? (now.initialised ? undefined : (recipes.find((r) => r.isReference) ?? recipes[0]));
    if (start) actions.load(start, targetsFor(start, storedTargets[start.id], additiveId));
    else if (!now.initialised) actions.startBlank(defaultTargets(320, additiveId, null));
  }, [initialised, seenActiveId, recipes, activeRecipeId, storedTargets, additiveId, actions]);

  const density = useMemo(() => densityLookup(components), [components]);
  const band = useMemo(() => {
    const b = solveBand(targets);
    return b ? { min: b.lo, max: b.hi } : null;
  }, [targets]);
  const { blendMethod, d341Form, operatingTempC, coldStartTempC, deliveryTempC, decimalSeparator, thousandsGrouping, temperatureUnit } = settings;
  const lo = band?.min;
  const hi = band?.max;
  const draftInputs = useMemo<DraftInputs>(
    () => ({
      components,
      byId,
      baseCurrency: priced.base,
      settings: { blendMethod, d341Form, operatingTempC, coldStartTempC, deliveryTempC, decimalSeparator, thousandsGrouping, temperatureUnit },
      grade: targets.grade,
      band: lo === undefined || hi === undefined ? null : { min: lo, max: hi },
    }),
    [components, byId, priced.base, blendMethod, d341Form, operatingTempC, coldStartTempC, deliveryTempC, decimalSeparator, thousandsGrouping, temperatureUnit, targets.grade, lo, hi],
  );
  // The table, the properties and the charts read the derived numbers from these relays, derived
  // once per edit as the store takes it (never stored); an edit re-renders only what shows them.
  const { view: viewRelay, prediction: predictionRelay } = useDraftRelays(draftInputs);

  const [solving, setSolving] = useState(false);
  const onSolve = useCallback(() => {
    setSolving(true);
    // Let "Solving…" paint before the (synchronous, usually sub-second) solve runs.
    setTimeout(() => {
      const s = useDesignerStore.getState();
      const reference = s.targets.referenceRecipeId ? useRecipes.getState().recipes.find((r) => r.id === s.targets.referenceRecipeId) ?? null : null;
      const outcome = runSolve(solvableLibrary(pricedLibrary(useLibrary.getState().components, settings)), s.targets, reference, settings.blendMethod, fmt);
      if (outcome.kind === 'optimal') s.applySolution(outcome.lines, outcome.message);
      else s.setNotice(outcome);
      setSolving(false);
    }, 0);
  }, [settings, fmt]);

  const densityNotEntered = useCallback(
    (id: string) => {
      const c = byId.get(id);
      return c && notEnteredFields(c).includes('density15') ? c.code : null;
    },
    [byId],
  );
  const onEdit = useCallback((id: string, f: number) => useDesignerStore.getState().editLine(id, f, density, densityNotEntered), [density, densityNotEntered]);

  const stockLabel = useCallback((id: string) => `stock ${byId.get(id)?.code ?? id}`, [byId]);
  const sourceRecipe = recipes.find((r) => r.id === sourceRecipeId) ?? null;
  // A draft without unsaved edits is its saved recipe: when that recipe changes elsewhere (an undo or
  // redo on another screen, another tab), the draft opens it as it is now.
  const sourceStamp = useDesignerStore((s) => s.sourceStamp);
  useEffect(() => {
    const now = useDesignerStore.getState();
    if (!now.initialised || now.dirty || !sourceRecipe || sourceRecipe.updatedAt === now.sourceStamp) return;
    actions.load(sourceRecipe, targetsFor(sourceRecipe, storedTargets[sourceRecipe.id], additiveId));
  }, [sourceRecipe, sourceStamp, dirty, storedTargets, additiveId, actions]);
  // The stocks that can be added change with the set of lines, not with their shares.
  const addable = useMemo(() => {
    const inRecipe = new Set(lineKey.split('|'));
    return components.filter((c) => c.availability !== 'withdrawn' && !inRecipe.has(c.id));
  }, [components, lineKey]);
  // The table's layout: which stocks, in order (kept while only the shares change).
  const tableLines = useMemo(
    () => (lineKey === '' ? [] : lineKey.split('|').map((id) => ({ componentId: id, component: byId.get(id) ?? null }))),
    [lineKey, byId],
  );

  // Callbacks kept across edits, so the parts of the screen an edit does not change are not re-rendered.
  const onLoadRecipe = useCallback(
    (r: Recipe) => {
      actions.load(r, targetsFor(r, storedTargets[r.id], additiveId));
      recipeActions.setActiveRecipe(r.id);
    },
    [actions, storedTargets, additiveId],
  );
  const onBlank = useCallback(
    () => actions.startBlank(defaultTargets(targets.grade, additiveId, targets.referenceRecipeId)),
    [actions, targets.grade, additiveId, targets.referenceRecipeId],
  );
  const onSaveNew = useCallback(
    (typed: string, reason: string): SaveOutcome => {
      const s = useDesignerStore.getState();
      // A new recipe never reads exactly as a saved one (the one it came from, most often): marked as a copy, as Duplicate does.
      const n = distinctName(typed, new Set(useRecipes.getState().recipes.map((r) => r.name.trim().toLowerCase())));
      const lib = useLibrary.getState().components;
      // The same field rules as storage: refuse before anything is written.
      const refused = firstProblem(targetsProblems(s.targets, recipeWho(n), stockLabel)) ?? checkText('reasonForChange', reason, recipeWho(n));
      if (refused) return { refused };
      let id: string;
      try {
        id = recipeActions.addRecipe({
          name: n,
          grade: s.targets.grade,
          lines: s.lines,
          reasonForChange: reason,
          // A product specification belongs to its grade: a new recipe of another grade starts blank
          // ("Per specification") rather than printing the other grade's release limits.
          specification: sourceRecipe && sourceRecipe.grade === s.targets.grade ? sourceRecipe.specification : undefined,
          stockBasis: recordStockBasis(lib, s.lines, new Date().toISOString()),
          // Saved with the recipe in one step: one undo removes both.
          targets: s.targets,
          activate: true,
        });
      } catch (e) {
        return { refused: (e as Error).message };
      }
      s.markSaved(id);
      s.setName(n);
      return { id };
    },
    [stockLabel, sourceRecipe],
  );
  const onSaveChanges = useCallback(
    (id: string, n: string, reason: string): SaveOutcome => {
      const s = useDesignerStore.getState();
      const lib = useLibrary.getState().components;
      const target = recipes.find((r) => r.id === id);
      const refused = firstProblem([
        ...(target ? recipeProblems({ ...target, name: n, lines: s.lines, grade: s.targets.grade, reasonForChange: reason }) : []),
        ...targetsProblems(s.targets, recipeWho(n), stockLabel),
      ]);
      if (refused) return { refused };
      let savedId: string;
      try {
        savedId = recipeActions.saveChanges(
          id,
          {
            name: n,
            grade: s.targets.grade,
            lines: s.lines,
            targets: s.targets,
            stockBasis: recordStockBasis(lib, s.lines, new Date().toISOString()),
          },
          reason,
          // The draft's recipe as it was when the edits began: one saved since is not overwritten
          // (nor one whose starting version a draft kept by an earlier version did not record).
          s.stampUnknown ? UNKNOWN_VERSION : s.sourceStamp,
        );
      } catch (e) {
        return { refused: (e as Error).message };
      }
      recipeActions.setActiveRecipe(savedId);
      s.markSaved(savedId);
      return { id: savedId };
    },
    [recipes, stockLabel],
  );

  return (
    <section className="designer" aria-labelledby="designer-h" data-testid="designer">
      <header className="screen-head">
        <h2 id="designer-h">Recipe designer</h2>
        <StartFrom recipes={recipes} currentId={sourceRecipeId} dirty={dirty} draftName={name} onLoad={onLoadRecipe} onBlank={onBlank} />
      </header>
      <div className="designer-grid">
        <aside className="designer-targets">
          <h3>Targets and constraints</h3>
          <TargetsForm
            targets={targets}
            components={components}
            recipes={recipes}
            onChange={actions.setTargets}
            onBound={actions.setBound}
            onSolve={onSolve}
            solving={solving}
          />
          <BlendMethodField method={settings.blendMethod} />
        </aside>
        <div className="designer-main">
          {priced.unpriced.length > 0 && (
            <Notice tone="warning" title={unpricedTitle(priced.unpriced)}>
              <p data-testid="unpriced">{unpricedMessage(priced.unpriced, priced.base)}</p>
            </Notice>
          )}
          {/* With nothing unsaved here, the drafts other tabs kept are offered (never one picked silently). */}
          {initialised && !dirty && <KeptDrafts onOpen={actions.openKeptDraft} />}
          <SolveNoticeView notice={notice} />
          <RecipeTable
            lines={tableLines}
            view={viewRelay}
            basis={basis}
            rebalanceMode={rebalanceMode}
            balanceId={balanceId}
            additiveId={targets.additive?.componentId ?? null}
            editNote={editNote}
            addable={addable}
            onEdit={onEdit}
            onRemove={actions.removeComponent}
            onAdd={actions.addComponent}
            onBasis={actions.setBasis}
            onRebalanceMode={actions.setRebalanceMode}
            onBalance={actions.setBalanceId}
          />
          <PropertiesView prediction={predictionRelay} targets={targets} />
          <SourceStatus recipe={sourceRecipe} components={components} />
          <SaveBox
            name={name}
            grade={targets.grade}
            sourceRecipe={sourceRecipe}
            nextRevision={sourceRecipe ? nextRevisionNumber(recipes, sourceRecipe) : 1}
            dirty={dirty}
            canSave={complete}
            onName={actions.setName}
            onSaveNew={onSaveNew}
            onSaveChanges={onSaveChanges}
          />
        </div>
      </div>
      <Suspense fallback={<p className="muted">Loading charts…</p>}>
        <DesignerCharts
          view={viewRelay}
          prediction={predictionRelay}
          components={components}
          referenceRecipe={recipes.find((r) => r.id === targets.referenceRecipeId) ?? null}
          settings={settings}
        />
      </Suspense>
    </section>
  );
}

/** The blend viscosity rule, also in Settings (its own component: an edit does not rewrite the select). */
const BlendMethodField = memo(function BlendMethodField({ method }: { method: BlendMethod }) {
  return (
    <label className="field">
      <span>Blend viscosity method (also in Settings)</span>
      <select value={method} onChange={(e) => settingsActions.updateSettings({ blendMethod: e.target.value as BlendMethod })}>
        {BLEND_METHODS.map((m) => (
          <option key={m} value={m}>
            {BLEND_METHOD_LABEL[m]}
          </option>
        ))}
      </select>
    </label>
  );
});

/**
 * "Open": another saved recipe, or a new blank one, in place of the draft. A draft with unsaved edits
 * is never dropped without asking (s22 item 2): the blender keeps the edits as a kept draft (offered
 * again by name and time, see KeptDrafts), discards them, or cancels.
 */
const StartFrom = memo(function StartFrom({
  recipes,
  currentId,
  dirty,
  draftName,
  onLoad,
  onBlank,
}: {
  recipes: readonly Recipe[];
  currentId: string | null;
  dirty: boolean;
  draftName: string;
  onLoad: (r: Recipe) => void;
  onBlank: () => void;
}) {
  const id = useId();
  const [choice, setChoice] = useState(currentId ?? '');
  useEffect(() => setChoice(currentId ?? ''), [currentId]);
  /** The choice waiting for the blender's answer about the unsaved edits. */
  const [asking, setAsking] = useState<string | null>(null);
  const picker = useRef<HTMLSelectElement>(null);
  const openChoice = (c: string) => {
    const r = recipes.find((x) => x.id === c);
    if (r) onLoad(r);
    else onBlank();
  };
  return (
    <>
      <form
        className="start-from"
        onSubmit={(e) => {
          e.preventDefault();
          if (dirty) setAsking(choice);
          else openChoice(choice);
        }}
      >
        <label htmlFor={id}>Open</label>
        <select id={id} ref={picker} value={choice} onChange={(e) => setChoice(e.target.value)}>
          <option value="">a new blank recipe</option>
          {recipes
            .filter((r) => !r.archived || r.id === currentId)
            .map((r) => (
              <option key={r.id} value={r.id}>
                {r.name} (rev. {r.revision}, {RECIPE_STATUS_LABEL[r.status].toLowerCase()})
              </option>
            ))}
        </select>
        <button type="submit">Open</button>
      </form>
      {asking !== null && dirty && (
        <DiscardQuestion
          draftName={draftName}
          target={recipes.find((r) => r.id === asking) ?? null}
          onAnswer={(answer) => {
            const c = asking;
            setAsking(null);
            // The question goes away: the keyboard goes on from the picker, not from the page's start.
            picker.current?.focus();
            if (answer === 'cancel') {
              setChoice(currentId ?? ''); // the picker shows the draft's recipe again
              return;
            }
            const name = draftName.trim();
            if (answer === 'keep' && !useDesignerStore.getState().setAside()) return;
            openChoice(c);
            if (answer === 'keep') {
              // (the recipe now active is the one just opened: it is not opened a second time over the note)
              useDesignerStore.setState({
                editNote: `Your unsaved edits to ${name ? `“${name}”` : 'the draft'} are kept as a draft: open them again from the kept drafts above.`,
                seenActiveId: useRecipes.getState().activeRecipeId,
              });
            }
          }}
        />
      )}
    </>
  );
});

/** The question asked before the Open picker replaces a draft holding unsaved edits. */
function DiscardQuestion({
  draftName,
  target,
  onAnswer,
}: {
  draftName: string;
  target: Recipe | null;
  onAnswer: (answer: 'keep' | 'discard' | 'cancel') => void;
}) {
  const id = useId();
  const box = useRef<HTMLDivElement>(null);
  // The question takes the focus (the Enter or click that opened it does not answer it).
  useEffect(() => box.current?.focus(), []);
  const name = draftName.trim();
  const keepable = draftKeepable(useDesignerStore.getState());
  return (
    <div
      ref={box}
      tabIndex={-1}
      className="notice notice-warning open-question"
      role="alertdialog"
      aria-labelledby={`${id}-q`}
      aria-describedby={`${id}-d`}
      data-testid="open-question"
      onKeyDown={(e) => {
        if (e.key === 'Escape') onAnswer('cancel');
      }}
    >
      <strong className="notice-title" id={`${id}-q`}>
        Discard the unsaved edits to {name ? `“${name}”` : 'this draft'}?
      </strong>
      <p id={`${id}-d`}>
        Opening {target ? `“${target.name}”` : 'a new blank recipe'} replaces them here.{' '}
        {keepable
          ? 'Keep them as a kept draft (offered here again, by name and time, to open later), or discard them.'
          : 'They cannot be kept as a draft as they are (a value breaks a field rule): cancel to correct it, or discard them.'}
      </p>
      <div className="notice-actions">
        {keepable && (
          <button type="button" className="primary" onClick={() => onAnswer('keep')}>
            Keep my edits as a draft, then open
          </button>
        )}
        <button type="button" onClick={() => onAnswer('discard')}>
          Discard my edits, then open
        </button>
        <button type="button" onClick={() => onAnswer('cancel')}>
          Cancel
        </button>
      </div>
    </div>
  );
}

const SolveNoticeView = memo(function SolveNoticeView({ notice }: { notice: ReturnType<typeof useDesignerStore.getState>['notice'] }) {
  if (!notice) return null;
  if (notice.kind === 'optimal') {
    return (
      <Notice tone="success" title="Solved">
        {notice.message}
      </Notice>
    );
  }
  if (notice.kind === 'infeasible') {
    return (
      <Notice tone="warning" title="No recipe meets these targets">
        <p data-testid="infeasible-reason">{notice.reason}</p>
        {notice.binding && <p className="muted">Limiting constraint: {notice.binding}</p>}
        {notice.suggestion && (
          <p>
            <strong>Suggested fix:</strong> {notice.suggestion}
          </p>
        )}
      </Notice>
    );
  }
  if (notice.kind === 'invalid-input') {
    return (
      <Notice tone="error" title="Check the input">
        <p data-testid="invalid-input">{notice.message}</p>
      </Notice>
    );
  }
  return (
    <Notice tone="error" title="The solver failed">
      <p>{notice.message}</p>
    </Notice>
  );
});

/** Where the draft came from: the saved recipe's status, and whether its stock data changed since. */
const SourceStatus = memo(function SourceStatus({ recipe, components }: { recipe: Recipe | null; components: readonly Component[] }) {
  const changes = useMemo(() => (recipe ? stockBasisChanges(recipe.stockBasis, components) : []), [recipe, components]);
  if (!recipe) return null;
  const specIssue = specificationGradeIssue(recipe);
  return (
    <>
      <p className="muted source-status" data-testid="source-status">
        Opened from “{recipe.name}”, revision {recipe.revision} —{' '}
        <StatusBadge status={recipe.status} />
        {recipe.archived ? ' (archived)' : ''}.
        {recipe.status !== 'draft' ? ' It is never overwritten: saving changes makes a new draft revision.' : ''}
      </p>
      {changes.length > 0 && (
        <Notice tone="warning" title="Stock data changed since this recipe was saved">
          <StockChangeList changes={changes} />
          <p>The predictions use the current data. Saving records the current data with the recipe.</p>
        </Notice>
      )}
      {specIssue && (
        <Notice tone="warning" title={specIssue.kind === 'unknown' ? 'Grade of specification unknown — check' : 'Specification of another grade'}>
          <p data-testid="spec-grade-flag">{specificationGradeMessage(specIssue)}</p>
        </Notice>
      )}
    </>
  );
});

/**
 * `name` (trimmed), or — when a saved recipe already has it (any case) — the same marked " (copy)",
 * " (copy 2)", … (an earlier mark replaced), within the recipe-name length.
 */
export function distinctName(name: string, taken: ReadonlySet<string>): string {
  const n = name.trim();
  if (!taken.has(n.toLowerCase())) return n;
  const base = n.replace(/ \(copy(?: \d+)?\)$/, '');
  for (let i = 1; ; i++) {
    const mark = i === 1 ? ' (copy)' : ` (copy ${i})`;
    const candidate = `${base.slice(0, TEXT_RULES.recipeName.max - mark.length)}${mark}`;
    if (!taken.has(candidate.toLowerCase())) return candidate;
  }
}

/** What a save did: the id saved to, or why nothing was saved. */
type SaveOutcome = { id: string } | { refused: string };

const SaveBox = memo(function SaveBox({
  name,
  grade,
  sourceRecipe,
  nextRevision,
  dirty,
  canSave,
  onName,
  onSaveNew,
  onSaveChanges,
}: {
  name: string;
  grade: number;
  sourceRecipe: Recipe | null;
  nextRevision: number;
  dirty: boolean;
  canSave: boolean;
  onName: (n: string) => void;
  /** Save as a new draft recipe. */
  onSaveNew: (name: string, reason: string) => SaveOutcome;
  /** Save into the source (a draft) or as a new draft revision of it (approved). */
  onSaveChanges: (id: string, name: string, reason: string) => SaveOutcome;
}) {
  const id = useId();
  const reasonId = useId();
  const [reason, setReason] = useState('');
  const [saved, setSaved] = useState('');
  const [refused, setRefused] = useState('');
  const fmt = useFormat();
  // The name as typed: kept here while the field rules refuse it, so the draft never holds it.
  const [draft, setDraft] = useState(name);
  useEffect(() => setDraft(name), [name]);
  const nameError = checkText('recipeName', draft);
  const reasonError = checkText('reasonForChange', reason);
  const finalName = draft.trim() || sourceRecipe?.name || `Gear oil VG ${grade} — new recipe`;
  const revising = sourceRecipe !== null && sourceRecipe.status !== 'draft';
  const needsReason = revising && reason.trim() === '';
  const report = (outcome: SaveOutcome, ok: (savedId: string) => string) => {
    if ('refused' in outcome) {
      // The field rules write "." and °C; shown in the user's numbers like every other message.
      setRefused(sayRefusal(outcome.refused, fmt)!);
      setSaved('');
      return;
    }
    setRefused('');
    setSaved(ok(outcome.id));
    setReason('');
  };
  const blocked = !canSave || Boolean(nameError) || Boolean(reasonError);
  return (
    <section className="save-box" aria-labelledby={`${id}-h`}>
      <h3 id={`${id}-h`}>Save</h3>
      <div className="save-row">
        <label htmlFor={id}>Recipe name</label>
        <input
          id={id}
          type="text"
          value={draft}
          placeholder={finalName}
          size={40}
          aria-invalid={nameError ? true : undefined}
          aria-describedby={nameError ? `${id}-err` : undefined}
          onChange={(e) => {
            setDraft(e.target.value);
            if (!checkText('recipeName', e.target.value)) onName(e.target.value);
          }}
        />
      </div>
      {nameError && (
        <p id={`${id}-err`} className="field-msg field-error" role="alert">
          {nameError}. Nothing is saved until it is shortened.
        </p>
      )}
      <div className="save-row">
        <label htmlFor={reasonId}>Reason for change{revising ? ' (required for a new revision)' : ''}</label>
        <input
          id={reasonId}
          type="text"
          value={reason}
          size={50}
          aria-invalid={reasonError ? true : undefined}
          placeholder="e.g. bright stock withdrawn; re-solved on Group II heavy stock"
          onChange={(e) => setReason(e.target.value)}
        />
      </div>
      {reasonError && (
        <p className="field-msg field-error" role="alert">
          {reasonError}.
        </p>
      )}
      <div className="save-row">
        {sourceRecipe && (
          <button
            type="button"
            disabled={blocked || !dirty || needsReason}
            title={needsReason && dirty ? 'Give the reason for change first' : undefined}
            onClick={() =>
              report(onSaveChanges(sourceRecipe.id, finalName, reason.trim()), (savedId) =>
                (savedId === sourceRecipe.id
                  ? `Saved changes to draft “${finalName}”.`
                  : `Saved as draft revision ${nextRevision} of “${sourceRecipe.name}”; it supersedes revision ${sourceRecipe.revision} once approved (Recipes screen).`) +
                (sourceRecipe.grade !== grade && !isBlankSpecification(sourceRecipe.specification) && sourceRecipe.specification.grade !== grade
                  ? ` The product specification of VG ${sourceRecipe.specification.grade ?? sourceRecipe.grade} was not carried to VG ${grade}: it starts blank (“Per specification”); enter the VG ${grade} release limits on Recipes.`
                  : ''),
              )
            }
          >
            {revising ? `Save as draft revision ${nextRevision} of “${sourceRecipe.name}”` : `Save changes to draft “${sourceRecipe.name}”`}
          </button>
        )}
        <button
          type="button"
          disabled={blocked}
          onClick={() =>
            report(
              onSaveNew(finalName, reason.trim()),
              (savedId) =>
                `Saved as a new draft recipe: ${useRecipes.getState().recipes.find((r) => r.id === savedId)?.name ?? finalName}.` +
                (sourceRecipe && sourceRecipe.grade !== grade
                  ? ` The product specification of “${sourceRecipe.name}” (VG ${sourceRecipe.grade}) was not copied to this VG ${grade} recipe: enter its release limits on Recipes.`
                  : ''),
            )
          }
        >
          Save as new recipe
        </button>
      </div>
      {revising && dirty && needsReason && <p className="muted">An approved recipe is never overwritten: give the reason for change to save a new draft revision.</p>}
      {refused && (
        <p className="field-msg field-error" role="alert">
          Not saved: {refused}.
        </p>
      )}
      <p role="status" className="muted">
        {saved}
      </p>
    </section>
  );
});
