// The recipe register: every saved recipe with its status (draft / approved / superseded), its
// revisions, reason for change and product specification; approve, rename, archive, delete with undo.
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import type { Recipe, ReleaseSpecification } from '../../core/formulation/model';
import { BLANK_SPECIFICATION, RECIPE_STATUS_LABEL } from '../../core/formulation/model';
import { assessRelease } from '../../core/release/release-hold';
import { stockBasisChanges } from '../../core/recipes/stock-basis';
import { shareChanges } from '../../core/recipes/share-changes';
import { isBlankSpecification, specificationGradeChoices, specificationGradeIssue, specificationGradeMessage } from '../../core/recipes/specification-grade';
import { approvalRefusal } from '../../core/recipes/approval';
import { ActionNotice, Notice } from '../../components/notices';
import { NumberField, TextField, ruleVerdict } from '../../components/fields';
import { useFormat } from '../../components/format';
import { StatusBadge, StockChangeList } from '../../components/recipe-status';
import { sayRefusal, userMessage } from '../../state/messages';
import { checkText, type NumberRuleKey, type TextRuleKey } from '../../state/field-rules';
import { holdLeave, nextRevisionNumber, recipeActions, useLibrary, useRecipes, useRecipesHistory, useSettings } from '../../state';
import './recipes.css';

/** `focus`: the action took away the button that was pressed (Delete, Duplicate): the notice's first button takes the focus. */
type Flash = { tone: 'success' | 'info' | 'warning'; text: string; undo?: boolean; focus?: boolean } | null;

