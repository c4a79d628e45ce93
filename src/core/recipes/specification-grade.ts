/**
 * A product specification belongs to the viscosity grade it was written for.
 *
 * A VG 320 specification's release limits (ν100 range, density, pour point…) are wrong for a VG 460
 * product. Each specification therefore carries the grade it was written for (`grade`), and a recipe
 * whose specification is linked to another grade — or to no known grade (saved before the link and
 * not inferable) — is flagged wherever the recipe is shown; its blend sheet is held and prints no
 * limits from that specification. Common practice (no source): a release document is checked against
 * the product it releases.
 *
 * A blank specification (no reference, no limit) has nothing grade-specific in it and is never flagged.
 */
import type { Recipe, ReleaseSpecification } from '../formulation/model';
import { BLANK_SPECIFICATION } from '../formulation/model';
import { ISO_GRADE_NUMBERS, nearestGrade } from '../viscosity/iso-grades';
import { kv40FromViscosityIndex } from '../viscosity/viscosity-index';

/** Why a recipe's specification may not be for its grade: another grade, or none known. */
export type SpecificationGradeIssue = { kind: 'other-grade'; specificationGrade: number; recipeGrade: number } | { kind: 'unknown'; recipeGrade: number };

/** The wording of the flag for a specification whose grade is not known (schema 9 migration). */
export const UNKNOWN_SPECIFICATION_GRADE = 'grade of specification unknown — check';

/**
 * True when the specification holds nothing: no reference, no limit, no worded limit. Its grade link
 * is ignored (a blank specification fits every grade).
 *
 * @param spec - a specification
 * @returns whether every field but the grade is blank
 * @example isBlankSpecification({ ...BLANK_SPECIFICATION, grade: 320 }) // → true
 */
export function isBlankSpecification(spec: ReleaseSpecification): boolean {
  return (Object.keys(BLANK_SPECIFICATION) as (keyof ReleaseSpecification)[]).every((k) => k === 'grade' || (typeof spec[k] === 'string' ? (spec[k] as string).trim() === '' : spec[k] === null));
}

/**
 * Whether a recipe's specification is for another grade, or for an unknown one.
 *
 * @param recipe - grade and specification of the recipe
 * @returns null when the specification is blank or linked to the recipe's grade; else the issue
 * @example specificationGradeIssue({ grade: 460, specification: { ...spec320 } }) // → { kind: 'other-grade', specificationGrade: 320, recipeGrade: 460 }
 */
export function specificationGradeIssue(recipe: Pick<Recipe, 'grade' | 'specification'>): SpecificationGradeIssue | null {
  const spec = recipe.specification;
  if (isBlankSpecification(spec)) return null;
  if (spec.grade === null) return { kind: 'unknown', recipeGrade: recipe.grade };
  if (spec.grade !== recipe.grade) return { kind: 'other-grade', specificationGrade: spec.grade, recipeGrade: recipe.grade };
  return null;
}

/**
 * The flag in words, as every screen and the blend sheet show it.
 *
 * @param issue - from {@link specificationGradeIssue}
 * @returns one sentence
 * @example specificationGradeMessage({ kind: 'other-grade', specificationGrade: 320, recipeGrade: 460 })
 * // → 'The product specification was written for VG 320, not for this VG 460 recipe: its limits are not printed; enter the VG 460 specification on Recipes.'
 */
export function specificationGradeMessage(issue: SpecificationGradeIssue): string {
  if (issue.kind === 'other-grade') {
    return `The product specification was written for VG ${issue.specificationGrade}, not for this VG ${issue.recipeGrade} recipe: its limits are not printed; enter the VG ${issue.recipeGrade} specification on Recipes.`;
  }
  return `The product specification's grade is unknown (${UNKNOWN_SPECIFICATION_GRADE}): it was saved before specifications were linked to a grade; confirm on Recipes that it is the VG ${issue.recipeGrade} specification, or enter that one.`;
}

/**
 * The specification a recipe's blend sheet prints: its own when linked to its grade (or blank), else
 * a blank one ("Per specification"), so that another grade's limits are never printed.
 *
 * @param recipe - grade and specification of the recipe
 * @returns the specification to print
 */
export function printableSpecification(recipe: Pick<Recipe, 'grade' | 'specification'>): ReleaseSpecification {
  return specificationGradeIssue(recipe) ? { ...BLANK_SPECIFICATION, grade: recipe.grade } : recipe.specification;
}

