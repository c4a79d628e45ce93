// From the saved inputs (library, recipes, targets, the plan) to the core's line-plan input.
import { entryFieldsInWords, notEnteredFields, notPredictedWords, unenteredStocks } from '../../core/formulation/entered-values';
import type { BlendTargets, Component, Recipe } from '../../core/formulation/model';
import type { LinePlanInput } from '../../core/lineplan/plan';
import { defaultTargets, type LinePlanInputs, type Settings } from '../../state';

/** A recipe as a grade of the plan. */
export interface PlanGrade {
  recipe: Recipe;
  /** "VG 460", or "VG 460 · <name>" when two planned recipes share a grade. */
  label: string;
  demandKg: number;
}

export interface DerivedPlan {
  /** The core's input (limited stocks at their supplies), or null when no recipe has a demand. */
  input: LinePlanInput | null;
  /** Ids of the limited stocks (gone in the plan after they are gone), library order. */
  limited: string[];
  grades: PlanGrade[];
  /** Plain warnings about the inputs (e.g. a limited stock without a supply). */
  warnings: string[];
}

/** The additive package the designer would default to: the first one not withdrawn. */
export function defaultAdditiveId(components: readonly Component[]): string | null {
  return components.find((c) => c.category === 'additive-package' && c.availability !== 'withdrawn')?.id ?? null;
}

/** A recipe's saved targets, else the defaults for its grade (as the designer opens it). */
export function targetsOf(recipe: Recipe, stored: BlendTargets | undefined, additiveId: string | null): BlendTargets {
  return stored ?? defaultTargets(recipe.grade, additiveId, recipe.isReference ? recipe.id : null);
}

/** Stocks limited in this plan: marked limited in the library, or given a supply in the plan; never withdrawn ones. */
export function limitedStocks(components: readonly Component[], plan: LinePlanInputs): Component[] {
  return components.filter((c) => c.availability !== 'withdrawn' && (c.availability === 'limited' || c.id in plan.supplies));
}

/**
 * The recipe the plant makes now in the line of revisions that `id` belongs to: `id` itself, or its
 * newest approved successor (an approved revision that supersedes it, and so on). A draft revision
 * does not replace the recipe it supersedes until it is approved; null when `id` is not saved.
 */
export function currentRecipe(recipes: readonly Recipe[], id: string): Recipe | null {
  let r = recipes.find((x) => x.id === id) ?? null;
  for (let guard = 0; r && guard < 1000; guard++) {
    const cur: Recipe = r;
    const next = recipes.filter((x) => x.supersedes === cur.id && x.status === 'approved').sort((a, b) => b.revision - a.revision)[0];
    if (!next) break;
    r = next;
  }
  return r;
}

/** Demands by the recipe they now apply to (see `currentRecipe`), with the ids they are saved under. */
export function plannedDemands(recipes: readonly Recipe[], plan: LinePlanInputs): Map<string, { kg: number; keys: string[] }> {
  const out = new Map<string, { kg: number; keys: string[] }>();
  for (const [id, kg] of Object.entries(plan.demands)) {
    const r = currentRecipe(recipes, id);
    if (!r || r.archived) continue;
    const e = out.get(r.id);
    // The entry saved under the recipe itself wins over one carried from an earlier revision.
    if (e) {
      e.keys.push(id);
      if (id === r.id) e.kg = kg;
    } else out.set(r.id, { kg, keys: [id] });
  }
  return out;
}

/**
 * Saved demands that are not planned: their recipe (or the newest approved revision it leads to) is
 * archived or no longer saved. The screen names them, so a grade does not leave the line unnoticed.
 *
 * @returns each demand's saved key, its quantity [kg] and the archived recipe (null when deleted)
 */
export function unplannedDemands(recipes: readonly Recipe[], plan: LinePlanInputs): { key: string; kg: number; recipe: Recipe | null }[] {
  return Object.entries(plan.demands).flatMap(([key, kg]) => {
    if (!(kg > 0)) return [];
    const r = currentRecipe(recipes, key);
    return !r || r.archived ? [{ key, kg, recipe: r }] : [];
  });
}

/**
 * Stocks limited in the saved plan (a supply, or limited for this plan only) that are now withdrawn
 * in the library: a withdrawn stock is in neither plan, so its entry is left out. The screen names
 * each with the planned grades whose recipe still holds it, so a limited stock (and the tonnes saved
 * for it) does not leave the plan unnoticed; the saved entry is kept.
 *
 * @returns each such stock's code, its saved supply [kg] (null: limited without a supply) and the
 *   labels of the planned grades whose current recipe holds it, in library order
 */
