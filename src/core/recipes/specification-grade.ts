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
import { ISO_GRADE_NUMBERS } from '../viscosity/iso-grades';

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

/** A specification's content without its grade link, for comparing two specifications. */
function contentKey(spec: ReleaseSpecification): string {
  const { grade: _grade, ...rest } = spec;
  return JSON.stringify(rest, Object.keys(rest).sort());
}

/**
 * The grade each recipe's specification was written for, inferred for records saved before the link
 * (recipes schema 8 → 9), where unambiguous:
 * 1. a blank specification → the recipe's grade (nothing in it is grade-specific);
 * 2. a reference naming exactly one viscosity grade → that grade (even when it is not the recipe's:
 *    the recipe is then flagged as carrying another grade's specification);
 * 3. otherwise, when every recipe holding the same specification (same reference and limits) is of
 *    one grade → that grade; the same specification on recipes of different grades (copied across
 *    grades by an earlier version) → null, flagged "grade of specification unknown — check".
 *
 * @param recipes - grade and specification of every saved recipe (a specification's own `grade` is ignored)
 * @returns the inferred grade or null, one per recipe, in order
 * @example inferSpecificationGrades([{ grade: 320, specification: s }, { grade: 460, specification: s }]) // → [null, null]
 */
export function inferSpecificationGrades(recipes: readonly Pick<Recipe, 'grade' | 'specification'>[]): (number | null)[] {
  const gradesOf = new Map<string, Set<number>>();
  for (const r of recipes) {
    const k = contentKey(r.specification);
    gradesOf.set(k, (gradesOf.get(k) ?? new Set()).add(r.grade));
  }
  return recipes.map((r) => {
    if (isBlankSpecification(r.specification)) return r.grade;
    const named = gradeNamedIn(r.specification.reference);
    if (named !== null) return named;
    const grades = gradesOf.get(contentKey(r.specification))!;
    return grades.size === 1 ? r.grade : null;
  });
}
