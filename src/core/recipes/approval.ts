/**
 * One approved revision per recipe at a time.
 *
 * A draft revision is made from one revision of a recipe (`supersedes`). Approving it supersedes that
 * revision. When that revision is already superseded — another draft made from it was approved first
 * — approving this draft as well would leave two approved revisions of one recipe, the second without
 * the first one's changes. Such an approval is refused, naming the approved revision to revise
 * instead. Common practice (no source): a plant makes one current revision of a product.
 */
import type { Recipe } from '../formulation/model';

type Rev = Pick<Recipe, 'id' | 'name' | 'revision' | 'status' | 'supersedes'>;

/**
 * The approved revision that (through one or more later revisions) replaced `from`, if any.
 *
 * @param recipes - every recipe
 * @param from - a revision
 * @returns the approved recipe reached by following later revisions, or null
 */
export function currentApprovedRevision<R extends Rev>(recipes: readonly R[], from: R): R | null {
  const later = new Map<string, R[]>();
  for (const r of recipes) if (r.supersedes) later.set(r.supersedes, [...(later.get(r.supersedes) ?? []), r]);
  const seen = new Set<string>([from.id]);
  let frontier = [from];
  while (frontier.length) {
    const next: R[] = [];
    for (const r of frontier) {
      for (const x of later.get(r.id) ?? []) {
        if (seen.has(x.id) || x.status === 'draft') continue;
        if (x.status === 'approved') return x;
        seen.add(x.id);
        next.push(x);
      }
    }
    frontier = next;
  }
  return null;
}

/**
 * Why a draft may not be approved because another revision of the same recipe already was; null when
 * nothing stands in the way on this count (other reasons — the release check — are separate).
 *
 * @param recipes - every recipe
 * @param id - the draft to approve
 * @returns the refusal in words, or null
 * @example approvalRefusal(recipes, 'rev3') // → '“Gear 320”, revision 3, was made from revision 1, which revision 2 has already superseded …'
 */
export function approvalRefusal(recipes: readonly Rev[], id: string): string | null {
  const r = recipes.find((x) => x.id === id);
  if (!r || r.status !== 'draft' || !r.supersedes) return null;
  const old = recipes.find((x) => x.id === r.supersedes);
  if (!old || old.status !== 'superseded') return null;
  const current = currentApprovedRevision(recipes, old);
  const by = current ? `revision ${current.revision} (approved)` : 'a later revision';
  return (
    `“${r.name}”, revision ${r.revision}, was made from revision ${old.revision}, which ${by} has already superseded: ` +
    `only one revision of a recipe is approved at a time, and approving this one would drop the changes of ${by}. ` +
    `Open ${current ? `revision ${current.revision}` : 'the current revision'} in the designer and save these changes as a new revision of it.`
  );
}
