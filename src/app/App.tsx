import { lazy, Suspense, useEffect, useRef, useState, type ComponentType } from 'react';
import { SCREENS, type ScreenEntry } from './screens';
import { ErrorBoundary } from './ErrorBoundary';
import { SavedWorkNotices } from './SavedWorkNotices';
import { TypedCopyNotice } from './TypedCopyNotice';
import { CautionBanner, DemoTag, StandingCaution } from '../components/notices';
import { FormatContext, useFormat, useUnitConversionsReady } from '../components/format';
import { setOpeningDraw } from '../components/row-window';
import { flushDeferredWrites, isDemoComponent, setRefusalWords, startSavedWork, useLibrary, useSavedWorkReady, useSettings, DEMO_PLANT } from '../state';

/**
 * One component per screen for the page's life: the screen's own component when its code has
 * already arrived (the opening screen, fetched while saved work is read), else a lazy one. A lazy
 * component suspends at least once, and React then shows the fallback and holds the screen back
 * for a moment (about 300 ms) when it arrives.
 */
const screenComponents = new Map<string, ComponentType>();
const loadedScreens = new Map<string, ComponentType>();
function screenComponent(entry: ScreenEntry): ComponentType {
  let c = screenComponents.get(entry.id);
  if (!c) {
    c = loadedScreens.get(entry.id) ?? lazy(entry.load);
    screenComponents.set(entry.id, c);
  }
  return c;
}

/** Fetch a screen's code (resolves, failed or not: a failed screen is reported by its lazy component). */
function loadScreen(entry: ScreenEntry): Promise<void> {
  return entry.load().then(
    (m) => void loadedScreens.set(entry.id, m.default),
    () => undefined,
  );
}

function screenFromHash(): ScreenEntry {
  const id = window.location.hash.replace(/^#\/?/, '').split(/[/?]/)[0] ?? '';
  return SCREENS.find((s) => s.id === id) ?? SCREENS[0]!;
}

let openingScreen: Promise<void> | null = null;
/**
 * Start fetching the opening screen's code (the screen named by the address): main.tsx calls it
 * before the first render, so the fetch runs beside the shell's first render and the reading of saved work.
 */
export function fetchOpeningScreen(): Promise<void> {
  openingScreen ??= loadScreen(screenFromHash());
  return openingScreen;
}

/**
 * Work of `startSavedWork` that the first screen does not wait for: held until that screen is drawn,
 * then run after its frame is painted (a task queued from the next animation frame).
 */
let afterFirstScreen: (() => void) | null = null;
function holdUntilFirstScreen(run: () => void): void {
  afterFirstScreen = run;
}
function releaseAfterPaint(): void {
  const run = afterFirstScreen;
  afterFirstScreen = null;
  if (run) requestAnimationFrame(() => window.setTimeout(run));
}

function useHashScreen(): ScreenEntry {
  const [screen, setScreen] = useState(screenFromHash);
  useEffect(() => {
    const on = () => {
      flushDeferredWrites(); // a draft written after the frame is written before another screen shows
      setScreen(screenFromHash());
    };
    window.addEventListener('hashchange', on);
    return () => window.removeEventListener('hashchange', on);
  }, []);
  return screen;
}

function DemoLabel() {
  const hasDemo = useLibrary((s) => s.components.some(isDemoComponent));
  const company = useSettings().companyName;
  if (!hasDemo) return company ? <span className="header-company">{company}</span> : null;
  return (
    <DemoTag>
      Invented demo data — {DEMO_PLANT} is an invented plant; stocks, codes and prices are invented
    </DemoTag>
  );
}

export function App() {
  const savedWorkReady = useSavedWorkReady();
  // In °F the screens wait for the unit conversions (mathjs), fetched only for °F.
  const unitsReady = useUnitConversionsReady();
  // A screen is drawn once saved work is in the stores and the opening screen's code is here.
  const [started, setStarted] = useState(false);
  const ready = savedWorkReady && unitsReady && started;
  const screen = useHashScreen();
  const mainRef = useRef<HTMLElement>(null);
  // The one formatter of the page, given to every screen (FormatContext); the stores' refusals
  // write numbers with it too (decimal separator, temperature unit).
  const fmt = useFormat();
  useEffect(() => setRefusalWords(fmt), [fmt]);
  const shownId = useRef<string | null>(null);

  useEffect(() => {
    // The screen is drawn once every store holds its saved copy (the stores say "ready" a moment
    // before their state is set) and the opening screen's code, fetched meanwhile, is here.
    // What the first screen does not wait for (the first start's save of the demo and the like) runs
    // after that screen is painted.
    void Promise.allSettled([startSavedWork({ later: holdUntilFirstScreen }), fetchOpeningScreen()]).then(() => setStarted(true));
  }, []);

  // Once a screen has been drawn, later screens draw every row at once.
  useEffect(() => {
    if (!ready) return;
    setOpeningDraw(false);
    releaseAfterPaint();
  }, [ready]);

  useEffect(() => {
    document.title = `${screen.label} — Blendbench`;
    // Move focus to the new screen after navigation (not on the first load).
    if (shownId.current !== null && shownId.current !== screen.id) mainRef.current?.focus();
    shownId.current = screen.id;
  }, [screen]);

  const Screen = ready ? screenComponent(screen) : null;
  return (
    <FormatContext value={fmt}>
    <div className="app">
      <a className="skip-link" href="#main">
        Skip to content
      </a>
      <header className="app-header">
        <div className="brand">
          <h1>Blendbench</h1>
          <span className="tagline">gear-oil reformulation workbench</span>
        </div>
        <div className="header-notes">
          <StandingCaution />
          <DemoLabel />
        </div>
      </header>
      <div className="app-body">
        <nav className="app-nav" aria-label="Screens">
          <ul>
            {SCREENS.map((s) => (
              <li key={s.id}>
                <a href={`#/${s.id}`} aria-current={s.id === screen.id ? 'page' : undefined}>
                  <span className="nav-label">{s.label}</span>
                  <span className="nav-blurb">{s.blurb}</span>
                </a>
              </li>
            ))}
          </ul>
        </nav>
        <main id="main" ref={mainRef} tabIndex={-1} className="app-main">
          <SavedWorkNotices />
          <TypedCopyNotice />
          {/* On paper the frame's one-line caution is gone: the full text prints instead (the blend sheet prints its own list). */}
          {screen.id === 'blend-sheet' ? null : <CautionBanner className="print-only" />}
          {Screen ? (
            <ErrorBoundary resetKey={screen.id}>
              <Suspense fallback={<p className="loading">Opening {screen.label}…</p>}>
                <Screen />
              </Suspense>
            </ErrorBoundary>
          ) : (
            <p className="loading" role="status">
              Opening saved work…
            </p>
          )}
        </main>
      </div>
      <footer className="app-footer">
        Blendbench runs entirely in this browser; nothing is sent anywhere. Predictions use published methods (ASTM D341,
        D2270, D7152, Refutas, ISO 3448).
      </footer>
    </div>
    </FormatContext>
  );
}
