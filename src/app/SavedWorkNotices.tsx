import { useState } from 'react';
import { Notice, persistentStorageText } from '../components/notices';
import { downloadText } from '../components/download';
import { useStorageStatus, STORE_KEYS, STORE_LABEL, readKeptCopy, resumeSaving, type StoreKey } from '../state/persistence';
import { persistedData, STORE_VERSION } from '../state';

/** Edits to library or recipes after which the shell suggests an export-all backup. */
export const BACKUP_REMINDER_EDITS = 25;

/** Download the export-all backup (the backup module, with zod, is loaded on the first use). */
export async function exportBackup(): Promise<void> {
  const { backupFileName, makeBackupText } = await import('../state/backup');
  downloadText(backupFileName(), makeBackupText(), 'application/json');
}

function acknowledgeUpgrade(key: StoreKey): void {
  useStorageStatus.setState((s) => ({ stores: { ...s.stores, [key]: { ...s.stores[key], upgraded: null } } }));
}

async function downloadKept(key: StoreKey) {
  const kept = await readKeptCopy(key);
  downloadText(`blendbench-unusable-${key}.json`, JSON.stringify(kept ?? null, null, 1), 'application/json');
}

/** Banners about saved work: unusable stored copies, failed saves, eviction risk, backup reminder. */
export function SavedWorkNotices() {
  const status = useStorageStatus();
  const persistence = persistentStorageText(status.persistent);
  const [dismissPersist, setDismissPersist] = useState(false);
  const [snoozedAt, setSnoozedAt] = useState(0);

  return (
    <div className="saved-work-notices" aria-live="polite">
      {STORE_KEYS.map((key) => {
        const st = status.stores[key];
        return (
          <div key={key}>
            {st.problem ? (
              <Notice
                tone="error"
                title={`The saved ${STORE_LABEL[key]} was not loaded.`}
                actions={
                  <>
                    {st.problem.keptAs ? (
                      <button type="button" onClick={() => void downloadKept(key)}>
                        Download the saved copy
                      </button>
                    ) : null}
                    <button
                      type="button"
                      onClick={() => {
                        if (
                          window.confirm(
                            `Replace the saved ${STORE_LABEL[key]} with what this tab shows now?` +
                              (st.problem?.keptAs ? ' The unusable copy stays kept in the browser and can still be downloaded.' : ''),
                          )
                        ) {
                          resumeSaving(key, persistedData(key), STORE_VERSION[key]);
                        }
                      }}
                    >
                      Save this tab’s {STORE_LABEL[key]} over it
                    </button>
                  </>
                }
              >
                {st.problem.message} Nothing has been overwritten: the saved copy is kept as it was
                {st.problem.keptAs ? ' (and a copy set aside)' : ''}, and saving of the {STORE_LABEL[key]} is paused. This tab
                shows the demo {STORE_LABEL[key]} meanwhile.
              </Notice>
            ) : null}
            {st.upgraded ? (
              <Notice
                tone="info"
                title={`The saved ${STORE_LABEL[key]} was upgraded.`}
                actions={
                  <button type="button" onClick={() => acknowledgeUpgrade(key)}>
                    Dismiss
                  </button>
                }
              >
                It was written by an older version of Blendbench (schema {st.upgraded.from}) and now uses schema {st.upgraded.to}.
                {st.upgraded.keptAs
                  ? ' The original copy is kept, untouched, in this browser.'
                  : ' The original could not be copied aside, so it stays saved as it was until the next start.'}
              </Notice>
            ) : null}
            {st.saveError ? (
              <Notice
                tone="error"
                title="Not saved"
                actions={
                  <button type="button" onClick={() => void exportBackup()}>
                    Export a backup now
                  </button>
                }
              >
                {st.saveError}
              </Notice>
            ) : null}
          </div>
        );
      })}
      {persistence.atRisk && !dismissPersist ? (
        <Notice
          tone="info"
          title="The browser may clear saved work."
          actions={
            <button type="button" onClick={() => setDismissPersist(true)}>
              Understood
            </button>
          }
        >
          <span data-testid="persistence-banner">{persistence.text}</span>
        </Notice>
      ) : null}
      {status.editsSinceBackup - snoozedAt >= BACKUP_REMINDER_EDITS ? (
        <Notice
          tone="warning"
          title="Time for a backup?"
          actions={
            <>
              <button type="button" onClick={() => void exportBackup()}>
                Export everything
              </button>
              <button type="button" onClick={() => setSnoozedAt(status.editsSinceBackup)}>
                Later
              </button>
            </>
          }
        >
          {status.editsSinceBackup} changes since the last backup in this session. A backup file keeps your work safe if the
          browser’s storage is cleared.
        </Notice>
      ) : null}
      {status.externalChange ? (
        <Notice
          tone="info"
          actions={
            <button type="button" onClick={() => useStorageStatus.setState({ externalChange: null })}>
              Dismiss
            </button>
          }
        >
          {status.externalChange}
        </Notice>
      ) : null}
    </div>
  );
}