/**
 * The one ISO viscosity grade a specification's reference names ("VG 320", "ISO VG 320", "…-VG320"),
 * or null when it names none or several.
 *
 * @param reference - the specification reference as typed
 * @returns the grade named, or null
 * @example gradeNamedIn('Plant spec GO-7, ISO VG 460') // → 460
 */
export function gradeNamedIn(reference: string): number | null {
  const named = new Set<number>();
  for (const m of reference.matchAll(/VG\s*-?\s*(\d{1,4})(?!\d)/gi)) {
    const g = Number(m[1]);
    if (ISO_GRADE_NUMBERS.includes(g)) named.add(g);
  }
  return named.size === 1 ? [...named][0]! : null;
}

/** How far above its VI minimum a product is taken to lie when its ν100 limits are read [VI units] (common practice, no source). */
const VI_ABOVE_MINIMUM = 15;
/** VI minimum taken for a specification that gives none [dimensionless] (common practice, no source). */
const VI_MINIMUM_IF_NONE = 85;

/**
 * Which of some grades a specification's ν100 limits point at. The product's ν100 is taken at the
 * geometric mid-point of the ν100 range and its VI anywhere from the specification's VI minimum (85 when
 * none is given) to {@link VI_ABOVE_MINIMUM} above it; its ν40 follows by ASTM D2270 solved for ν40.
 * At both ends of that VI range the ν40 must be nearest (log scale; grades are spaced geometrically) to
 * the same one of `grades`, and at the middle of the range that grade must be the nearest ISO 3448 grade
 * of all. ν40 moves a great deal with VI at a given ν100 (a VG 320 oil of ν100 24 mm²/s: ν40 339 at
 * VI 90, 287 at VI 105), so limits that leave the answer open settle nothing.
 *
 * @param spec - the specification (both ν100 limits are needed)
 * @param grades - the grades it may belong to (those of the recipes holding it)
 * @returns the grade, or null when the limits do not settle it
 */
export function gradeAmongFromKv100Limits(spec: ReleaseSpecification, grades: readonly number[]): number | null {
  const lo = spec.kv100Min;
  const hi = spec.kv100Max;
  if (lo === null || hi === null || !(lo > 0) || !(hi >= lo) || grades.length === 0) return null;
  const y = Math.sqrt(lo * hi);
  const viLow = spec.viMin ?? VI_MINIMUM_IF_NONE;
  const kv40At = (vi: number): number | null => {
    try {
      return kv40FromViscosityIndex(vi, y);
    } catch {
      return null; // outside D2270's scope
    }
  };
  const nearestOf = (kv40: number | null): number | null => {
    if (kv40 === null) return null;
    // A grade's number is its mid-point ν40 in mm²/s (ISO 3448).
    const d = grades.map((g) => ({ g, d: Math.abs(Math.log(kv40 / g)) })).sort((a, b) => a.d - b.d);
    return d.length > 1 && d[0]!.d === d[1]!.d ? null : d[0]!.g;
  };
  const a = nearestOf(kv40At(viLow));
  if (a === null || a !== nearestOf(kv40At(viLow + VI_ABOVE_MINIMUM))) return null;
  const middle = kv40At(viLow + VI_ABOVE_MINIMUM / 2);
  return middle !== null && nearestGrade(middle).grade === a ? a : null;
}

/** A specification's content without its grade link, for comparing two specifications. */
function contentKey(spec: ReleaseSpecification): string {
  const { grade: _grade, ...rest } = spec;
  return JSON.stringify(rest, Object.keys(rest).sort());
}

/**
 * Viscosity index assumed for a specification without a VI minimum when its ν100 limits are read
 * against the grades [dimensionless]: typical of mineral industrial gear oils (common practice, no source).
 */
export const TYPICAL_GEAR_OIL_VI = 95;

/**
 * The ISO grade a specification's ν100 limits point at: the ν40 of an oil at the geometric mid-point of
 * the ν100 range with the specification's VI minimum (or {@link TYPICAL_GEAR_OIL_VI}), by ASTM D2270
 * solved for ν40, then the grade nearest to it (ISO 3448 bands; grades are spaced about 1.5× apart, so
 * a VI off by 10–15 moves ν40 by a few per cent and does not change the grade).
 *
 *   ν100 = √(ν100,min · ν100,max),  ν40 = D2270⁻¹(VI, ν100),  grade = nearest ISO 3448 grade to ν40
 *
 * @param spec - the specification (both ν100 limits are needed; one alone does not place the product)
 * @returns the grade number, or null when the limits do not tell (a limit missing, ν100 < 2.0 mm²/s,
 *   a VI no oil of that ν100 has)
 * @example gradeFromKv100Limits({ ...BLANK_SPECIFICATION, kv100Min: 22, kv100Max: 26, viMin: 90 }) // → 320
 */
