// Settings (QA manager): when lapse warnings go out, when a continuity-log month closes to foremen, at
// what time the daily lapse watch runs and the company's time zone (its "today" everywhere). Checked
// with the API's own schema; a 400 lands on its field.
import { companySettingsInput, type CompanySettings } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { lapseWatchQueries, useUpdateSettings } from '@/features/lapse-watch/api/lapse-watch-queries';
import { errorMessage, isApiError } from '@/lib/api-client';

export default function SettingsRoute() {
  return (
    <RequireRole roles={['qa_manager']} title="Settings" message="Company settings are kept by the QA manager.">
      <SettingsScreen />
    </RequireRole>
  );
}

function SettingsScreen() {
  const settings = useQuery(lapseWatchQueries.settings());
  return (
    <>
      <PageHeader title="Settings" description="Lapse warnings, closed months, the daily lapse-watch time and the company's time zone." />
      {settings.isPending ? (
        <LoadingState label="Loading settings…" />
      ) : settings.isError ? (
        <ErrorState error={settings.error} onRetry={() => void settings.refetch()} />
      ) : (
        <SettingsForm key={`${settings.data.updatedAt ?? 'defaults'}:${settings.data.timeZone}`} settings={settings.data} />
      )}
    </>
  );
}

/** "30, 7" → [30, 7]; anything that is not a whole number stays as NaN so the schema names the field. */
export function parseDays(text: string): number[] {
  return text
    .split(/[\s,;]+/)
    .filter(Boolean)
    .map((t) => (/^\d+$/.test(t) ? Number(t) : Number.NaN));
}

/** Every IANA zone the browser knows, the company's own first if the list lacks it. */
function zoneNames(current: string): string[] {
  const known = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('timeZone') : [];
  return known.includes(current) ? known : [current, ...known];
}

export function SettingsForm({ settings }: { settings: CompanySettings }) {
  const update = useUpdateSettings();
  const [warnDays, setWarnDays] = useState(settings.warnDays.join(', '));
  const [closedMonthAfter, setClosedMonthAfter] = useState(String(settings.closedMonthAfter));
  const [lapseWatchTime, setLapseWatchTime] = useState(settings.lapseWatchTime);
  // '' = follow the server's zone.
  const [timeZone, setTimeZone] = useState(settings.timeZoneIsServerDefault ? '' : settings.timeZone);
  const [errors, setErrors] = useState<Record<string, string>>({});

  const submit = (e: FormEvent) => {
    e.preventDefault();
    // A new attempt: the last save's "Settings saved." must not stand beside this one's errors.
    update.reset();
    const parsed = companySettingsInput.safeParse({
      warnDays: parseDays(warnDays),
      closedMonthAfter: /^\d+$/.test(closedMonthAfter.trim()) ? Number(closedMonthAfter) : Number.NaN,
      lapseWatchTime,
      timeZone: timeZone === '' ? null : timeZone,
    });
    if (!parsed.success) {
      const found: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const key = String(issue.path[0] ?? 'form');
        found[key] ??= issue.message;
      }
      setErrors(found);
      return;
    }
    setErrors({});
    update.mutate(parsed.data, {
      onError: (error) => {
        if (isApiError(error)) setErrors(Object.fromEntries(Object.entries(error.fields).map(([k, v]) => [k.split('.')[0]!, v])));
      },
    });
  };

  const formError = update.error && !(isApiError(update.error) && Object.keys(update.error.fields).length) ? errorMessage(update.error) : undefined;
  return (
    <Card className="max-w-xl p-5">
      <form className="space-y-4" onSubmit={submit} noValidate>
        <TextField
          label="Warn before a lapse (days)"
          hint="One to four lead times, e.g. 30, 7. Supervisors get a digest at each."
          value={warnDays}
          onChange={(e) => setWarnDays(e.target.value)}
          error={errors.warnDays}
          inputMode="numeric"
        />
        <TextField
          label="Close a month to foremen after (months)"
          hint="Older months of the continuity log can then be changed by the QA manager only."
          value={closedMonthAfter}
          onChange={(e) => setClosedMonthAfter(e.target.value)}
          error={errors.closedMonthAfter}
          inputMode="numeric"
        />
        <SelectField
          label="Time zone"
          hint={`The company's today is ${settings.today} in ${settings.timeZone}. Day counts, the continuity log's current month, the verify page and the daily run all follow this zone.`}
          value={timeZone}
          onChange={(e) => setTimeZone(e.target.value)}
          error={errors.timeZone}
        >
          <option value="">Server's time zone ({settings.serverTimeZone})</option>
          {zoneNames(settings.timeZone).map((z) => (
            <option key={z} value={z}>
              {z.replaceAll('_', ' ')}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Daily lapse-watch time"
          hint="The time of day in the company's time zone, as your browser shows times."
          type="time"
          value={lapseWatchTime}
          onChange={(e) => setLapseWatchTime(e.target.value)}
          error={errors.lapseWatchTime}
        />
        <FormError message={formError ?? errors.form} />
        <div className="flex items-center gap-3">
          <Button type="submit" variant="primary" busy={update.isPending}>
            Save settings
          </Button>
          {update.isSuccess && <span role="status" className="text-sm font-semibold text-emerald-800">Settings saved.</span>}
        </div>
      </form>
    </Card>
  );
}
