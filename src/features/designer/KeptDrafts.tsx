/**
 * The drafts other tabs kept (s21 item 1): a tab that opens the designer with nothing unsaved of its
 * own is offered, by name and time, the unsaved drafts no open tab holds (a tab closed, or a browser
 * closed, with edits unsaved; or a draft set aside when another recipe was opened over its unsaved
 * edits, s22 item 2) — never one picked silently. Opening one makes it this tab's draft;
 * discarding one removes it after a second click. A draft kept longer than OLD_DRAFT_DAYS is pointed
 * out for discarding; none is ever deleted without the blender's word.
 */
import { memo, useEffect, useState } from 'react';
import { Notice } from '../../components/notices';
import {
  askOpenTabs,
  claimDraftKey,
  draftKeysLocked,
  DRAFT_ANSWER_WAIT_MS,
  OLD_DRAFT_DAYS,
  ownDraftKey,
  releaseDraftClaim,
  useWorkspaceStore,
  type KeptDraft,
} from '../../state';
import { keptWhen } from './store';

/** What a kept draft is, in a line: "from 23:12 — 4 stocks, VG 320, “Trial”". */
export function keptDraftSummary(d: KeptDraft, now: Date = new Date()): string {
  const stocks = `${d.lines.length} stock${d.lines.length === 1 ? '' : 's'}`;
  const named = d.name.trim() ? `, “${d.name.trim()}”` : '';
  return `the draft kept ${keptWhen(d.keptAt, now)} — ${stocks}, VG ${d.targets.grade}${named}`;
}

/** Whole days since a draft was kept (null: time not recorded). */
function ageDays(d: KeptDraft, now: Date): number | null {
  return d.keptAt === null ? null : Math.floor((now.getTime() - new Date(d.keptAt).getTime()) / 86_400_000);
}

/** `onOpen` opens the kept draft of a key as this tab's; false when no draft is kept under it any more. */
export const KeptDrafts = memo(function KeptDrafts({ onOpen }: { onOpen: (key: string) => boolean }) {
  const drafts = useWorkspaceStore((s) => s.drafts);
  const own = ownDraftKey();
  const others = Object.keys(drafts).filter((k) => k !== own);
  const othersKey = others.join('|');
  // The drafts open tabs hold are theirs: asked again whenever the kept drafts change. With Web Locks
  // the browser says at once which keys open tabs hold (s23); otherwise the list is shown once the
  // tabs have had DRAFT_ANSWER_WAIT_MS to answer. A draft whose open tab answers later (a busy tab)
  // leaves the list then.
  const [held, setHeld] = useState<{ asked: string; keys: Set<string> } | null>(null);
  useEffect(() => {
    if (othersKey === '') return;
    let live = true;
    let shown = false;
    const keys = new Set<string>();
    const show = () => live && setHeld({ asked: othersKey, keys: new Set(keys) });
    const stop = askOpenTabs((key) => {
      keys.add(key);
      if (shown) show();
    });
    let timer: ReturnType<typeof setTimeout> | undefined;
    void draftKeysLocked().then((locked) => {
      if (!live) return;
      if (locked === null) {
        timer = setTimeout(() => {
          shown = true;
          show();
        }, DRAFT_ANSWER_WAIT_MS);
        return;
      }
      for (const k of locked) keys.add(k);
      shown = true;
      show();
    });
    return () => {
      live = false;
      stop();
      clearTimeout(timer);
    };
  }, [othersKey]);
  const [confirming, setConfirming] = useState<string | null>(null);
  /**
   * A kept draft another tab took (it opened it first), or one that vanished before it could be opened
   * here (saved or discarded in another tab): named once, then no longer offered.
   */
  const [taken, setTaken] = useState<{ key: string; summary: string; gone: boolean } | null>(null);
  // A draft is opened only once this tab holds its key (a tab that holds it already refuses the claim).
  // A key claimed for a draft that vanished meanwhile is let go at once (its lock would be held for good).
  const open = (key: string, summary: string) => {
    const claim = claimDraftKey(key);
    if (claim === true) {
      if (!onOpen(key)) setTaken({ key, summary, gone: true });
      return;
    }
    void claim.then((mine) => {
      if (mine && onOpen(key)) return;
      if (mine) releaseDraftClaim(key);
      setTaken({ key, summary, gone: mine });
      setHeld((h) => (h ? { asked: h.asked, keys: new Set([...h.keys, key]) } : h));
    });
  };
  if (others.length === 0 || held?.asked !== othersKey) return null;
  const offered = others.filter((k) => !held.keys.has(k));
  const takenNote = taken && (
    <p className="small" role="status">
      {`${taken.summary.charAt(0).toUpperCase()}${taken.summary.slice(1)} ${
        taken.gone ? 'is no longer kept: it was saved or discarded in another tab.' : 'is open in another tab now: go on with it there.'
      }`}
    </p>
  );
  if (offered.length === 0) {
    const title = taken?.gone ? 'The kept draft is no longer kept' : 'The kept draft is open in another tab';
    return takenNote ? <Notice tone="info" title={title}>{takenNote}</Notice> : null;
  }
  const now = new Date();
  offered.sort((a, b) => (drafts[b]!.keptAt ?? '').localeCompare(drafts[a]!.keptAt ?? ''));
  return (
    <Notice tone="info" title={offered.length === 1 ? 'An unsaved draft is kept' : `${offered.length} unsaved drafts are kept`}>
      <p className="small">
        Kept from a tab or window closed with edits unsaved, or set aside when another recipe was opened over them. Open one to go on with it
        here (it becomes this tab’s draft), or discard it.
      </p>
      {takenNote}
      <ul className="kept-drafts" data-testid="kept-drafts">
        {offered.map((k) => {
          const d = drafts[k]!;
          const age = ageDays(d, now);
          const summary = keptDraftSummary(d, now);
          return (
            <li key={k}>
              {confirming === k ? (
                <>
                  Discard {summary} for good?{' '}
                  <button
                    type="button"
                    onClick={() => {
                      useWorkspaceStore.getState().keepDraft(k, null);
                      setConfirming(null);
                    }}
                  >
                    Discard it
                  </button>{' '}
                  <button type="button" onClick={() => setConfirming(null)}>
                    Keep it
                  </button>
                </>
              ) : (
                <>
                  <button type="button" onClick={() => open(k, summary)}>
                    Open {summary}
                  </button>{' '}
                  <button type="button" className="link" aria-label={`Discard ${summary}`} onClick={() => setConfirming(k)}>
                    Discard
                  </button>
                  {age !== null && age >= OLD_DRAFT_DAYS && (
                    <span className="small muted" data-testid="kept-draft-old">
                      {' '}
                      — kept {age} days ago: discard it if it is no longer needed.
                    </span>
                  )}
                </>
              )}
            </li>
          );
        })}
      </ul>
    </Notice>
  );
});