export function gradeFromKv100Limits(spec: ReleaseSpecification): number | null {
  const lo = spec.kv100Min;
  const hi = spec.kv100Max;
  if (lo === null || hi === null || !(lo > 0) || !(hi >= lo)) return null;
  try {
    const kv40 = kv40FromViscosityIndex(spec.viMin ?? TYPICAL_GEAR_OIL_VI, Math.sqrt(lo * hi));
    return nearestGrade(kv40).grade;
  } catch {
    return null; // outside D2270's scope: the limits do not tell
  }
}


/** What inference reads of a stored recipe: its grade and specification, and (when known) its lineage. */
export type SpecificationHolder = Pick<Recipe, 'grade' | 'specification'> & Partial<Pick<Recipe, 'id' | 'supersedes'>>;

/**
 * The grade each recipe's specification was written for, inferred for records saved before the link
 * (recipes schema 8 → 9) from every clue the stored records hold, in this order:
 * 1. a blank specification → the recipe's grade (nothing in it is grade-specific);
 * 2. a reference naming exactly one viscosity grade → that grade (even when it is not the recipe's:
 *    the recipe is then flagged as carrying another grade's specification);
 * 3. every recipe holding the same specification (same reference and limits) is of one grade → that grade;
 * 4. held by recipes of several grades (copied across grades by an earlier version): the one of those
 *    grades its ν100 limits point at over the VI range its minimum admits ({@link gradeAmongFromKv100Limits});
 * 5. else the recipe it was first saved on: the holders that are not revisions (`supersedes`) of another
 *    holder are its origins; when they are all of one grade → that grade;
 * 6. otherwise null, flagged "grade of specification unknown — check" (the blender picks the grade on
 *    the Recipes screen in one step).
 *
 * @param recipes - grade, specification and (optional) id and `supersedes` of every saved recipe (a
 *   specification's own `grade` is ignored)
 * @returns the inferred grade or null, one per recipe, in order
 * @example inferSpecificationGrades([{ grade: 320, specification: s }, { grade: 460, specification: s }]) // → [null, null] (s: no ν100 limits, no lineage)
 */
export function inferSpecificationGrades(recipes: readonly SpecificationHolder[]): (number | null)[] {
  const holders = new Map<string, SpecificationHolder[]>();
  for (const r of recipes) {
    const k = contentKey(r.specification);
    holders.set(k, [...(holders.get(k) ?? []), r]);
  }
  const byContent = new Map<string, number | null>();
  const sharedGrade = (key: string): number | null => {
    if (byContent.has(key)) return byContent.get(key)!;
    const group = holders.get(key)!;
    const grades = new Set(group.map((h) => h.grade));
    let found: number | null = null;
    if (grades.size === 1) found = group[0]!.grade;
    else {
      const fromLimits = gradeAmongFromKv100Limits(group[0]!.specification, [...grades]);
      if (fromLimits !== null) found = fromLimits;
      else {
        const ids = new Set(group.map((h) => h.id).filter((id): id is string => typeof id === 'string'));
        const origins = group.filter((h) => !(h.supersedes && ids.has(h.supersedes)));
        const originGrades = new Set(origins.map((h) => h.grade));
        if (origins.length < group.length && originGrades.size === 1) found = origins[0]!.grade;
      }
    }
    byContent.set(key, found);
    return found;
  };
  return recipes.map((r) => {
    if (isBlankSpecification(r.specification)) return r.grade;
    const named = gradeNamedIn(r.specification.reference);
    if (named !== null) return named;
    return sharedGrade(contentKey(r.specification));
  });
}

/**
 * The grades a specification of unknown grade may have been written for, for the blender to pick
 * from in one step: the recipe's own grade first, then the grade its ν100 limits point at, then the
 * grades of the other recipes holding the same specification (ascending).
 *
 * @param recipe - the recipe whose specification's grade is unknown
 * @param recipes - every saved recipe
 * @returns distinct grade numbers, the recipe's own first
 */
export function specificationGradeChoices(recipe: Pick<Recipe, 'grade' | 'specification'>, recipes: readonly Pick<Recipe, 'grade' | 'specification'>[]): number[] {
  const key = contentKey(recipe.specification);
  const others = recipes.filter((r) => contentKey(r.specification) === key).map((r) => r.grade).sort((a, b) => a - b);
  const fromLimits = gradeFromKv100Limits(recipe.specification);
  return [...new Set([recipe.grade, ...(fromLimits === null ? [] : [fromLimits]), ...others])];
}