export function withdrawnSupplies(
  components: readonly Component[],
  recipes: readonly Recipe[],
  plan: LinePlanInputs,
): { code: string; kg: number | null; grades: string[] }[] {
  const grades = plannedGrades(recipes, plan);
  return components.flatMap((c) => {
    if (c.availability !== 'withdrawn' || !(c.id in plan.supplies)) return [];
    const holding = grades.filter((g) => g.recipe.lines.some((l) => l.componentId === c.id)).map((g) => g.label);
    return [{ code: c.code, kg: plan.supplies[c.id] ?? null, grades: holding }];
  });
}

/** The planned recipes (a demand above 0, recipe still saved), by grade then name. */
export function plannedGrades(recipes: readonly Recipe[], plan: LinePlanInputs): PlanGrade[] {
  const demands = plannedDemands(recipes, plan);
  const planned = recipes
    .filter((r) => (demands.get(r.id)?.kg ?? 0) > 0)
    .sort((a, b) => a.grade - b.grade || a.name.localeCompare(b.name));
  const perGrade = new Map<number, number>();
  for (const r of planned) perGrade.set(r.grade, (perGrade.get(r.grade) ?? 0) + 1);
  return planned.map((recipe) => ({
    recipe,
    label: perGrade.get(recipe.grade)! > 1 ? `VG ${recipe.grade} · ${recipe.name}` : `VG ${recipe.grade}`,
    demandKg: demands.get(recipe.id)!.kg,
  }));
}

export function derivePlan(
  components: readonly Component[],
  recipes: readonly Recipe[],
  targets: Readonly<Record<string, BlendTargets>>,
  plan: LinePlanInputs,
  settings: Pick<Settings, 'blendMethod' | 'operatingTempC' | 'coldStartTempC'> & Partial<Pick<Settings, 'decimalSeparator' | 'thousandsGrouping' | 'temperatureUnit'>>,
): DerivedPlan {
  const grades = plannedGrades(recipes, plan);
  const limited = limitedStocks(components, plan);
  const warnings: string[] = [];
  const supplyKg: Record<string, number> = {};
  for (const c of limited) {
    const s = plan.supplies[c.id];
    if (typeof s === 'number') supplyKg[c.id] = s;
    else warnings.push(`No supply is entered for ${c.code}: while it lasts, the plan treats it as unlimited.`);
  }
  const byId = new Map(components.map((c) => [c.id, c]));
  // A stock whose measured values are not yet entered is never planned with (its placeholders are not
  // data): limited or kept in use in this plan, it is left out, and the screen says so.
  for (const c of components) {
    const pending = notEnteredFields(c);
    if (!pending.length) continue;
    const limitedHere = c.id in plan.supplies;
    const kept = c.id in plan.keep;
    if (!limitedHere && !kept) continue;
    const what = limitedHere && kept ? 'its supply and least use in this plan are' : limitedHere ? 'its supply in this plan is' : 'it is not kept in use and its least use is';
    warnings.push(`${c.code} has ${entryFieldsInWords(pending)} not yet entered: ${what} left out until the values are entered on Stocks.`);
  }
  const keepKg: Record<string, number> = {};
  for (const [id, kg] of Object.entries(plan.keep)) {
    const c = byId.get(id);
    if (c && notEnteredFields(c).length === 0) keepKg[id] = kg;
  }
  // A current recipe holding such a stock is not costed (its stock is left out of costing:
  // `priceLibraryInBase`), so the plans are not compared with it (its grade's change reads '—'): the
  // screen says why.
  const notCompared = grades.filter((g) => unenteredStocks(g.recipe.lines, components).length > 0);
  if (notCompared.length) {
    const stocks = [...new Set(notCompared.flatMap((g) => unenteredStocks(g.recipe.lines, components)))];
    const labels = notCompared.map((g) => g.label);
    const named = labels.length > 1 ? `${labels.slice(0, -1).join(', ')} and ${labels.at(-1)}` : labels[0]!;
    warnings.push(
      `${notPredictedWords(stocks)}: the current recipe${labels.length > 1 ? 's' : ''} of ${named} ${labels.length > 1 ? 'are' : 'is'} not costed, so the plans are not compared with ${labels.length > 1 ? 'them' : 'it'} until the values are entered on Stocks.`,
    );
  }
  const additiveId = defaultAdditiveId(components);
  const input: LinePlanInput | null =
    grades.length === 0
      ? null
      : {
          components,
          grades: grades.map((g) => ({
            id: g.recipe.id,
            label: g.label,
            targets: targetsOf(g.recipe, targets[g.recipe.id], additiveId),
            demandKg: g.demandKg,
            current: g.recipe.lines,
          })),
          supplyKg,
          keepKg,
          maxStocks: plan.maxStocks,
          method: settings.blendMethod,
          operatingTempC: settings.operatingTempC,
          coldTempC: settings.coldStartTempC,
          // The user's number style for the reasons (plain data: the plan runs in a worker).
          display: { decimalSeparator: settings.decimalSeparator, thousandsGrouping: settings.thousandsGrouping, temperatureUnit: settings.temperatureUnit },
        };
  return { input, limited: limited.map((c) => c.id), grades, warnings };
}
