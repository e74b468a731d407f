import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A company's own settings; a company without a row runs on the defaults. */
export interface CompanySettingsRow {
  organizationId: string;
  warnDays: number[];
  closedMonthAfter: number;
  lapseWatchTime: string;
  timeZone: string | null;
  updatedAt: Date;
}

export const CompanySettingsEntity = new EntitySchema<CompanySettingsRow>({
  name: 'CompanySettings',
  tableName: 'company_settings',
  columns: {
    organizationId: { type: 'uuid', name: 'organization_id', primary: true },
    warnDays: { type: 'integer', name: 'warn_days', array: true },
    closedMonthAfter: col.int('closed_month_after'),
    lapseWatchTime: col.text('lapse_watch_time'),
    timeZone: col.text('time_zone', true),
    updatedAt: col.at('updated_at'),
  },
});
