/**
 * A specification belongs to the grade it was written for (known defect 1 of session 19): the flag,
 * the printable specification and the inference used by the schema 8 → 9 migration.
 * Grade numbers: ISO 3448:1992 Table 1. The rules themselves: common practice (no source).
 */
import { describe, expect, it } from 'vitest';
import { ISO_GRADES } from '../../../src/core/viscosity/iso-grades';
import { viscosityIndex } from '../../../src/core/viscosity/viscosity-index';
import { BLANK_SPECIFICATION, type ReleaseSpecification } from '../../../src/core/formulation/model';
import {
  gradeFromKv100Limits,
  specificationGradeChoices,
  gradeNamedIn,
  inferSpecificationGrades,
  isBlankSpecification,
  printableSpecification,
  specificationGradeIssue,
  specificationGradeMessage,
} from '../../../src/core/recipes/specification-grade';

const spec320: ReleaseSpecification = { ...BLANK_SPECIFICATION, grade: 320, reference: 'Plant spec 7', viMin: 90, pourMax: -6 };

describe('specification grade link', () => {
  it('flags a specification written for another grade, and one of unknown grade', () => {
    expect(specificationGradeIssue({ grade: 320, specification: spec320 })).toBeNull();
    expect(specificationGradeIssue({ grade: 460, specification: spec320 })).toEqual({ kind: 'other-grade', specificationGrade: 320, recipeGrade: 460 });
    const unknown = specificationGradeIssue({ grade: 460, specification: { ...spec320, grade: null } });
    expect(unknown).toEqual({ kind: 'unknown', recipeGrade: 460 });
    expect(specificationGradeMessage(unknown!)).toMatch(/grade of specification unknown — check/);
    expect(specificationGradeMessage({ kind: 'other-grade', specificationGrade: 320, recipeGrade: 460 })).toMatch(/written for VG 320, not for this VG 460 recipe/);
  });

  it('never flags a blank specification, whatever its link', () => {
    expect(isBlankSpecification({ ...BLANK_SPECIFICATION, grade: 680 })).toBe(true);
    expect(isBlankSpecification({ ...BLANK_SPECIFICATION, copper: ' ' })).toBe(true);
    expect(isBlankSpecification({ ...BLANK_SPECIFICATION, foam: 'nil' })).toBe(false);
    expect(specificationGradeIssue({ grade: 460, specification: { ...BLANK_SPECIFICATION, grade: 320 } })).toBeNull();
  });

  it('prints a blank specification in place of another grade’s', () => {
    const printed = printableSpecification({ grade: 460, specification: spec320 });
    expect(isBlankSpecification(printed)).toBe(true);
    expect(printed.grade).toBe(460);
    expect(printableSpecification({ grade: 320, specification: spec320 })).toBe(spec320);
  });

  it('reads the one grade a reference names', () => {
    expect(gradeNamedIn('Plant spec GO-7, ISO VG 460')).toBe(460);
    expect(gradeNamedIn('BBW-SPEC-VG320 (invented demo specification)')).toBe(320);
    expect(gradeNamedIn('VG 320 / VG 460 family')).toBeNull();
    expect(gradeNamedIn('VG 333')).toBeNull(); // not an ISO 3448 grade
    expect(gradeNamedIn('Plant spec 7')).toBeNull();
  });

  it('infers the link where unambiguous, else leaves it unknown', () => {
    const other: ReleaseSpecification = { ...spec320, reference: 'Plant spec 9', viMin: 95 };
    const named: ReleaseSpecification = { ...spec320, reference: 'Plant spec, ISO VG 320' };
    const grades = inferSpecificationGrades([
      { grade: 220, specification: { ...BLANK_SPECIFICATION } }, // blank → its own grade
      { grade: 320, specification: spec320 }, // the same limits on a VG 320 and a VG 460 recipe → unknown
      { grade: 460, specification: spec320 },
      { grade: 680, specification: other }, // only on VG 680 recipes → 680
      { grade: 460, specification: named }, // names VG 320 → 320 (then flagged as another grade's)
    ]);
    expect(grades).toEqual([220, null, null, 680, 320]);
  });
});

