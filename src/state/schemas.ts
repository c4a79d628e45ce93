/**
 * zod schemas for everything Blendbench stores or imports: components, recipes, targets, settings,
 * and the backup file. Stored data and imported files are validated with the same schemas, so a
 * record that could not be typed in through the interface cannot arrive through the back door either.
 */
import { z } from 'zod';
import { COMPONENT_CATEGORIES } from '../core/formulation/model';
import type { BlendTargets, Component, ComponentCategory, Recipe } from '../core/formulation/model';

// zod 4 probes `new Function` at start-up unless told not to; our CSP forbids eval.
z.config({ jitless: true });

export { z };

const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });
const positive = finite.refine((v) => v > 0, { message: 'must be above zero' });
const fraction = finite.refine((v) => v >= 0 && v <= 1, { message: 'must be between 0 and 1' });
const nullableFinite = finite.nullable();
const isoDate = z.string().regex(/^(\d{4}-\d{2}-\d{2})?$/, { message: 'must be a date YYYY-MM-DD' });
/** Free text, bounded so a hostile file cannot fill the browser's storage. */
const text = (max: number) => z.string().max(max, { message: `must be at most ${max} characters` });

export const categorySchema = z.enum(COMPONENT_CATEGORIES as unknown as [ComponentCategory, ...ComponentCategory[]]);
export const availabilitySchema = z.enum(['available', 'limited', 'withdrawn']);
export const priceBasisSchema = z.enum(['per-kg', 'per-litre', 'per-tonne']);

export const viscosityPointSchema = z.object({
  tempC: finite.refine((t) => t > -100 && t < 400, { message: 'temperature must be between −100 and 400 °C' }),
  kv: positive,
});

export const calibrationSchema = z.object({
  effectiveKv40: positive,
  effectiveKv100: positive,
  trial: z.object({
    massFractions: z.record(z.string(), fraction),
    measuredKv40: positive,
    measuredKv100: positive,
    labReference: text(200),
  }),
  method: z.enum(['refutas', 'astm-d7152']),
  calibratedOn: isoDate,
});

export const componentSchema = z
  .object({
    id: z.string().min(1).max(100),
    code: text(40).refine((s) => s.trim().length > 0, { message: 'stock code is required' }),
    name: text(200),
    category: categorySchema,
    viscosityPoints: z.array(viscosityPointSchema).min(2, { message: 'needs at least two viscosity points' }).max(20),
    density15: positive,
    anilinePoint: nullableFinite,
    pourPoint: nullableFinite,
    flashPoint: nullableFinite,
    sulfurPct: nullableFinite,
    saturatesPct: nullableFinite,
    price: z.object({
      amount: finite.refine((v) => v >= 0, { message: 'price cannot be negative' }),
      basis: priceBasisSchema,
      currency: text(12),
    }),
    availability: availabilitySchema,
    oxidationRating: nullableFinite,
    shearLossPct: nullableFinite,
    calibration: calibrationSchema.nullable(),
    source: text(300),
    sourceDate: isoDate,
    notes: text(2000),
  })
  .superRefine((c, ctx) => {
    const temps = c.viscosityPoints.map((p) => p.tempC);
    if (new Set(temps).size < 2) {
      ctx.addIssue({ code: 'custom', path: ['viscosityPoints'], message: 'needs viscosities at two different temperatures' });
    }
    const sorted = [...c.viscosityPoints].sort((a, b) => a.tempC - b.tempC);
    for (let i = 1; i < sorted.length; i++) {
      const lo = sorted[i - 1]!;
      const hi = sorted[i]!;
      if (hi.tempC > lo.tempC && hi.kv >= lo.kv) {
        ctx.addIssue({
          code: 'custom',
          path: ['viscosityPoints'],
          message: `viscosity at ${hi.tempC} °C (${hi.kv}) must be below the viscosity at ${lo.tempC} °C (${lo.kv})`,
        });
      }
    }
  });

export const recipeLineSchema = z.object({ componentId: z.string().min(1).max(100), massFraction: fraction });

export const recipeSchema = z.object({
  id: z.string().min(1).max(100),
  name: text(200),
  grade: positive,
  lines: z.array(recipeLineSchema).max(60),
  revision: z.number().int().min(1),
  isReference: z.boolean(),
  notes: text(4000),
  updatedAt: z.string().max(40),
});

export const targetsSchema = z.object({
  grade: positive,
  targetKv40: positive.nullable(),
  tolerancePct: finite.refine((v) => v >= 0 && v <= 100, { message: 'must be between 0 and 100 %' }),
  minVi: nullableFinite,
  maxAnilinePoint: nullableFinite,
  maxPolymerFraction: fraction.nullable(),
  maxPourPoint: nullableFinite,
  minFlashPoint: nullableFinite,
  additive: z.object({ componentId: z.string().min(1), massFraction: fraction }).nullable(),
  bounds: z.record(z.string(), z.object({ min: fraction.optional(), max: fraction.optional() })),
  objective: z.enum(['cost', 'solvency', 'oxidation', 'closest']),
  referenceRecipeId: z.string().nullable(),
});

export const settingsSchema = z.object({
  temperatureUnit: z.enum(['C', 'F']),
  currencySymbol: text(8),
  decimalSeparator: z.enum(['.', ',']),
  thousandsGrouping: z.boolean(),
  companyName: text(200),
  operatingTempC: finite,
  coldStartTempC: finite,
  blendMethod: z.enum(['refutas', 'astm-d7152']),
  lastBackupAt: z.string().max(40).nullable(),
});

/** Persisted slice of the library store. */
export const libraryDataSchema = z.object({ components: z.array(componentSchema).max(5000) });
/** Persisted slice of the recipes store. */
export const recipesDataSchema = z.object({
  recipes: z.array(recipeSchema).max(5000),
  targets: z.record(z.string(), targetsSchema),
  activeRecipeId: z.string().nullable(),
  sheets: z.record(
    z.string(),
    z.object({
      lot: text(120),
      batchSize: text(32),
      batchUnit: z.enum(['kg', 'litres']),
      vessel: text(120),
      instructions: text(20000).nullable(),
    }),
  ),
});
/** Persisted slice of the settings store. */
export const settingsDataSchema = z.object({ settings: settingsSchema });

// Compile-time checks that the schemas and the domain model agree (each assignable to the other).
function agree<A, B extends A>(_check?: [A, B]): void {}
agree<z.infer<typeof componentSchema>, Component>();
agree<Component, z.infer<typeof componentSchema>>();
agree<z.infer<typeof recipeSchema>, Recipe>();
agree<Recipe, z.infer<typeof recipeSchema>>();
agree<z.infer<typeof targetsSchema>, BlendTargets>();
agree<BlendTargets, z.infer<typeof targetsSchema>>();

/** One-line, human-readable summary of a zod error: "viscosityPoints: …; price.amount: …". */
export function describeIssues(error: z.ZodError, max = 4): string {
  const parts = error.issues.slice(0, max).map((i) => {
    const path = i.path.map(String).join('.');
    return path ? `${path}: ${i.message}` : i.message;
  });
  if (error.issues.length > max) parts.push(`… and ${error.issues.length - max} more`);
  return parts.join('; ');
}
