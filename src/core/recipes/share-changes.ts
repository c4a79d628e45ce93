/**
 * The change in composition between two revisions of a recipe: each stock's mass share before and
 * after, for the blend sheet's "change from the recipe it supersedes" (the operator sees at a glance
 * which stocks moved and by how much).
 */
import type { RecipeLine } from '../formulation/model';

/** One stock's share in the earlier and the later revision. */
export interface ShareChange {
  componentId: string;
  /** Mass fraction in the earlier revision, 0–1 (0 when it was not in it). */
  from: number;
  /** Mass fraction in the later revision, 0–1 (0 when it was dropped). */
  to: number;
  /** to − from (mass fraction). */
  delta: number;
  /** 'added' (not in the earlier), 'removed' (not in the later), 'changed' or 'same' (|delta| < 1e-9). */
  kind: 'added' | 'removed' | 'changed' | 'same';
}

/**
 * Stock-by-stock change of mass shares between two recipes. Lines naming the same stock twice are
 * summed. Order: by the later share, largest first, then removed stocks by their earlier share.
 *
 * @param from - lines of the earlier revision (mass fractions 0–1)
 * @param to - lines of the later revision
 * @returns one row per stock in either recipe
 * @example shareChanges([{ componentId: 'a', massFraction: 0.6 }, { componentId: 'b', massFraction: 0.4 }],
 *   [{ componentId: 'a', massFraction: 0.5 }, { componentId: 'c', massFraction: 0.5 }])
 *   // → [a 0.6→0.5 changed, c 0→0.5 added, b 0.4→0 removed] (a before c: equal later share, larger earlier share first)
 */
export function shareChanges(from: readonly RecipeLine[], to: readonly RecipeLine[]): ShareChange[] {
  const sum = (lines: readonly RecipeLine[]) => {
    const m = new Map<string, number>();
    for (const l of lines) m.set(l.componentId, (m.get(l.componentId) ?? 0) + l.massFraction);
    return m;
  };
  const a = sum(from);
  const b = sum(to);
  const ids = [...new Set([...b.keys(), ...a.keys()])];
  const rows = ids.map((componentId, order) => {
    const f = a.get(componentId) ?? 0;
    const t = b.get(componentId) ?? 0;
    const delta = t - f;
    const kind: ShareChange['kind'] = !a.has(componentId) ? 'added' : !b.has(componentId) ? 'removed' : Math.abs(delta) < 1e-9 ? 'same' : 'changed';
    return { row: { componentId, from: f, to: t, delta, kind }, order };
  });
  rows.sort((x, y) => y.row.to - x.row.to || y.row.from - x.row.from || x.order - y.order);
  return rows.map((r) => r.row);
}
