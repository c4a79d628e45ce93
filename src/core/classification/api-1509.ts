/**
 * API base-stock categories — API 1509 Appendix E — and the check of a stock against the category
 * it is filed under.
 *
 * | Group | Saturates       | Sulfur            | Viscosity index |
 * |-------|-----------------|-------------------|-----------------|
 * | I     | < 90 % and/or   | > 0.03 %          | 80 ≤ VI < 120   |
 * | II    | ≥ 90 %          | ≤ 0.03 %          | 80 ≤ VI < 120   |
 * | III   | ≥ 90 %          | ≤ 0.03 %          | VI ≥ 120        |
 * | IV    | polyalphaolefins (PAO)                                  |
 * | V     | all other base stocks                                   |
 *
 * The VI boundary is half-open: VI exactly 120 is Group III, not Group II. The VI compared is the
 * reported VI (whole number, ASTM D2270 with E29 rounding), as the category is judged on reported
 * test results. Sulfur and saturates are checked only where entered (null = not measured).
 *
 * @see API 1509, Engine Oil Licensing and Certification System, Appendix E (base-stock
 *   interchangeability), Table E-1 (categories as recalled; common practice).
 */
import type { ComponentCategory } from '../formulation/model';

/** Saturates floor of Groups II and III [mass %]. */
export const API_SATURATES_MIN_PCT = 90;
/** Sulfur ceiling of Groups II and III [mass %]. */
export const API_SULFUR_MAX_PCT = 0.03;
/** VI range of Groups I and II: 80 ≤ VI < 120; Group III: VI ≥ 120. */
export const API_VI_MIN = 80;
export const API_VI_GROUP_III = 120;

/** One disagreement between the entered data and the category. */
export interface ApiGroupIssue {
  field: 'vi' | 'sulfurPct' | 'saturatesPct';
  message: string;
}

/**
 * Check a base stock's reported VI, sulfur and saturates against its API 1509 category.
 * Groups IV and V, polymers and additive packages have no such limits (no issues returned).
 *
 * @param category - the category the stock is filed under
 * @param data - `reportedVi` (whole number, ASTM D2270), `sulfurPct` [mass %] and `saturatesPct`
 *   [mass %]; null where not known
 * @returns the disagreements, in plain words (empty when the data fit the category)
 * @example apiGroupIssues('group-ii', { reportedVi: 120, sulfurPct: 0.01, saturatesPct: 98 })
 *   // → [{ field: 'vi', message: 'VI 120 is Group III (VI ≥ 120), not Group II (80 ≤ VI < 120) — API 1509 Appendix E' }]
 * @see API 1509 Appendix E.
 */
export function apiGroupIssues(
  category: ComponentCategory,
  data: { reportedVi: number | null; sulfurPct: number | null; saturatesPct: number | null },
): ApiGroupIssue[] {
  const issues: ApiGroupIssue[] = [];
  const { reportedVi: vi, sulfurPct: s, saturatesPct: sat } = data;
  const src = ' — API 1509 Appendix E';
  if (category === 'group-i' || category === 'group-ii') {
    const name = category === 'group-i' ? 'Group I' : 'Group II';
    if (vi !== null && vi >= API_VI_GROUP_III) {
      issues.push({ field: 'vi', message: `VI ${vi} is Group III (VI ≥ ${API_VI_GROUP_III}), not ${name} (${API_VI_MIN} ≤ VI < ${API_VI_GROUP_III})${src}` });
    } else if (vi !== null && vi < API_VI_MIN) {
      issues.push({ field: 'vi', message: `VI ${vi} is below ${API_VI_MIN}, outside ${name} (${API_VI_MIN} ≤ VI < ${API_VI_GROUP_III})${src}` });
    }
  }
  if (category === 'group-iii' && vi !== null && vi < API_VI_GROUP_III) {
    issues.push({ field: 'vi', message: `VI ${vi} is below ${API_VI_GROUP_III}, the Group III floor${src}` });
  }
  if (category === 'group-ii' || category === 'group-iii') {
    const name = category === 'group-ii' ? 'Group II' : 'Group III';
    if (s !== null && s > API_SULFUR_MAX_PCT) {
      issues.push({ field: 'sulfurPct', message: `sulfur ${s} % is above ${API_SULFUR_MAX_PCT} %, the ${name} ceiling${src}` });
    }
    if (sat !== null && sat < API_SATURATES_MIN_PCT) {
      issues.push({ field: 'saturatesPct', message: `saturates ${sat} % are below ${API_SATURATES_MIN_PCT} %, the ${name} floor${src}` });
    }
  }
  if (category === 'group-i' && s !== null && sat !== null && s <= API_SULFUR_MAX_PCT && sat >= API_SATURATES_MIN_PCT) {
    issues.push({
      field: 'saturatesPct',
      message: `sulfur ${s} % and saturates ${sat} % meet Groups II/III; Group I has saturates < ${API_SATURATES_MIN_PCT} % and/or sulfur > ${API_SULFUR_MAX_PCT} %${src}`,
    });
  }
  return issues;
}
