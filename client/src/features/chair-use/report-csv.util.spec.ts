import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvFileName, tableCsv } from './report-csv.util';
import { rangeFilePart } from './report-range.util';
import { chairTable, channelTable, dentistTable, operatorTable, overrunTable, remindersTable, whatIfTable } from './report-tables.util';
import { accuracyReport, attendanceReport, chairUseReport, operatorUseReport, referralsReport, whatIfResponse } from './test/reports.fixtures';

describe('report tables and their CSV', () => {
  it('writes the chair table as the screen shows it: headers in words, one-decimal hours and shares, totals last', () => {
    const model = chairTable(chairUseReport());
    const csv = tableCsv(model);
    expect(csv.split('\r\n')).toEqual([
      'Chair,Location,Open (h),Booked (h),Booked share (%),Open on done days (h),Used (h),Actual share (%)',
      // 1800 of 2400 min = 75 %; 1470 of 2100 = 70 %.
      'Chair 1,Harbour Street,40.0,30.0,75.0,35.0,24.5,70.0',
      'Chair 2,Harbour Street,40.0,20.0,50.0,35.0,17.5,50.0',
      'Mill 1,Mill Lane,20.0,16.7,83.3,20.0,15.0,75.0',
      'All chairs,All locations,100.0,66.7,66.7,90.0,57.0,63.3',
    ]);
    expect(csvFileName(model, rangeFilePart({ from: '2026-10-26', to: '2026-11-08' }))).toBe('chair-use-by-chair_2026-10-26_to_2026-11-08.csv');
  });

  it('quotes cells that hold commas or quotes (RFC 4180) so a spreadsheet reads them back whole', () => {
    const model = dentistTable(referralsReport());
    const csv = tableCsv(model);
    expect(csv).toContain('"Dr. Odo Brandt, Brandt & Vale Dental",1,0,1');
    const parsed = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
    expect(parsed).toEqual([model.columns.map((c) => c.label), ...model.rows, model.totals]);
    expect(parsed[0]).toEqual(['Referring dentist', 'Oct 2026', 'Nov 2026', 'Total']);
    expect(parsed.at(-1)).toEqual(['All referring dentists', '4', '3', '7']);
  });

  it('shows shares that make a whole as adding to 100.0', () => {
    const reminders = remindersTable(attendanceReport());
    expect(reminders.rows.map((r) => r[2])).toEqual(['33.4', '33.3', '33.3', '0.0']);
    expect(reminders.totals).toEqual(['All confirmed visits', '30', '100.0']);
    const channels = channelTable(attendanceReport());
    // 18, 6, 3, 3 and 8 of 38: 47.37 + 15.79 + 7.89 + 7.89 + 21.05, one by one 99.9.
    expect(channels.rows.map((r) => [r[0], r[2]])).toEqual([['Text reply', '47.4'], ['E-mail', '15.8'], ['Visit page link', '7.9'], ['Front desk', '7.9'], ['Not confirmed', '21.0']]);
    expect(channels.totals).toEqual(['All', '38', '100.0']);
  });

  it('builds the endodontist, overrun and what-if tables', () => {
    expect(operatorTable(operatorUseReport()).totals).toEqual(['All endodontists', '70.0', '47.5', '67.9']);
    expect(overrunTable(accuracyReport(), 'America/New_York').rows).toEqual([['Thu, Oct 29, 2026', 'Chair 1', '17:00', '17:25', '25']]);
    expect(whatIfTable(whatIfResponse()).rows).toEqual([
      // 1110 min of cases ÷ 1200 min of capacity a week = 0.925 weeks; ÷ 1680 = 0.661 weeks (two decimals here);
      // the change is that of the shown figures.
      ['Weeks of backlog', '0.93', '0.66', '−0.27'],
      ['Lead time to a first visit (weeks)', '1.20', '0.90', '−0.30'],
      ['Capacity per week (h)', '20.0', '28.0', '+8.0'],
      ['Free chair time per week (h)', '20.0', '28.0', '+8.0'],
      ['Free endodontist time per week (h)', '25.0', '33.0', '+8.0'],
      ['Open chair time per week (h)', '100.0', '108.0', '+8.0'],
    ]);
  });
});
