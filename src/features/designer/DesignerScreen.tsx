import { Suspense, lazy, useCallback, useEffect, useId, useMemo, useState } from 'react';
import type { BlendTargets, Recipe } from '../../core/formulation/model';
import { Notice } from '../../components/notices';
import { useFormat } from '../../components/format';
import { componentsById, defaultTargets, recipeActions, useLibrary, useRecipes, useSettings } from '../../state';
import { checkText, firstProblem, recipeProblems, recipeWho, targetsProblems } from '../../state/field-rules';
import { TargetsForm } from './TargetsForm';
import { RecipeTable } from './RecipeTable';
import { deriveDraft } from './derive';
import { densityLookup, useDesignerStore } from './store';
import { runSolve } from './solve';
import { usePrediction } from './predict';
import { PropertiesPanel } from './PropertiesPanel';
import './designer.css';

const DesignerCharts = lazy(() => import('./DesignerCharts'));

/** Targets for a recipe: the stored ones, else defaults for its grade with the library's additive. */
function targetsFor(recipe: Recipe, stored: BlendTargets | undefined, additiveId: string | null): BlendTargets {
  return stored ?? defaultTargets(recipe.grade, additiveId, recipe.isReference ? recipe.id : null);
}

export default function DesignerScreen() {
  const components = useLibrary((s) => s.components);
  const byId = componentsById(components);
  const recipes = useRecipes((s) => s.recipes);
  const storedTargets = useRecipes((s) => s.targets);
  const activeRecipeId = useRecipes((s) => s.activeRecipeId);
  const settings = useSettings();
  const fmt = useFormat();

  const targets = useDesignerStore((s) => s.targets);
  const lines = useDesignerStore((s) => s.lines);
  const basis = useDesignerStore((s) => s.basis);
  const rebalanceMode = useDesignerStore((s) => s.rebalanceMode);
  const balanceId = useDesignerStore((s) => s.balanceId);
  const editNote = useDesignerStore((s) => s.editNote);
  const notice = useDesignerStore((s) => s.notice);
  const name = useDesignerStore((s) => s.name);
  const sourceRecipeId = useDesignerStore((s) => s.sourceRecipeId);
  const dirty = useDesignerStore((s) => s.dirty);
  const initialised = useDesignerStore((s) => s.initialised);
  const actions = useDesignerStore.getState();

  const additiveId = useMemo(
    () => components.find((c) => c.category === 'additive-package' && c.availability !== 'withdrawn')?.id ?? null,
    [components],
  );

  // First visit: open the active recipe (or the first reference recipe), else a blank VG 320 draft.
  // Later, a recipe made active elsewhere (e.g. adopted in the explorer) opens unless the draft has unsaved edits.
  const seenActiveId = useDesignerStore((s) => s.seenActiveId);
  useEffect(() => {
    if (initialised && activeRecipeId === seenActiveId) return;
    actions.setSeenActiveId(activeRecipeId);
    if (initialised && useDesignerStore.getState().dirty) return;
    const start = recipes.find((r) => r.id === activeRecipeId) ?? (initialised ? undefined : (recipes.find((r) => r.isReference) ?? recipes[0]));
    if (start) actions.load(start, targetsFor(start, storedTargets[start.id], additiveId));
    else if (!initialised) actions.startBlank(defaultTargets(320, additiveId, null));
  }, [initialised, seenActiveId, recipes, activeRecipeId, storedTargets, additiveId, actions]);

  const density = useMemo(() => densityLookup(components), [components]);
  const view = useMemo(() => deriveDraft(lines, byId), [lines, byId]);
  const prediction = usePrediction(lines, components, settings, targets.grade);

  const [solving, setSolving] = useState(false);
  const onSolve = useCallback(() => {
    setSolving(true);
    // Let "Solving…" paint before the (synchronous, usually sub-second) solve runs.
    setTimeout(() => {
      const s = useDesignerStore.getState();
      const reference = s.targets.referenceRecipeId ? useRecipes.getState().recipes.find((r) => r.id === s.targets.referenceRecipeId) ?? null : null;
      const outcome = runSolve(useLibrary.getState().components, s.targets, reference, settings.blendMethod, fmt);
      if (outcome.kind === 'optimal') s.applySolution(outcome.lines, outcome.message);
      else s.setNotice(outcome);
      setSolving(false);
    }, 0);
  }, [settings.blendMethod, fmt]);

  const stockLabel = useCallback((id: string) => `stock ${byId.get(id)?.code ?? id}`, [byId]);

  const onEdit = useCallback((id: string, f: number) => useDesignerStore.getState().editLine(id, f, density), [density]);

  const inRecipe = new Set(lines.map((l) => l.componentId));
  const addable = components.filter((c) => c.availability !== 'withdrawn' && !inRecipe.has(c.id));

  return (
    <section className="designer" aria-labelledby="designer-h" data-testid="designer">
      <header className="screen-head">
        <h2 id="designer-h">Recipe designer</h2>
        <StartFrom
          recipes={recipes}
          currentId={sourceRecipeId}
          onLoad={(r) => {
            actions.load(r, targetsFor(r, storedTargets[r.id], additiveId));
            recipeActions.setActiveRecipe(r.id);
          }}
          onBlank={() => actions.startBlank(defaultTargets(targets.grade, additiveId, targets.referenceRecipeId))}
        />
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
        </aside>
        <div className="designer-main">
          <SolveNoticeView notice={notice} />
          <RecipeTable
            view={view}
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
          <PropertiesPanel prediction={prediction} targets={targets} />
          <SaveBox
            name={name}
            grade={targets.grade}
            sourceRecipe={recipes.find((r) => r.id === sourceRecipeId) ?? null}
            dirty={dirty}
            canSave={lines.length > 0 && Math.abs(view.total - 1) < 1e-6}
            onName={actions.setName}
            onSaveNew={(n) => {
              const s = useDesignerStore.getState();
              // The same field rules as storage: refuse before anything is written.
              const refused = firstProblem(targetsProblems(s.targets, recipeWho(n), stockLabel));
              if (refused) return refused;
              let id: string;
              try {
                id = recipeActions.addRecipe({ name: n, grade: s.targets.grade, lines: s.lines });
              } catch (e) {
                return (e as Error).message;
              }
              recipeActions.setTargets(id, s.targets);
              recipeActions.setActiveRecipe(id);
              s.markSaved(id);
              s.setName(n);
              return null;
            }}
            onSaveOver={(id, raise) => {
              const s = useDesignerStore.getState();
              const target = recipes.find((r) => r.id === id);
              const refused = firstProblem([
                ...(target ? recipeProblems({ ...target, lines: s.lines, grade: s.targets.grade }) : []),
                ...targetsProblems(s.targets, target ? recipeWho(target.name) : undefined, stockLabel),
              ]);
              if (refused) return refused;
              recipeActions.setLines(id, s.lines);
              recipeActions.updateRecipe(id, { grade: s.targets.grade });
              recipeActions.setTargets(id, s.targets);
              if (raise) recipeActions.raiseRevision(id);
              s.markSaved(id);
              return null;
            }}
          />
        </div>
      </div>
      <Suspense fallback={<p className="muted">Loading charts…</p>}>
        <DesignerCharts
          view={view}
          prediction={prediction}
          components={components}
          referenceRecipe={recipes.find((r) => r.id === targets.referenceRecipeId) ?? null}
          settings={settings}
        />
      </Suspense>
    </section>
  );
}

