import { AskFirst } from '@/ui/confirm-step';
import { Panel } from '@/ui/panel';
import { ScreenFrame } from '@/ui/screen-frame';
import { QueryView } from '@/ui/state-views';
import {
  useRangesQuery,
  useResetRangeMutation,
  useResetRangesMutation,
  useSaveSettingsMutation,
  useSetRangeMutation,
  useSettingsQuery,
} from './api';
import { ClinicForm } from './clinic-form';
import { ConsentTextsPanel } from './consent-texts-panel';
import { RangeEditor } from './range-editor';

function ResetAll() {
  const reset = useResetRangesMutation();
  return (
    <AskFirst
      label="Reset all to defaults…"
      testID="ranges-reset-all"
      question="Drop every range the clinic set, at every site?"
      confirmLabel="Yes, reset all"
      cancelLabel="Cancel"
      tone="danger"
      busy={reset.isPending}
      error={reset.error?.message}
      onConfirm={() => reset.mutateAsync()}
    >
      Each measurement is then shown against the default ranges and their sources.
    </AskFirst>
  );
}

export function SettingsScreen() {
  const settings = useSettingsQuery();
  const save = useSaveSettingsMutation();
  const ranges = useRangesQuery();
  const setRange = useSetRangeMutation();
  const resetRange = useResetRangeMutation();

  return (
    <ScreenFrame
      title="Settings"
      subtitle="The clinic's details, record keeping, consent wording and reference ranges."
      testID="settings-screen"
    >
      <Panel title="Clinic" detail="Shown on every report and e-mail." testID="settings-clinic">
        <QueryView query={settings} loading="Loading the settings…" testID="settings">
          {(data) => <ClinicForm settings={data} onSave={(s) => save.mutateAsync(s)} />}
        </QueryView>
      </Panel>
      <ConsentTextsPanel />
      <Panel
        title="Reference ranges"
        detail="Each measurement is shown against these. The defaults carry their sources; a clinic may set its own limits per site. Values outside a range read “refer to a licensed clinician”, never a diagnosis."
        testID="settings-ranges"
      >
        <QueryView query={ranges} loading="Loading the ranges…" testID="ranges">
          {(data) => (
            <>
              <ResetAll />
              <RangeEditor
                ranges={data}
                onSave={(r, value) => setRange.mutateAsync({ metric: r.metric, site: r.site, range: value })}
                onReset={(r) => resetRange.mutateAsync({ metric: r.metric, site: r.site })}
              />
            </>
          )}
        </QueryView>
      </Panel>
    </ScreenFrame>
  );
}
