// The blend-sheet screen: wires the printable sheet to the saved library, recipes and settings.
// Opens on `#/blend-sheet/<recipeId>` when given, else on the active recipe.
import { useCallback, useMemo, useState } from 'react';
import type { Recipe } from '../../core/formulation/model';
import { predictBlend } from '../../core/formulation/blend-properties';
import { recipeActions, useActiveRecipe, useLibrary, useRecipes, useSettings } from '../../state';
import { useFormat } from '../../components/format';
import { BlendSheetView } from './BlendSheetView';
import { sheetPrediction } from '../../core/sheet/blend-sheet';

function recipeIdFromHash(): string | null {
  const parts = window.location.hash.replace(/^#\/?/, '').split('/');
  return parts[0] === 'blend-sheet' && parts[1] ? decodeURIComponent(parts[1]) : null;
}

function localIsoDate(d: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

export default function BlendSheetScreen() {
  const components = useLibrary((s) => s.components);
  const recipes = useRecipes((s) => s.recipes);
  const sheets = useRecipes((s) => s.sheets);
  const targets = useRecipes((s) => s.targets);
  const qcInputs = useRecipes((s) => s.qc);
  const active = useActiveRecipe();
  const settings = useSettings();
  const f = useFormat();
  const [picked, setPicked] = useState<string | null>(() => {
    const fromHash = recipeIdFromHash();
    return fromHash && recipes.some((r) => r.id === fromHash) ? fromHash : null;
  });
  const today = useMemo(() => localIsoDate(new Date()), []);
  const exchange = useMemo(
    () => ({ base: settings.baseCurrency, rates: settings.exchangeRates }),
    [settings.baseCurrency, settings.exchangeRates],
  );
  const formatNumber = useCallback((x: number, d: number) => f.num(x, d), [f]);
  const recipeId = picked ?? active?.id ?? null;

  const predict = useCallback(
    (recipe: Recipe) => {
      const p = predictBlend(components, recipe.lines, {
        method: settings.blendMethod,
        operatingTempC: settings.operatingTempC,
        d341Form: settings.d341Form,
        display: settings,
      });
      return { ...sheetPrediction(p), warnings: p.warnings, properties: p };
    },
    [components, settings],
  );

  return (
    <BlendSheetView
      components={components}
      recipes={recipes}
      recipeId={recipeId}
      onRecipeChange={(id) => {
        setPicked(id);
        recipeActions.setActiveRecipe(id);
      }}
      companyName={settings.companyName}
      meteringTempC={settings.meteringTempC}
      deliveryTempC={settings.deliveryTempC}
      predict={predict}
      targets={targets}
      method={settings.blendMethod}
      exchange={exchange}
      today={today}
      temperatureUnit={settings.temperatureUnit}
      sheetInputs={sheets}
      onSheetInputsChange={recipeActions.setSheetInputs}
      qcInputs={qcInputs}
      onQcInputsChange={recipeActions.setQcInputs}
      formatNumber={formatNumber}
      display={settings}
    />
  );
}