function StartFrom({
  recipes,
  currentId,
  onLoad,
  onBlank,
}: {
  recipes: readonly Recipe[];
  currentId: string | null;
  onLoad: (r: Recipe) => void;
  onBlank: () => void;
}) {
  const id = useId();
  const [choice, setChoice] = useState(currentId ?? '');
  useEffect(() => setChoice(currentId ?? ''), [currentId]);
  return (
    <form
      className="start-from"
      onSubmit={(e) => {
        e.preventDefault();
        const r = recipes.find((x) => x.id === choice);
        if (r) onLoad(r);
        else onBlank();
      }}
    >
      <label htmlFor={id}>Open</label>
      <select id={id} value={choice} onChange={(e) => setChoice(e.target.value)}>
        <option value="">a new blank recipe</option>
        {recipes.map((r) => (
          <option key={r.id} value={r.id}>
            {r.name} (rev. {r.revision})
          </option>
        ))}
      </select>
      <button type="submit">Open</button>
    </form>
  );
}

function SolveNoticeView({ notice }: { notice: ReturnType<typeof useDesignerStore.getState>['notice'] }) {
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
}

function SaveBox({
  name,
  grade,
  sourceRecipe,
  dirty,
  canSave,
  onName,
  onSaveNew,
  onSaveOver,
}: {
  name: string;
  grade: number;
  sourceRecipe: Recipe | null;
  dirty: boolean;
  canSave: boolean;
  onName: (n: string) => void;
  /** Save as a new recipe; null, or why nothing was saved. */
  onSaveNew: (name: string) => string | null;
  /** Save over a recipe; null, or why nothing was saved. */
  onSaveOver: (id: string, raiseRevision: boolean) => string | null;
}) {
  const id = useId();
  const [raise, setRaise] = useState(true);
  const [saved, setSaved] = useState('');
  const [refused, setRefused] = useState('');
  // The name as typed: kept here while the field rules refuse it, so the draft never holds it.
  const [draft, setDraft] = useState(name);
  useEffect(() => setDraft(name), [name]);
  const nameError = checkText('recipeName', draft);
  const finalName = draft.trim() || `Gear oil VG ${grade} — new recipe`;
  const report = (message: string | null, ok: string) => {
    setRefused(message ?? '');
    setSaved(message ? '' : ok);
  };
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
        <button
          type="button"
          disabled={!canSave || Boolean(nameError)}
          onClick={() => report(onSaveNew(finalName), `Saved as a new recipe: ${finalName}.`)}
        >
          Save as new recipe
        </button>
      </div>
      {nameError && (
        <p id={`${id}-err`} className="field-msg field-error" role="alert">
          {nameError}. Nothing is saved until it is shortened.
        </p>
      )}
      {sourceRecipe && (
        <div className="save-row">
          <button
            type="button"
            disabled={!canSave || !dirty}
            onClick={() =>
              report(onSaveOver(sourceRecipe.id, raise), `Saved over ${sourceRecipe.name}${raise ? ` (revision ${sourceRecipe.revision + 1})` : ''}.`)
            }
          >
            Save changes to “{sourceRecipe.name}”
          </button>
          <label className="checkbox">
            <input type="checkbox" checked={raise} onChange={(e) => setRaise(e.target.checked)} /> raise the revision
          </label>
        </div>
      )}
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
}
