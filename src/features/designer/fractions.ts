/**
 * Hand-editing of recipe fractions that keeps the recipe at exactly 100 %.
 *
 * Rule (stated in the designer): when one line is set to a new share, the other lines keep their
 * MASS fractions except the absorbing lines, which take up the difference:
 * - "balance" mode: one chosen balance stock absorbs it;
 * - "proportional" mode: every unlocked line absorbs it in proportion to its current share
 *   (the additive package stays at its fixed treat rate).
 * Scaling the absorbers' masses by one factor scales their volumes by the same factor, so the
 * rule is the same in the mass % and the volume % view; in the volume view the edited line's
 * mass fraction is solved so that its volume share (ideal mixing at 15 °C) is the one entered.
 */
import type { RecipeLine } from '../../core/formulation/model';

export type Basis = 'mass' | 'volume';

export type Rebalance =
  | { mode: 'balance'; balanceId: string }
  | { mode: 'proportional'; lockedIds: readonly string[] };

export interface EditResult {
  lines: RecipeLine[];
  /** The entered value could not be reached (absorbers at 0 or fixed lines at 100 %). */
  clamped: boolean;
  /** Why it was clamped, in words; empty when not clamped. */
  message: string;
}

/** Shares of each line in a basis (mass or volume at 15 °C by ideal mixing), in line order. */
export function basisFractions(lines: readonly RecipeLine[], density: (id: string) => number, basis: Basis): number[] {
  if (basis === 'mass') return lines.map((l) => l.massFraction);
  const v = lines.map((l) => l.massFraction / density(l.componentId));
  const total = v.reduce((s, x) => s + x, 0);
  return total > 0 ? v.map((x) => x / total) : v.map(() => 0);
}

/** Sets line `id` to `value` (0–1) in `basis`; the absorbing lines take up the difference. */
export function editFraction(
  lines: readonly RecipeLine[],
  density: (id: string) => number,
  basis: Basis,
  id: string,
  value: number,
  rebalance: Rebalance,
): EditResult {
  const idx = lines.findIndex((l) => l.componentId === id);
  if (idx < 0 || !Number.isFinite(value)) return { lines: [...lines], clamped: true, message: 'Unknown line or value.' };
  const target = Math.min(1, Math.max(0, value));
  const absorbers = new Set<string>();
  if (rebalance.mode === 'balance') {
    if (rebalance.balanceId !== id && lines.some((l) => l.componentId === rebalance.balanceId)) absorbers.add(rebalance.balanceId);
  } else {
    for (const l of lines) if (l.componentId !== id && !rebalance.lockedIds.includes(l.componentId)) absorbers.add(l.componentId);
  }
  if (absorbers.size === 0) {
    return {
      lines: [...lines],
      clamped: true,
      message:
        rebalance.mode === 'balance'
          ? 'Choose a balance stock other than this line to absorb the change.'
          : 'No other line is free to absorb the change.',
    };
  }
  // Fixed lines keep their mass fractions: W_F (mass) and V_F (specific volume, L/kg of blend).
  let wFixed = 0;
  let vFixed = 0;
  let absorberMass = 0;
  for (const l of lines) {
    if (l.componentId === id || absorbers.has(l.componentId)) {
      if (absorbers.has(l.componentId)) absorberMass += l.massFraction;
      continue;
    }
    wFixed += l.massFraction;
    vFixed += l.massFraction / density(l.componentId);
  }
  // Absorbers' relative weights: current shares, or equal when they are all at zero.
  const weights = new Map<string, number>();
  for (const a of absorbers) {
    const w = lines.find((l) => l.componentId === a)!.massFraction;
    weights.set(a, absorberMass > 0 ? w / absorberMass : 1 / absorbers.size);
  }
  const free = Math.max(0, 1 - wFixed);
  let x: number;
  if (basis === 'mass') {
    x = target;
  } else {
    // φ = x·a / (x·a + V_F + (1 − W_F − x)·k), solved for x (a = 1/ρ of the edited line,
    // k = weighted specific volume of the absorbers).
    const a = 1 / density(id);
    let k = 0;
    for (const [aid, r] of weights) k += r / density(aid);
    const den = a * (1 - target) + target * k;
    x = den > 0 ? (target * (vFixed + free * k)) / den : free;
  }
  let clamped = false;
  let message = '';
  if (x > free + 1e-12) {
    clamped = true;
    x = free;
    message =
      rebalance.mode === 'balance'
        ? 'Limited: the balance stock is down to 0 %. Choose another balance stock or lower another line.'
        : 'Limited: the other lines are down to 0 % (locked lines stay).';
  }
  x = Math.max(0, x);
  const rest = free - x;
  const out = lines.map((l) => {
    if (l.componentId === id) return { componentId: id, massFraction: x };
    const r = weights.get(l.componentId);
    return r === undefined ? { ...l } : { componentId: l.componentId, massFraction: r * rest };
  });
  return { lines: closeToOne(out, absorbers), clamped, message };
}

