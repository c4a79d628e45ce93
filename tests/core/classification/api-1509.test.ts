// API 1509 Appendix E base-stock categories (tests/reference/check-values.md §6; issue 13 §6).
import { describe, expect, it } from 'vitest';
import { apiGroupIssues } from '../../../src/core/classification/api-1509';

const none = { sulfurPct: null, saturatesPct: null };

describe('API 1509 group boundaries', () => {
  it('VI exactly 120 is Group III; 119 is Group II; 80 is the Group I/II floor', () => {
    // API 1509 Appendix E (check-values.md §6): Groups I and II 80 ≤ VI < 120, Group III VI ≥ 120
    expect(apiGroupIssues('group-ii', { reportedVi: 120, ...none }).map((i) => i.field)).toEqual(['vi']);
    expect(apiGroupIssues('group-ii', { reportedVi: 120, ...none })[0]!.message).toMatch(/Group III/);
    expect(apiGroupIssues('group-ii', { reportedVi: 119, ...none })).toEqual([]);
    expect(apiGroupIssues('group-iii', { reportedVi: 120, ...none })).toEqual([]);
    expect(apiGroupIssues('group-iii', { reportedVi: 119, ...none })).toHaveLength(1);
    expect(apiGroupIssues('group-i', { reportedVi: 80, ...none })).toEqual([]);
    expect(apiGroupIssues('group-i', { reportedVi: 79, ...none })).toHaveLength(1);
    expect(apiGroupIssues('group-i', { reportedVi: 120, ...none })).toHaveLength(1);
  });

  it('sulfur ≤ 0.03 % and saturates ≥ 90 % for Groups II and III, only where entered', () => {
    // API 1509 Appendix E (check-values.md §6)
    expect(apiGroupIssues('group-ii', { reportedVi: 100, sulfurPct: 0.03, saturatesPct: 90 })).toEqual([]);
    expect(apiGroupIssues('group-ii', { reportedVi: 100, sulfurPct: 0.031, saturatesPct: 90 }).map((i) => i.field)).toEqual(['sulfurPct']);
    expect(apiGroupIssues('group-iii', { reportedVi: 130, sulfurPct: null, saturatesPct: 89.9 }).map((i) => i.field)).toEqual([
      'saturatesPct',
    ]);
    expect(apiGroupIssues('group-ii', { reportedVi: null, sulfurPct: null, saturatesPct: null })).toEqual([]);
    // a "Group I" stock that meets Group II/III chemistry is flagged too
    expect(apiGroupIssues('group-i', { reportedVi: 100, sulfurPct: 0.01, saturatesPct: 95 })).toHaveLength(1);
    expect(apiGroupIssues('group-i', { reportedVi: 100, sulfurPct: 0.5, saturatesPct: 70 })).toEqual([]);
  });

  it('Groups IV and V, polymers and additive packages carry no such limits', () => {
    // API 1509 Appendix E: Group IV = PAO, Group V = all others
    for (const c of ['group-iv', 'group-v', 'polymer', 'additive-package'] as const) {
      expect(apiGroupIssues(c, { reportedVi: 50, sulfurPct: 2, saturatesPct: 10 })).toEqual([]);
    }
  });
});
