/**
 * The navigation list: one entry per screen, each loaded lazily (React.lazy) on first visit.
 *
 * To add a screen: create `src/features/<name>/<Name>Screen.tsx` with a DEFAULT export (a component
 * taking no props that renders its own <h2>), then add ONE line below, before `settings`.
 * The frame carries one standing caution on every screen (and prints the full text).
 */
import type { ComponentType } from 'react';

export interface ScreenEntry {
  /** URL hash: `#/<id>`. */
  id: string;
  /** Navigation label. */
  label: string;
  /** One line under the label in the navigation. */
  blurb: string;
  /** True if the screen shows predicted properties. */
  predictions: boolean;
  load: () => Promise<{ default: ComponentType }>;
}

export const SCREENS: ScreenEntry[] = [
  { id: 'library', label: 'Stocks', blurb: 'Component library', predictions: true, load: () => import('../features/library/LibraryScreen') },
  { id: 'designer', label: 'Recipe designer', blurb: 'Solve and fine-tune a recipe', predictions: true, load: () => import('../features/designer/DesignerScreen') },
  { id: 'explorer', label: 'Substitute explorer', blurb: 'Replace a withdrawn stock', predictions: true, load: () => import('../features/explorer/ExplorerScreen') },
  { id: 'recipes', label: 'Recipes', blurb: 'Status, revisions, specification', predictions: true, load: () => import('../features/recipes/RecipesScreen') },
  { id: 'line-plan', label: 'Whole-line plan', blurb: 'Every grade against limited stocks', predictions: true, load: () => import('../features/lineplan/LinePlanScreen') },
  { id: 'blend-sheet', label: 'Blend sheet', blurb: 'Printable sheet for the plant', predictions: true, load: () => import('../features/blend-sheet/BlendSheetScreen') },
  { id: 'settings', label: 'Settings', blurb: 'Units, saved work, backups', predictions: false, load: () => import('../features/settings/SettingsScreen') },
];