/** Removes a line; its share goes to the absorbers (balance stock, or all unlocked lines). */
export function removeLine(lines: readonly RecipeLine[], id: string, rebalance: Rebalance): RecipeLine[] {
  const kept = lines.filter((l) => l.componentId !== id);
  if (kept.length === 0) return [];
  const removed = lines.find((l) => l.componentId === id)?.massFraction ?? 0;
  const absorbers = new Set<string>(
    rebalance.mode === 'balance' && kept.some((l) => l.componentId === rebalance.balanceId)
      ? [rebalance.balanceId]
      : kept.filter((l) => rebalance.mode === 'balance' || !rebalance.lockedIds.includes(l.componentId)).map((l) => l.componentId),
  );
  if (absorbers.size === 0) kept.forEach((l) => absorbers.add(l.componentId));
  const absorberMass = kept.filter((l) => absorbers.has(l.componentId)).reduce((s, l) => s + l.massFraction, 0);
  const out = kept.map((l) =>
    absorbers.has(l.componentId)
      ? {
          componentId: l.componentId,
          massFraction: l.massFraction + (absorberMass > 0 ? (removed * l.massFraction) / absorberMass : removed / absorbers.size),
        }
      : { ...l },
  );
  return closeToOne(out, absorbers);
}

/** Adds a line at 0 % (no effect on the others); ignores a component already present. */
export function addLine(lines: readonly RecipeLine[], id: string): RecipeLine[] {
  if (lines.some((l) => l.componentId === id)) return [...lines];
  return [...lines, { componentId: id, massFraction: lines.length === 0 ? 1 : 0 }];
}

/** Scales all lines to sum exactly to 1 (e.g. after loading a recipe rounded to 0.01 %). */
export function normalise(lines: readonly RecipeLine[]): RecipeLine[] {
  const total = lines.reduce((s, l) => s + Math.max(0, l.massFraction), 0);
  if (!(total > 0)) return lines.map((l) => ({ ...l }));
  const out = lines.map((l) => ({ componentId: l.componentId, massFraction: Math.max(0, l.massFraction) / total }));
  return closeToOne(out, new Set(out.map((l) => l.componentId)));
}

/** Puts the floating-point remainder on the largest absorber so the fractions sum to 1. */
function closeToOne(lines: RecipeLine[], absorbers: ReadonlySet<string>): RecipeLine[] {
  let best = -1;
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i]!;
    if (absorbers.has(l.componentId) && (best < 0 || l.massFraction > lines[best]!.massFraction)) best = i;
  }
  if (best < 0) return lines;
  let others = 0;
  for (let i = 0; i < lines.length; i++) if (i !== best) others += lines[i]!.massFraction;
  const closed = 1 - others;
  if (closed >= 0) lines[best] = { componentId: lines[best]!.componentId, massFraction: closed };
  return lines;
}