export default function RecipesScreen() {
  const recipes = useRecipes((s) => s.recipes);
  const activeRecipeId = useRecipes((s) => s.activeRecipeId);
  const components = useLibrary((s) => s.components);
  const history = useRecipesHistory();
  const [showArchived, setShowArchived] = useState(false);
  const [query, setQuery] = useState('');
  const [selectedId, setSelectedId] = useState<string | null>(activeRecipeId);
  const [flash, setFlash] = useState<Flash>(null);
  const flashBox = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (flash?.focus) flashBox.current?.querySelector('button')?.focus();
  }, [flash]);
  const fmt = useFormat();

  const byId = useMemo(() => new Map(recipes.map((r) => [r.id, r])), [recipes]);
  const componentIds = useMemo(() => new Map(components.map((c) => [c.id, c])), [components]);
  const supersededBy = useMemo(() => {
    const m = new Map<string, Recipe[]>();
    for (const r of recipes) if (r.supersedes) m.set(r.supersedes, [...(m.get(r.supersedes) ?? []), r]);
    return m;
  }, [recipes]);
  const shown = useMemo(() => {
    const q = query.trim().toLowerCase();
    // Spaces do not count: "VG320" finds "VG 320" (in the name or the grade) as "vg 320" does.
    const compact = (t: string) => t.replace(/\s+/g, '');
    const cq = compact(q);
    return recipes
      .filter((r) => (showArchived || !r.archived) && (!q || r.name.toLowerCase().includes(q) || compact(r.name.toLowerCase()).includes(cq) || `vg${r.grade}`.includes(cq)))
      .sort((a, b) => a.grade - b.grade || a.name.localeCompare(b.name) || a.revision - b.revision);
  }, [recipes, showArchived, query]);
  const selected = (selectedId ? byId.get(selectedId) : undefined) ?? null;

  const remove = (r: Recipe) => {
    recipeActions.removeRecipe(r.id);
    setSelectedId(null);
    setFlash({ tone: 'info', text: `Deleted “${r.name}” (revision ${r.revision}).`, undo: true, focus: true });
  };

  return (
    <section className="recipes" aria-labelledby="recipes-h" data-testid="recipes">
      <h2 id="recipes-h">Recipes</h2>
      <p className="lead">
        Every saved recipe with its status. A <strong>draft</strong> can be changed and is not for release; an <strong>approved</strong>{' '}
        recipe is never overwritten — a change makes a new draft revision that supersedes it, and approving that revision marks the
        old one <strong>superseded</strong>.
      </p>
      <div className="toolbar">
        <label className="inline-field">
          Find
          <input type="search" value={query} onChange={(e) => setQuery(e.target.value)} placeholder="name or VG 320" size={18} />
        </label>
        <label className="check">
          <input type="checkbox" checked={showArchived} onChange={(e) => setShowArchived(e.target.checked)} /> Show archived
        </label>
        <span className="toolbar-gap" />
        {/* The notice names the last action and offers its undo: once the toolbar moves through the history it no longer holds. */}
        <button
          type="button"
          disabled={!history.canUndo}
          onClick={() => {
            history.undo();
            setFlash(null);
          }}
        >
          Undo
        </button>
        <button
          type="button"
          disabled={!history.canRedo}
          onClick={() => {
            history.redo();
            setFlash(null);
          }}
        >
          Redo
        </button>
      </div>
      <div ref={flashBox}>
        {flash && (
          <ActionNotice
            tone={flash.tone}
            text={flash.text}
            canUndo={Boolean(flash.undo && history.canUndo)}
            onUndo={history.undo}
            onDismiss={() => setFlash(null)}
          />
        )}
      </div>
      <div className="recipes-grid">
        <div className="table-scroll">
          <table className="data recipes-table" data-testid="recipe-list">
            <caption className="visually-hidden">Saved recipes</caption>
            <thead>
              <tr>
                <th scope="col">Recipe</th>
                <th scope="col" className="num">Grade</th>
                <th scope="col" className="num">Rev.</th>
                <th scope="col">Status</th>
                <th scope="col">Flags</th>
                <th scope="col">Saved</th>
              </tr>
            </thead>
            <tbody>
              {shown.map((r) => {
                const changed = stockBasisChanges(r.stockBasis, components).length > 0;
                const withdrawn = r.lines.some((l) => l.massFraction > 0 && componentIds.get(l.componentId)?.availability === 'withdrawn');
                const specIssue = specificationGradeIssue(r);
                const isSel = r.id === selected?.id;
                return (
                  <tr key={r.id} className={isSel ? 'selected' : undefined} aria-selected={isSel}>
                    <th scope="row">
                      <button type="button" className="link" aria-pressed={isSel} onClick={() => setSelectedId(r.id)}>
                        {r.name}
                      </button>
                      {r.isReference ? <span className="tag"> in production</span> : null}
                    </th>
                    <td className="num one-line">VG {r.grade}</td>
                    <td className="num">{r.revision}</td>
                    <td>
                      <StatusBadge status={r.status} />
                      {r.archived ? <span className="tag"> archived</span> : null}
                    </td>
                    <td>
                      {withdrawn ? <span className="tag tag-bad">withdrawn stock</span> : null}
                      {changed ? <span className="tag tag-warn">stock data changed</span> : null}
                      {specIssue ? (
                        <span className="tag tag-bad" data-testid="spec-grade-tag">
                          {specIssue.kind === 'unknown' ? 'grade of specification unknown — check' : `specification of VG ${specIssue.specificationGrade}`}
                        </span>
                      ) : null}
                    </td>
                    <td className="one-line">{r.updatedAt.slice(0, 10)}</td>
                  </tr>
                );
              })}
              {shown.length === 0 && (
                <tr>
                  <td colSpan={6} className="muted">
                    No recipe matches.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
        </div>
        {selected ? (
          <RecipeDetail
            key={selected.id}
            recipe={selected}
            recipes={recipes}
            supersedes={selected.supersedes ? (byId.get(selected.supersedes) ?? null) : null}
            supersededBy={supersededBy.get(selected.id) ?? []}
            onSelect={setSelectedId}
            onFlash={setFlash}
            onDelete={() => remove(selected)}
            fmtPct={(f) => fmt.num(f * 100, 2)}
          />
        ) : (
          <p className="muted recipe-detail">Select a recipe to see its status, specification and history.</p>
        )}
      </div>
    </section>
  );
}

function RecipeDetail({
  recipe,
  recipes,
  supersedes,
  supersededBy,
  onSelect,
  onFlash,
  onDelete,
  fmtPct,
}: {
  recipe: Recipe;
  recipes: readonly Recipe[];
  supersedes: Recipe | null;
  supersededBy: readonly Recipe[];
  onSelect: (id: string) => void;
  onFlash: (f: Flash) => void;
  onDelete: () => void;
  fmtPct: (fraction: number) => string;
}) {
  const components = useLibrary((s) => s.components);
  const targets = useRecipes((s) => s.targets[recipe.id]) ?? null;
  const settings = useSettings();
  const fmt = useFormat();
  const codeOf = (id: string) => components.find((c) => c.id === id)?.code ?? id;
  const release = useMemo(
    () =>
      assessRelease({
        recipe,
        components,
        targets,
        method: settings.blendMethod,
        supersededBy: supersededBy.find((r) => r.status === 'approved') ?? null,
        display: settings,
        sayError: (e) => userMessage(e, { components, words: fmt }),
      }),
    [recipe, components, targets, settings, supersededBy, fmt],
  );
  const stockChanges = useMemo(() => stockBasisChanges(recipe.stockBasis, components), [recipe, components]);
  const [renameRefused, setRenameRefused] = useState<string | null>(null);
  const [actionRefused, setActionRefused] = useState<string | null>(null);
  // Reasons other than the status itself stop an approval; so does another approved revision of the same recipe.
  const blocking = release.reasons.filter((r) => r.kind !== 'status');
  const notApprovable = recipe.status === 'draft' ? approvalRefusal(recipes, recipe.id) : null;
  const specIssue = specificationGradeIssue(recipe);
  const changes = supersedes ? shareChanges(supersedes.lines, recipe.lines) : [];
  const open = (screen: 'designer' | 'blend-sheet') => {
    recipeActions.setActiveRecipe(recipe.id);
    window.location.hash = screen === 'designer' ? '#/designer' : `#/blend-sheet/${encodeURIComponent(recipe.id)}`;
  };

  return (
    <section className="recipe-detail panel" aria-labelledby="recipe-detail-h">
      <h3 id="recipe-detail-h">
        {recipe.name} <span className="muted">— VG {recipe.grade}, revision {recipe.revision}</span> <StatusBadge status={recipe.status} />
      </h3>
      <TextField
        label="Name"
        size={48}
        rule="recipeName"
        trimForRule
        value={recipe.name}
        validate={(v) => ({ error: v.trim() ? undefined : 'a recipe needs a name' })}
        onCommit={(v) => {
          const refused = recipeActions.renameRecipe(recipe.id, v.trim());
          setRenameRefused(refused ? `Not renamed: ${sayRefusal(refused, fmt)}` : null);
        }}
      />
      {renameRefused && (
        <p className="field-msg field-error" role="alert" data-testid="rename-refused">
          {renameRefused}
        </p>
      )}
      <dl className="recipe-facts">
        <dt>Status</dt>
        <dd>
          {RECIPE_STATUS_LABEL[recipe.status]}
          {recipe.status === 'approved' ? (recipe.approvedAt ? ` on ${recipe.approvedAt.slice(0, 10)}` : ' (carried over from an earlier version)') : ''}
          {recipe.archived ? ', archived' : ''}
          {recipe.isReference ? ', in production (the reference a substitute replaces)' : ''}
        </dd>
        <dt>Supersedes</dt>
        <dd>
          {supersedes ? (
            <button type="button" className="link" onClick={() => onSelect(supersedes.id)}>
              {supersedes.name}, revision {supersedes.revision} ({RECIPE_STATUS_LABEL[supersedes.status].toLowerCase()})
            </button>
          ) : recipe.supersedes ? (
            'a recipe that was deleted'
          ) : (
            '—'
          )}
        </dd>
        <dt>Later revisions</dt>
        <dd>
          {supersededBy.length === 0
            ? '—'
            : supersededBy.map((r, i) => (
                <span key={r.id}>
                  {i > 0 ? ', ' : ''}
                  <button type="button" className="link" onClick={() => onSelect(r.id)}>
                    revision {r.revision} ({RECIPE_STATUS_LABEL[r.status].toLowerCase()})
                  </button>
                </span>
              ))}
        </dd>
        <dt>Reason for change</dt>
        <dd>{recipe.reasonForChange.trim() || '—'}</dd>
        <dt>Composition</dt>
        <dd>
          {[...recipe.lines]
            .filter((l) => l.massFraction > 0)
            .sort((a, b) => b.massFraction - a.massFraction)
            .map((l) => `${codeOf(l.componentId)} ${fmtPct(l.massFraction)} %`)
            .join(' · ')}
        </dd>
      </dl>

      {supersedes && (
        <div className="recipe-change">
          <h4>Change from revision {supersedes.revision}</h4>
          <ul>
            {changes.map((c) => (
              <li key={c.componentId}>
                <span className="code">{codeOf(c.componentId)}</span> {c.kind === 'added' ? '—' : `${fmtPct(c.from)} %`} →{' '}
                {c.kind === 'removed' ? '—' : `${fmtPct(c.to)} %`}
              </li>
            ))}
          </ul>
        </div>
      )}

      {specIssue && (
        <Notice tone="warning" title={specIssue.kind === 'unknown' ? 'Grade of specification unknown — check' : 'Specification of another grade'}>
          <p data-testid="spec-grade-flag">{specificationGradeMessage(specIssue)}</p>
        </Notice>
      )}
      {stockChanges.length > 0 && (
        <Notice tone="warning" title="Stock data changed since this recipe was saved">
          <StockChangeList changes={stockChanges} />
          <p>Predictions now use the current data; a new revision records it.</p>
        </Notice>
      )}

      <div className="release-check" data-testid="release-check">
        <h4>Release check</h4>
        {release.reasons.length === 0 ? (
          <p>No hold: the blend sheet can be printed for production. The laboratory must still confirm every release property.</p>
        ) : (
          <ul>
            {release.reasons.map((r) => (
              <li key={r.message}>{r.message}</li>
            ))}
          </ul>
        )}
      </div>

      <div className="button-row recipe-actions">
        {recipe.status === 'draft' && (
          <button
            type="button"
            className="primary"
            disabled={blocking.length > 0 || notApprovable !== null}
            aria-describedby={notApprovable ? 'approval-refused' : undefined}
            title={blocking.length > 0 ? 'Resolve the release-check reasons first' : undefined}
            onClick={() => {
              const refused = recipeActions.approveRecipe(recipe.id);
              if (refused) {
                setActionRefused(`Not approved: ${refused}`);
                return;
              }
              // Other drafts made from the same revision can no longer be approved (one approved revision per recipe).
              const siblings = recipes.filter((x) => x.id !== recipe.id && x.status === 'draft' && recipe.supersedes !== null && x.supersedes === recipe.supersedes);
              onFlash({
                tone: 'success',
                text:
                  `Approved “${recipe.name}” (revision ${recipe.revision})${supersedes && supersedes.status === 'approved' ? `; revision ${supersedes.revision} is now superseded` : ''}.` +
                  (siblings.length
                    ? ` Draft revision${siblings.length > 1 ? 's' : ''} ${siblings.map((x) => x.revision).join(', ')}, made from the same revision, can no longer be approved: save ${siblings.length > 1 ? 'their' : 'its'} changes as a new revision of revision ${recipe.revision}.`
                    : ''),
                undo: true,
              });
            }}
          >
            Approve
          </button>
        )}
        <button type="button" onClick={() => open('designer')}>
          Open in the designer
        </button>
        <button type="button" onClick={() => open('blend-sheet')}>
          Blend sheet
        </button>
        <button
          type="button"
          onClick={() => {
            let id: string | null;
            try {
              id = recipeActions.duplicateRecipe(recipe.id);
            } catch (e) {
              // At the collection limit (or a field the rules refuse): said here, nothing is stored.
              setActionRefused(`Not duplicated: ${sayRefusal(e instanceof Error ? e.message : String(e), fmt)}. Nothing was changed; delete recipes that are no longer needed to make room.`);
              return;
            }
            setActionRefused(null);
            if (id) {
              onSelect(id);
              // The copy's name as saved (a name at its limit is shortened to keep the " (copy)" mark).
              const copyName = useRecipes.getState().recipes.find((r) => r.id === id)?.name ?? `${recipe.name} (copy)`;
              onFlash({ tone: 'success', text: `Copied as a new draft: “${copyName}”.`, undo: true, focus: true });
            }
          }}
        >
          Duplicate
        </button>
        <button
          type="button"
          onClick={() => {
            recipeActions.setArchived(recipe.id, !recipe.archived);
            onFlash({ tone: 'info', text: `${recipe.archived ? 'Restored' : 'Archived'} “${recipe.name}”.`, undo: true });
          }}
        >
          {recipe.archived ? 'Restore from archive' : 'Archive'}
        </button>
        <button type="button" className="danger" onClick={onDelete}>
          Delete
        </button>
      </div>
      {actionRefused && (
        <p className="field-msg field-error" role="alert" data-testid="recipe-action-refused">
          {actionRefused}
        </p>
      )}
      {notApprovable && (
        <p className="field-msg field-error" id="approval-refused" data-testid="approval-refused">
          Cannot be approved: {notApprovable}
        </p>
      )}
      {recipe.status === 'draft' && blocking.length > 0 && (
        <p className="muted">Approval waits until the release check shows no reason other than the draft status.</p>
      )}

      <SpecificationForm recipe={recipe} recipes={recipes} onSaved={(id, text) => {
        onSelect(id);
        onFlash({ tone: 'success', text, undo: true });
      }} />
    </section>
  );
}

/**
 * The specification's limits, in the form's order: the one list the form's fields and the list of
 * limits that differ (a save made elsewhere) are both drawn from, so their labels cannot drift apart.
 * `row`: the form's line (0 = the reference, alone); `method`: the test method named after the label
 * in the form; `dp`: decimals when a limit is written in a message.
 */
type SpecField = {
  key: Exclude<keyof ReleaseSpecification, 'grade'>;
  label: string;
  row: 0 | 1 | 2 | 3;
  dp: number;
} & (
  | { kind: 'text'; rule: TextRuleKey; size: number; method?: string; placeholder?: string }
  | { kind: 'num'; rule: NumberRuleKey; unit?: string }
  | { kind: 'temp'; rule: NumberRuleKey }
);
const SPEC_FIELDS: readonly SpecField[] = [
  { key: 'reference', label: 'Specification reference', row: 0, dp: 0, kind: 'text', rule: 'specReference', size: 36 },
  { key: 'kv100Min', label: 'ν100 minimum', row: 1, dp: 2, kind: 'num', rule: 'specKv100', unit: 'mm²/s' },
  { key: 'kv100Max', label: 'ν100 maximum', row: 1, dp: 2, kind: 'num', rule: 'specKv100', unit: 'mm²/s' },
  { key: 'viMin', label: 'VI minimum', row: 1, dp: 0, kind: 'num', rule: 'specViMin' },
  { key: 'density15Min', label: 'Density at 15 °C, minimum', row: 2, dp: 4, kind: 'num', rule: 'specDensity15', unit: 'kg/L' },
  { key: 'density15Max', label: 'Density at 15 °C, maximum', row: 2, dp: 4, kind: 'num', rule: 'specDensity15', unit: 'kg/L' },
  { key: 'flashMin', label: 'Flash point minimum', row: 2, dp: 0, kind: 'temp', rule: 'specFlashMin' },
  { key: 'pourMax', label: 'Pour point maximum', row: 2, dp: 0, kind: 'temp', rule: 'specPourMax' },
  { key: 'copper', label: 'Copper strip corrosion', row: 3, dp: 0, kind: 'text', rule: 'specText', size: 16, method: 'ASTM D130', placeholder: 'e.g. 1b max' },
  { key: 'foam', label: 'Foaming', row: 3, dp: 0, kind: 'text', rule: 'specText', size: 24, method: 'ASTM D892' },
];

/** Each limit that differs between the stored specification and the one typed, "label: saved x, yours y". */
function specDifferences(stored: ReleaseSpecification, typed: ReleaseSpecification, fmt: ReturnType<typeof useFormat>): string[] {
  const say = (v: unknown, kind: SpecField['kind'], dp: number) =>
    v === null || v === '' ? 'blank' : kind === 'text' ? `“${String(v)}”` : kind === 'temp' ? fmt.temp(v as number, dp) : fmt.num(v as number, dp);
  return SPEC_FIELDS.filter((f) => stored[f.key] !== typed[f.key]).map(
    (f) => `${f.label}: saved ${say(stored[f.key], f.kind, f.dp)}, yours ${say(typed[f.key], f.kind, f.dp)}`,
  );
}

/** The product specification's release limits; blank → "per specification" on the sheet. */
function SpecificationForm({
  recipe,
  recipes,
  onSaved,
}: {
  recipe: Recipe;
  recipes: readonly Recipe[];
  onSaved: (id: string, text: string) => void;
}) {
  const fmt = useFormat();
  const id = useId();
  const [spec, setSpec] = useState<ReleaseSpecification>(() => structuredClone(recipe.specification));
  const specIssue = specificationGradeIssue({ grade: recipe.grade, specification: spec });
  // A stored specification whose grade the upgrade could not tell, with nothing typed over it yet.
  const unknownStored = recipe.specification.grade === null && !isBlankSpecification(recipe.specification) && spec.grade === null;
  const [pickRefused, setPickRefused] = useState<string | null>(null);
  const [reason, setReason] = useState('');
  // The stored specification the limits typed here began from. When the stored one changes elsewhere
  // (another tab's save, an undo), the form follows it only if nothing typed here is unsaved; else it
  // keeps the typed limits and shows both, and the blender chooses — neither side is dropped silently.
  const [base, setBase] = useState<ReleaseSpecification>(recipe.specification);
  const same = (a: ReleaseSpecification, b: ReleaseSpecification) => JSON.stringify(a) === JSON.stringify(b);
  const unsaved = !same(spec, base);
  const elsewhere = recipe.specification !== base && !same(recipe.specification, base) && unsaved && !same(spec, recipe.specification);
  useEffect(() => {
    if (recipe.specification === base || elsewhere) return;
    if (!unsaved) setSpec(structuredClone(recipe.specification));
    setBase(recipe.specification);
  }, [recipe.specification, base, unsaved, elsewhere]);
  const changed = !same(spec, recipe.specification);
  // Limits typed here but not saved: leaving the page asks first (they live only in this form).
  useEffect(() => {
    if (!changed) return;
    const release = holdLeave(() => true);
    return () => void release();
  }, [changed]);
  const revising = recipe.status !== 'draft';
  const set = (patch: Partial<ReleaseSpecification>) => setSpec((s) => ({ ...s, ...patch }));
  const pairError = (lo: number | null, hi: number | null, what: string) =>
    lo !== null && hi !== null && lo > hi ? `the minimum ${what} is above the maximum` : undefined;
  const reasonProblem = checkText('reasonForChange', reason.trim());
  const errors = [pairError(spec.kv100Min, spec.kv100Max, 'ν100'), pairError(spec.density15Min, spec.density15Max, 'density')].filter(Boolean);
  // One field of the list above, as the form shows it (°F or °C as set; stored in °C).
  const field = (f: SpecField) => {
    if (f.kind === 'text') {
      const label = f.method ? `${f.label} (${f.method})` : f.label;
      return (
        <TextField
          key={f.key}
          label={label}
          size={f.size}
          rule={f.rule}
          value={spec[f.key] as string}
          {...(f.placeholder ? { placeholder: f.placeholder } : {})}
          onCommit={(v) => set({ [f.key]: v })}
        />
      );
    }
    const v = spec[f.key] as number | null;
    if (f.kind === 'temp') {
      return (
        <NumberField
          key={f.key}
          label={f.label}
          unit={fmt.tempUnit}
          allowEmpty
          value={v === null ? null : fmt.tempValue(v)}
          validate={(t) => ruleVerdict(f.rule, t, fmt, fmt.tempToC)}
          onCommit={(t) => set({ [f.key]: t === null ? null : fmt.tempToC(t) })}
        />
      );
    }
    return (
      <NumberField
        key={f.key}
        label={f.label}
        {...(f.unit ? { unit: f.unit } : {})}
        allowEmpty
        value={v}
        validate={(t) => ruleVerdict(f.rule, t, fmt)}
        onCommit={(t) => set({ [f.key]: t })}
      />
    );
  };
  const row = (r: SpecField['row']) => SPEC_FIELDS.filter((f) => f.row === r).map(field);
  return (
    <fieldset className="spec-form">
      <legend>Product specification (release limits)</legend>
      <p className="muted">
        Limits printed in the blend sheet&rsquo;s QC table; a blank one prints “Per specification”. ν40 is set by the grade (ISO 3448) and the plant aim.
        The blend sheet’s QC table shows the predictions beside the limits, for information only.
      </p>
      <p data-testid="spec-grade-link">
        {isBlankSpecification(spec)
          ? `Written for: VG ${recipe.grade} (blank).`
          : spec.grade === null
            ? 'Written for: grade unknown — check (saved before specifications were linked to a grade).'
            : `Written for: VG ${spec.grade}${spec.grade === recipe.grade ? '' : ` — not this recipe’s grade (VG ${recipe.grade}); its limits are not printed`}.`}{' '}
        {specIssue && !unknownStored && (
          <button type="button" onClick={() => set({ grade: recipe.grade })}>
            It is the VG {recipe.grade} specification
          </button>
        )}
      </p>
      {unknownStored && (
        <p className="button-row" data-testid="spec-grade-pick">
          {/* The upgrade could not tell the grade: one click records it (any status; no limit changes). */}
          {specificationGradeChoices(recipe, recipes).map((g) => (
            <button
              key={g}
              type="button"
              onClick={() => {
                const refused = recipeActions.confirmSpecificationGrade(recipe.id, g);
                if (refused) setPickRefused(refused);
                else {
                  setPickRefused(null);
                  onSaved(
                    recipe.id,
                    g === recipe.grade
                      ? `Recorded: the specification of “${recipe.name}” is its VG ${g} specification.`
                      : `Recorded: the specification of “${recipe.name}” was written for VG ${g}, not for this VG ${recipe.grade} recipe; its limits are not printed until the VG ${recipe.grade} specification is entered.`,
                  );
                }
              }}
            >
              It is the VG {g} specification
            </button>
          ))}
        </p>
      )}
      {pickRefused && (
        <p className="field-msg field-error" role="alert">
          Not recorded: {pickRefused}.
        </p>
      )}
      {row(0)}
      <div>{row(1)}</div>
      <div>{row(2)}</div>
      <div>{row(3)}</div>
      {errors.length > 0 && (
        <p className="field-error" role="alert">
          {errors.join('; ')}.
        </p>
      )}
      {elsewhere && (
        <Notice
          tone="warning"
          title="This specification was saved elsewhere while you were typing"
          actions={
            <>
              <button type="button" onClick={() => setBase(recipe.specification)}>
                Keep my limits
              </button>
              <button
                type="button"
                onClick={() => {
                  setSpec(structuredClone(recipe.specification));
                  setBase(recipe.specification);
                }}
              >
                Use the saved limits
              </button>
            </>
          }
        >
          <p data-testid="spec-changed-elsewhere">
            The stored specification of “{recipe.name}” was saved elsewhere (in another tab, or by an undo) since you began
            typing; your unsaved limits are kept in the form. Where they differ: {specDifferences(recipe.specification, spec, fmt).join('; ')}.
            Choose which to keep: <em>Keep my limits</em> (then save them over it) or <em>Use the saved limits</em>.
          </p>
        </Notice>
      )}
      {changed && revising && (
        <p>
          <label htmlFor={`${id}-reason`}>Reason for change (required: an approved recipe is never overwritten)</label>{' '}
          <input
            id={`${id}-reason`}
            type="text"
            size={40}
            value={reason}
            aria-invalid={reasonProblem ? true : undefined}
            aria-describedby={reasonProblem ? `${id}-reason-msg` : undefined}
            onChange={(e) => setReason(e.target.value)}
          />
          {reasonProblem && (
            <span id={`${id}-reason-msg`} className="field-msg field-error" role="alert">
              {reasonProblem}
            </span>
          )}
        </p>
      )}
      <div className="button-row">
        <button
          type="button"
          disabled={!changed || elsewhere || errors.length > 0 || reasonProblem !== null || (revising && !reason.trim())}
          title={elsewhere ? 'Choose first: keep your limits or use the saved ones' : undefined}
          onClick={() => {
            // Limits saved on this form are the recipe's own: written for its grade.
            const saving = { ...spec, grade: recipe.grade };
            const savedId = recipeActions.saveChanges(recipe.id, { specification: saving }, reason.trim() || recipe.reasonForChange);
            // What this form saved is what it now began from (not a change made elsewhere).
            const stored = useRecipes.getState().recipes.find((r) => r.id === recipe.id)?.specification;
            if (stored && savedId === recipe.id) {
              setSpec(structuredClone(stored));
              setBase(stored);
            }
            setReason('');
            onSaved(
              savedId,
              savedId === recipe.id
                ? `Saved the specification of “${recipe.name}”.`
                : `Saved the specification as draft revision ${nextRevisionNumber(recipes, recipe)} of “${recipe.name}”; approve it to supersede revision ${recipe.revision}.`,
            );
          }}
        >
          {revising ? `Save as draft revision ${nextRevisionNumber(recipes, recipe)}` : 'Save specification'}
        </button>
        <button type="button" disabled={!changed} onClick={() => setSpec(structuredClone(recipe.specification))}>
          Discard changes
        </button>
        <button type="button" disabled={isBlankSpecification(spec)} onClick={() => setSpec({ ...BLANK_SPECIFICATION, grade: recipe.grade })}>
          Clear all limits
        </button>
      </div>
    </fieldset>
  );
}

