/**
 * A specification belongs to the grade it was written for (known defect 1 of session 19): the flag,
 * the printable specification and the inference used by the schema 8 → 9 migration.
 * Grade numbers: ISO 3448:1992 Table 1. The rules themselves: common practice (no source).
 */
import { describe, expect, it } from 'vitest';
import { BLANK_SPECIFICATION, type ReleaseSpecification } from '../../../src/core/formulation/model';
import {
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