/** The ν100 of an oil of the given ν40 and VI, by bisection on the forward D2270 VI (an independent path). */
function kv100For(kv40: number, vi: number): number {
  let lo = 2;
  let hi = kv40 / 1.5;
  // VI rises with ν100 at a fixed ν40.
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (viscosityIndex(kv40, mid) < vi) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

describe('every clue of the stored record (s20 defect 5)', () => {
  it('reads the grade from the ν100 limits: the ISO 3448 mid-point of VG 150…1000 at VI 95 comes back as its grade', () => {
    // ISO 3448:1992 Table 1 mid-points; ν100 of VI 95 oils from ASTM D2270 (forward, by bisection).
    for (const g of ISO_GRADES.filter((x) => x.grade >= 150 && x.grade <= 1000)) {
      const y = kv100For(g.mid, 95);
      // A ±5 % ν100 range around it (common practice (no source) for a release range).
      for (const viMin of [null, 95]) {
        expect(gradeFromKv100Limits({ ...BLANK_SPECIFICATION, kv100Min: 0.95 * y, kv100Max: 1.05 * y, viMin })).toBe(g.grade);
      }
    }
  });

  it('says nothing from one ν100 limit alone, or limits outside D2270’s scope', () => {
    expect(gradeFromKv100Limits({ ...BLANK_SPECIFICATION, kv100Min: 22 })).toBeNull();
    expect(gradeFromKv100Limits({ ...BLANK_SPECIFICATION, kv100Min: 1, kv100Max: 1.5 })).toBeNull();
    expect(gradeFromKv100Limits({ ...BLANK_SPECIFICATION, kv100Min: 26, kv100Max: 22 })).toBeNull();
  });

  it('the same limits on a VG 320 and a VG 460 recipe: the ν100 limits settle it; else the recipe it was first saved on; else unknown', () => {
    const y320 = kv100For(320, 95); // VG 320 mid-point, ISO 3448 Table 1
    const withKv100: ReleaseSpecification = { ...BLANK_SPECIFICATION, reference: 'Plant spec 7', kv100Min: 0.95 * y320, kv100Max: 1.05 * y320, viMin: 90 };
    expect(inferSpecificationGrades([{ grade: 320, specification: withKv100 }, { grade: 460, specification: withKv100 }])).toEqual([320, 320]);
    // No ν100 limits: a VG 460 revision made from the VG 320 recipe carried its specification along.
    const plain: ReleaseSpecification = { ...spec320, grade: null };
    expect(
      inferSpecificationGrades([
        { id: 'a', supersedes: null, grade: 320, specification: plain },
        { id: 'b', supersedes: 'a', grade: 460, specification: plain },
      ]),
    ).toEqual([320, 320]);
    // Two unrelated recipes of two grades, no ν100 limits, no reference naming a grade: still unknown.
    expect(
      inferSpecificationGrades([
        { id: 'a', supersedes: null, grade: 320, specification: plain },
        { id: 'b', supersedes: null, grade: 460, specification: plain },
      ]),
    ).toEqual([null, null]);
    // ν100 limits pointing at a grade none of its recipes has: not taken (the recipes' grades bound the answer).
    const y680 = kv100For(680, 95);
    const for680: ReleaseSpecification = { ...plain, kv100Min: 0.95 * y680, kv100Max: 1.05 * y680 };
    expect(inferSpecificationGrades([{ grade: 320, specification: for680 }, { grade: 460, specification: for680 }])).toEqual([null, null]);
  });

  it('settles each pair of neighbouring gear-oil grades from ν100 limits of a VI 95 product with a VI minimum of 90', () => {
    // ISO 3448 Table 1 mid-points; the product's ν100 from ASTM D2270 (forward, by bisection).
    const pairs = [[150, 220], [220, 320], [320, 460], [460, 680], [680, 1000]] as const;
    for (const [a, b] of pairs) {
      for (const g of [a, b]) {
        const y = kv100For(g, 95);
        const spec: ReleaseSpecification = { ...BLANK_SPECIFICATION, reference: 'Plant spec', kv100Min: 0.95 * y, kv100Max: 1.05 * y, viMin: 90 };
        expect(inferSpecificationGrades([{ grade: a, specification: spec }, { grade: b, specification: spec }])).toEqual([g, g]);
      }
    }
  });

  it('offers the grades to pick from: the recipe’s own, the one its ν100 limits point at, those of the recipes sharing it', () => {
    const plain: ReleaseSpecification = { ...spec320, grade: null };
    expect(specificationGradeChoices({ grade: 460, specification: plain }, [{ grade: 460, specification: plain }, { grade: 320, specification: plain }, { grade: 220, specification: { ...spec320, reference: 'Other spec' } }])).toEqual([460, 320]);
  });
});
